"""The structures one design table's search shares, in one frozen value."""

from __future__ import annotations

from dataclasses import dataclass

from ..section import BarArrays, DesignInputs
from .costs import CostRates
from .grid import Geometries, SizingGrid
from .members import FootingTables
from .screen import StabilityScreen


@dataclass(frozen=True)
class SearchContext:
    """Everything the searches of one design table read (built by
    :func:`~.search.design_table`; nothing in it changes from height to height).

    ``g``: the grid's geometries (flat, the toe the slowest axis) with their embedment;
    ``codes``: per column the stem and heel pair codes (``stem_of``, ``heel_of``) and the
    first column of each pair (``stem_first``, ``heel_first``); ``pre``: the height-independent
    costs and widths (:func:`~.costs.precompute`); ``toe_tab``: the heel and toe capacities
    per (footing thickness, bar option); ``screen``: the stability screen; ``emb``, ``fb``: the
    least embedment and the freeboard; ``width_max_ft``: the room for the footing (None: any).
    The plain reference (:func:`~.search.exhaustive_optimum`) needs only the first seven.
    """

    g: Geometries
    grid: SizingGrid
    inputs: DesignInputs
    rates: CostRates
    bars: BarArrays
    emb: float
    fb: float
    codes: dict | None = None
    pre: dict | None = None
    toe_tab: FootingTables | None = None
    screen: StabilityScreen | None = None
    width_max_ft: float | None = None
