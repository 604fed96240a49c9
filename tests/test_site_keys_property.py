"""Every key of the site file given a value of every TOML type and of extreme size: the site is
read, or refused with one InputError line naming the file; never any other exception.

The values are tried exhaustively (every key x every value), through ``load_site`` and the
resource estimate that ``design`` runs next; the corpus (``tests/bad_inputs``) takes chosen
cases through the whole command line.
"""

from __future__ import annotations

import re
from pathlib import Path

import pytest
from sitekit import make_site

from wallsched.budget import check_budget
from wallsched.errors import InputError
from wallsched.keys import SITE_KEYS, STRIP_KEYS
from wallsched.site import (
    OPTIONAL_TABLES,
    OVERRIDABLE,
    SITE_ONLY,
    WALL_KEYS,
    WALL_SOURCES,
    load_site,
)

VALUES = {
    "string": '"x"', "empty string": '""', "long string": '"' + "x" * 5000 + '"',
    "control character": '"a\\u0007b"', "path-like": '"../../etc/passwd"',
    "integer": "3", "zero": "0", "negative": "-7", "huge integer": "9" * 400,
    "past the TOML reader": "8" * 5000, "float": "2.5", "tiny": "1e-300", "huge float": "1e308",
    "overflowing float": "1e400", "nan": "nan", "inf": "inf", "-inf": "-inf", "bool": "true",
    "date": "1979-05-27", "datetime": "1979-05-27T07:32:00Z", "time": "07:32:00",
    "array": "[1, 2]", "array of strings": '["a", "b"]', "big array": "[" + "1, " * 1000 + "1]",
    "nested array": "[[1], [2]]", "inline table": "{ a = 1 }", "empty table": "{}",
}

# (table as written, its keys); "walls" is the [[walls]] entry, "strip" a [[loads.strip]]
TABLES = [("site", SITE_KEYS), *OVERRIDABLE.items(), *SITE_ONLY.items(),
          *OPTIONAL_TABLES.items(), ("strip", STRIP_KEYS),
          ("walls", {**WALL_KEYS, **dict.fromkeys(WALL_SOURCES)})]
KEYS = [(t, k) for t, keys in TABLES for k in keys]

OPTIONAL = {"seismic": "[seismic]\nkh = 0.2\n", "water": "[water]\nlevel_ft = 2\n",
            "strip": "[[loads.strip]]\noffset_ft = 2\nwidth_ft = 4\npressure_psf = 100\n"}


def site_text(base: str, table: str, key: str, value: str) -> str:
    """``base`` with ``key = value`` in ``table`` (replacing the key where it is given)."""
    if table in OPTIONAL:
        block = OPTIONAL[table]
        line = f"{key} = {value}"
        block = (re.sub(rf"(?m)^{key} = .*$", lambda _: line, block)
                 if re.search(rf"(?m)^{key} = ", block) else block + line + "\n")
        return base + "\n" + block if table == "strip" else base.replace(
            "[[walls]]", block + "\n[[walls]]", 1)
    header = "[[walls]]" if table == "walls" else f"[{table}]"
    if header not in base:
        base = base.replace("[[walls]]", f"{header}\n\n[[walls]]", 1)
    start = base.index(header) + len(header)
    end = base.find("\n[", start)
    end = len(base) if end < 0 else end
    body = base[start:end]
    line = f"{key} = {value}"
    if re.search(rf"(?m)^{re.escape(key)} = ", body):
        body = re.sub(rf"(?m)^{re.escape(key)} = .*$", lambda _: line, body)
    else:
        body = "\n" + line + body
    return base[:start] + body + base[end:]


@pytest.fixture(scope="module")
def folder(tmp_path_factory) -> tuple[Path, str]:
    root = tmp_path_factory.mktemp("keys")
    path = make_site(root)
    return path, path.read_text()


def test_every_key_every_type_never_a_traceback(folder):
    path, base = folder
    read = refused = 0
    for table, key in KEYS:
        for what, value in VALUES.items():
            path.write_text(site_text(base, table, key, value))
            try:
                site = load_site(path)
                check_budget(site, [_Stations() for _ in site.walls])
                read += 1
            except InputError as exc:
                line = exc.one_line()
                assert "\n" not in line and "site.toml" in line, (table, key, what, line)
                assert len(line) < 1000, (table, key, what, line[:200])
                refused += 1
            except Exception as exc:  # noqa: BLE001 - the property: nothing else, ever
                pytest.fail(f"[{table}] {key} = <{what}>: {type(exc).__name__}: {exc}"[:500])
    # both outcomes occur: the values are neither all refused nor all read
    assert read > len(KEYS) and refused > len(KEYS)


def test_the_builder_sets_the_key(folder):
    path, base = folder
    text = site_text(base, "soil", "unit_weight_pcf", "121")
    assert "unit_weight_pcf = 121" in text and "unit_weight_pcf = 120" not in text
    path.write_text(text)
    assert load_site(path).walls[0].soil["unit_weight_pcf"] == 121.0
    path.write_text(site_text(base, "strip", "width_ft", "6"))
    assert load_site(path).walls[0].loads["strip"][0]["width_ft"] == 6.0
    path.write_text(site_text(base, "walls", "start_station_ft", "250"))
    assert load_site(path).walls[0].start_station_ft == 250.0
    path.write_text(site_text(base, "sizing", "stem_max_in", "20"))
    assert load_site(path).sizing["stem_max_in"] == 20.0


class _Stations:
    """What the resource estimate reads of a sampled wall: 100 ft at 5-ft stations."""

    def __init__(self):
        import numpy as np

        self.station_ft = np.arange(21) * 5.0

    def __len__(self) -> int:
        return 21
