"""Tests of sheetfuncs.input.reading: the account of what was read (Reading, LeftOut), its one-line
summary, and cell contents as a log line shows them."""

from __future__ import annotations

import datetime as dt

from sheetfuncs.input import LeftOut, Reading, cell_content, sheet_ref


def test_cell_content_like_a_spreadsheet():
    assert cell_content("retest") == '"retest"'
    assert cell_content('say "hi"') == '"say ""hi"""'  # quotes doubled, as in a formula
    assert cell_content("two\nlines\t here") == '"two lines here"'  # one line, always
    assert cell_content("x" * 60) == '"' + "x" * 39 + '…"'
    assert cell_content(True) == "TRUE" and cell_content(3.0) == "3"
    assert cell_content(dt.date(2024, 3, 5)) == "2024-03-05"


def test_left_out_reference_is_the_range_that_holds_its_cells():
    rows = LeftOut.of([(17, 2), (16, 5), (16, 2)], "summary rows (Mean, SD)", "summary")
    assert rows.ref == "B16:E17" and rows.cells == ((16, 2), (16, 5), (17, 2))
    one = LeftOut.of([(9, 3)], "text in the data", "text", '"retest"')
    assert one.ref == "C9" and one.described == 'text in the data ("retest")'


def test_sheet_names_are_quoted_as_in_formulas():
    assert sheet_ref("Lot's data", "B3:E15") == "'Lot''s data'!B3:E15"
    assert sheet_ref(None, "A1:B5") == "A1:B5"


def test_summary_names_block_groups_and_what_was_left_out():
    left = (
        LeftOut.of([(1, 1), (2, 1)], "title or note above the table", "title"),
        LeftOut.of([(r, 1) for r in range(3, 16)], "identifier column (Sample)", "identifier"),
        LeftOut.of([(16, c) for c in range(1, 6)], "summary row (Mean)", "summary"),
        LeftOut.of([(9, 3)], "text in the data", "text", '"retest"'),
        LeftOut.of([(19, 1)], "sign-off line", "signoff"),
    )
    r = Reading(path="t.xlsx", sheet="Hardness", block="B3:E15", detected=True, cells_read=76,
                cells_used=54, left_out=left)
    assert r.cells_left_out == 22 and r.balanced
    assert r.summary(["L1", "L2"], [12, 11]) == (
        "read 'Hardness'!B3:E15: 2 groups, 23 values (L1 12, L2 11); left out 22 cells: "
        "A1:A2 title or note above the table; A3:A15 identifier column (Sample); A16:E16 "
        'summary row (Mean); C9 text in the data ("retest"); and 1 more (see the log)'
    )
    assert not Reading(path=None, sheet=None, block="A1:B2", detected=False, cells_read=4,
                       cells_used=3).balanced
