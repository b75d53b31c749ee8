"""Tests of sheetfuncs.input.files.formulas: a sheet's formulas read from its XML part (shared
formulas translated to each cell, as a spreadsheet program shows them), hidden rows, and what a
formula covers."""

from __future__ import annotations

import zipfile
from pathlib import Path

import openpyxl

from sheetfuncs.input.files.formulas import formula_refs, is_aggregate, read_formulas, scan_sheet


def _book(tmp_path: Path) -> Path:
    """Invented hardness of three lines: values in B2:D4, Mean formulas in row 5 (the first a
    shared formula's leader, the others its followers, as spreadsheet programs save them), a
    unit conversion in E2, a text cell and a self-closing empty cell between, row 3 hidden."""
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "Hardness"
    ws.append(["Line", "L1", "L2", "L3", "in"])
    for r in ([88.1, 90.2, 87.0], [87.6, 91.0, 86.4], [88.4, 90.6, 87.7]):
        ws.append(["x", *r])
    ws["E2"] = "=B2/25.4"
    ws.append(["Mean", "=AVERAGE(B2:B4)", "=AVERAGE(C2:C4)", "=AVERAGE(D2:D4)"])
    ws.row_dimensions[3].hidden = True
    path = tmp_path / "f.xlsx"
    wb.save(path)
    with zipfile.ZipFile(path) as zf:
        parts = {n: zf.read(n) for n in zf.namelist()}
    sheet = parts["xl/worksheets/sheet1.xml"].decode()
    sheet = sheet.replace("<f>AVERAGE(B2:B4)</f>", '<f t="shared" ref="B5:D5" si="0">AVERAGE(B2:B4)</f>')
    sheet = sheet.replace("<f>AVERAGE(C2:C4)</f>", '<f t="shared" si="0"/>')
    sheet = sheet.replace("<f>AVERAGE(D2:D4)</f>", '<f t="shared" si="0"></f>')
    sheet = sheet.replace('<c r="E3"', '<c r="F3"/><c r="E3"')  # an empty self-closing cell
    parts["xl/worksheets/sheet1.xml"] = sheet.encode()
    with zipfile.ZipFile(path, "w") as zf:
        for name, data in parts.items():
            zf.writestr(name, data)
    return path


def test_formulas_with_shared_followers_translated(tmp_path):
    path = _book(tmp_path)
    assert read_formulas(path, "Hardness", 1, 1, 10, 10) == {
        (2, 5): "B2/25.4",
        (5, 2): "AVERAGE(B2:B4)", (5, 3): "AVERAGE(C2:C4)", (5, 4): "AVERAGE(D2:D4)",
    }
    assert read_formulas(path, "Hardness", 5, 3, 5, 3) == {(5, 3): "AVERAGE(C2:C4)"}  # the box only
    assert read_formulas(path, "No such sheet", 1, 1, 10, 10) == {}


def test_scan_finds_formulas_and_hidden_rows(tmp_path):
    assert scan_sheet(_book(tmp_path), "Hardness") == (True, frozenset({3}))


def test_what_a_formula_covers():
    assert formula_refs("AVERAGE(B2:B4)*2+'Lot 2'!C3+$D$7") == [(2, 2, 4, 2), (7, 4, 7, 4)]
    assert formula_refs('IF(A1>0,"B2:B9",A1)') == [(1, 1, 1, 1), (1, 1, 1, 1)]  # text is not a reference
    assert is_aggregate("_xlfn.STDEV.S(B2:B9)") and is_aggregate("average(b2:b9)")
    assert not is_aggregate("B2/25.4") and not is_aggregate('"SUM(B2:B9)"&A1')
