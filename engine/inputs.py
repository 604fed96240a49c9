"""The site-wide inputs every section is checked with: soil, loads (surcharge, strip loads,
the seismic case, water), materials and criteria, as plain values (``DesignInputs``), with
the ``[seismic]`` and ``[water]`` tables (``SeismicLoad``, ``WaterTable``). Every field is
also the file key of the same name, declared with it (``engine/keyspec.key``). The geometry,
bars and weights of a section are ``engine/section.py``.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass, fields

import numpy as np

from .keyspec import REQUIRED, key

SEISMIC_METHODS = ("seed-whitman", "mononobe-okabe")


@dataclass(frozen=True)
class SeismicLoad:
    """The ``[seismic]`` table: horizontal coefficient, method, load factor, required FS."""

    kh: float = key(float, REQUIRED, lo=0, hi=0.8, doc="horizontal seismic coefficient kh")
    method: str = key(str, "seed-whitman", choices=SEISMIC_METHODS,
                      doc="dynamic increment: Seed-Whitman 0.375 kh gamma H^2 or "
                          "Mononobe-Okabe")
    # IBC 2021 1807.2.3: 0.7 on nominal earthquake loads
    load_factor: float = key(float, 0.7, lo=0, hi=1.0, lo_open=True,
                             doc="factor on the nominal earthquake loads in the stability "
                                 "case (IBC 2021 1807.2.3: 0.7)")
    fs_overturning: float = key(float, 1.1, lo=1.0, hi=5.0,  # IBC 2021 1807.2.3
                                doc="required FS, overturning with seismic (IBC 2021 "
                                    "1807.2.3)")
    fs_sliding: float = key(float, 1.1, lo=1.0, hi=5.0,  # IBC 2021 1807.2.3
                            doc="required FS, sliding with seismic (IBC 2021 1807.2.3)")
    # the soil over the heel moves with the wall (DESIGN.md 7)
    soil_inertia: bool = key(bool, True, doc="the soil over the heel moves with the wall: its "
                                             "inertia kh W acts with the concrete's")

    def __post_init__(self):
        if self.method not in SEISMIC_METHODS:
            raise ValueError(f"seismic method must be one of {SEISMIC_METHODS}, "
                             f"got {self.method!r}")
        if not (0.0 <= self.kh < 1.0):
            raise ValueError(f"seismic kh must be in 0 to 1, got {self.kh!r}")


@dataclass(frozen=True)
class WaterTable:
    """The ``[water]`` table: water level behind the wall above the bottom of footing, ft, and
    the saturated unit weight of the soil below it (None: ``unit_weight_pcf``)."""

    level_ft: float = key(float, REQUIRED, lo=-100, hi=100,
                          doc="water level behind the wall above the bottom of footing, ft "
                              "(at or below 0: drained)")
    saturated_unit_weight_pcf: float | None = key(
        float, None, lo=63, hi=170,
        doc="total unit weight of the soil below the level, pcf (default unit_weight_pcf)")


def _strip_tuple(items) -> tuple:
    out = []
    for it in items or ():
        if isinstance(it, Mapping):
            out.append((float(it["offset_ft"]), float(it["width_ft"]),
                        float(it["pressure_psf"])))
        else:
            off, width, q = it
            out.append((float(off), float(width), float(q)))
    return tuple(out)


@dataclass(frozen=True, kw_only=True)
class Soil:
    """The ``[soil]`` table (from the geotechnical report): no soil value has a default, only
    the choices of method do."""

    unit_weight_pcf: float = key(float, REQUIRED, lo=50, hi=160, doc="backfill unit weight, pcf")
    active_efp_pcf: float | None = key(
        float, None, lo=0, hi=150, lo_open=True,
        doc="active equivalent fluid pressure, pcf (or friction_angle_deg)")
    friction_angle_deg: float | None = key(
        float, None, lo=0, hi=50, lo_open=True,
        doc="backfill friction angle, degrees (or active_efp_pcf)")
    passive_efp_pcf: float | None = key(float, None, lo=0, hi=1000,
                                        doc="passive equivalent fluid pressure, pcf")
    passive_from_friction_angle: bool = key(
        bool, False, doc="take passive as Rankine Kp from friction_angle_deg")
    friction_coefficient: float = key(float, REQUIRED, lo=0, hi=1.0, lo_open=True,
                                      doc="base sliding friction coefficient")
    allowable_bearing_psf: float = key(float, REQUIRED, lo=0, hi=50000, lo_open=True,
                                       doc="allowable bearing pressure, psf")
    # (the file's "source" and "backslope" = "H:V" keys follow here: wallsched/keys.py)
    # sloping backfill and the active-pressure method (engine/pressure)
    backslope_deg: float | None = key(  # None or 0: level retained grade
        float, None, lo=0, hi=60, hi_open=True,
        doc="slope of the retained ground above the wall, degrees (or backslope); it rises "
            "from where the grade meets the stem")
    active_method: str = key(str, "rankine", choices=("rankine", "coulomb"),
                             doc="active coefficient from friction_angle_deg: Rankine on the "
                                 "virtual back, or Coulomb with wall_friction_deg")
    # "heel": soil on soil, friction = backslope; "stem": delta on the stem's back face
    coulomb_plane: str = key(str, "heel", choices=("heel", "stem"),
                             doc="Coulomb: \"heel\" - on the plane through the heel edge, "
                                 "interface friction = backslope; \"stem\" - on the stem's "
                                 "back face with wall_friction_deg, the soil over the heel "
                                 "retained")
    wall_friction_deg: float | None = key(
        float, None, lo=0, hi=45,
        doc="wall friction angle delta for active_method = \"coulomb\", degrees (from the "
            "geotechnical report)")


@dataclass(frozen=True)
class Loads:
    """The ``[loads]`` table with the ``[seismic]`` and ``[water]`` tables."""

    surcharge_psf: float = key(float, 0.0, lo=0, hi=5000,
                               doc="uniform live surcharge on the retained grade, psf")
    # table-valued: written as [[loads.strip]] entries, and the top-level [seismic] and
    # [water] tables (the files' loaders fill these three; STRIP_KEYS in wallsched/keys.py)
    # ((offset_ft, width_ft, pressure_psf), ...) from [[loads.strip]]; () no strip loads
    strip: tuple = key(list, (), doc="strip surcharges near the wall, [[loads.strip]] entries")
    # from the [seismic] table; None: no seismic case
    seismic: SeismicLoad | None = key(dict, None,
                                      doc="the seismic case, from the [seismic] table")
    # from the [water] table; None: drained
    water: WaterTable | None = key(dict, None, doc="water behind the wall, from the [water] "
                                   "table (default drained)")

    def __post_init__(self):
        object.__setattr__(self, "strip", _strip_tuple(self.strip))


@dataclass(frozen=True)
class Materials:
    """The ``[materials]`` table."""

    fc_psi: float = key(float, 4000.0, lo=2500, hi=10000,
                        doc="concrete strength f'c, psi (ACI 318-19 Table 19.2.1.1 minimum "
                            "2500)")
    fy_psi: float = key(float, 60000.0, lo=40000, hi=80000,
                        doc="reinforcement yield fy, psi (A615)")
    concrete_unit_weight_pcf: float = key(float, 150.0, lo=90, hi=160,  # common practice
                                          doc="concrete unit weight, pcf (common practice "
                                              "150)")


@dataclass(frozen=True)
class Criteria:
    """The design rules of ``[criteria]`` a section is checked by: the stability conventions
    (DESIGN.md section 7) and the strength options (ACI 318-19). The table's keys for the
    stations, segments and quantities along a wall follow ``frost_depth_ft`` in the file
    (wallsched/keys.py); the engine reads them from the wall's table."""

    # stability, IBC 2021 section 1807.2.3
    fs_overturning: float = key(float, 1.5, lo=1.0, hi=5.0, doc="FS overturning (IBC 1807.2.3)")
    fs_sliding: float = key(float, 1.5, lo=1.0, hi=5.0, doc="required FS, sliding (IBC 1807.2.3)")
    count_toe_soil: bool = key(bool, True, doc="soil over the toe resists")
    use_passive: bool = key(bool, True, doc="passive pressure on the front resists sliding")
    passive_neglect_ft: float = key(float, 1.0, lo=0, hi=10,  # common practice
                                    doc="depth below front grade with no passive (common "
                                        "practice)")
    surcharge_resists: bool = key(bool, False, doc="live surcharge weight on the heel resists")
    batter_face: str = key(str, "back", choices=("back", "front"),
                           doc="which stem face is battered")
    # geometry along the wall (the site pipeline)
    min_embedment_ft: float = key(float, 1.0, lo=0, hi=20,  # IBC 2021 1809.4 (12 in)
                                  doc="front grade to bottom of footing, ft (IBC 2021 1809.4: "
                                      "12 in)")
    frost_depth_ft: float | None = key(float, None, lo=0, hi=15,
                                       doc="frost depth below front grade, ft")
    # strength options, ACI 318-19 (the section check; DESIGN.md section 7)
    # None: Table 20.5.1.3.1 by bar size (2 / 1.5 in)
    cover_stem_in: float | None = key(
        float, None, lo=0.75, hi=6,
        doc="clear cover to the stem bars, in (default ACI 318-19 Table 20.5.1.3.1: 2 in for "
            "#6 and larger, 1.5 in for #5 and smaller)")
    cover_heel_in: float | None = key(
        float, None, lo=0.75, hi=6,
        doc="clear cover to the heel top bars, in (default as cover_stem_in)")
    cover_toe_in: float = key(float, 3.0, lo=0.75, hi=6,  # Table 20.5.1.3.1: against earth
                              doc="clear cover to the toe bottom bars, in (ACI 318-19 Table "
                                  "20.5.1.3.1: 3 in cast against earth)")
    footing_shear_size_effect: bool = key(  # 13.2.6.2 permits neglecting lambda_s
        bool, False, doc="apply lambda_s to footing one-way shear (ACI 318-19 13.2.6.2 "
                         "permits neglecting it)")
    crack_control: bool = key(bool, True,  # 24.3.2 on the stem
                              doc="limit the stem bar spacing for crack control (ACI 318-19 "
                                  "24.3.2, service bar stress)")
    hook_psi_o: float = key(float, 1.0, lo=1.0, hi=1.25,  # see development.py
                            doc="hook location factor psi_o (ACI 318-19 Table 25.4.3.2): 1.0 "
                                "for a continuous wall, 1.25 where side cover < 6 db")
    heel_upward_pressure: bool = key(  # heel by the net factored pressure (DESIGN.md 7)
        bool, True, doc="design the heel for the net factored pressure of 1.2D+1.6H+1.6L, "
                        "1.2D+1.6H and 0.9D+1.6H (false: the textbook method, upward pressure "
                        "neglected)")


