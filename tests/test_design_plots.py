"""Design plots: files written, the elevation's lines are the DXF's lines."""

from __future__ import annotations

import ezdxf
import matplotlib.image as mpimg
import numpy as np
import pytest
from designkit import make_design
from wallsched.exporters.design_plots import elevation_series, write_design_plots
from wallsched.exporters.dxf_elevation import write_elevation_dxf


def test_plots_written(tmp_path):
    design = make_design()
    paths = write_design_plots(design, tmp_path)
    assert [p.name for p in paths] == ["W1-elevation.png", "W1-utilization.png"]
    for p in paths:
        img = mpimg.imread(p)
        assert img.shape[0] > 300 and img.shape[1] > 600
        dark = (img[..., :3].mean(axis=2) < 0.5).mean()
        assert dark > 0.001  # something is drawn


def test_plot_geometry_matches_dxf(tmp_path):
    design = make_design()
    dxf = write_elevation_dxf(design, tmp_path, input_hash="h", site_name="S")
    msp = ezdxf.readfile(dxf).modelspace()
    series = elevation_series(design)
    for layer, lines in series.items():
        drawn = [np.array(pl.get_points("xy")) for pl in msp.query(f'LWPOLYLINE[layer=="{layer}"]')]
        # the elevation's lines (the true-size sections lie to the right of the last station)
        drawn = [d for d in drawn if d[:, 0].max() <= design.stations.station_ft[-1] + 1e-9]
        assert len(drawn) == len(lines), layer
        for mine, theirs in zip(lines, drawn, strict=True):
            # closed DXF polylines omit the repeated first vertex
            n = len(theirs)
            assert mine[:n] == pytest.approx(theirs)


def test_elevation_series_exaggerated():
    design = make_design()
    one = elevation_series(design, 1.0)["C-WALL-OTLN"][0]
    two = elevation_series(design, 2.0)["C-WALL-OTLN"][0]
    assert np.ptp(two[:, 1]) == pytest.approx(2 * np.ptp(one[:, 1]))
    assert (two[:, 0] == one[:, 0]).all()


# --- plots a person reads (issue 16) -------------------------------------------------------

CHECK_NAMES = ("overturning", "sliding", "bearing", "embedment", "stem_flexure", "stem_shear",
               "stem_flexure_height", "stem_shear_height", "stem_min_steel", "stem_spacing",
               "stem_hook", "heel_flexure", "heel_shear", "heel_min_steel", "heel_spacing",
               "toe_flexure", "toe_shear", "toe_min_steel", "toe_spacing", "toe_depth",
               "stem_horizontal_steel", "footing_longitudinal_steel", "seismic_sliding")


def _busy_design(n_segments: int = 30, stations_per_ft: float = 0.2):
    """The kit's wall cut into many short segments with marks past Z and a check per name."""
    from dataclasses import replace

    base = make_design()
    marks = ["B", "AA", "Z", "A", "AB", "C", "N"]
    a, b = 100.0, 280.0
    edges = np.linspace(a, b, n_segments + 1)
    segs = []
    for i in range(n_segments):
        src = base.segments[i % len(base.segments)]
        segs.append(replace(src, segment=f"W1-{i + 1:02d}", mark=marks[i % len(marks)],
                            station_start_ft=float(edges[i]), station_end_ft=float(edges[i + 1])))
    st = np.linspace(a, b, int((b - a) * stations_per_ft) + 1)
    ws = base.stations
    stations = type(ws)(wall=ws.wall, station_ft=st, x=st - a, y=np.zeros_like(st),
                        retained_grade_ft=np.interp(st, ws.station_ft, ws.retained_grade_ft),
                        front_grade_ft=np.interp(st, ws.station_ft, ws.front_grade_ft),
                        existing_ground_ft=np.interp(st, ws.station_ft, ws.existing_ground_ft),
                        is_break=np.zeros(st.size, bool))
    rng = np.random.default_rng(3)
    checks = {n: rng.uniform(0.1, 0.95, st.size) for n in CHECK_NAMES}
    util = np.max(np.vstack(list(checks.values())), axis=0)
    return replace(base, segments=tuple(segs), stations=stations, station_checks=checks,
                   station_utilization=util,
                   station_segment=np.minimum(np.searchsorted(edges[1:], st), n_segments - 1))


def _figures(design):
    from wallsched.exporters.design_plots import elevation_figure, utilization_figure
    from wallsched.exporters.plots import stations_figure

    return {"elevation": elevation_figure(design), "utilization": utilization_figure(design),
            "stations": stations_figure(design.stations)}


def _close(figs):
    import matplotlib.pyplot as plt

    for f in figs.values():
        plt.close(f)


def test_no_two_texts_overlap_on_any_plot():
    from wallsched.exporters.plots import drawn_texts

    for design in (make_design(), _busy_design()):
        figs = _figures(design)
        try:
            for name, fig in figs.items():
                boxes = drawn_texts(fig)
                assert len(boxes) > 15, name
                for i, (ta, a) in enumerate(boxes):
                    for tb, b in boxes[i + 1:]:
                        ox = min(a.x1, b.x1) - max(a.x0, b.x0)
                        oy = min(a.y1, b.y1) - max(a.y0, b.y0)
                        assert not (ox > 0 and oy > 0), (name, ta.get_text(), tb.get_text())
        finally:
            _close(figs)


