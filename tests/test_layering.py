"""The layers of the code, read from the imports of every module (DEVELOPERS.md, "Layers").

- ``engine/`` and ``profile/`` import nothing of wallsched outside themselves except the shared
  errors module (``wallsched/errors.py``);
- ``exporters/`` import from the engine only its result types (``engine/model.py``) and from the
  hub only ``errors``, ``cautions`` and the version (``wallsched/__init__.py``);
- no import cycle anywhere, counting the imports inside functions too;
- no private name imported from another module.
"""

from __future__ import annotations

import ast
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1]
# folder -> the import name it installs under (pyproject.toml [tool.setuptools.package-dir])
PACKAGES = {"wallsched": "wallsched", "engine": "wallsched.engine",
            "profile": "wallsched.profile", "exporters": "wallsched.exporters"}
ERRORS = "wallsched.errors"
ENGINE_RESULT_TYPES = {"wallsched.engine.model"}
HUB_FOR_EXPORTERS = {"wallsched", "wallsched.errors", "wallsched.cautions"}


def _modules() -> dict[str, Path]:
    out = {}
    for folder, name in PACKAGES.items():
        for path in sorted((ROOT / folder).rglob("*.py")):
            rel = path.relative_to(ROOT / folder).with_suffix("")
            parts = [p for p in rel.parts if p != "__init__"]
            out[".".join([name, *parts])] = path
    return out


MODULES = _modules()


def _is_package(module: str) -> bool:
    return MODULES[module].name == "__init__.py"


def _resolve(module: str, node: ast.ImportFrom | ast.Import) -> list[str]:
    """The wallsched modules one import statement of ``module`` reaches."""
    if isinstance(node, ast.Import):
        names = [a.name for a in node.names]
    else:
        if node.level:
            base = module.split(".")
            if not _is_package(module):
                base = base[:-1]
            base = base[: len(base) - (node.level - 1)]
            target = ".".join(base + ([node.module] if node.module else []))
        else:
            target = node.module or ""
        # "from package import submodule" reaches the submodule
        names = [f"{target}.{a.name}" if f"{target}.{a.name}" in MODULES else target
                 for a in node.names]
    return sorted({n for n in names if n in MODULES})


def _imports() -> dict[str, set[str]]:
    graph: dict[str, set[str]] = {}
    for module, path in MODULES.items():
        tree = ast.parse(path.read_text(encoding="utf-8"), filename=str(path))
        reached: set[str] = set()
        for node in ast.walk(tree):
            if isinstance(node, ast.Import | ast.ImportFrom):
                reached.update(_resolve(module, node))
        reached.discard(module)
        graph[module] = reached
    return graph


GRAPH = _imports()


def _layer(module: str) -> str:
    parts = module.split(".")
    return parts[1] if len(parts) > 1 and parts[1] in ("engine", "profile", "exporters") \
        else "hub"


def _inside(module: str, layer: str) -> bool:
    return _layer(module) == layer


def test_the_import_reader_sees_the_known_edges():
    # a check of the reader itself: edges that exist in the code, found by it
    assert "wallsched.engine.pressure" in GRAPH["wallsched.engine.checks"]
    assert ERRORS in GRAPH["wallsched.profile.csvread"]
    assert "wallsched.cautions" in GRAPH["wallsched.exporters.schedule"]
    assert "wallsched" in GRAPH["wallsched.cli"]  # from . import __version__
    assert "wallsched.profile.dxfread" in GRAPH["wallsched.profile.sources"]  # from . import
    assert "wallsched.engine.audit" in GRAPH["wallsched.engine.wall_design"]  # in a function


@pytest.mark.parametrize("layer", ["engine", "profile"])
def test_engine_and_profile_import_only_themselves_and_the_errors(layer):
    bad = [f"{m} imports {t}" for m, ts in sorted(GRAPH.items()) if _inside(m, layer)
           for t in sorted(ts) if not _inside(t, layer) and t != ERRORS]
    assert not bad, "\n".join(bad)


