"""Least-cost sizing: the cheapest section on the candidate grid that passes every check.

The grid (``[sizing]``, common-practice increments; :mod:`.grid`): toe and heel in 3-in
steps, footing thickness in 1-in steps from 12 in, stem at least 8 in in 1-in steps
(optionally battered on the back face, top at the minimum), a shear key under the stem at
each depth of ``key_depths_in`` (0 = none), bars #4-#11 at 6 to 18 in for the stem, heel and
toe. The stem horizontal bars and the footing longitudinal bars follow from the geometry (the
least area and widest spacing ACI 318-19 allows, in #4 or #5; :mod:`.costs`).

Design heights are taken in increments of ``design_height_increment_ft`` (rounded up; walls
are tabulated by height in common practice), so one *design table* per wall holds the optimum
for every height the wall needs: :func:`~.search.design_table`. For each height the search is
exact over the whole grid:

1. the checks decompose (:mod:`.members`): stability depends on the geometry alone, the stem
   on the stem thickness and footing thickness and its bars, the heel on heel length and
   footing thickness and its bars, the toe on the geometry (through the bearing pressure) and
   its bars. So the cheapest passing stem bars are found once per (stem, footing) pair and
   the cheapest heel bars once per (heel, footing) pair; the toe bars per geometry;
2. branch and bound (:func:`~.search.search_whole_grid`): a geometry's cost with its
   cheapest stem and heel bars and the cheapest toe bar option that could exist is a lower
   bound on any full candidate of that geometry; geometries are evaluated cheapest bound
   first, in blocks, until no bound is below the best full candidate found;
3. heights are processed in increasing order, and a geometry that fails stability at one
   height fails at every greater height (loads grow with height), so it is dropped for good
   (certified by the stability screen, :mod:`.screen`);
4. wherever the cost without bars grows with the toe (checked), the same branch and bound
   runs column by column (:mod:`.columns`), over far fewer candidates.

One design table's searches share a :class:`~.context.SearchContext`.
:func:`~.search.exhaustive_optimum` is the plain reference (every combination through
:func:`~..checks.check_section`), which the tests hold the fast search to on small grids.
"""

from .costs import CostRates, candidate_cost, geometry_cost
from .grid import KEY_DEPTHS_DEFAULT_IN, STANDARD_SPACINGS_IN, Geometries, SizingGrid, parse_sizes
from .search import Choice, DesignTable, design_table, exhaustive_optimum

__all__ = ["KEY_DEPTHS_DEFAULT_IN", "STANDARD_SPACINGS_IN", "Choice", "CostRates",
           "DesignTable", "Geometries", "SizingGrid", "candidate_cost", "design_table",
           "exhaustive_optimum", "geometry_cost", "parse_sizes"]
