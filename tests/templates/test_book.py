"""Finding a template's data block."""

from __future__ import annotations

from pathlib import Path

import openpyxl
import pytest
from openpyxl.workbook.defined_name import DefinedName

from sheetfuncs.errors import InputError
from sheetfuncs.templates.book import find_block, read_book
from tests.support.fill_books import line_template, lots_template


def test_the_only_named_range_is_the_block_with_its_table(tmp_path: Path) -> None:
    book = read_book(line_template(tmp_path / "t.xlsx"))
    block = find_block(book, None, "t.xlsx")
    assert (block.name, block.sheet, block.part) == ("Measurements", "Line data", "xl/worksheets/sheet1.xml")
    assert (block.top, block.left, block.rows, block.cols, block.cells) == (4, 1, 17, 4, False)
    assert block.table is not None and block.table.name == "MeasurementsTable"
    assert find_block(book, "measurementstable", "t.xlsx") == block


def test_cells_block_single_cells_and_unknown_names(tmp_path: Path) -> None:
    path = lots_template(tmp_path / "t.xlsx")
    wb = openpyxl.load_workbook(path)
    wb.defined_names["Alpha"] = DefinedName("Alpha", attr_text="Summary!$D$1")
    wb.defined_names["GroupSummary"] = DefinedName("GroupSummary", attr_text="Summary!$H$2:$K$9",
                                                   comment="sheetfuncs: cells")
    wb.save(path)
    book = read_book(path)
    assert find_block(book, "GroupSummary", "t.xlsx").cells
    assert find_block(book, "LotReadings", "t.xlsx").table is None
    with pytest.raises(InputError, match='the name "Alpha" in t.xlsx does not refer to one range'):
        find_block(book, "Alpha", "t.xlsx")
    with pytest.raises(InputError, match='t.xlsx has no defined name or table "Lots" '
                                         r'\(names: LotReadings, Alpha, GroupSummary\); give one'):
        find_block(book, "Lots", "t.xlsx")
