"""Tests of sheetfuncs.input.files.xlsx: workbooks read as blocks of saved values, and their properties.

No numeric check here needs an outside source: the values are read back as they were written.
"""

from __future__ import annotations

import datetime as dt
import zipfile

import openpyxl
import pytest

from tests.support.workbooks import lots_book, make_book, patch_zip, sheet_xml
from sheetfuncs.errors import InputError
from sheetfuncs.input.files.reader import read_cells, read_groups
from sheetfuncs.input.files.xlsx import workbook_properties

ROWS = [["A", "B"], [1.0, 2.0], [1.5, 2.5], [1.2, 2.1]]


# --------------------------------------------------------------------------------------------
# sheets and ranges


def test_used_range_is_trimmed_and_addresses_are_the_sheets(tmp_path):
    path = lots_book(tmp_path)
    loaded = read_groups(path, sheet="Lot data")
    assert loaded.block.ref == "C3:E6"
    assert (loaded.source.first_row, loaded.source.first_col) == (3, 3)
    assert loaded.groups.labels == ("Lot A", "Lot B", "Lot C")
    (note,) = loaded.groups.cells
    assert loaded.source.full_address(note.row, note.col) == "'Lot data'!E5"


def test_first_worksheet_is_the_default(tmp_path):
    path = lots_book(tmp_path)
    assert read_cells(path).rows == (("see other sheet",),)


def test_explicit_range_keeps_its_top_left_corner(tmp_path):
    path = lots_book(tmp_path)
    block = read_cells(path, sheet="Lot data", cell_range="B2:E6")
    assert block.source.first_row == 2 and block.source.first_col == 2
    assert block.rows[0] == (None, None, None, None)  # the host would hand over this row too
    assert block.rows[1] == (None, "Lot A", "Lot B", "Lot C")
    # whole columns: trailing blank rows are not materialised
    block = read_cells(path, sheet="Lot data", cell_range="D:E")
    assert block.ref == "D1:E6"


def test_defined_name_as_range(tmp_path):
    path = lots_book(tmp_path)
    wb = openpyxl.load_workbook(path)
    wb.defined_names["LotTable"] = openpyxl.workbook.defined_name.DefinedName(
        "LotTable", attr_text="'Lot data'!$C$3:$E$6"
    )
    wb.save(path)
    loaded = read_groups(path, cell_range="LotTable")
    assert loaded.source.sheet == "Lot data"
    assert loaded.groups.labels == ("Lot A", "Lot B", "Lot C")
    with pytest.raises(InputError, match="neither a range like A1:F40 nor a name"):
        read_cells(path, cell_range="NoSuchName")


def test_empty_range_is_named_as_given(tmp_path):
    book = make_book(tmp_path / "lots.xlsx", {"Lot data": [["A", "B"], [1.0, 2.0], [3.0, 4.0]]})
    with pytest.raises(InputError) as ei:
        read_cells(book, cell_range="D:D")
    assert str(ei.value) == ('sheetfuncs: the range D:D of sheet "Lot data" in lots.xlsx is '
                             "empty; check the range")
    with pytest.raises(InputError, match=r"the range \$F\$2:\$G\$9 of sheet"):
        read_cells(book, cell_range="$F$2:$G$9")
    with pytest.raises(InputError) as ei:
        read_cells(book, cell_range="'Lot data'!7:9")
    assert str(ei.value).startswith("sheetfuncs: the range 'Lot data'!7:9 in lots.xlsx is empty")
    wb = openpyxl.load_workbook(book)
    wb.defined_names["Spare"] = openpyxl.workbook.defined_name.DefinedName(
        "Spare", attr_text="'Lot data'!$H$1:$H$20")
    wb.save(book)
    with pytest.raises(InputError, match=r"""the name "Spare" \('Lot data'!H1:H20\) in lots"""):
        read_cells(book, cell_range="Spare")


def test_empty_sheet(tmp_path):
    path = make_book(tmp_path / "e.xlsx", {"Blank": [], "Data": ROWS})
    with pytest.raises(InputError) as ei:
        read_cells(path)
    assert str(ei.value) == (
        'sheetfuncs: sheet "Blank" of e.xlsx is empty; choose the sheet that holds the data '
        "(--sheet)"
    )
    with pytest.raises(InputError) as ei:
        read_cells(path, sheet="Data", cell_range="D1:E9")
    assert str(ei.value) == 'sheetfuncs: the range D1:E9 of sheet "Data" in e.xlsx is empty; check the range'


def test_missing_sheet(tmp_path):
    path = make_book(tmp_path / "m.xlsx", {"Run 1": ROWS, "Run 2": ROWS})
    with pytest.raises(InputError) as ei:
        read_cells(path, sheet="Run 3")
    assert str(ei.value) == 'sheetfuncs: m.xlsx has no sheet named "Run 3"; its sheets are "Run 1", "Run 2"'


