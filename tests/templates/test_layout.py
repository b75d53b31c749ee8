"""The pieces every template is built from: addresses, the block's grid, a page's records."""

from __future__ import annotations

from openpyxl import Workbook
from openpyxl.worksheet.formula import ArrayFormula

from sheetfuncs.templates.layout import Block, Page, absolute, local, write_block


def test_addresses() -> None:
    assert absolute("Data", (9, 2), (39, 6)) == "'Data'!$B$9:$F$39"
    assert local((9, 2), (39, 6)) == "B9:F39"


def test_grid_pads_the_example_to_the_block() -> None:
    b = Block("Box", "BoxTable", ("A", "B"), 3, ((1.0, 2.0), (3.0,)))
    assert b.grid() == [["A", "B"], [1.0, 2.0], [3.0, None], [None, None]]


def test_array_is_recorded_with_its_exact_area() -> None:
    ws = Workbook().active
    page = Page(ws, row=5)
    top = page.array("SF_TABLE(Box)", (4, 6), col=3)
    assert top == (5, 3) and page.row == 9
    assert page.arrays[0].ref == "C5:H8" and page.arrays[0].formula == "SF_TABLE(Box)"
    value = ws["C5"].value
    assert isinstance(value, ArrayFormula) and value.ref == "C5:H8" and value.text == "=SF_TABLE(Box)"


def test_skip_and_goto_come_back() -> None:
    page = Page(Workbook().active, row=10)
    assert page.skip(3) == 10 and page.row == 13
    assert page.goto(10) == 13
    address = page.value("p", "IF(ISNUMBER(E8),E8,\"check the data\")", decision=True)
    assert address == "C10" and page.decisions == ["C10"]
    assert page.ws["C10"].value == '=IF(ISNUMBER(E8),E8,"check the data")'


def test_setting_names_one_cell() -> None:
    ws = Workbook().active
    ws.title = "Record"
    page = Page(ws, row=4)
    page.setting("Alpha", "Alpha", 0.05, "hint", ("0.05", "0.01"))
    assert page.names == {"Alpha": "'Record'!$C$4"} and ws["C4"].value == 0.05
    assert ws.data_validations.dataValidation[0].formula1 == '"0.05,0.01"'


def test_block_gets_name_and_table_over_the_same_range() -> None:
    wb = Workbook()
    ws = wb.active
    ws.title = "Data"
    b = Block("Box", "BoxTable", ("Group", "n"), 2, (("x", 3),), cells=True)
    ref = write_block(Page(ws, row=4), b, "invented")
    assert ref == "'Data'!$B$5:$C$7" and ws["B4"].value == "invented"
    assert wb.defined_names["Box"].attr_text == ref
    assert wb.defined_names["Box"].comment == "sheetfuncs: cells"
    assert ws.tables["BoxTable"].ref == "B5:C7"
