"""The formulas library's values with SF_ results given (IF/ISNUMBER/ROUND/AND/INDEX/&).

Expected values follow the spreadsheet definitions of those functions: common practice."""

from __future__ import annotations

from pathlib import Path

import openpyxl
from openpyxl.worksheet.formula import ArrayFormula

import pytest

from sheetfuncs.errors import InputError
from sheetfuncs.templates.cells import ErrorValue
from sheetfuncs.templates.evaluate import evaluate_workbook


def book(path: Path) -> Path:
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "Results here"
    ws["A1"] = "=SF_P(B5:C9)"
    ws["B1"] = '=IF(ISNUMBER(A1),IF(A1<0.05,"means differ","no difference shown"),"check the data")'
    ws["C1"] = "=ROUND(A1,3)"
    ws["D1"] = '=AND(ISNUMBER(A1),A1<0.5)&"!"'
    ws["A2"] = ArrayFormula("A2:B3", "=SF_TABLE(B5:C9)")
    ws["D2"] = "=INDEX(A2:B3,2,2)*2"
    ws["D3"] = "=1/0"
    wb.save(path)
    return path


def test_dependents_get_values_from_the_given_sf_results(tmp_path: Path) -> None:
    path = book(tmp_path / "b.xlsx")
    got = evaluate_workbook(path, ("Results here",), {("Results here", "A1"): 0.01234,
                                                   ("Results here", "A2:B3"): [["x", "y"], ["z", 4.5]]}
                            ).as_dict()
    s = "Results here"
    assert got[(s, "B1")] == "means differ" and got[(s, "C1")] == 0.012
    assert got[(s, "D2")] == 9.0
    # Known deviation of formulas 1.3.4 (measured): a logical joined with & reads "True", where
    # Excel and Calc show "TRUE". Documented in sheetfuncs.templates.evaluate; this check fails
    # when the library changes, so that the note is revisited.
    assert got[(s, "D1")] == "True!"
    assert got[(s, "D3")] == ErrorValue("#DIV/0!")
    got = evaluate_workbook(path, (s,), {(s, "A1"): "sheetfuncs: no numbers"}).as_dict()
    assert got[(s, "B1")] == "check the data"


def test_a_sheet_name_with_an_apostrophe_is_refused(tmp_path: Path) -> None:
    """formulas 1.3.4 turns a reference to 'It''s'!A1 into #REF! (measured), so no value is
    trusted: one line instead."""
    path = book(tmp_path / "b.xlsx")
    with pytest.raises(InputError, match="the sheet name \"It's\" holds an apostrophe"):
        evaluate_workbook(path, ("Results here", "It's"), {})
