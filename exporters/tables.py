"""CSV tables written the same way everywhere: fixed float format, no index, LF endings."""

from __future__ import annotations

from pathlib import Path

import pandas as pd

FLOAT_FORMAT = "%.4f"  # every CSV table of a run folder


def write_csv(frame: pd.DataFrame, path: Path) -> None:
    """Write ``frame`` reproducibly (same inputs give byte-identical files)."""
    frame.to_csv(path, index=False, lineterminator="\n", float_format=FLOAT_FORMAT)
