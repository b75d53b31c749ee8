"""Tests of sheetfuncs.input.files.tables: spreadsheet tables by name as the range to read.

The workbooks are built here with openpyxl (which writes table parts); the values are invented
and read back as they were written, so no numeric check needs an outside source.
"""

from __future__ import annotations

import openpyxl
import pytest
from openpyxl.worksheet.table import Table

from sheetfuncs.errors import InputError
from sheetfuncs.input.files.reader import read_cells, read_groups
from sheetfuncs.input.files.tables import workbook_tables
from tests.support.workbooks import patch_zip

#: Invented fill weights (g) of three filling heads, under a title row.
WEIGHTS = [["Head 1", "Head 2", "Head 3"], [500.1, 499.8, 500.4], [500.3, 499.9, 500.6],
           [500.0, 499.7, 500.2]]


def _book(path, *, totals: bool = False, header: bool = True):
    """A workbook whose first sheet "Notes" holds a note and whose sheet "Weights" holds the
    table "FillWeights" at B4 (with a totals row of averages when ``totals``)."""
    wb = openpyxl.Workbook()
    wb.active.title = "Notes"
    wb.active["A1"] = "the data are on the sheet Weights"
    ws = wb.create_sheet("Weights")
    ws["B2"] = "Fill weights, invented data"
    rows = WEIGHTS if header else WEIGHTS[1:]
    if totals:
        rows = rows + [[500.13, 499.8, 500.4]]
    for i, row in enumerate(rows):
        for j, v in enumerate(row):
            ws.cell(4 + i, 2 + j, v)
    last = 4 + len(rows) - 1
    ws.add_table(Table(displayName="FillWeights", ref=f"B4:D{last}",
                       totalsRowCount=1 if totals else None,
                       headerRowCount=1 if header else 0))
    wb.defined_names["Heads"] = openpyxl.workbook.defined_name.DefinedName(
        "Heads", attr_text="Weights!$B$4:$C$7")
    wb.save(path)
    return path


def test_table_by_name_reads_its_header_and_its_sheet(tmp_path):
    path = _book(tmp_path / "fill.xlsx")
    for given in ("FillWeights", "fillweights", "FillWeights[#All]", "FILLWEIGHTS[ #all ]"):
        loaded = read_groups(path, cell_range=given)
        assert loaded.source.sheet == "Weights"
        assert loaded.block.ref == "B4:D7"
        assert loaded.block.notes == ()
        assert loaded.groups.labels == ("Head 1", "Head 2", "Head 3")
        assert loaded.groups.counts == (3, 3, 3)
    assert workbook_tables(path)[0].sheet == "Weights"


def test_data_part_takes_the_labels_from_the_header(tmp_path):
    path = _book(tmp_path / "fill.xlsx")
    loaded = read_groups(path, cell_range="FillWeights[#Data]")
    assert loaded.groups.labels == ("Head 1", "Head 2", "Head 3")
    assert loaded.block.notes == (
        "FillWeights[#Data]: the group labels come from the table's header row 'Weights'!B4:D4",
    )
    bare = _book(tmp_path / "bare.xlsx", header=False)  # a table without a header row
    block = read_cells(bare, cell_range="FillWeights[#Data]")
    assert block.ref == "B4:D6" and block.notes == ()


def test_totals_row_is_left_out_with_a_note(tmp_path):
    path = _book(tmp_path / "fill.xlsx", totals=True)
    loaded = read_groups(path, cell_range="FillWeights")
    assert loaded.block.ref == "B4:D7"
    assert loaded.groups.counts == (3, 3, 3)
    assert loaded.block.notes == (
        "the totals row 'Weights'!B8:D8 of the table \"FillWeights\" is not read (it holds "
        "totals, not measurements)",
    )


def test_sheet_that_disagrees_with_the_table(tmp_path):
    path = _book(tmp_path / "fill.xlsx")
    with pytest.raises(InputError) as ei:
        read_cells(path, cell_range="FillWeights", sheet="Notes")
    assert str(ei.value) == (
        'sheetfuncs: the table "FillWeights" is on sheet "Weights", not "Notes"; leave out '
        "the sheet (--sheet) or give an A1 range"
    )
    assert read_cells(path, cell_range="FillWeights", sheet="weights").ref == "B4:D7"


def test_unknown_name_lists_names_and_tables(tmp_path):
    path = _book(tmp_path / "fill.xlsx")
    with pytest.raises(InputError) as ei:
        read_cells(path, cell_range="FillWeight")
    assert str(ei.value) == (
        'sheetfuncs: "FillWeight" is neither a range like A1:F40 nor a name or table in '
        'fill.xlsx, which has "Heads", "FillWeights" (table); check the range'
    )
    with pytest.raises(InputError) as ei:
        read_cells(path, cell_range="FillWeights[#Totals]")
    assert str(ei.value) == (
        'sheetfuncs: FillWeights[#Totals] names a part of the table "FillWeights" in '
        "fill.xlsx that is not read alone; give FillWeights (the whole table) or an A1 range"
    )
    plain = tmp_path / "plain.xlsx"
    openpyxl.Workbook().save(plain)
    with pytest.raises(InputError) as ei:
        read_cells(plain, cell_range="Heads")
    assert str(ei.value).endswith("which has no names or tables; check the range")


def test_defined_name_still_works_beside_a_table(tmp_path):
    path = _book(tmp_path / "fill.xlsx")
    loaded = read_groups(path, cell_range="heads")
    assert loaded.block.ref == "B4:C7" and loaded.groups.labels == ("Head 1", "Head 2")
    with pytest.raises(InputError) as ei:
        read_cells(path, cell_range="Heads", sheet="Notes")
    assert str(ei.value) == (
        'sheetfuncs: the name "Heads" is on sheet "Weights", not "Notes"; leave out the '
        "sheet (--sheet) or give an A1 range"
    )


def test_damaged_or_oversized_table_parts_are_not_tables(tmp_path):
    path = _book(tmp_path / "fill.xlsx")
    huge = patch_zip(path, tmp_path / "huge.xlsx",
                     {"xl/tables/table1.xml": b"<table " + b" " * (5 * 1024 * 1024) + b"/>"})
    assert workbook_tables(huge) == ()  # larger than any real table part: not read
    broken = patch_zip(path, tmp_path / "broken.xlsx", {"xl/tables/table1.xml": b"<table"})
    with pytest.raises(InputError, match=r"^sheetfuncs: broken\.xlsx is damaged or not a "
                                         r"workbook sheetfuncs can read"):
        read_cells(broken, cell_range="FillWeights")


def test_table_through_the_command_line(tmp_path, capsys):
    from tests.support.cli import run

    path = _book(tmp_path / "fill.xlsx")
    code, out, err = run(["table", str(path), "--range", "FillWeights", "--json"], capsys)
    assert code == 0, err
    assert '"Head 3"' in out
