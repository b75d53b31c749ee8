"""The cell patcher: only the cells written change, in their rows, in column and row order."""

from __future__ import annotations

import pytest

from sheetfuncs.errors import InputError
from sheetfuncs.templates.cells import CellValue, ErrorValue, patch_sheet, split_ref

HEAD = '<?xml version="1.0"?>\n<worksheet xmlns="m" xmlns:x14ac="e" mc:Ignorable="x14ac">'
SHEET = (HEAD + '<dimension ref="A1:C3"/><sheetData>'
         '<row r="1" spans="1:3"><c r="A1" s="2" t="s"><v>0</v></c><c r="C1"><v>7</v></c></row>'
         '<row r="3"><c r="B3" s="4"><f>SF_P(A1:C1)</f><v>0.5</v></c></row>'
         '</sheetData><pageMargins left="0.7"/></worksheet>')


def test_existing_cell_keeps_its_style_and_loses_its_type() -> None:
    out = patch_sheet(SHEET, {"A1": CellValue(2.5)})
    assert '<c r="A1" s="2"><v>2.5</v></c><c r="C1"><v>7</v></c>' in out
    assert out.replace('<c r="A1" s="2"><v>2.5</v></c>', '<c r="A1" s="2" t="s"><v>0</v></c>') == SHEET


def test_new_cells_and_rows_go_in_order() -> None:
    out = patch_sheet(SHEET, {"B1": CellValue("Head 1"), "D1": CellValue(True), "A2": CellValue(None),
                              "A4": CellValue(ErrorValue("#N/A"))})
    assert ('<c r="A1" s="2" t="s"><v>0</v></c><c r="B1" t="inlineStr"><is><t>Head 1</t></is></c>'
            '<c r="C1"><v>7</v></c><c r="D1" t="b"><v>1</v></c></row><row r="2"><c r="A2"/></row>'
            '<row r="3">') in out
    assert out.endswith('<row r="4"><c r="A4" t="e"><v>#N/A</v></c></row></sheetData>'
                        '<pageMargins left="0.7"/></worksheet>')


def test_formula_is_kept_and_its_value_typed() -> None:
    out = patch_sheet(SHEET, {"B3": CellValue("sheetfuncs: a & b <c>", keep_formula=True)})
    assert '<c r="B3" s="4" t="str"><f>SF_P(A1:C1)</f><v>sheetfuncs: a &amp; b &lt;c&gt;</v></c>' in out
    out = patch_sheet(SHEET, {"B3": CellValue(0.125, keep_formula=True)})
    assert '<c r="B3" s="4"><f>SF_P(A1:C1)</f><v>0.125</v></c>' in out
    assert patch_sheet(SHEET, {"B3": CellValue(1.0)}).count("<f>") == 0  # a data cell loses it


def test_empty_sheet_data_and_prefixed_parts() -> None:
    out = patch_sheet("<x:worksheet><x:sheetData/></x:worksheet>", {"B2": CellValue(" x ")})
    assert out == ('<x:worksheet><x:sheetData><x:row r="2"><x:c r="B2" t="inlineStr"><x:is>'
                   '<x:t xml:space="preserve"> x </x:t></x:is></x:c></x:row></x:sheetData></x:worksheet>')


def test_refusals_are_one_line() -> None:
    with pytest.raises(InputError, match="has a cell without an address"):
        patch_sheet("<sheetData><row r=\"1\"><c><v>1</v></c></row></sheetData>", {"A1": CellValue(1.0)})
    with pytest.raises(InputError, match="no cell data part"):
        patch_sheet("<worksheet/>", {"A1": CellValue(1.0)})
    with pytest.raises(InputError, match="only finite numbers"):
        patch_sheet(SHEET, {"A1": CellValue(float("inf"))})
    assert split_ref("ab12") == (12, 28)
