"""LandXML 1.2 TIN surfaces (``<Surface><Definition surfType="TIN">``: ``<Pnts><P id>`` and
``<Faces><F>``; faces marked invisible, ``i="1"``, are skipped), as a :class:`~.surface.Surface`
(the document layer is :mod:`.landxml`)."""

from __future__ import annotations

from functools import lru_cache
from pathlib import Path

import numpy as np

from ..errors import ProfileError
from .landxml import children, load_document, named, numbers, open_landxml


@lru_cache(maxsize=8)
def _surface(path: str, mtime_ns: int, size: int, label: str, name: str):
    from .surface import make_surface

    doc = load_document(path, mtime_ns, size, label)
    surf = named(doc, "Surface", name)
    what = f"surface {name!r}"
    defs = children(surf, "Definition")
    if not defs:
        raise ProfileError(f"{what} has no <Definition> (points and faces)", file=label)
    d = defs[0]
    kind = d.get("surfType", "TIN")
    if kind.upper() != "TIN":
        raise ProfileError(f"{what} is surfType={kind!r}; only TIN surfaces are read",
                           file=label)
    ids: dict[str, int] = {}
    coords = []
    for p in (p for pn in children(d, "Pnts") for p in children(pn, "P")):
        pid = p.get("id")
        vals = numbers(p, f"{what} point {pid}", label, 3)
        if pid in ids:
            raise ProfileError(f"{what}: point id {pid} is used twice", file=label)
        ids[pid] = len(coords)
        coords.append(vals[:3])
    if len(coords) < 3:
        raise ProfileError(f"{what} has fewer than three points", file=label)
    faces = []
    hidden = 0
    for k, f in enumerate((f for fc in children(d, "Faces") for f in children(fc, "F")), 1):
        if (f.get("i") or "0").strip() == "1":
            hidden += 1
            continue
        refs = (f.text or "").split()
        if len(refs) != 3:
            raise ProfileError(f"{what}: face {k} has {len(refs)} points; a TIN face has "
                               "three", file=label)
        try:
            faces.append([ids[r] for r in refs])
        except KeyError as exc:
            raise ProfileError(f"{what}: face {k} refers to point {exc.args[0]}, which is "
                               "not among its points", file=label) from None
    if not faces:
        raise ProfileError(f"{what} has no visible faces", file=label)
    pts = np.array(coords, dtype=float)
    xy = pts[:, [1, 0]] * doc.ft_linear  # "N E Z": x = easting, y = northing
    z = pts[:, 2] * doc.ft_elevation
    messages = list(doc.messages)
    return make_surface(xy, z, faces, name=f"surface {name!r}", label=label,
                        messages=messages)


def read_surface_landxml(path: Path, options: dict, label: str):
    """The named TIN ``<Surface>`` as a :class:`~.surface.Surface`."""
    doc_stat = path.stat()
    open_landxml(path, label)  # size check, parse, units
    return _surface(str(path), doc_stat.st_mtime_ns, doc_stat.st_size, label, options["surface"])
