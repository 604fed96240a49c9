"""Plots per wall (matplotlib, Agg backend): PNG files a person looks at.

Every plot is drawn by a ``*_figure`` function that returns the finished figure (tests read
its text extents) and is saved by :func:`save`. A finished figure (:func:`finish`) carries
every caution in its footer and holds no two texts that overlap: a text added with
:func:`optional_text` is kept only where it overlaps no fixed text (titles, axis and tick
labels, the legend) and no optional text kept before it (lower priority number first, then in
the order added). Station series are drawn from their per-pixel envelope
(:mod:`.envelope`), so the time to plot grows with the pixels, not the stations.
"""

from __future__ import annotations

import textwrap
from pathlib import Path

import numpy as np

from ..cautions import CAUTIONS
from ..profile.stationing import format_station
from .envelope import envelope, envelope_indices

DPI = 110
FIGSIZE_IN = (11.0, 6.5)
FOOTER_PT = 5.5
OPTIONAL = "wallsched-optional"
GAP_PX = 1.0  # clear gap kept between two texts
_DRAWN = "_wallsched_drawn"  # set by finish: the figure's pixels are final
_PENDING = "_wallsched_optional"  # a figure's optional texts to place: (ax, x, y, text, ...)


def new_figure(*, nrows: int = 1, figsize=FIGSIZE_IN, sharex=True, **kw):
    """A figure (Agg, at the saved resolution) and its column of axes."""
    import matplotlib

    matplotlib.use("Agg")
    import matplotlib.pyplot as plt

    fig, axes = plt.subplots(nrows, 1, figsize=figsize, sharex=sharex, squeeze=False, dpi=DPI,
                             **kw)
    return fig, axes[:, 0]


def optional_text(ax, x, y, text, *, priority: int = 0, **kw) -> None:
    """A text that :func:`finish` keeps only where it overlaps nothing (``ax.annotate``
    arguments: ``xytext`` and ``textcoords`` offset it from the point). It is made there, and
    only where the point it is aligned on is clear: most optional texts of a long wall never
    become artists."""
    fig = ax.figure
    pending = getattr(fig, _PENDING, None)
    if pending is None:
        pending = []
        setattr(fig, _PENDING, pending)
    pending.append((ax, x, y, text, priority, kw))


def _anchor_px(ax, x, y, kw: dict, dpi: float):
    """The display point an optional text is aligned on (its box always holds it), from the
    point and its offset in points; None when it is placed some other way."""
    xycoords = kw.get("xycoords", "data")
    offset = kw.get("xytext", (0.0, 0.0)) if kw.get("textcoords") == "offset points" else (
        None if "xytext" in kw else (0.0, 0.0))
    if offset is None or not (xycoords == "data" or hasattr(xycoords, "transform")):
        return None
    trans = ax.transData if xycoords == "data" else xycoords
    px, py = trans.transform((x, y))
    dx, dy = offset
    return px + dx * dpi / 72.0, py + dy * dpi / 72.0


def _footer(fig) -> float:
    """Every caution at the foot of ``fig``, wrapped to its width; returns the height used
    (figure fraction)."""
    chars = int(fig.get_figwidth() * 72.0 / (0.52 * FOOTER_PT)) - 4  # a character ~0.52 em
    lines = [line for c in CAUTIONS for line in textwrap.wrap(c, chars)]
    line_h = 1.4 * FOOTER_PT / 72.0 / fig.get_figheight()
    y = 0.005
    for line in reversed(lines):
        text = _stamp_text_class()(0.01, y, line, fontsize=FOOTER_PT, color="0.3", va="bottom")
        text.set_transform(fig.transSubfigure)  # as ``fig.text`` does
        text.set_figure(fig)
        fig.texts.append(text)
        text._remove_method = fig.texts.remove
        y += line_h
    return y + 0.005


