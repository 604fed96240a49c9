"""The site-wide inputs every section is checked with: soil, loads (surcharge, strip loads,
the seismic case, water), materials and criteria, as plain values (``DesignInputs``), with
the ``[seismic]`` and ``[water]`` tables (``SeismicLoad``, ``WaterTable``). The geometry, bars
and weights of a section are ``engine/section.py``.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass, fields

import numpy as np

from .defaults import CRITERIA, LOADS, MATERIALS, SEISMIC, SOIL_OPTIONS

SEISMIC_METHODS = ("seed-whitman", "mononobe-okabe")


@dataclass(frozen=True)
class SeismicLoad:
    """The ``[seismic]`` table: horizontal coefficient, method, load factor, required FS."""

    kh: float
    method: str = SEISMIC["method"]
    load_factor: float = SEISMIC["load_factor"]
    fs_overturning: float = SEISMIC["fs_overturning"]
    fs_sliding: float = SEISMIC["fs_sliding"]
    soil_inertia: bool = SEISMIC["soil_inertia"]

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

    level_ft: float
    saturated_unit_weight_pcf: float | None = None


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


@dataclass(frozen=True)
class Soil:
    """The ``[soil]`` table (from the geotechnical report): no soil value has a default."""

    unit_weight_pcf: float
    friction_coefficient: float
    allowable_bearing_psf: float
    active_efp_pcf: float | None = None
    friction_angle_deg: float | None = None
    passive_efp_pcf: float | None = None
    passive_from_friction_angle: bool = SOIL_OPTIONS["passive_from_friction_angle"]
    backslope_deg: float | None = None  # None or 0: level retained grade
    active_method: str = SOIL_OPTIONS["active_method"]
    wall_friction_deg: float | None = None
    # "heel": soil on soil, friction = backslope; "stem": delta on the stem's back face
    coulomb_plane: str = SOIL_OPTIONS["coulomb_plane"]


@dataclass(frozen=True)
class Loads:
    """The ``[loads]`` table with the ``[seismic]`` and ``[water]`` tables."""

    surcharge_psf: float = LOADS["surcharge_psf"]
    # ((offset_ft, width_ft, pressure_psf), ...) from [[loads.strip]]
    strip: tuple = LOADS["strip"]
    seismic: SeismicLoad | None = None  # from the [seismic] table; None: no seismic case
    water: WaterTable | None = None  # from the [water] table; None: drained

    def __post_init__(self):
        object.__setattr__(self, "strip", _strip_tuple(self.strip))


@dataclass(frozen=True)
class Materials:
    """The ``[materials]`` table."""

    fc_psi: float = MATERIALS["fc_psi"]
    fy_psi: float = MATERIALS["fy_psi"]
    concrete_unit_weight_pcf: float = MATERIALS["concrete_unit_weight_pcf"]


@dataclass(frozen=True)
class Criteria:
    """The design rules of ``[criteria]`` a section is checked by: the stability conventions
    (DESIGN.md section 7) and the strength options (ACI 318-19)."""

    fs_overturning: float = CRITERIA["fs_overturning"]
    fs_sliding: float = CRITERIA["fs_sliding"]
    count_toe_soil: bool = CRITERIA["count_toe_soil"]
    use_passive: bool = CRITERIA["use_passive"]
    passive_neglect_ft: float = CRITERIA["passive_neglect_ft"]
    surcharge_resists: bool = CRITERIA["surcharge_resists"]
    batter_face: str = CRITERIA["batter_face"]
    min_embedment_ft: float = CRITERIA["min_embedment_ft"]
    frost_depth_ft: float | None = CRITERIA["frost_depth_ft"]
    cover_stem_in: float | None = CRITERIA["cover_stem_in"]
    cover_heel_in: float | None = CRITERIA["cover_heel_in"]
    cover_toe_in: float = CRITERIA["cover_toe_in"]
    footing_shear_size_effect: bool = CRITERIA["footing_shear_size_effect"]
    crack_control: bool = CRITERIA["crack_control"]
    hook_psi_o: float = CRITERIA["hook_psi_o"]
    heel_upward_pressure: bool = CRITERIA["heel_upward_pressure"]


GROUPS = (("soil", Soil), ("loads", Loads), ("materials", Materials), ("criteria", Criteria))


@dataclass(frozen=True)
class DesignInputs:
    """Soil, loads, materials and criteria shared by every section of one call, each its own
    object (``inputs.soil.unit_weight_pcf``, ``inputs.criteria.fs_sliding``, ...).

    Field names are the keys of ``wallsched/keys.py`` (the site and section files); the
    defaults, with their sources, are declared once in ``engine/defaults.py``. Soil values
    have no defaults (never silently assumed). Build from validated tables with
    :meth:`from_tables`, or from the keys by name with :meth:`of`.
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
        non-soil key takes its default (``engine/defaults.py``). A
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
