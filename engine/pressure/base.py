"""What every pressure model shares: the resolved soil pressures, the thrust and its
components, the plane the thrust acts on, and the protocol a model implements.

Units: pcf, psf, ft, lb and lb-ft per foot of wall. All functions broadcast over arrays.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Literal, Protocol

import numpy as np

WATER_PCF = 62.4  # unit weight of water, common practice


def floats(x):
    """``x`` as a float array (the pressure functions broadcast over sections)."""
    return np.asarray(x, dtype=float)


@dataclass(frozen=True)
class EarthPressure:
    """Resolved pressures for one soil.

    ``ka`` is the active coefficient in the direction of the thrust (``inclination_deg``
    above the horizontal) and ``active_efp_pcf`` = Ka * gamma; when the report gives an EFP,
    Ka = EFP / gamma (DESIGN.md section 7) and the thrust is horizontal. The horizontal parts
    are ``horizontal_efp_pcf`` and ``surcharge_horizontal_psf``. ``passive_efp_pcf`` is 0 when
    passive resistance is not used. ``stem_moment_formula`` and ``stem_shear_formula`` are the
    stem's factored moment and shear as the models in use compute them, the text the calc
    package prints.
    """

    active_efp_pcf: float
    ka: float
    passive_efp_pcf: float
    surcharge_psf: float
    basis: str  # "equivalent fluid pressure", "Rankine, phi = .. deg", "Coulomb, ..."
    inclination_deg: float = 0.0
    backslope_deg: float = 0.0
    stem_moment_formula: str = ""
    stem_shear_formula: str = ""

    @property
    def surcharge_lateral_psf(self) -> float:
        """Uniform pressure of the live surcharge, Ka * q (in the direction of the thrust)."""
        return self.ka * self.surcharge_psf

    @property
    def cos_inclination(self) -> float:
        return float(np.cos(np.radians(self.inclination_deg)))

    @property
    def sin_inclination(self) -> float:
        return float(np.sin(np.radians(self.inclination_deg)))

    @property
    def horizontal_efp_pcf(self) -> float:
        return self.active_efp_pcf * self.cos_inclination

    @property
    def surcharge_horizontal_psf(self) -> float:
        return self.surcharge_lateral_psf * self.cos_inclination


@dataclass(frozen=True)
class ThrustComponent:
    """One lateral load on the heel plane: horizontal force, its height above the bottom of
    footing, and a vertical component acting down on the heel plane (x = B)."""

    name: str
    horizontal_lb: np.ndarray
    arm_ft: np.ndarray
    vertical_lb: np.ndarray | float = 0.0


@dataclass(frozen=True)
class Thrust:
    """The lateral loads on the vertical plane through the heel edge (service, per foot)."""

    components: tuple[ThrustComponent, ...]

    @property
    def horizontal_lb(self) -> np.ndarray:
        return sum(c.horizontal_lb for c in self.components)

    @property
    def moment_lbft(self) -> np.ndarray:
        """Overturning moment about the bottom of footing (toe)."""
        return sum(c.horizontal_lb * c.arm_ft for c in self.components)

    @property
    def vertical_lb(self) -> np.ndarray:
        return sum(np.asarray(c.vertical_lb, dtype=float) for c in self.components)

    def component(self, name: str) -> ThrustComponent | None:
        for c in self.components:
            if c.name == name:
                return c
        return None


@dataclass(frozen=True)
class Plane:
    """The plane the active thrust acts on, for one geometry: its height above the bottom of
    footing (``height_ft``), the water height above the bottom of footing on it
    (``water_ft``), and ``level``: every model in use reduces to level backfill on the design
    height H (the closed forms EFP H^2/2 at H/3 and Ka q H at H/2 then apply)."""

    height_ft: np.ndarray
    water_ft: np.ndarray | float
    level: bool


def arm(force, moment):
    """moment / force where the force is positive, else 0 (the height of a resultant)."""
    with np.errstate(divide="ignore", invalid="ignore"):
        return np.where(force > 0, moment / force, 0.0)


class PressureModel(Protocol):
    """One pressure model (a module of ``engine/pressure/models/`` defining ``MODEL``).

    ``name`` is the enum value (:class:`~.registry.Model`); ``order`` places it among the
    models in use (their loads are summed in this order); ``case`` says whether it loads the
    static case or the seismic one; an *active* model gives the soil's coefficient (exactly
    one applies to any inputs), the others add loads.
    """

    name: str
    order: int
    case: Literal["static", "seismic"]
    active: bool

    def applies(self, inputs) -> bool:
        """Whether the model is in use for these inputs."""

    def check(self, inputs, has_phi: bool) -> None:
        """The model's cross-key rules (raise ValueError with one clear sentence)."""

    def level(self, inputs) -> bool:
        """True where the model's load is the level-backfill case on the design height."""

    def pressure(self, inputs) -> tuple[float, float, float, str]:
        """Active models: (Ka, EFP pcf, inclination deg, basis text); others: unused."""

    def components(self, geom, inputs, p: EarthPressure, plane: Plane, *,
                   live: bool) -> list[ThrustComponent]:
        """The model's loads on the thrust plane (``live`` False: the live loads left out)."""

    def stem_loads(self, geom, inputs, p: EarthPressure, z, plane_level: bool, *,
                   live: bool) -> list[tuple]:
        """The model's (shear lb, moment lb-ft) parts on the stem ``z`` below the retained
        grade, summed in order with the other models' parts."""

    def conventions(self, inputs, p: EarthPressure, plain: bool) -> list[str]:
        """The model's stated conventions (the lines ``wallsched section`` prints); ``plain``:
        level backfill without [seismic], the short form."""

    def formula(self, inputs, p: EarthPressure, level: bool) -> tuple[str, str]:
        """The model's term of the stem moment and of the stem shear as printed."""


class ModelBase:
    """Defaults of the :class:`PressureModel` protocol: a model overrides what it has."""

    active = False
    text_order: int | None = None  # where its conventions are stated (default: ``order``)
    method: str | None = None  # an active model: the active_method value it answers
    case: Literal["static", "seismic"] = "static"

    def check(self, inputs, has_phi: bool) -> None:
        return None

    def level(self, inputs) -> bool:
        return False

    def pressure(self, inputs) -> tuple[float, float, float, str]:
        raise NotImplementedError(f"{self.name} is not an active pressure model")

    def components(self, geom, inputs, p, plane, *, live):
        return []

    def stem_loads(self, geom, inputs, p, z, plane_level, *, live):
        return []

    def conventions(self, inputs, p, plain) -> list[str]:
        return []

    def formula(self, inputs, p, level) -> tuple[str, str]:
        return "", ""
