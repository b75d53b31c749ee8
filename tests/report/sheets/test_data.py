"""The Data sheets: the long form, the log of unused input cells with their addresses, text that
stays text, and the continuation beyond a sheet's row limit."""

from __future__ import annotations

import openpyxl

from sheetfuncs import groups_from_range
from sheetfuncs.input.demo import demo_groups
from sheetfuncs.report import write_report
from sheetfuncs.report.grid import safe_text

from tests.support.scenarios import write_in


def test_tab_and_cr_text_stays_text(tmp_path):
    rows = [["A", "B"], [1.0, 2.0], ["\t=1", 2.5], ["\r=2", 2.2], [1.2, 2.1]]
    path = write_in(tmp_path, groups_from_range(rows))
    ws = openpyxl.load_workbook(path)["Data"]
    content = [ws.cell(r, 8) for r in (2, 3)]
    assert [c.data_type for c in content] == ["s", "s"]
    assert content[0].value == "\t=1"
    # a carriage return is stored as the format's escape _x000D_ (ECMA-376 ST_Xstring), which
    # spreadsheet programs show as CR; openpyxl shows the escape itself
    assert content[1].value == "_x000D_=2"
    assert safe_text("a\x01b") == "a\u2401b" and safe_text("_x000D_") == "_x005F_x000D_"


def test_data_long_form_and_log_with_addresses(demo):
    g, _, wb = demo
    ws = wb["Data"]
    rows = list(ws.iter_rows(min_row=2, max_col=4, values_only=True))
    values = [r[2] for r in rows if r[2] is not None]
    assert values == [v for a in g.arrays for v in a.tolist()]
    assert [r[1] for r in rows] == [lab for lab, a in g for _ in range(a.size)]
    # the demo's "retest" note is row 7, column 2 of the range, which starts at B3
    assert [ws["F2"].value, ws["G2"].value, ws["H2"].value, ws["I2"].value] == [
        "'Lot data'!D10", "text", "retest", "ignored"]


def test_data_continue_on_more_sheets(tmp_path):
    g = demo_groups()  # 30 values; 9 rows of data per sheet below
    path = write_report(g, tmp_path / "split.xlsx", _row_limit=10)
    wb = openpyxl.load_workbook(path)
    assert wb.sheetnames == ["Findings", "Tables", "Comparisons", "Groups", "Data", "Data 2",
                             "Data 3", "Data 4", "Chart", "Audit", "About"]
    values = []
    for name in ("Data", "Data 2", "Data 3", "Data 4"):
        ws = wb[name]
        assert ws.max_row <= 10 and ws["C1"].value == "Response"
        values += [r[0] for r in ws.iter_rows(min_row=2, min_col=3, max_col=3, values_only=True)]
    assert values == [v for a in g.arrays for v in a.tolist()]
    formulas = " ".join(str(c.value) for row in wb["Audit"].iter_rows() for c in row)
    for name in ("Data!", "'Data 2'!", "'Data 3'!", "'Data 4'!$D$2:$D$4"):
        assert name in formulas