def test_exporters_import_only_result_types_errors_cautions_and_version():
    bad = []
    for m, ts in sorted(GRAPH.items()):
        if not _inside(m, "exporters"):
            continue
        for t in sorted(ts):
            layer = _layer(t)
            if layer == "engine" and t not in ENGINE_RESULT_TYPES:
                bad.append(f"{m} imports {t} (the engine's result types are "
                           f"{', '.join(sorted(ENGINE_RESULT_TYPES))})")
            elif layer == "hub" and t not in HUB_FOR_EXPORTERS:
                bad.append(f"{m} imports {t} (from the hub only errors, cautions, version)")
    assert not bad, "\n".join(bad)


def _cycles(graph: dict[str, set[str]]) -> list[list[str]]:
    """The strongly connected components of more than one module (Tarjan)."""
    index: dict[str, int] = {}
    low: dict[str, int] = {}
    stack: list[str] = []
    on: set[str] = set()
    out: list[list[str]] = []

    def visit(v: str) -> None:
        index[v] = low[v] = len(index)
        stack.append(v)
        on.add(v)
        for w in sorted(graph.get(v, ())):
            if w not in index:
                visit(w)
                low[v] = min(low[v], low[w])
            elif w in on:
                low[v] = min(low[v], index[w])
        if low[v] == index[v]:
            comp = []
            while True:
                w = stack.pop()
                on.discard(w)
                comp.append(w)
                if w == v:
                    break
            if len(comp) > 1:
                out.append(sorted(comp))

    for v in sorted(graph):
        if v not in index:
            visit(v)
    return out


def test_the_cycle_finder_finds_a_cycle():
    assert _cycles({"a": {"b"}, "b": {"c"}, "c": {"a"}, "d": {"a"}}) == [["a", "b", "c"]]
    assert _cycles({"a": {"b"}, "b": set()}) == []


def test_no_import_cycle():
    # a package's __init__ importing its own modules is not a cycle of the code: leave the
    # edges from a package to its submodules out, keep everything else
    graph = {m: {t for t in ts if not (_is_package(m) and t.startswith(m + "."))}
             for m, ts in GRAPH.items()}
    found = _cycles(graph)
    assert not found, "\n".join(" <-> ".join(c) for c in found)


def test_a_pressure_model_imports_only_the_pressure_package():
    # a model is one module of engine/pressure/models/: it reads the shared pieces of
    # engine/pressure (types, coefficients, profiles, planes, the active soil) and no other
    # model, so that adding one touches nothing else
    pkg = "wallsched.engine.pressure"
    models = [m for m in MODULES if m.startswith(pkg + ".models.") and not _is_package(m)]
    assert len(models) >= 8
    bad = [f"{m} imports {t}" for m in models for t in sorted(GRAPH[m])
           if not t.startswith(pkg + ".") or t.startswith(pkg + ".models.")
           or t in (pkg + ".registry", pkg + ".thrust")]
    assert not bad, "\n".join(bad)


def _private_names_taken() -> list[str]:
    """``from <a wallsched module> import _name`` anywhere: a private name used across modules."""
    out = []
    for module, path in MODULES.items():
        tree = ast.parse(path.read_text(encoding="utf-8"), filename=str(path))
        for node in ast.walk(tree):
            if isinstance(node, ast.ImportFrom) and _resolve(module, node):
                out += [f"{module} takes {a.name}" for a in node.names
                        if a.name.startswith("_") and not a.name.startswith("__")]
    return out


def test_no_private_name_is_imported_across_modules(tmp_path):
    assert not _private_names_taken(), "\n".join(_private_names_taken())
    # the finder itself: a module that takes a private name is found
    global MODULES
    saved = MODULES
    probe = tmp_path / "probe.py"
    probe.write_text("from .base import _hidden\n", encoding="utf-8")
    try:
        MODULES = {**saved, "wallsched.engine.pressure.probe": probe}
        assert _private_names_taken() == ["wallsched.engine.pressure.probe takes _hidden"]
    finally:
        MODULES = saved
