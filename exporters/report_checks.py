"""Every check row of a governing case written out for the calc package: formula, the numbers
put in, and the result (ratio, clause, verdict). The formulas of the stem's loads are the
engine's (its pressure models'); nothing is computed here.
"""

from __future__ import annotations

import math
from dataclasses import dataclass


@dataclass(frozen=True)
class CheckText:
    """One check written out: formula, the numbers put in, and the result."""

    name: str
    title: str
    clause: str
    formula: str
    numbers: str
    result: str
    ratio: float
    passes: bool


def num_text(v, fmt=",.0f") -> str:
    if v is None or not math.isfinite(float(v)):
        return "n/a"
    return format(float(v), fmt)


_n = num_text  # short, for the long format strings below


def _flex(m, member) -> str:
    a = float(member.a_in) if m["as_in2"] else math.nan  # the engine's stress block
    return (f"As = {_n(m['as_in2'], '.3f')} in²/ft, d = {_n(m['d_in'], '.2f')} in, "
            f"a = As·fy/(0.85·f'c·b) = {_n(a, '.2f')} in, φ = {_n(m['phi'], '.3f')} "
            f"(εt = {_n(m['eps_t'], '.4f')}), φMn = {_n(m['phi_mn_lbft'])} lb-ft/ft")


def _shear(m, size_effect, inp) -> str:
    lam = "λs·" if size_effect else ""
    return (f"φVc = 0.75·8·{lam}ρw^(1/3)·√f'c·b·d ≤ 0.75·5·√f'c·b·d with d = "
            f"{_n(m['d_in'], '.2f')} in, f'c = {inp.materials.fc_psi:,.0f} psi, b = 12 in: "
            f"φVc = {_n(m['phi_vn_lb'])} lb/ft")


def _stability_texts(case) -> dict[str, tuple[str, str]]:
    r, g, inp = case.result, case.geometry, case.inputs
    f = float
    B = f(g.footing_width_ft)
    ot, sl, br = r["overturning"], r["sliding"], r["bearing"]
    st = case.checks.stability
    case_v = st.case_surcharge if bool(st.bearing_with_surcharge) else st.case_dead
    return {
        "overturning": (
            "FS_OT = ΣM_R / ΣM_O about the toe at the bottom of footing ≥ FS required; "
            "resultant inside the base",
            f"ΣM_R = {_n(ot['m_resisting_lbft'])} lb-ft/ft, ΣM_O = "
            f"{_n(ot['m_overturning_lbft'])} lb-ft/ft, FS_OT = {_n(ot['fs'], '.2f')} "
            f"(required {_n(ot['fs_required'], '.2f')}); resultant "
            f"{'inside' if ot['resultant_in_base'] else 'OUTSIDE'} the base"),
        "sliding": (
            "FS_SL = (μ·ΣV + P_p) / ΣH ≥ FS required",
            f"(μ = {inp.soil.friction_coefficient:g} × ΣV = {_n(sl['sum_v_lb'])} lb/ft + P_p = "
            f"{_n(sl['passive_lb'])} lb/ft) / ΣH = {_n(sl['h_driving_lb'])} lb/ft: "
            f"FS_SL = {_n(sl['fs'], '.2f')} (required {_n(sl['fs_required'], '.2f')})"),
        "bearing": (
            "e = B/2 − (ΣM_R − ΣM_O)/ΣV; q_max = ΣV/B·(1 + 6e/B) for e ≤ B/6, else "
            "2ΣV/(3(B/2 − e)) ≤ q_allowable",
            f"case {br['case']}: ΣV = {_n(float(case_v.sum_v_lb))} lb/ft, B = {B:.2f} ft, "
            f"e = {_n(br['eccentricity_ft'], '.2f')} ft (B/6 = {B / 6:.2f} ft), q_max = "
            f"{_n(br['q_max_psf'])} psf, q_min = {_n(br['q_min_psf'])} psf, allowable "
            f"{_n(br['allowable_psf'])} psf"),
        "embedment": (
            "D = front grade − bottom of footing ≥ max(min_embedment_ft, frost_depth_ft)",
            f"D = {case.front_grade_ft:.2f} − {case.segment.bottom_of_footing_ft:.2f} = "
            f"{f(g.embedment_ft):.2f} ft"),
    }