_RECORDING: list | None = None  # drawn_texts' record while a figure draws
_STAMPS: dict = {}  # a stamped text's key -> its pixels before and after it was drawn
STAMP_PAD_PX = 4  # the pixels kept round a stamped text's box (glyphs may reach past it)
STAMP_LIMIT = 200  # texts kept at most (a footer line of an 11 in plot: about 0.1 MB)
_STAMP_CLASS = None
STAMP_USES = [0]  # the times a kept text was copied in (read by the tests)


def _stamp_text_class():
    """The class of a text drawn from a copy of its pixels (made once, on first use, so that
    matplotlib is imported only when a plot is drawn)."""
    global _STAMP_CLASS
    if _STAMP_CLASS is None:
        from matplotlib.backends.backend_agg import RendererAgg
        from matplotlib.text import Text
        from matplotlib.transforms import Bbox

        base_draw = Text.draw

        class StampedText(Text):
            """A fixed text repeated on many figures of one size (the caution footer): the
            first time it is drawn, the pixels of its box (with a margin) are kept before and
            after; where the same text is drawn again at the same place on a figure of the
            same size over the same pixels, the kept result is copied in. The copy is the
            draw's own result byte for byte: it is taken only where the drawing changed
            nothing outside the kept pixels, and used only over identical pixels."""

            def _key(self, renderer):
                fig = self.figure
                return (self.get_text(), self.get_fontproperties(), str(self.get_color()),
                        self.get_alpha(), self.get_rotation(), self.get_ha(), self.get_va(),
                        self.get_position(), tuple(fig.bbox.bounds), fig.dpi,
                        renderer.width, renderer.height)

            def get_window_extent(self, renderer=None, dpi=None):
                if renderer is not None and dpi is None:
                    kept = _STAMPS.get(self._key(renderer))
                    if kept is not None:
                        return Bbox(kept[0])
                return super().get_window_extent(renderer, dpi)

            def draw(self, renderer):
                if not self.get_visible():
                    return None
                if not isinstance(renderer, RendererAgg) or "draw_text" in vars(renderer):
                    # another renderer, or a draw without pixels (the layout alone)
                    base_draw(self, renderer)
                    _record(self, Text.get_window_extent(self, renderer))
                    return None
                key = self._key(renderer)
                buf = np.asarray(renderer.buffer_rgba())
                kept = _STAMPS.get(key)
                if kept is not None:
                    _, rows, cols, before, after = kept
                    if np.array_equal(buf[rows, cols], before):
                        buf[rows, cols] = after
                        STAMP_USES[0] += 1
                        self.stale = False
                        _record(self, Bbox(kept[0]))
                        return None
                box = Text.get_window_extent(self, renderer)
                h, w = buf.shape[:2]
                pad = STAMP_PAD_PX
                r0, r1 = max(int(h - box.y1) - pad, 0), min(int(h - box.y0) + pad + 1, h)
                c0, c1 = max(int(box.x0) - pad, 0), min(int(box.x1) + pad + 1, w)
                rows, cols = slice(r0, r1), slice(c0, c1)
                ring = (slice(max(r0 - pad, 0), min(r1 + pad, h)),
                        slice(max(c0 - pad, 0), min(c1 + pad, w)))
                around, before = buf[ring].copy(), buf[rows, cols].copy()
                base_draw(self, renderer)
                after = buf[rows, cols].copy()
                # the drawing stayed inside the kept pixels: the ring round them is unchanged
                inner = (slice(r0 - ring[0].start, r1 - ring[0].start),
                         slice(c0 - ring[1].start, c1 - ring[1].start))
                changed = buf[ring].copy()
                changed[inner], around[inner] = 0, 0
                if (kept is None and np.array_equal(changed, around)
                        and not np.array_equal(before, after)):
                    if len(_STAMPS) >= STAMP_LIMIT:
                        _STAMPS.clear()
                    _STAMPS[key] = (box.get_points().copy(), rows, cols, before, after)
                _record(self, box)
                return None

        _STAMP_CLASS = StampedText
    return _STAMP_CLASS


