"""Render a DXF's model space or one of its sheets to PNG (ezdxf drawing add-on + matplotlib,
Agg) for a person to look at."""

from __future__ import annotations

from pathlib import Path


def render_dxf_png(dxf_path, png_path, *, dpi: int = 150, width_in: float = 24.0,
                   window: tuple[float, float, float, float] | None = None,
                   layout: str | None = None) -> Path:
    """Draw ``dxf_path`` on a white background into ``png_path``; returns the PNG path.

    ``window`` = (x0, y0, x1, y1) in drawing units shows only that part (a zoom).
    ``layout`` names a paper-space sheet (drawn at its paper size, viewports included);
    None draws model space.
    """
    import matplotlib

    matplotlib.use("Agg")
    import ezdxf
    import matplotlib.pyplot as plt
    from ezdxf import bbox
    from ezdxf.addons.drawing import Frontend, RenderContext
    from ezdxf.addons.drawing.config import BackgroundPolicy, ColorPolicy, Configuration
    from ezdxf.addons.drawing.matplotlib import MatplotlibBackend

    doc = ezdxf.readfile(str(dxf_path))
    space = doc.modelspace() if layout is None else doc.layouts.get(layout)
    if layout is not None:
        w, h = space.dxf.paper_width / 25.4, space.dxf.paper_height / 25.4  # stored in mm
        window = window or (0.0, 0.0, w, h)
    if window is not None:
        w, h = window[2] - window[0], window[3] - window[1]
    else:
        box = bbox.extents(space, fast=True)
        w, h = max(box.size.x, 1.0), max(box.size.y, 1.0)
    fig = plt.figure(figsize=(width_in, max(width_in * h / w, 2.0)))
    ax = fig.add_axes((0, 0, 1, 1))
    cfg = Configuration(background_policy=BackgroundPolicy.WHITE,
                        color_policy=ColorPolicy.BLACK)
    try:
        ctx = RenderContext(doc)
        if layout is not None:
            ctx.set_current_layout(space)
        # the figure keeps the size asked for (the backend would shrink it to its aspect)
        backend = MatplotlibBackend(ax, adjust_figure=False)
        Frontend(ctx, backend, config=cfg).draw_layout(space, finalize=True)
        if window is not None:
            ax.set_xlim(window[0], window[2])
            ax.set_ylim(window[1], window[3])
        png_path = Path(png_path)
        fig.savefig(png_path, dpi=dpi, facecolor="white", metadata={"Software": None})
    finally:
        plt.close(fig)
    return png_path


def sheet_names(dxf_path) -> list[str]:
    """The paper-space sheets of a DXF, in tab order."""
    import ezdxf

    doc = ezdxf.readfile(str(dxf_path))
    return [name for name in doc.layout_names_in_taborder() if name != "Model"]