def _stem_texts(case) -> dict[str, tuple[str, str]]:
    r, g, inp = case.result, case.geometry, case.inputs
    p = case.checks.pressure
    hs = float(g.soil_height_ft)
    stem = r["stem"]
    return {
        "stem_flexure": (
            p.stem_moment_formula + "; φMn = φ·As·fy·(d − a/2)",
            f"h_s = {hs:.2f} ft, EFP = {p.active_efp_pcf:g} pcf, Ka = {p.ka:.3f}, q = "
            f"{p.surcharge_psf:g} psf: Mu = {_n(stem['mu_lbft'])} lb-ft/ft; "
            + _flex(stem, case.checks.stem)),
        "stem_shear": (
            p.stem_shear_formula,
            f"Vu = {_n(stem['vu_lb'])} lb/ft; " + _shear(stem, True, inp)),
        "stem_flexure_height": (
            "Mu(y) ≤ φMn(y) at sections up the stem (bars full height, thickness tapering)",
            f"worst at y = {_n(float(case.checks.stem.height_flexure_y_ft), '.2f')} ft above "
            "the footing"),
        "stem_shear_height": (
            "Vu(y) ≤ φVc(y) at sections up the stem",
            f"worst at y = {_n(float(case.checks.stem.height_shear_y_ft), '.2f')} ft above "
            "the footing"),
        "stem_min_steel": ("As ≥ As,min = 0.0018·b·h (h = stem base thickness)",
                           f"h = {_n(stem['thickness_in'], '.1f')} in"),
        "stem_spacing": (
            "s ≤ min(3h, 18 in" + (", crack control 15(40,000/fs) − 2.5cc ≤ 12(40,000/fs))"
                                   if inp.criteria.crack_control else ")"),
            f"service bar stress fs = {_n(stem['fs_service_psi'])} psi, clear cover "
            f"{_n(stem['cover_in'], '.2f')} in"),
        "stem_hook": ("ℓdh ≤ footing thickness − bottom cover − bottom mat (toe + longitudinal "
                      "bars)",
                      f"ℓdh = {_n(stem['ldh_in'], '.1f')} in, available "
                      f"{_n(stem['ldh_available_in'], '.1f')} in"),
    }


def _footing_texts(case) -> dict[str, tuple[str, str]]:
    r, g, inp = case.result, case.geometry, case.inputs
    f = float
    br, heel, toe = r["bearing"], r["heel"], r["toe"]
    wu_heel = case.heel_load_psf  # ACI 318-19 5.3.1 via ASCE 7 2.3 (the engine's heel load)
    return {
        "heel_flexure": ((
            "Mu at the back face of the stem = the combination's load on the heel less its "
            "factored bearing pressure under the heel, the largest of 1.2D+1.6H+1.6L, "
            "1.2D+1.6H, 0.9D+1.6H" + (", 1.2D+1.0E+1.6H" if inp.loads.seismic is not None else ""))
            if inp.criteria.heel_upward_pressure else
            "wu = 1.2·(γ·h_s + γc·T) + 1.6·q; Mu = wu·L²/2 at the back face of the stem",
            (f"governing {heel['mu_combination']}, " if inp.criteria.heel_upward_pressure
             else f"wu = {wu_heel:,.0f} psf, ")
            + f"L = {f(g.heel_ft):.2f} ft: Mu = "
            f"{_n(heel['mu_lbft'])} lb-ft/ft; " + _flex(heel, case.checks.heel)),
        "heel_shear": (("Vu at the back face of the stem, the largest of the combinations "
                        "(net of the factored bearing pressure)")
                       if inp.criteria.heel_upward_pressure
                       else "Vu = wu·L at the back face of the stem",
                       (f"governing {heel['vu_combination']}: "
                        if inp.criteria.heel_upward_pressure else "")
                       + f"Vu = {_n(heel['vu_lb'])} lb/ft; "
                       + _shear(heel, inp.criteria.footing_shear_size_effect, inp)),
        "heel_development": (
            "top bars beyond the back face of the stem: ℓd (Table 25.4.2.3, ψt = 1.3 top bar) "
            "or ℓdh (25.4.3.1) × As,req/As,prov (25.4.10.1), ≥ 12 in / 8db and 6 in; ≤ stem "
            "+ toe − 3 in",
            f"{heel['anchorage']}: required {_n(heel['ld_required_in'], '.1f')} in (straight "
            f"{_n(heel['ld_straight_in'], '.1f')} in, hooked {_n(heel['ldh_in'], '.1f')} in; "
            f"As,req = {_n(heel['as_required_in2'], '.3f')} in²/ft), room "
            f"{_n(heel['ld_available_in'], '.1f')} in"),
        "toe_development": (
            "bottom bars beyond the front face of the stem: ℓd (Table 25.4.2.3) or ℓdh "
            "(25.4.3.1) × As,req/As,prov (25.4.10.1); ≤ stem + heel − 3 in",
            f"{toe['anchorage']}: required {_n(toe['ld_required_in'], '.1f')} in (straight "
            f"{_n(toe['ld_straight_in'], '.1f')} in, hooked {_n(toe['ldh_in'], '.1f')} in), "
            f"room {_n(toe['ld_available_in'], '.1f')} in"),
        "heel_min_steel": ("As ≥ 0.0018·b·T", f"T = {f(g.footing_thickness_in):g} in"),
        "heel_spacing": ("s ≤ min(3T, 18 in)", f"T = {f(g.footing_thickness_in):g} in"),
        "toe_flexure": (
            "Mu = 1.6·(bearing pressure moment over the toe) − 0.9·(footing + soil)·L²/2",
            f"L = {f(g.toe_ft):.2f} ft, pressure of the case {br['case']}: Mu = "
            f"{_n(toe['mu_lbft'])} lb-ft/ft; " + _flex(toe, case.checks.toe)),
        "toe_shear": ("Vu at d from the front face of the stem = 1.6·(bearing force over the "
                      "toe to there) − 0.9·(footing + soil) over the same length",
                      f"Vu = {_n(toe['vu_lb'])} lb/ft; "
                      + _shear(toe, inp.criteria.footing_shear_size_effect, inp)),
        "toe_min_steel": ("As ≥ 0.0018·b·T", f"T = {f(g.footing_thickness_in):g} in"),
        "toe_spacing": ("s ≤ min(3T, 18 in)", f"T = {f(g.footing_thickness_in):g} in"),
        "toe_depth": ("d of the bottom bars ≥ 6 in", f"d = {_n(toe['d_in'], '.2f')} in"),
    }


