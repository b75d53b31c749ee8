"""Tests of sheetfuncs.input.cells: A1 references as the host writes them (common practice)."""

from __future__ import annotations

import pytest

from sheetfuncs.errors import InputError
from sheetfuncs.input.cells import parse_range


@pytest.mark.parametrize(
    "text, expect",
    [
        ("A1:F40", (1, 1, 40, 6, None)),
        ("$B$2:$E$30", (2, 2, 30, 5, None)),
        ("F40:A1", (1, 1, 40, 6, None)),
        ("C5", (5, 3, 5, 3, None)),
        ("B:E", (1, 2, None, 5, None)),
        ("2:40", (2, 1, 40, None, None)),
        ("'Lot data'!A1:B3", (1, 1, 3, 2, "Lot data")),
        ("'It''s'!A1:B3", (1, 1, 3, 2, "It's")),
        ("Sheet2!XFD1048576", (1048576, 16384, 1048576, 16384, "Sheet2")),
    ],
)
def test_parse_range(text, expect):
    r = parse_range(text)
    assert (r.min_row, r.min_col, r.max_row, r.max_col, r.sheet) == expect


def test_parse_range_outside_the_sheet_and_names():
    with pytest.raises(InputError, match="outside a sheet"):
        parse_range("A1:A1048577")
    with pytest.raises(InputError, match="outside a sheet"):
        parse_range("XFE1")
    assert parse_range("LotData") is None


def test_range_reference_written_back_as_the_host_writes_it():
    assert parse_range("B:B").a1() == "B:B"
    assert parse_range("$B:$E").a1() == "B:E"
    assert parse_range("2:40").a1() == "2:40"
    assert parse_range("C5").a1() == "C5"
    assert parse_range("B2:E30").a1() == "B2:E30"
    assert parse_range("B:E").a1(last_row=9) == "B1:E9"