# --------------------------------------------------------------------------------------------
# cell values


def test_logical_values_dates_and_durations_in_a_workbook(tmp_path):
    rows = [["A", "B"], [1.0, 2.0], [True, 2.5], [1.2, 2.1]]
    path = make_book(tmp_path / "logical.xlsx", {"S": rows})
    g = read_groups(path).groups
    assert g.counts == (2, 3) and g.cells[0].kind == "logical"
    path = make_book(tmp_path / "date.xlsx", {"S": [["A", "B"], [1.0, dt.datetime(2024, 3, 5)],
                                                   [1.1, 2.0], [1.3, 2.2]]})
    with pytest.raises(InputError, match=r"a date at 'S'!B2 of date\.xlsx: dates are not measurements"):
        read_groups(path)
    path = make_book(tmp_path / "dur.xlsx", {"S": [["A", "B"], [1.0, dt.timedelta(minutes=5)],
                                                  [1.1, 2.0]]})
    with pytest.raises(InputError, match=r"duration \(time\) value at 'S'!B2"):
        read_cells(path)


def test_formula_with_saved_value_reads_the_value(tmp_path):
    src = make_book(tmp_path / "f.xlsx", {"S": [["A", "B"], [1.0, 2.0], [1.5, "=A2+1"],
                                               [1.2, '=""']]})
    xml = sheet_xml(src)
    assert "<f>A2+1</f><v />" in xml
    # a spreadsheet program saves the values: 2.5 for the formula, "" (text) for =""
    xml = xml.replace("<f>A2+1</f><v />", "<f>A2+1</f><v>2.5</v>")
    xml = xml.replace('<c r="B4"><f>""</f><v />', '<c r="B4" t="str"><f>""</f><v></v>')
    path = patch_zip(src, tmp_path / "saved.xlsx", {"xl/worksheets/sheet1.xml": xml.encode()})
    block = read_cells(path)
    assert block.rows[2] == (1.5, 2.5)
    assert block.rows[3] == (1.2, None)  # an empty-text result is a blank, not an error
    g = read_groups(path).groups
    assert g.counts == (3, 2)


def test_xlsm_reads_saved_values(tmp_path):
    src = make_book(tmp_path / "m.xlsx", {"S": [["A", "B"], [1.0, 2.0], [1.5, 2.5]]})
    ct = zipfile.ZipFile(src).read("[Content_Types].xml").decode()
    ct = ct.replace("application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml",
                    "application/vnd.ms-excel.sheet.macroEnabled.main+xml")
    path = patch_zip(src, tmp_path / "m.xlsm", {"[Content_Types].xml": ct.encode(),
                                                "xl/vbaProject.bin": b"\xd0\xcf\x11\xe0fake"})
    assert read_groups(path).groups.counts == (2, 2)


def test_formula_without_saved_value_is_reported_with_its_address(tmp_path):
    rows = [["A", "B"], [1.0, 2.0], [1.5, "=A3+1"], [1.2, "=A4*2"]]
    path = make_book(tmp_path / "calc.xlsx", {"Run 1": rows}, at="B2")
    with pytest.raises(InputError) as ei:
        read_groups(path)
    assert str(ei.value) == (
        "sheetfuncs: the formula in 'Run 1'!C4 of calc.xlsx has no saved value (and 1 more); "
        "the file was saved by a program that does not calculate: open it in a spreadsheet "
        "program and save it, or paste the values, then try again"
    )
    # cells are 0-based within the block (which starts at B2)
    assert ei.value.cells == ((2, 1), (3, 1))
    # never read as blank: a range that leaves the formulas out reads fine
    assert read_groups(path, cell_range="B2:C3", labels="yes").groups.counts == (1, 1)


# --------------------------------------------------------------------------------------------
# document properties


def test_workbook_properties(tmp_path):
    wb = openpyxl.Workbook()
    wb.properties.creator = "QA lab"
    wb.properties.title = "Lot release"
    wb.properties.keywords = "lots; release"
    path = tmp_path / "p.xlsx"
    wb.save(path)
    props = workbook_properties(path)
    assert props["creator"] == "QA lab" and props["title"] == "Lot release"
    assert props["keywords"] == "lots; release"
    bare = patch_zip(path, tmp_path / "bare.xlsx", {"docProps/core.xml": None})
    assert workbook_properties(bare) == {}
    text = tmp_path / "text.xlsx"
    text.write_text("A,B\n1,2\n", encoding="utf-8")
    with pytest.raises(InputError, match="not an .xlsx workbook"):
        workbook_properties(text)
    with pytest.raises(InputError, match="more than the"):
        workbook_properties(path, size_limit=100)
