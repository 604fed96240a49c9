"""The pressure models in use: every module of ``engine/pressure/models/`` that defines
``MODEL`` is a model, named by the :class:`Model` enum and placed by its ``order``. A new
model is a new module there (with its keys, its scalar twin in the audit and its test);
nothing here changes."""

from __future__ import annotations

import enum
import importlib
import pkgutil

from . import models as _models_pkg
from .base import PressureModel


def _discover() -> tuple[PressureModel, ...]:
    found = []
    for info in pkgutil.iter_modules(_models_pkg.__path__):
        module = importlib.import_module(f"{_models_pkg.__name__}.{info.name}")
        if hasattr(module, "MODEL"):
            found.append(module.MODEL)
    return tuple(sorted(found, key=lambda m: m.order))


MODELS: tuple[PressureModel, ...] = _discover()

Model = enum.Enum("Model", [(m.name.upper(), m.name) for m in MODELS], type=str)
Model.__doc__ = "The pressure models, by name (``Model.COULOMB.value == \"coulomb\"``)."

_BY_NAME = {m.name: m for m in MODELS}
ACTIVE_METHODS = tuple(dict.fromkeys(m.method for m in MODELS if m.method))


def model(kind: Model | str) -> PressureModel:
    """The model of an enum member (or its name)."""
    return _BY_NAME[Model(kind).value]


def in_use(inputs, case: str = "static") -> tuple[PressureModel, ...]:
    """The models of ``case`` ("static" or "seismic") that apply to ``inputs``, in order."""
    return tuple(m for m in MODELS if m.case == case and m.applies(inputs))


def active_model(inputs) -> PressureModel:
    """The one active model (the soil's coefficient) of ``inputs``."""
    (m,) = (m for m in MODELS if m.active and m.applies(inputs))
    return m


def models_of(inputs) -> tuple[Model, ...]:
    """The enum members of every model in use, static then seismic."""
    return tuple(Model(m.name) for m in in_use(inputs) + in_use(inputs, "seismic"))


def is_level(inputs) -> bool:
    """Every static model in use reduces to level backfill on the design height (the thrust
    then depends on the design height alone)."""
    return all(m.level(inputs) for m in in_use(inputs))


def check_inputs(inputs, has_phi: bool) -> None:
    """The cross-key rules of every model, in order (ValueError with one clear sentence)."""
    if inputs.soil.active_method not in ACTIVE_METHODS:
        raise ValueError("active_method must be " + " or ".join(
            repr(x) for x in ACTIVE_METHODS) + f", got {inputs.soil.active_method!r}")
    for m in MODELS:
        m.check(inputs, has_phi)
