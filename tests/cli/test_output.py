"""Tests of the output helpers (sheetfuncs.cli.output): strict JSON values, CSV cells that a
spreadsheet cannot take for formulas, aligned text and the ignored-cell log."""

from __future__ import annotations

import math

from sheetfuncs.cli import csv_safe, json_ready
from sheetfuncs.cli.output import aligned, records, text_cell
from tests.support.cli import run, write_csv


def test_csv_safe_and_json_ready():
    assert csv_safe("=1+2") == "'=1+2" and csv_safe("\tx") == "'\tx" and csv_safe("\rx") == "'\rx"
    assert csv_safe("plain") == "plain" and csv_safe(-1.25) == "-1.25"
    assert csv_safe(math.inf) == "inf" and csv_safe(math.nan) == "nan" and csv_safe(None) == ""
    assert csv_safe(0.1 + 0.2) == "0.30000000000000004"  # shortest round-trip repr
    assert json_ready({"a": (math.inf, -math.inf, math.nan, 1)}) == {"a": ["inf", "-inf", None, 1]}


def test_aligned_text_table():
    table = [["Source", "df", "F", "p"], ["Factor", 3, math.inf, 0.0], ["Residual", 26, None, None]]
    assert aligned(table) == [
        "Source    df         F  p",
        "Factor     3  infinite  0",
        "Residual  26",
    ]  # first and last columns left-aligned, the others right-aligned
    assert text_cell(math.nan) == "undefined" and text_cell(2 / 3) == "0.666667"
    assert records(table)[0] == {"Source": "Factor", "df": 3, "F": math.inf, "p": 0.0}


def test_text_output_counts_left_out_cells_beyond_eight(tmp_path, capsys):
    rows = [["A", "B"]] + [[i, f"note {i}"] for i in range(1, 11)] + [[i, i + 1] for i in range(3)]
    code, out, err = run(["table", str(write_csv(tmp_path / "notes.csv", rows)), "--range", "A1:B14"],
                         capsys)
    assert code == 0, err
    lines = [x for x in out.splitlines() if x.startswith("  left out") or x.startswith("  and ")]
    assert lines[0] == '  left out B2: text in the data ("note 1")'
    assert lines[7] == '  left out B9: text in the data ("note 8")'
    assert lines[8:] == ["  and 2 more left out (see --json)"]
