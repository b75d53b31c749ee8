"""sheetfuncs.input.source: where a range came from, for sheet-and-address positions (A1 notation
and sheet-name quoting as spreadsheet programs write them; common practice)."""

from __future__ import annotations

from sheetfuncs.input import InputSource


def test_addresses_count_from_the_first_cell_of_the_range():
    s = InputSource(path="lots.xlsx", sheet="Lot data", first_row=3, first_col=2)
    assert s.address(0, 0) == "B3" and s.address(4, 26) == "AB7"
    assert s.full_address(1, 1) == "'Lot data'!C4"


def test_a_quote_in_the_sheet_name_is_doubled_and_no_sheet_gives_the_bare_address():
    assert InputSource(sheet="Lot's data").full_address(0, 0) == "'Lot''s data'!A1"
    assert InputSource().full_address(0, 0) == "A1"
