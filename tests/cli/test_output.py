"""Tests of the output helpers (sheetfuncs.cli.output): strict JSON values, CSV cells that a
spreadsheet cannot take for formulas, aligned text and the ignored-cell log."""

from __future__ import annotations

import math

from sheetfuncs.cli import csv_safe, json_ready
from sheetfuncs.cli.output import cell_shown


def test_csv_safe_and_json_ready():
    assert csv_safe("=1+2") == "'=1+2" and csv_safe("\tx") == "'\tx" and csv_safe("\rx") == "'\rx"
    assert csv_safe("plain") == "plain" and csv_safe(-1.25) == "-1.25"
    assert csv_safe(math.inf) == "inf" and csv_safe(math.nan) == "nan" and csv_safe(None) == ""
    assert csv_safe(0.1 + 0.2) == "0.30000000000000004"  # shortest round-trip repr
    assert json_ready({"a": (math.inf, -math.inf, math.nan, 1)}) == {"a": ["inf", "-inf", None, 1]}


def test_cell_shown_like_a_spreadsheet():
    assert cell_shown("text", "retest") == 'text "retest"'
    assert cell_shown("text", 'say "hi"') == 'text "say ""hi"""'  # quotes doubled
    assert cell_shown("logical", True) == "logical value TRUE"
    assert cell_shown("text", "x" * 60).endswith('…"')


