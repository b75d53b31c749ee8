"""The Groups sheet: per-group summaries equal to the core's."""

from __future__ import annotations

import openpyxl

from sheetfuncs import describe

from tests.support.scenarios import INFINITE, cells_text, write_in


def test_groups_equal_the_core(demo):
    g, _, wb = demo
    got = [[c.value for c in r][:10] for r in wb["Groups"].iter_rows(min_row=5, max_row=4 + g.k)]
    want = describe(g, 0.95).table()[1:]
    assert got == want


def test_a_group_of_one_value_is_explained(tmp_path):
    ws = openpyxl.load_workbook(write_in(tmp_path, INFINITE))["Groups"]
    assert ws["D7"].value == "undefined"  # group "c" has one value: no SD
    assert "undefined: a group of one value has no SD, standard error or interval." in cells_text(ws)
