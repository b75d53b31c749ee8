"""Tests of sheetfuncs.input.files.block: blank margins trimmed, and the block's A1 reference.

No check here needs an outside source: cells are only moved and counted, never computed.
"""

from __future__ import annotations

from sheetfuncs.input.cells import parse_range
from sheetfuncs.input.files.block import cell_block, is_blank, row_span, trim_rows
from sheetfuncs.input.source import InputSource


def test_blank_cells_and_row_spans():
    assert is_blank(None) and is_blank("")
    assert not is_blank(" ") and not is_blank(0.0) and not is_blank(False)
    assert row_span(()) is None
    assert row_span((None, "", None)) is None
    assert row_span((None, 1.0, "", "x", None)) == (1, 3)
    assert row_span((1.0, None, 2.0)) == (0, 2)


def test_used_range_loses_blank_margins_on_all_four_sides():
    rows = [(None, None, None, None), (None, "A", "B", None), (None, 1.0, None, None),
            (None, None, None, None)]
    out, inside, first_row, first_col = trim_rows(rows, 1, 1, None, [])
    assert out == [("A", "B"), (1.0, None)]
    assert inside == []
    assert (first_row, first_col) == (2, 2)


def test_a_given_range_keeps_its_top_left_corner_and_its_width():
    ref = parse_range("B2:E5")
    rows = [(None, None, None), (None, "A", 1.0), (None, None, None)]
    out, _, first_row, first_col = trim_rows(rows, 2, 2, ref, [])
    assert out == [(None, None, None, None), (None, "A", 1.0, None)]
    assert (first_row, first_col) == (2, 2)


def test_possible_formula_cells_count_as_non_blank():
    # sheet cell D3 exists but holds no saved value: the block reaches it
    rows = [("A", None, None), (1.0, None, None)]
    out, inside, first_row, first_col = trim_rows(rows, 2, 2, None, [(3, 4)])
    assert out == [("A", None, None), (1.0, None, None)]
    assert inside == [(3, 4)]
    assert (first_row, first_col) == (2, 2)


def test_nothing_but_blanks_gives_no_rows():
    assert trim_rows([(None, ""), ()], 4, 3, None, []) == ([], [], 4, 3)


def test_cell_block_reference_from_its_top_left_cell():
    source = InputSource(path="lots.csv", first_row=2, first_col=3)
    block = cell_block([("A", "B"), (1.0, None), (2.0, 3.0)], source, "csv", ",")
    assert block.ref == "C2:D4"
    assert (block.n_rows, block.n_cols, block.n_cells) == (3, 2, 6)
    assert block.kind == "csv" and block.delimiter == "," and block.source is source
