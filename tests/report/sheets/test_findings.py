"""The Findings sheet: what was read, then the answer filled by its verdict, then the key figures
and the sections of the Findings text."""

from __future__ import annotations

import openpyxl

from sheetfuncs.report.context import prepare
from sheetfuncs.report.findings import findings

from tests.support.scenarios import CLEAR, NONE, write_in


def test_what_was_read_then_the_answer_filled_by_its_verdict(tmp_path):
    for groups, fill, name in ((CLEAR, "E2EFDA", "clear.xlsx"), (NONE, "EDEDED", "none.xlsx")):
        fi = findings(prepare(groups))
        ws = openpyxl.load_workbook(write_in(tmp_path, groups, name))["Findings"]
        assert ws["A4"].value == "What was read"
        assert ws["A5"].value == fi.data_read[0] and fi.data_read[0].startswith("Data passed from Python")
        assert ws["A7"].value == "The answer"
        assert ws["A8"].value == fi.headline and ws["A8"].fill.fgColor.rgb.endswith(fill)
        assert "A8:E8" in {str(m) for m in ws.merged_cells.ranges}


def test_key_figures_with_their_p_values_marked(tmp_path):
    fi = findings(prepare(CLEAR))
    ws = openpyxl.load_workbook(write_in(tmp_path, CLEAR))["Findings"]
    col_a = [c.value for (c,) in ws.iter_rows(min_col=1, max_col=1)]
    head = col_a.index("Figure") + 1
    assert [ws.cell(head, c).value for c in range(1, 6)] == ["Figure", "Value", "df", "p", "Reading"]
    figures = [ws.cell(head + 1 + i, 1).value for i in range(len(fi.key_figures))]
    assert figures == [row[0] for row in fi.key_figures]
    ranges = [str(cf.sqref) for cf in ws.conditional_formatting]
    assert f"D{head + 1}:D{head + len(fi.key_figures)}" in ranges
    for head_text, _ in fi.sections:
        assert head_text in col_a
