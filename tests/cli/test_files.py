"""Tests of the files the commands write (sheetfuncs.cli.files): the report's name and folder,
the same file under two names, and file-system errors as one line."""

from __future__ import annotations

from pathlib import Path

import pytest

from sheetfuncs.cli.files import check_output_folder, check_report_name, os_reason
from sheetfuncs.cli.parser import UsageError
from sheetfuncs.errors import InputError


def test_a_report_is_an_xlsx_file():
    check_report_name(Path("out/Lots.XLSX"))  # the suffix in any case
    for name in ("r.xlsm", "r.csv", "report"):
        with pytest.raises(UsageError, match=f'not "{name}" \\(reports never carry macros\\)'):
            check_report_name(Path("out") / name)


def test_the_output_folder_must_exist(tmp_path):
    check_output_folder(tmp_path / "r.xlsx")
    with pytest.raises(InputError, match="the folder .*nowhere does not exist; create it"):
        check_output_folder(tmp_path / "nowhere" / "r.xlsx")


def test_os_reason_names_the_file():
    assert os_reason(PermissionError(13, "Permission denied", "r.xlsx")) == "r.xlsx: Permission denied"
    assert os_reason(OSError(28, "No space left on device"), "out.xlsx") == (
        "out.xlsx: No space left on device")
    assert os_reason(OSError("disk went away")) == "disk went away"