def _detailing_texts(case) -> dict[str, tuple[str, str]]:
    g = case.geometry
    f = float
    return {
        "stem_horizontal_steel": (
            "2 faces × As ≥ ρt·b·t_avg (ρt 0.0020 for #5 and smaller, fy ≥ 60 ksi; else 0.0025)",
            f"t_avg = {(f(g.stem_top_in) + f(g.stem_base_in)) / 2:.1f} in"),
        "stem_horizontal_spacing": ("s ≤ min(3t, 18 in)", f"t = {f(g.stem_top_in):g} in"),
        "footing_longitudinal_steel": ("2 mats × As ≥ 0.0018·b·T",
                                       f"T = {f(g.footing_thickness_in):g} in"),
        "footing_longitudinal_spacing": ("s ≤ min(5T, 18 in)",
                                         f"T = {f(g.footing_thickness_in):g} in"),
    }


def _result_text(row) -> str:
    """demand / capacity = ratio -> verdict, as the row gives them."""
    ratio = row["ratio"]
    unit = "" if row["unit"] == "-" else f" {row['unit']}"
    if row["name"] in ("overturning", "sliding"):
        dc = (f"required FS {_n(row['demand'], '.2f')} / provided "
              f"{_n(row['capacity'], '.2f')}")
    else:
        fmt = ".3f" if row["unit"] in ("in2/ft",) else ",.2f" if row["unit"] in (
            "in", "ft") else ",.0f"
        dc = (f"demand {_n(row['demand'], fmt)}{unit} / capacity "
              f"{_n(row['capacity'], fmt)}{unit}")
    rtxt = "inf" if ratio is None and not row["passes"] else _n(ratio, ".3f")
    verdict = "OK" if row["passes"] else "FAILS"
    return f"{dc} = ratio {rtxt} -> {verdict}"


def check_texts(case) -> list[CheckText]:
    """Every check row of the case as formula -> numbers -> result (ratio, clause)."""
    fs = {**_stability_texts(case), **_stem_texts(case), **_footing_texts(case),
          **_detailing_texts(case)}
    out = []
    for row in case.result["checks"]:
        formula, numbers = fs.get(row["name"], ("demand ≤ capacity", ""))
        ratio = row["ratio"]
        out.append(CheckText(row["name"], row["title"], row["clause"], formula, numbers,
                             _result_text(row), math.inf if ratio is None else float(ratio),
                             bool(row["passes"])))
    return out
