"""Where every value sits on the Data sheets: segments of rows below each sheet's header, a group
straddling two sheets, and the log of unused cells running longer than the values."""

from __future__ import annotations

import pytest

from sheetfuncs.report.sheets.data_layout import DataLayout, Segment


def test_groups_straddle_sheets_in_order():
    # common practice (plain counting): 3 rows per sheet below the header, groups of 4 and 3
    lay = DataLayout.plan((4, 3), n_log=2, row_limit=4)
    assert lay.sheets == ("Data", "Data 2", "Data 3") and lay.capacity == 3 and lay.n_values == 7
    assert lay.group_segments == (
        (Segment("Data", 2, 4), Segment("Data 2", 2, 2)),
        (Segment("Data 2", 3, 4), Segment("Data 3", 2, 2)),
    )
    assert lay.value_segments == (Segment("Data", 2, 4), Segment("Data 2", 2, 4), Segment("Data 3", 2, 2))
    assert Segment("Data 2", 2, 4).col("D") == "'Data 2'!$D$2:$D$4"
    assert Segment("Data", 2, 31).col("A") == "Data!$A$2:$A$31"


def test_a_long_log_adds_sheets_without_values():
    lay = DataLayout.plan((1, 1), n_log=5, row_limit=3)
    assert lay.sheets == ("Data", "Data 2", "Data 3")
    assert lay.value_segments == (Segment("Data", 2, 3),)


def test_a_sheet_needs_room_for_a_header_and_a_row():
    with pytest.raises(ValueError, match="room for a header and one row"):
        DataLayout.plan((2, 2), n_log=0, row_limit=1)
