"""``wallsched section FILE.toml [--json]``: check one cantilever cross-section.

Exit codes (DESIGN.md section 6): 0 every check passes; 3 a check fails; 2 a bad file (one
line naming the key, the value and the allowed range).
"""

from __future__ import annotations

import json
import math
from pathlib import Path

import click

from .cautions import CAUTIONS, EPILOG

CONVENTIONS = {
    "count_toe_soil": ("soil over the toe resists", "soil over the toe neglected"),
    "use_passive": ("passive pressure on the front resists sliding", "passive neglected"),
    "surcharge_resists": ("surcharge weight on the heel resists (one more weight everywhere)",
                          "surcharge weight never resists overturning or sliding; bearing is "
                          "the larger of the cases with and without it"),
}


def _fmt(x) -> str:
    if x is None:
        return "-"
    if isinstance(x, float) and not math.isfinite(x):
        return "-"
    a = abs(x)
    if a >= 1000:
        return f"{x:,.0f}"
    if a >= 100:
        return f"{x:.1f}"
    if a >= 1:
        return f"{x:.2f}"
    return f"{x:.3f}"


def _conventions(sf, pressure, inputs) -> list[str]:
    from .engine.pressure import conventions

    c = sf.criteria
    lines = conventions(inputs, pressure)
    if c["use_passive"]:
        lines.append(f"passive EFP {pressure.passive_efp_pcf:.1f} pcf from "
                     f"{c['passive_neglect_ft']:g} ft below front grade to the bottom of "
                     "footing or key")
    lines.append("surcharge weight (bearing, and stability when it resists): q x heel, from the "
                 "stem's back face at its base to the heel edge")
    for k, (yes, no) in CONVENTIONS.items():
        lines.append(f"{k} = {str(bool(c[k])).lower()}: {yes if c[k] else no}")
    lines.append(f"batter_face = \"{c['batter_face']}\": the stem's "
                 f"{'back (earth)' if c['batter_face'] == 'back' else 'front (exposed)'} "
                 "face is battered")
    lines.append("overturning about the toe at the bottom of footing; bearing by the kern "
                 "rule, triangular outside it; a resultant outside the base fails")
    lines.append("stem one-way shear: ACI 318-19 Table 22.5.5.1(c) with lambda_s; footing: row "
                 "(c), lambda_s " + ("applied" if c["footing_shear_size_effect"] else
                                     "neglected as 13.2.6.2 permits"))
    return lines


def build_report(sf, result) -> dict:
    """The JSON object: the engine's result plus the inputs, conventions and cautions."""
    out = {"file": str(sf.path), "section": sf.name}
    out.update(result.to_dict())
    inputs = sf.design_inputs()
    p = result.pressure
    out["earth_pressure"] = {
        "basis": p.basis, "active_efp_pcf": p.active_efp_pcf,
        "ka": p.ka, "passive_efp_pcf": p.passive_efp_pcf,
        "surcharge_psf": p.surcharge_psf,
        "surcharge_lateral_psf": p.surcharge_lateral_psf,
    }
    if inputs.extended or inputs.loads.seismic is not None:
        from .engine.pressure import design_thrust, virtual_back_height_ft

        geom = sf.section_geometry()
        th = design_thrust(geom, inputs, p)
        out["earth_pressure"].update(
            inclination_deg=p.inclination_deg, backslope_deg=p.backslope_deg,
            horizontal_efp_pcf=p.horizontal_efp_pcf,
            virtual_back_height_ft=float(virtual_back_height_ft(geom, inputs)),
            drained=inputs.loads.water is None,
            water_level_ft=inputs.water_level_ft,
            thrust=[{"name": c.name, "horizontal_lb": float(c.horizontal_lb),
                     "arm_ft": float(c.arm_ft), "vertical_lb": float(c.vertical_lb)}
                    for c in th.components])
    out["conventions"] = _conventions(sf, p, inputs)
    out["inputs"] = {t: dict(getattr(sf, t)) for t in
                     ("geometry", "soil", "loads", "materials", "criteria", "reinforcement")}
    out["units"] = "ft, in, lb, psf, pcf, psi; forces and moments per foot of wall"
    out["cautions"] = list(CAUTIONS)
    return out


def _clean(obj):
    if isinstance(obj, float):
        return obj if math.isfinite(obj) else None
    if isinstance(obj, dict):
        return {k: _clean(v) for k, v in obj.items()}
    if isinstance(obj, list | tuple):
        return [_clean(v) for v in obj]
    return obj