GROUPS = (("soil", Soil), ("loads", Loads), ("materials", Materials), ("criteria", Criteria))


@dataclass(frozen=True)
class DesignInputs:
    """Soil, loads, materials and criteria shared by every section of one call, each its own
    object (``inputs.soil.unit_weight_pcf``, ``inputs.criteria.fs_sliding``, ...).

    Each group's field is declared with its key of the site and section files
    (``engine/keyspec.key``: type, default with its source, range, text), which
    ``wallsched/keys.py`` collects. Soil values have no defaults (never silently assumed).
    Build from validated tables with :meth:`from_tables`, or from the keys by name with
    :meth:`of`.
    """

    soil: Soil
    loads: Loads = Loads()
    materials: Materials = Materials()
    criteria: Criteria = Criteria()

    @classmethod
    def of(cls, **values) -> DesignInputs:
        """From the keys by name (``DesignInputs.of(unit_weight_pcf=120, fs_sliding=1.5,
        ...)``), each to its group; an unknown name raises TypeError."""
        parts = {}
        for name, group in GROUPS:
            names = {f.name for f in fields(group)}
            parts[name] = group(**{k: values.pop(k) for k in list(values) if k in names})
        if values:
            raise TypeError(f"unknown design inputs: {', '.join(sorted(values))}")
        return cls(**parts)

    def but(self, **values) -> DesignInputs:
        """A copy with the keys ``values`` (by name, as :meth:`of`) changed."""
        flat = {f.name: getattr(getattr(self, name), f.name)
                for name, group in GROUPS for f in fields(group)}
        unknown = set(values) - set(flat)
        if unknown:
            raise TypeError(f"unknown design inputs: {', '.join(sorted(unknown))}")
        return DesignInputs.of(**{**flat, **values})

    def __post_init__(self):
        soil, crit = self.soil, self.criteria
        has_efp = soil.active_efp_pcf is not None
        has_phi = soil.friction_angle_deg is not None
        if has_efp == has_phi:
            raise ValueError("give exactly one of active_efp_pcf and friction_angle_deg")
        if soil.passive_from_friction_angle and not has_phi:
            raise ValueError("passive_from_friction_angle needs friction_angle_deg")
        if crit.use_passive and not soil.passive_from_friction_angle and (
                soil.passive_efp_pcf is None):
            raise ValueError("use_passive needs passive_efp_pcf or passive_from_friction_angle")
        if crit.batter_face not in ("back", "front"):
            raise ValueError(f"batter_face must be 'back' or 'front', got {crit.batter_face!r}")
        for group, name in (("soil", "unit_weight_pcf"), ("soil", "friction_coefficient"),
                            ("soil", "allowable_bearing_psf"), ("materials", "fc_psi"),
                            ("materials", "fy_psi"), ("materials", "concrete_unit_weight_pcf")):
            v = getattr(getattr(self, group), name)
            if not (isinstance(v, int | float) and np.isfinite(v) and v > 0):
                raise ValueError(f"{name} must be a positive number, got {v!r}")
        self._check_extended(has_phi)

    def _check_extended(self, has_phi: bool):
        """Cross-key rules of the pressure models (each model's own, engine/pressure)."""
        from .pressure import check_inputs

        check_inputs(self, has_phi)

    @property
    def gamma_below_water_pcf(self) -> float:
        """Total unit weight of the soil below the water level: ``saturated_unit_weight_pcf``
        when given, else ``unit_weight_pcf`` (DESIGN.md section 7, water)."""
        water = self.loads.water
        sat = None if water is None else water.saturated_unit_weight_pcf
        return float(self.soil.unit_weight_pcf if sat is None else sat)

    @property
    def water_level_ft(self) -> float | None:
        """Water level above the bottom of footing, ft (None: drained)."""
        return None if self.loads.water is None else float(self.loads.water.level_ft)

    @classmethod
    def from_tables(cls, soil: Mapping, loads: Mapping, materials: Mapping,
                    criteria: Mapping, seismic: Mapping | None = None,
                    water: Mapping | None = None) -> DesignInputs:
        """From the validated ``[soil]``, ``[loads]``, ``[materials]``, ``[criteria]`` dicts,
        and the optional ``[seismic]`` and ``[water]`` tables (absent, empty or without
        ``kh`` / ``level_ft``: no seismic case, drained).

        Keys this class does not know (e.g. ``station_interval_ft``) are ignored; a missing
        non-soil key takes its field's default. A
        ``backslope = "H:V"`` soil key gives ``backslope_deg``.
        """
        from .pressure import backslope_from_ratio

        names = {f.name for _, group in GROUPS for f in fields(group)} - {"seismic", "water"}
        kw = {}
        for table in (soil, loads, materials, criteria):
            for k, v in table.items():
                if k in names and v is not None:
                    kw[k] = v
        if soil.get("backslope") is not None:
            if soil.get("backslope_deg") is not None:
                raise ValueError("give either backslope (\"H:V\") or backslope_deg, not both")
            kw["backslope_deg"] = backslope_from_ratio(soil["backslope"])
        seismic = seismic if seismic is not None else loads.get("seismic")
        water = water if water is not None else loads.get("water")
        if seismic and seismic.get("kh") is not None:
            kw["seismic"] = SeismicLoad(**{k: v for k, v in seismic.items() if v is not None
                                           and k in {f.name for f in fields(SeismicLoad)}})
        if water and water.get("level_ft") is not None:
            sat = water.get("saturated_unit_weight_pcf")
            kw["water"] = WaterTable(float(water["level_ft"]),
                                     None if sat is None else float(sat))
        return cls.of(**kw)

    @property
    def stem_plane(self) -> bool:
        """The thrust acts on the vertical plane through the stem's back face at its base
        (Coulomb with the report's wall friction): the soil over the heel is retained soil."""
        return self.soil.active_method == "coulomb" and self.soil.coulomb_plane == "stem"

    @property
    def extended(self) -> bool:
        """A pressure model in use that is not level backfill (the static thrust then depends
        on more than the design height)."""
        from .pressure import is_level

        return not is_level(self)