def _record(text, box) -> None:
    if _RECORDING is not None and text.get_text().strip():
        _RECORDING.append((text, box))


def drawn_texts(fig, *, render: bool = False) -> list:
    """``(text, window extent)`` of every text ``fig`` draws (empty ones left out), read
    while the figure draws itself (with ``render``, into its pixels; else no pixels)."""
    global _RECORDING
    from matplotlib.text import Text

    seen = []
    draw = Text.draw

    def recording(self, renderer):
        draw(self, renderer)
        if self.get_visible() and self.get_text().strip():
            seen.append((self, self.get_window_extent(renderer)))

    Text.draw = recording
    _RECORDING = seen  # the stamped texts record themselves
    try:
        if render:
            fig.canvas.draw()
        else:
            fig.draw_without_rendering()  # the layout and every text's extent, no pixels
    finally:
        Text.draw = draw
        _RECORDING = None
    return seen


class _Boxes:
    """Window extents kept in a grid of cells, for overlap checks among many texts."""

    CELL = 40.0

    def __init__(self):
        self.cells: dict[tuple[int, int], list] = {}

    def _keys(self, b):
        c = self.CELL
        for i in range(int(b.x0 // c), int(b.x1 // c) + 1):
            for j in range(int(b.y0 // c), int(b.y1 // c) + 1):
                yield i, j

    def clear(self, b) -> bool:
        for k in self._keys(b):
            for o in self.cells.get(k, ()):
                if (b.x0 < o.x1 + GAP_PX and o.x0 < b.x1 + GAP_PX and b.y0 < o.y1 + GAP_PX
                        and o.y0 < b.y1 + GAP_PX):
                    return False
        return True

    def add(self, b) -> None:
        for k in self._keys(b):
            self.cells.setdefault(k, []).append(b)


def finish(fig) -> None:
    """The footer with the cautions, the layout, and the optional texts placed clear of every
    other text (see the module docstring).

    The figure is drawn once, into its pixels, with the optional texts hidden (reading every
    fixed text's extent as it draws); the optional texts that fit are then drawn over those
    pixels, which :func:`save` writes as they are."""
    from matplotlib.transforms import Bbox

    foot = _footer(fig)
    fig.tight_layout(rect=(0, foot, 1, 1))
    pending = getattr(fig, _PENDING, None) or []
    setattr(fig, _PENDING, [])
    boxes = _Boxes()
    for _, b in drawn_texts(fig, render=True):
        boxes.add(b)
    renderer = fig.canvas.get_renderer()
    order = sorted(range(len(pending)), key=lambda i: (pending[i][4], i))
    fig_box = fig.bbox
    for i in order:
        ax, x, y, text, priority, kw = pending[i]
        anchor = _anchor_px(ax, x, y, kw, fig.dpi)
        if anchor is not None:
            # the text's box holds its anchor: where the anchor alone is outside the figure or
            # not clear, so is the box (the same choice, without making the text)
            a = Bbox.from_extents(anchor[0], anchor[1], anchor[0], anchor[1])
            if not (fig_box.x0 <= a.x0 <= fig_box.x1 and fig_box.y0 <= a.y0 <= fig_box.y1
                    and boxes.clear(a)):
                continue
        t = ax.annotate(text, (x, y), **kw)
        t.set_gid(f"{OPTIONAL}:{priority}")
        t.set_in_layout(False)
        b = t.get_window_extent(renderer)
        inside = (b.x0 >= fig_box.x0 and b.x1 <= fig_box.x1 and b.y0 >= fig_box.y0
                  and b.y1 <= fig_box.y1)
        if inside and boxes.clear(b):
            boxes.add(b)
            t.draw(renderer)
        else:
            t.remove()
    fig.stale = False
    setattr(fig, _DRAWN, True)


# zlib level 3: about half the encoding time of the default 6 for 3-7 % larger files
PNG_OPTIONS = {"compress_level": 3}


def save(fig, path) -> Path:
    """Save ``fig`` to ``path`` (PNG) and close it: the pixels :func:`finish` drew, or a
    fresh draw of a figure it did not finish."""
    import matplotlib.pyplot as plt
    from matplotlib.image import imsave

    path = Path(path)
    try:
        if getattr(fig, _DRAWN, False) and not fig.stale:
            # what savefig writes, without drawing the figure again
            imsave(path, fig.canvas.buffer_rgba(), format="png", origin="upper", dpi=DPI,
                   metadata={"Software": None}, pil_kwargs=PNG_OPTIONS)
        else:
            fig.savefig(path, dpi=DPI, metadata={"Software": None}, pil_kwargs=PNG_OPTIONS)
    finally:
        plt.close(fig)
    return path


def legend_outside(ax, **kw):
    """The legend right of ``ax``, clear of the data and its labels."""
    return ax.legend(loc="upper left", bbox_to_anchor=(1.005, 1.0), borderaxespad=0.0,
                     fontsize=7, **kw)


def station_ticks(ax, start: float, end: float) -> None:
    """Ticks in station notation at a round interval for the length."""
    from matplotlib.ticker import FuncFormatter, MultipleLocator

    length = max(end - start, 1.0)
    step = next((s for s in (10, 25, 50, 100, 200, 500, 1000, 2000, 5000, 10000, 20000, 50000)
                 if length / s <= 12), 100000)
    ax.xaxis.set_major_locator(MultipleLocator(step))
    ax.xaxis.set_major_formatter(FuncFormatter(lambda v, _: format_station(v, 0)))


def stations_figure(ws):
    """Both grades and the retained height against station for one wall."""
    st = np.asarray(ws.station_ft, dtype=float)
    fig, (ax1, ax2) = new_figure(nrows=2, gridspec_kw={"height_ratios": [2, 1]})
    # every line thinned to its per-pixel envelope: the same picture, whatever the count
    ax1.plot(*envelope(st, ws.retained_grade_ft), color="tab:brown", lw=1.6,
             label="retained grade")
    ax1.plot(*envelope(st, ws.front_grade_ft), color="tab:green", lw=1.6, label="front grade")
    if not np.isnan(ws.existing_ground_ft).all():
        ax1.plot(*envelope(st, ws.existing_ground_ft), color="0.5", lw=1, ls="--",
                 label="existing ground")
    breaks = np.unique(np.round(st[np.asarray(ws.is_break, dtype=bool)], 1))
    ax1.vlines(breaks, 0, 1, transform=ax1.get_xaxis_transform(), color="0.8", lw=0.5,
               zorder=0, label="station at a grade break")
    ax1.set_ylabel("elevation (ft)")
    ax1.set_title(f"Wall {ws.wall}: grades along the wall")
    ax1.grid(True, lw=0.3)
    legend_outside(ax1)
    h_all = np.asarray(ws.retained_height_ft, dtype=float)
    k = int(np.argmax(h_all))
    i = envelope_indices(st, h_all)
    x, h = st[i], h_all[i]
    ax2.fill_between(x, 0, h, where=h >= 0, color="tab:blue", alpha=0.3, lw=0)
    ax2.fill_between(x, 0, h, where=h < 0, color="tab:red", alpha=0.5, lw=0,
                     label="retained side flips")
    ax2.plot(x, h, color="tab:blue", lw=1.2)
    optional_text(ax2, st[k], h_all[k], f"max {h_all[k]:.2f} ft at {format_station(st[k])}",
                  xytext=(5, -12), textcoords="offset points", fontsize=8)
    ax2.axhline(0, color="k", lw=0.6)
    ax2.set_ylabel("retained height (ft)")
    ax2.set_xlabel("station")
    ax2.grid(True, lw=0.3)
    if (h_all < 0).any():
        legend_outside(ax2)
    station_ticks(ax2, float(st[0]), float(st[-1]))
    finish(fig)
    return fig


def plot_stations(ws, path: Path) -> Path:
    """``stations_figure`` saved to ``path``."""
    return save(stations_figure(ws), path)