def render_text(rep: dict) -> str:
    g = rep["inputs"]["geometry"]
    r = rep["inputs"]["reinforcement"]
    lines = [f"wallsched section: {rep['file']}" + (f"  ({rep['section']})" if rep["section"]
                                                     else "")]
    lines.append(
        f"retained height {g['retained_height_ft']:g} ft + embedment {g['embedment_ft']:g} ft = "
        f"H {_fmt(rep['design_height_ft'])} ft; footing {_fmt(rep['footing_width_ft'])} ft x "
        f"{g['footing_thickness_in']:g} in (toe {g['toe_ft']:g} ft, heel {g['heel_ft']:g} ft); "
        f"stem {g['stem_top_in']:g} in top / {g['stem_base_in']:g} in base")
    if g["key_width_in"] > 0:
        lines.append(f"shear key {g['key_width_in']:g} in wide x {g['key_depth_in']:g} in deep, "
                     f"{g['key_offset_ft']:g} ft from the toe edge")
    bars = ", ".join(f"{k} {r[k]}" for k in ("stem", "heel", "toe", "horizontal", "longitudinal")
                     if r.get(k))
    lines.append(f"bars: {bars}")
    ot, sl, br = rep["overturning"], rep["sliding"], rep["bearing"]
    lines.append(
        f"overturning FS {_fmt(ot['fs'])} (M_R {_fmt(ot['m_resisting_lbft'])} / M_O "
        f"{_fmt(ot['m_overturning_lbft'])} lb-ft); sliding FS {_fmt(sl['fs'])} (resisting "
        f"{_fmt(sl['h_resisting_lb'])} / driving {_fmt(sl['h_driving_lb'])} lb); q_max "
        f"{_fmt(br['q_max_psf'])} psf at e = {_fmt(br['eccentricity_ft'])} ft ({br['case']})")
    if rep.get("seismic"):
        sz = rep["seismic"]
        lines.append(
            f"seismic: Delta P_AE {_fmt(sz['delta_pae_lb'])} lb (x load factor "
            f"{_fmt(sz['delta_pae_design_lb'])} lb), inertia {_fmt(sz['inertia_lb'])} lb; "
            f"overturning FS {_fmt(sz['fs_overturning'])}, sliding FS {_fmt(sz['fs_sliding'])}, "
            f"q_max {_fmt(sz['q_max_psf'])} psf")
    lines.append("")
    head = ("check", "demand", "capacity", "unit", "ratio", "result", "clause")
    table = [head]
    for c in rep["checks"]:
        table.append((c["name"], _fmt(c["demand"]), _fmt(c["capacity"]), c["unit"],
                      _fmt(c["ratio"]) if c["ratio"] is not None else "-",
                      "ok" if c["passes"] else "FAIL", c["clause"]))
    widths = [max(len(row[i]) for row in table) for i in range(len(head))]
    right = (1, 2, 4)
    for row in table:
        cells = [row[i].rjust(widths[i]) if i in right else row[i].ljust(widths[i])
                 for i in range(len(head))]
        lines.append("  ".join(cells).rstrip())
    lines.append("")
    fails = [c["name"] for c in rep["checks"] if not c["passes"]]
    util = _fmt(rep["utilization_max"])
    if rep["passes"]:
        lines.append(f"RESULT: every check passes (utilization {util}, governing "
                     f"{rep['governing_check']})")
    else:
        lines.append(f"RESULT: {len(fails)} check(s) FAIL: {', '.join(fails)}")
    lines.append("")
    lines.append("Load factors:")
    lines.extend(f"- {x}" for x in rep["load_factors"])
    lines.append("Conventions:")
    lines.extend(f"- {x}" for x in rep["conventions"])
    lines.append("CAUTIONS:")
    lines.extend(f"- {x}" for x in rep["cautions"])
    return "\n".join(lines)


@click.command(epilog=EPILOG)
@click.argument("section_file", type=click.Path(dir_okay=False, path_type=Path))
@click.option("--json", "as_json", is_flag=True,
              help="Print exactly one JSON object instead of the table.")
@click.pass_context
def section(ctx, section_file: Path, as_json: bool):
    """Check one cantilever cross-section given in SECTION_FILE (TOML).

    Every check is printed with its demand, capacity, ratio, pass/fail and clause.
    Exit 0 when every check passes, 3 when one fails, 2 for a bad file.
    """
    from .engine.checks import check_section
    from .section_file import load_section

    sf = load_section(section_file)
    result = check_section(sf.section_geometry(), sf.design_inputs(), sf.bars())
    rep = _clean(build_report(sf, result))
    if as_json:
        click.echo(json.dumps(rep, indent=2, allow_nan=False))
    else:
        click.echo(render_text(rep))
    ctx.exit(0 if rep["passes"] else 3)