def test_at_most_eight_legend_entries_and_every_check_in_one():
    from wallsched.exporters.design_plots import check_groups

    design = _busy_design()
    figs = _figures(design)
    try:
        for name, fig in figs.items():
            for ax in fig.axes:
                legend = ax.get_legend()
                if legend is not None:
                    assert len(legend.get_texts()) <= 8, name
        groups = check_groups(CHECK_NAMES)
        named = [n for _, names in groups for n in names]
        assert sorted(named) == sorted(CHECK_NAMES)  # each check in exactly one group
        texts = [t.get_text() for t in figs["utilization"].axes[0].get_legend().get_texts()]
        assert "largest ratio" in texts and "limit 1.0" in texts
        assert "sliding (2)" in texts  # sliding and seismic_sliding
    finally:
        _close(figs)


def test_marks_in_natural_order():
    from wallsched.exporters.design_plots import utilization_figure

    fig = utilization_figure(_busy_design())
    try:
        ax = fig.axes[-1]
        fig.canvas.draw()
        ticks = sorted(zip(ax.get_yticks(), [t.get_text() for t in ax.get_yticklabels()],
                           strict=True))
        assert [t for _, t in ticks] == ["A", "B", "C", "N", "Z", "AA", "AB"]
    finally:
        import matplotlib.pyplot as plt

        plt.close(fig)


def test_elevation_labels_follow_the_dxf_rules():
    """Every segment end and step gets its label (the kit's wall has room for them), and
    an interval label stands at a multiple of the interval."""
    from wallsched.exporters.design_plots import elevation_figure
    from wallsched.exporters.dxf_elev_view import label_stations
    from wallsched.profile.stationing import format_station

    design = make_design()
    fig = elevation_figure(design, label_interval_ft=25.0)
    try:
        texts = {t.get_text() for t in fig.axes[0].texts}
        st = design.stations
        wanted = label_stations(list(design.segments), st.station_ft, st.front_grade_ft, 25.0)
        required = [q for q in wanted if q.required]
        assert len(required) == 6  # 100, both sides of the steps at 160 and 230, 280
        for q in required:
            assert f"{format_station(q.station_ft)}  TW {q.tw:.2f}" in texts
        assert "1+25.00  TW 104.00" in texts  # an interval label
    finally:
        import matplotlib.pyplot as plt

        plt.close(fig)


def test_plots_draw_the_envelope_of_many_stations():
    from wallsched.exporters.envelope import PLOT_COLUMNS

    design = _busy_design(n_segments=12, stations_per_ft=200.0)  # 36,001 stations
    assert design.stations.station_ft.size > 8 * PLOT_COLUMNS
    figs = _figures(design)
    try:
        for name, fig in figs.items():
            for ax in fig.axes:
                for line in ax.get_lines():
                    assert len(line.get_xdata()) <= 4 * PLOT_COLUMNS + 4, name
    finally:
        _close(figs)


def test_stamped_footer_is_the_drawn_footer_byte_for_byte(tmp_path):
    """The caution footer copied from an earlier figure of the same size (the stamp cache of
    ``plots``) gives the PNG a fresh draw gives, and the cautions are still the figure's
    texts; a different figure under the footer is drawn, not copied."""
    from wallsched.exporters import plots
    from wallsched.exporters.design_plots import plot_design_elevation

    from wallsched.cautions import CAUTIONS

    design = make_design()
    plots._STAMPS.clear()
    fresh = plot_design_elevation(design, tmp_path / "fresh.png").read_bytes()
    assert plots._STAMPS  # the first draw kept the footer's pixels
    uses = plots.STAMP_USES[0]
    again = plot_design_elevation(design, tmp_path / "again.png").read_bytes()
    assert plots.STAMP_USES[0] - uses == len(plots._STAMPS)  # every footer line copied
    assert again == fresh
    # with nothing kept, the same bytes again
    plots._STAMPS.clear()
    assert plot_design_elevation(design, tmp_path / "third.png").read_bytes() == fresh
    fig = plots.stations_figure(design.stations)
    footer = " ".join(t.get_text() for t in fig.texts)
    assert all(c.split()[0] in footer for c in CAUTIONS)
    import matplotlib.pyplot as plt

    plt.close(fig)
    # other pixels under the footer (a grey figure): drawn, not copied
    fig, _ = plots.new_figure()
    fig.set_facecolor("0.8")
    plots._footer(fig)
    uses = plots.STAMP_USES[0]
    fig.canvas.draw()
    assert plots.STAMP_USES[0] == uses
    foot = np.asarray(fig.canvas.buffer_rgba())[-20:, :400, :3]
    assert (foot < 120).any()  # the footer's text is there
    plt.close(fig)
