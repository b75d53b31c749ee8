"""What a report says first (sheetfuncs.report.reading): the block read, each group with its n,
what was left out, and a request to check it when the block was found on the sheet."""

from __future__ import annotations

import openpyxl
import pytest

from sheetfuncs import InputError
from sheetfuncs.input import LeftOut, Reading, read_groups
from sheetfuncs.report.context import prepare
from sheetfuncs.report.findings import findings

from tests.support.cli import write_csv
from tests.support.scenarios import CLEAR, cells_text, write_in


def _found() -> Reading:
    """A reading as block detection records it: a title row and a summary row left out."""
    return Reading(
        path="/data/tablets.xlsx", sheet="Hardness", block="B3:D9", detected=True,
        cells_read=30, cells_used=24,
        left_out=(LeftOut.of([(1, 1)], "title or note above the table", "title"),
                  LeftOut.of([(10, c) for c in range(1, 6)], "summary row (Mean)", "summary")),
        notes=("row 6 is hidden in the sheet; its cells were read as data",),
    )


def test_findings_open_with_what_was_read_and_ask_to_check_what_detection_left_out(tmp_path):
    reading = _found()
    fi = findings(prepare(CLEAR, reading=reading))
    assert fi.data_read[0].startswith(
        "Read 'Hardness'!B3:D9 of tablets.xlsx (found by reading the sheet, no range given): ")
    assert fi.data_read[1] == ("6 non-blank cells of the 30 read were left out; check that none of "
                               "them are measurements before relying on the answer:")
    assert fi.data_read[2:] == (
        "  'Hardness'!A1: title or note above the table",
        "  'Hardness'!A10:E10: summary row (Mean)",
        "row 6 is hidden in the sheet; its cells were read as data",
    )
    assert fi.text().index("Read 'Hardness'") < fi.text().index(fi.headline)  # before the answer
    ws = openpyxl.load_workbook(write_in(tmp_path, CLEAR, reading=reading))["Findings"]
    col_a = [c.value for (c,) in ws.iter_rows(min_col=1, max_col=1)]
    assert col_a.index("What was read") < col_a.index("The answer")
    assert ws.cell(col_a.index(fi.data_read[1]) + 1, 1).font.b  # marked for checking


def test_report_of_a_file_logs_every_left_out_cell_and_counts_the_account(tmp_path):
    rows = [["A", "B"], [1.2, 2.0], ["n/a", 2.5], [1.5, "#N/A"], [1.1, 2.2], [1.3, 2.1]]
    with pytest.raises(InputError, match=r"the data hold the error #N/A at row 4, column 2"):
        read_groups(write_csv(tmp_path / "lab.csv", rows), cell_range="A1:B6")
    rows[3][1] = 2.4
    loaded = read_groups(write_csv(tmp_path / "lab.csv", rows), cell_range="A1:B6")
    r = loaded.reading
    assert (r.cells_read, r.cells_used, r.cells_left_out, r.balanced) == (12, 11, 1, True)
    wb = openpyxl.load_workbook(write_in(tmp_path, loaded.groups, source=loaded.source, reading=r))
    assert [wb["Data"][f"{c}2"].value for c in "FGHI"] == ["A3", "text in the data", '"n/a"', "left out"]
    about = {row[0]: row[1] for row in wb["About"].iter_rows(min_row=4, max_col=2, values_only=True)
             if row[0]}
    assert about["Range read"] == "A1:B6" and about["How it was found"] == "the range given"
    assert (about["Non-blank cells read"], about["Cells used (values and labels)"],
            about["Cells left out"]) == (12, 11, 1)
    assert "Read A1:B6 of lab.csv (the range given): 9 values in 2 groups (A 4, B 5)." in cells_text(
        wb["Findings"])


def test_reading_must_be_a_reading(tmp_path):
    with pytest.raises(InputError, match="reading must be a sheetfuncs.input.Reading or None, not dict"):
        prepare(CLEAR, reading={"block": "A1:B2"})


def test_write_report_takes_what_read_groups_returned(tmp_path):
    rows = [["A", "B"], [1.2, 2.0], ["n/a", 2.5], [1.5, 2.4], [1.1, 2.2]]
    loaded = read_groups(write_csv(tmp_path / "lab.csv", rows), cell_range="A1:B5")
    wb = openpyxl.load_workbook(write_in(tmp_path, loaded))
    assert wb["Data"]["F2"].value == "A3"  # the reading's log, with the cell's address
    assert "Read A1:B5 of lab.csv (the range given)" in cells_text(wb["Findings"])
