"""``schedule.xlsx`` as written row by row: title, header with units, values as they are (an
empty value an empty cell), one empty row, the cautions, and the print set-up."""

from __future__ import annotations

import math

import numpy as np
import openpyxl
import pandas as pd
from wallsched.exporters.schedule import write_xlsx

from wallsched.cautions import CAUTIONS


def test_workbook_rows_and_print_setup(tmp_path):
    schedule = pd.DataFrame({
        "wall": ["W1", "W1", "W2"], "segment": ["W1-01", "W1-02", "W2-01"],
        "length_ft": [12.5, 30.0, np.nan], "key_depth_in": [0.0, 12.0, 0.0],
        "steel_lb": [1200.25, np.nan, 88.0], "ok_count": np.array([3, 4, 5], dtype=np.int64),
        "flag": [True, False, True], "status": ["ok", None, "ok"],
        "count": pd.array([1, None, 3], dtype="Int64"),  # a nullable column with a gap
    })
    bars = pd.DataFrame({"wall": ["W1"], "mark": ["S1"], "weight_lb": [10.5]})
    path = tmp_path / "schedule.xlsx"
    write_xlsx(schedule, bars, None, path, "Invented site")
    wb = openpyxl.load_workbook(path)
    assert wb.sheetnames == ["schedule", "bar list"]
    ws = wb["schedule"]
    assert ws["A1"].value == "Invented site - schedule" and ws["A1"].font.b
    header = [c.value for c in ws[2]]
    assert header[:3] == ["wall", "segment", "length_ft [ft]"]  # the units (UNITS)
    assert "steel_lb [lb]" in header and "flag" in header
    assert all(c.font.b and c.alignment.wrap_text for c in ws[2])
    rows = [[c.value for c in r] for r in ws.iter_rows(min_row=3, max_row=5)]
    assert rows[0] == ["W1", "W1-01", 12.5, 0.0, 1200.25, 3, True, "ok", 1]
    assert rows[1][4] is None and rows[1][7] is None and rows[1][8] is None  # empty cells
    assert rows[2][2] is None and rows[2][5] == 5 and isinstance(rows[2][5], int)
    assert not any(isinstance(v, float) and math.isnan(v) for r in rows for v in r)
    assert all(c.value is None for c in ws[6])  # one empty row
    assert [ws.cell(7 + i, 1).value for i in range(len(CAUTIONS))] == list(CAUTIONS)
    assert ws.cell(7, 1).font.i and ws.cell(7, 1).font.sz == 8
    assert ws.max_row == 6 + len(CAUTIONS)
    assert ws.freeze_panes == "C3" and ws.print_title_rows == "$2:$2"
    assert ws.page_setup.orientation == "landscape" and ws.page_setup.fitToWidth == 1
    assert ws.oddFooter.left.text == CAUTIONS[0] + " " + CAUTIONS[2]
    assert ws.column_dimensions["A"].width == 9  # max(9, min(24, len + 2))
    assert ws.column_dimensions["C"].width == len("length_ft") + 2
    assert [c.value for c in wb["bar list"][3]] == ["W1", "S1", 10.5]
