"""Tests of sheetfuncs.input.files.filetype: the kind of an input judged by its content.

The files are built here (openpyxl workbooks, invented values, hand-made zip and compound
files); no numeric check needs an outside source.
"""

from __future__ import annotations

import shutil
import zipfile

import pytest

from sheetfuncs.errors import InputError
from sheetfuncs.input.files.filetype import file_type, kind_by_name
from sheetfuncs.input.files.reader import input_kind, read_cells, read_groups
from tests.support.workbooks import make_book

ROWS = [["Line 1", "Line 2"], [12.1, 12.6], [12.3, 12.4], [12.0, 12.8]]  # invented


def _message(path) -> str:
    with pytest.raises(InputError) as ei:
        read_cells(path)
    return str(ei.value)


@pytest.mark.parametrize("name, shown", [
    ("budget.xls", "named .xls"), ("budget.dat", "named .dat"), ("budget.csv", "named .csv"),
    ("budget", "with no suffix in its name"),
])
def test_workbook_under_another_name_is_read_with_a_note(tmp_path, name, shown):
    book = make_book(tmp_path / "b.xlsx", {"Data": ROWS})
    path = tmp_path / name
    shutil.copy(book, path)
    loaded = read_groups(path)
    assert loaded.groups.labels == ("Line 1", "Line 2") and loaded.block.kind == "workbook"
    assert loaded.block.notes == (f"{name} is an .xlsx workbook {shown}; read as .xlsx",)
    assert input_kind(path) == "workbook"


def test_workbook_with_its_own_name_has_no_note(tmp_path):
    path = make_book(tmp_path / "b.xlsm", {"Data": ROWS})
    assert file_type(path) == ("workbook", ())
    assert read_cells(path).notes == ()


def test_old_binary_workbook_named_xlsx(tmp_path):
    from tests.input.files.test_safety import _cfb

    path = tmp_path / "lots.xlsx"
    path.write_bytes(_cfb({"Workbook": b"\x09\x08"}))
    assert _message(path) == (
        "sheetfuncs: lots.xlsx is an old binary .xls workbook (whatever its name says), which "
        "sheetfuncs does not read; save it as .xlsx (Excel Workbook) and try again"
    )
    old = tmp_path / "lots.xls"
    old.write_bytes(path.read_bytes())
    assert _message(old) == (
        "sheetfuncs: lots.xls is an old binary .xls workbook, which sheetfuncs does not read; "
        "save it as .xlsx (Excel Workbook) and try again"
    )


def test_text_named_like_a_workbook(tmp_path):
    path = tmp_path / "data.xlsx"
    path.write_text("Line 1,Line 2\n12.1,12.6\n")
    assert _message(path) == (
        "sheetfuncs: data.xlsx is a text (CSV) file, not a workbook; rename it to .csv"
    )
    page = tmp_path / "export.xls"
    page.write_text("<html><body><table><tr><td>1</td></tr></table></body></html>")
    assert _message(page) == (
        "sheetfuncs: export.xls is a web page or XML file, not a workbook; open it in a "
        "spreadsheet program and save it as .xlsx"
    )


def test_opendocument_and_binary_workbooks(tmp_path):
    ods = tmp_path / "lots.ods"
    with zipfile.ZipFile(ods, "w") as z:
        z.writestr("mimetype", "application/vnd.oasis.opendocument.spreadsheet")
        z.writestr("content.xml", "<office:document-content/>")
    assert _message(ods) == (
        "sheetfuncs: lots.ods is an OpenDocument spreadsheet (.ods), which sheetfuncs does not "
        "read; save it as .xlsx (or .csv) and try again"
    )
    disguised = tmp_path / "lots.xlsx"
    shutil.copy(ods, disguised)
    assert "lots.xlsx is an OpenDocument spreadsheet (.ods)" in _message(disguised)
    xlsb = tmp_path / "lots.xlsb"
    with zipfile.ZipFile(xlsb, "w") as z:
        z.writestr("[Content_Types].xml", "<Types/>")
        z.writestr("xl/workbook.bin", b"\x83\x01\x00")
    assert _message(xlsb) == (
        "sheetfuncs: lots.xlsb is a binary .xlsb workbook, which sheetfuncs does not read; "
        "save it as .xlsx and try again"
    )
    numbers = tmp_path / "lots.numbers"
    with zipfile.ZipFile(numbers, "w") as z:
        z.writestr("Index/Document.iwa", b"\x00")
    assert _message(numbers) == (
        "sheetfuncs: lots.numbers is a .numbers file, which sheetfuncs does not read; save it "
        "as .xlsx or .csv and try again"
    )


def test_empty_file_and_unknown_files(tmp_path):
    for name in ("empty.xlsx", "empty.csv", "empty.json"):
        (tmp_path / name).write_bytes(b"")
        assert _message(tmp_path / name) == (
            f"sheetfuncs: {name} is empty (0 bytes); check that it is the right file"
        )
    notes = tmp_path / "notes.json"
    notes.write_text('{"a": 1}')
    assert _message(notes) == (
        "sheetfuncs: cannot tell what kind of file notes.json is; give an .xlsx or .xlsm "
        "workbook or a .csv file"
    )
    with pytest.raises(InputError, match=r"old binary \.xls workbook"):
        kind_by_name(tmp_path / "missing.xls")  # a file that is not there: judged by name
    assert file_type(tmp_path / "missing.csv") == ("csv", ())


def test_csv_named_csv_is_csv_and_binary_csv_keeps_its_message(tmp_path):
    path = tmp_path / "lots.csv"
    path.write_text("A,B\n1,2\n3,4\n")
    assert file_type(path) == ("csv", ())
    latin = tmp_path / "latin.csv"
    latin.write_bytes("Bühne,B\n1,2\n".encode("latin-1"))
    assert "latin.csv is not UTF-8 text" in _message(latin)
