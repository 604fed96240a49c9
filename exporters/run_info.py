"""What the exporters are told about the run besides the design: the program version, the site
file's name and notes, the input files with their SHA-256, the cautions, every wall's resolved
input tables, and the design basis rows of the calc package (filled by the hub,
``wallsched/basis.py``)."""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass, field
from typing import Any

from ..cautions import CAUTIONS


@dataclass(frozen=True)
class RunInfo:
    """The run around a :class:`~wallsched.engine.model.SiteDesign`.

    ``wall_tables``: wall id -> {"soil", "loads", "materials", "criteria"} -> resolved values
    (site-file order of walls). ``basis``: table name -> rows ``key | value per wall | where it
    comes from`` of the calc package's design basis; ``soil_sources``: the stated sources of
    the soil values (empty when none is stated).
    """

    version: str
    site_name: str
    meta: Mapping[str, Any]
    input_hashes: Mapping[str, str]
    wall_tables: Mapping[str, Mapping[str, Mapping[str, Any]]]
    costs: Mapping[str, Any] = field(default_factory=dict)
    sizing: Mapping[str, Any] = field(default_factory=dict)
    basis: Mapping[str, list[list[str]]] = field(default_factory=dict)
    soil_sources: tuple[str, ...] = ()
    cautions: tuple[str, ...] = tuple(CAUTIONS)

    @property
    def wall_ids(self) -> tuple[str, ...]:
        return tuple(self.wall_tables)

    @property
    def hash_text(self) -> str:
        """The input hashes in one line, shortened (the drawings' title block)."""
        return ", ".join(f"{k} sha256 {v[:16]}" for k, v in self.input_hashes.items())
