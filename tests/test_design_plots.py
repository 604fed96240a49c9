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
