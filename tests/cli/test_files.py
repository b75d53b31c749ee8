"""Tests of the files the commands write (sheetfuncs.cli.files): the report's name and folder,
the same file under two names, and file-system errors as one line."""

from __future__ import annotations

from pathlib import Path

import pytest

from sheetfuncs.cli.files import check_output_folder, check_report_name, os_reason
from sheetfuncs.cli.parser import UsageError
from sheetfuncs.errors import InputError


def test_a_report_is_an_xlsx_file():
    assert check_report_name("out/Lots.XLSX") == Path("out/Lots.XLSX")  # the suffix in any case
    for name in ("r.xlsm", "r.csv", "report"):
        with pytest.raises(UsageError) as ei:
            check_report_name(Path("out") / name)
        assert str(ei.value) == (
            f'the report must be an .xlsx file, not "{name}"; give -o a name ending in .xlsx'
        )


def test_o_naming_a_folder_suggests_out_dir(tmp_path):
    with pytest.raises(UsageError) as ei:
        check_report_name("reports/", out_dir=True)
    assert str(ei.value) == (
        "-o reports/ names a folder; give -o a file name ending in .xlsx, or give --out-dir "
        "reports/ to write the report into that folder"
    )
    folder = tmp_path / "out.xlsx"  # a folder, whatever its name says
    folder.mkdir()
    with pytest.raises(InputError) as ei:
        check_report_name(str(folder))
    assert ei.value.reason == (
        f"-o {folder} names a folder; give -o a file name ending in .xlsx, such as "
        f"{folder / 'report.xlsx'}"
    )


def test_the_output_folder_must_exist(tmp_path):
    check_output_folder(tmp_path / "r.xlsx")
    with pytest.raises(InputError, match="the folder .*nowhere does not exist; create it"):
        check_output_folder(tmp_path / "nowhere" / "r.xlsx")


def test_os_reason_names_the_file():
    assert os_reason(PermissionError(13, "Permission denied", "r.xlsx")) == "r.xlsx: Permission denied"
    assert os_reason(OSError(28, "No space left on device"), "out.xlsx") == (
        "out.xlsx: No space left on device")
    assert os_reason(OSError("disk went away")) == "disk went away"
