"""The stability screen: a fast necessary condition for stability at one height over the
whole grid (weights linear in the height, one thrust per height), which only ever discards.
"""

from __future__ import annotations

import math

import numpy as np

from ..pressure import design_thrust, earth_pressure, passive_resistance_lb
from ..section import DesignInputs, SectionGeometry, section_weights
from .costs import rows_nondecreasing
from .grid import axes_geometry, flat_of, grid_geometry


class StabilityScreen:
    """A fast necessary condition for stability at one height, for every geometry at once.

    The weights are linear in the design height (stem, soil over the heel and the battered
    face grow with it; footing, key, toe soil and surcharge do not) and the thrust and passive
    resistance are the same for every geometry at a height. The weights come from the engine's
    own :func:`~..section.section_weights` at two heights, with linearity verified at a third;
    where it does not hold (a pressure model whose weights are not linear) the screen passes
    everything. The screen only discards: every candidate is then checked by the engine.
    """

    SLACK = 1e-9
    DH = 0.01  # ft, the backward difference of the certificate

    HEIGHTS = (4.0, 12.0, 7.0)  # ft: the two the lines go through, and the one that checks

    def __init__(self, g, inputs: DesignInputs, emb: float, fb: float):
        self.inputs = inputs
        self._g = g
        self.emb, self.fb = emb, fb
        self.p = earth_pressure(inputs)
        n = g.size
        self.ncol = g.ncol
        # intercepts and slopes side by side (one gather reads a geometry's four)
        self.vm = np.empty((n, 4))
        self.v0, self.v1, self.m0, self.m1 = (self.vm[:, i] for i in range(4))
        self.vq, self.mq, self.B = (np.empty(n) for _ in range(3))
        lin = self._fit_lines()
        # linearity verified at a third height on a spread of the grid
        hs = self.HEIGHTS
        probe = np.unique(np.linspace(0, n - 1, min(n, 4096)).astype(int))
        wc = section_weights(grid_geometry(g, probe, hs[2], emb, fb), inputs)
        vc, mc = wc.dead()
        lin = lin and all(np.allclose(c, x0[probe] + x1[probe] * hs[2], rtol=1e-9, atol=1e-6)
                          for c, x0, x1 in ((vc, self.v0, self.v1), (mc, self.m0, self.m1)))
        same = self._thrust_is_common()
        self._embedments()
        # below a water level the soil is buoyant: its weight is linear in the height only
        # where the level lies at or below the retained grade of every geometry (the design
        # height plus the least embedment reaches the level), the fitting heights included
        self.h_min = (-math.inf if inputs.loads.water is None
                      else float(inputs.loads.water.level_ft) - float(np.min(self.e_vals)))
        # (the screen puts a vertical thrust at the heel edge: not with the stem plane)
        self.linear = bool(lin and same and hs[0] >= self.h_min and not inputs.stem_plane)
        self._probe, self._valid = probe, {}
        # failures that hold at every greater height can be certified only where the thrust
        # is the level-backfill one (no vertical part, convex in the height)
        self.certify = self.linear and not inputs.extended

    def _fit_lines(self) -> bool:
        """The weights' lines in the height, toe by toe (a few at a time) on the grid's axes:
        slopes and intercepts, the surcharge and the widths; sets ``toe_monotone`` (the
        weights, their moments about the toe and the widths never decrease as the toe grows:
        what the column search needs). Returns whether the surcharge stayed the same."""
        g, inputs, emb, fb = self._g, self.inputs, self.emb, self.fb
        hs = self.HEIGHTS
        d = hs[1] - hs[0]
        lin = True
        self.toe_monotone, last_rows = bool(np.all(np.diff(g.toe_axis) > 0)), None
        for toes, flat in g.toe_chunks():
            sh = (toes.stop - toes.start, *g.shape[1:])
            geo_a = axes_geometry(g, hs[0], emb, fb, toes)
            wa = section_weights(geo_a, inputs)
            wb = section_weights(axes_geometry(g, hs[1], emb, fb, toes), inputs)
            va, ma = (flat_of(x, sh) for x in wa.dead())
            vb, mb = (flat_of(x, sh) for x in wb.dead())
            v1, m1 = (vb - va) / d, (mb - ma) / d
            v0, m0 = va - v1 * hs[0], ma - m1 * hs[0]
            self.v1[flat], self.m1[flat], self.v0[flat], self.m0[flat] = v1, m1, v0, m0
            # the surcharge's weight does not change with the height (compared on the axes
            # its terms have)
            lin = lin and all(np.allclose(getattr(wa.surcharge, k), getattr(wb.surcharge, k),
                                          rtol=1e-12) for k in ("lb", "moment_lbft"))
            qa, qma = flat_of(wa.surcharge.lb, sh), flat_of(wa.surcharge.moment_lbft, sh)
            self.vq[flat], self.mq[flat] = qa, qma
            B = flat_of(geo_a.footing_width_ft, sh)
            self.B[flat] = B
            rows = [x.reshape(sh[0], -1) for x in (
                (v0, v1, m0, m1, B, qa, qma) if inputs.criteria.surcharge_resists
                else (v0, v1, m0, m1, B))]
            self.toe_monotone = self.toe_monotone and rows_nondecreasing(rows, last_rows)
            last_rows = [r[-1:] for r in rows]
        return lin

    def _thrust_is_common(self) -> bool:
        """The thrust does not depend on the geometry (level backfill on the heel plane of
        height H): two different sections compared at one height."""
        g = self._g
        T_index = g.col["T_index"]
        last = int(np.nonzero(T_index == T_index[0])[0][-1]) + (g.nt - 1) * g.ncol
        two = grid_geometry(g, np.array([0, last]), 8.0, self.emb, self.fb)
        th = design_thrust(two, self.inputs, self.p)
        return all(np.allclose(np.broadcast_to(getattr(th, k), (2,))[0],
                               np.broadcast_to(getattr(th, k), (2,))[1], rtol=1e-12)
                   for k in ("horizontal_lb", "moment_lbft", "vertical_lb"))

    def _embedments(self) -> None:
        """The embedment depends on the footing thickness alone, the passive also on the
        key's depth: one value per (thickness, key depth), and one of them per column."""
        g = self._g
        T_index = g.col["T_index"]
        combo = T_index * (int(g.col["key_index"].max()) + 1) + g.col["key_index"]
        n_c = int(combo.max()) + 1
        first = np.zeros(n_c, int)
        first[combo[::-1]] = np.arange(combo.size)[::-1]
        self.e_vals = np.broadcast_to(g.take("embedment_ft", first) if "embedment_ft" in g
                                      else np.full(n_c, self.emb), (n_c,))
        # the depth of the passive's bottom below the front grade: the bottom of the key
        self.passive_depth = self.e_vals + g.take("key_depth_in", first) / 12.0
        self.e_col = combo

    def e_of(self, idx):
        """The (embedment, key depth) value (index into ``e_vals``) of the geometries ``idx``."""
        if isinstance(idx, slice):
            idx = np.arange(self.B.size)[idx]
        return self.e_col[np.asarray(idx) % self.ncol]

    def forces(self, h: float):
        """Per (embedment, key depth) value: overturning moment, driving force, vertical
        thrust, passive (to the bottom of the footing or key, as in the engine)."""
        i = self.inputs
        one = SectionGeometry(retained_height_ft=h, embedment_ft=self.e_vals,
                              footing_thickness_in=12.0, stem_top_in=8.0, stem_base_in=8.0,
                              toe_ft=1.0, heel_ft=1.0, freeboard_ft=self.fb)
        th = design_thrust(one, i, self.p)  # one thrust per embedment (design height)
        shape = self.e_vals.shape
        pp = (passive_resistance_lb(self.p.passive_efp_pcf, i.criteria.passive_neglect_ft,
                                    self.passive_depth)
              if i.criteria.use_passive else np.zeros(shape))
        return (np.broadcast_to(th.moment_lbft, shape), np.broadcast_to(th.horizontal_lb, shape),
                np.broadcast_to(th.vertical_lb, shape), np.broadcast_to(pp, shape))

    def valid_at(self, h: float) -> bool:
        """The screen holds at height ``h``: linear, within the heights where it is (with
        [water], at and above ``h_min``), and its weights equal the engine's at ``h`` on the
        probe spread over the grid (checked once per height)."""
        if not self.linear or h < self.h_min - 1e-9:
            return False
        if h not in self._valid:
            w = section_weights(grid_geometry(self._g, self._probe, h, self.emb, self.fb),
                                self.inputs)
            v, m = w.dead()
            p = self._probe
            self._valid[h] = bool(
                np.allclose(v, self.v0[p] + self.v1[p] * h, rtol=1e-9, atol=1e-6)
                and np.allclose(m, self.m0[p] + self.m1[p] * h, rtol=1e-9, atol=1e-6))
        return self._valid[h]

    def passes(self, h: float, idx=slice(None)) -> np.ndarray:
        """The screen at height ``h`` for the geometries ``idx`` (all by default)."""
        if not self.valid_at(h):
            return np.ones(self.B[idx].shape, bool)
        i = self.inputs
        m_o, h_d, v_th, pp = self.forces(h)
        e_ix = self.e_of(idx)
        m_o, h_d, v_th, pp = m_o[e_ix], h_d[e_ix], v_th[e_ix], pp[e_ix]
        B = self.B[idx]
        v = self.v0[idx] + self.v1[idx] * h + v_th
        m = self.m0[idx] + self.m1[idx] * h + v_th * B
        vq, mq = self.vq[idx], self.mq[idx]
        if i.criteria.surcharge_resists:
            v, m = v + vq, m + mq
        k = 1.0 - self.SLACK
        ok = (m >= i.criteria.fs_overturning * m_o * k) & (
            i.soil.friction_coefficient * v + pp >= i.criteria.fs_sliding * h_d * k)
        cases = [(v, m)] if i.criteria.surcharge_resists else [(v, m), (v + vq, m + mq)]
        for vv, mm in cases:
            with np.errstate(divide="ignore", invalid="ignore"):
                e = np.abs(B / 2.0 - (mm - m_o) / vv)
                a = B / 2.0 - e
                q = np.where(e <= B / 6.0, vv / B * (1.0 + 6.0 * e / B), 2.0 * vv / (3.0 * a))
            ok &= (a > 0) & (vv > 0) & (q * k <= i.soil.allowable_bearing_psf)
        return ok

    def doomed(self, h: float, idx) -> np.ndarray:
        """Geometries ``idx`` that fail overturning or sliding at ``h`` and at every greater
        height. The margins M_R - FS M_O and mu V + P_p - FS H are concave in the height (the
        resisting side is linear, the driving side convex), so a negative margin whose slope is
        not positive stays negative; the slope of the driving side is taken by a backward
        difference, which is no more than its true slope."""
        out = np.zeros(np.shape(idx), bool)
        if not self.certify or h <= 2 * self.DH or not self.valid_at(h):
            return out
        i = self.inputs
        m_o, h_d, _, pp = self.forces(h)
        m_o0, h_d0, _, _ = self.forces(h - self.DH)
        e_ix = self.e_of(idx)
        sm = (m_o - m_o0)[e_ix] / self.DH
        sh = (h_d - h_d0)[e_ix] / self.DH
        v = self.v0[idx] + self.v1[idx] * h
        m = self.m0[idx] + self.m1[idx] * h
        v1, m1 = self.v1[idx], self.m1[idx]
        if i.criteria.surcharge_resists:
            v, m = v + self.vq[idx], m + self.mq[idx]
        fs_o, fs_s, mu_b = (i.criteria.fs_overturning, i.criteria.fs_sliding,
                            i.soil.friction_coefficient)
        ot = (m < fs_o * m_o[e_ix] * (1 - 1e-6)) & (m1 <= fs_o * sm)
        sl = ((mu_b * v + pp[e_ix] < fs_s * h_d[e_ix] * (1 - 1e-6))
              & (mu_b * v1 <= fs_s * sh))
        return ot | sl
