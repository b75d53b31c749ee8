"""The block read of groups_from_range (all data cells floats or blanks) against the cell-by-cell read.

``groups_from_range`` reads a wide or rowwise range whose data cells are all ``float`` or
``None`` in one block (``sheetfuncs.input.ranges._plain_block``); every other range, and every range
when ``block=False`` is passed to ``sheetfuncs.input.ranges._read_range``, is read cell by cell. The
two reads must give identical results (labels, arrays bit for bit, ignored cells, notes, layout,
label source) or the identical message. The expected behaviour is the cell-by-cell read, whose
range rules tests/input/test_ranges.py checks against the engineering guide (common practice
for the host's statistics functions); here it is the reference the block read is held to.

All values are invented.
"""

from __future__ import annotations

import datetime as dt
import decimal
import math
from typing import Any
from unittest import mock

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from sheetfuncs import InputError, groups_from_range
import sheetfuncs.input.ranges as ranges_module
from sheetfuncs.input.ranges import _plain_block, _read_range

NA_CODE = -2146826246  # #N/A as an unconverted COM error code (0x800A0000 + 2042, from memory)


def _outcome(rows: Any, layout: str, labels: Any, *, block: bool) -> tuple:
    """What a read gives, as a comparable value: the result's fields or the message and cells."""
    try:
        g = _read_range(rows, layout, labels, block=block)
    except InputError as exc:
        return ("error", str(exc), exc.cells)
    for a in g.arrays:
        assert a.dtype == np.float64 and not a.flags.writeable and a.flags.c_contiguous
    return (
        "groups",
        g.labels,
        tuple(a.tobytes() for a in g.arrays),  # bit for bit: -0.0 and subnormals included
        g.cells,
        g.notes,
        g.layout,
        g.label_source,
    )


def _assert_same(rows: Any, layout: str, labels: Any) -> tuple:
    fast = _outcome(rows, layout, labels, block=True)
    slow = _outcome(rows, layout, labels, block=False)
    assert fast == slow
    public = _outcome(rows, layout, labels, block=True)
    assert public == fast
    return fast


def _data_start(rows: list[list[Any]], layout: str, labels: Any) -> int | None:
    """Index of the first data cell in each line, as groups_from_range decides it (None: error)."""
    try:
        g = groups_from_range(rows, layout, labels)
    except InputError:
        return None
    return 1 if g.label_source == "range" else 0


# --------------------------------------------------------------------------------------------
# strategies

FLOATS = st.one_of(
    st.sampled_from([0.0, -0.0, 1.0, 2.5, 10.25, -3.75, 1e-300, 5e-324, 1.7976931348623157e308, 0.1]),
    st.floats(allow_nan=False, allow_infinity=False),
)
PLAIN = st.one_of(FLOATS, FLOATS, st.none())  # floats and blanks, floats more often
LABEL = st.one_of(
    st.sampled_from(["Zone A", "zone a", "Zone B", " Zone C ", "Lot 7", "Zone A", ""]),
    st.none(),
    st.text(alphabet="ABCxyz 1", min_size=1, max_size=4),
)
OTHER = st.one_of(
    st.sampled_from(["text", "", " ", "#N/A", "#DIV/0!", "#SPILL!", True, False, NA_CODE, 3, -7,
                     10**400, decimal.Decimal("12.50"), dt.datetime(2024, 3, 1, 8, 30),
                     math.nan, math.inf, -math.inf, np.float64(2.5)]),
    st.integers(-10, 10),
)
LAYOUTS = st.sampled_from(["wide", "rowwise"])
LABEL_ARGS = st.sampled_from(["auto", True, False])


@st.composite
def plain_ranges(draw, with_header: bool | None = None) -> tuple[list[list[Any]], str, Any, bool]:
    """A range of floats and blanks, with or without a line of labels first."""
    layout = draw(LAYOUTS)
    n_lines = draw(st.integers(1, 5))  # groups (columns for wide, rows for rowwise)
    depth = draw(st.integers(1, 6))  # data cells per line
    header = draw(st.booleans()) if with_header is None else with_header
    lines = [[draw(PLAIN) for _ in range(depth)] for _ in range(n_lines)]
    if header:
        lines = [[draw(LABEL)] + ln for ln in lines]
    rows = [list(r) for r in zip(*lines)] if layout == "wide" else lines
    if draw(st.booleans()):
        rows = [tuple(r) for r in rows]  # COM hands over tuples, xlwings lists: both are read
    return rows, layout, draw(LABEL_ARGS), header


@st.composite
def mixed_ranges(draw) -> tuple[list[list[Any]], str, Any, tuple[int, int]]:
    """A range of floats and blanks with at least one other cell (text, logical, error ...)."""
    rows, layout, labels, _ = draw(plain_ranges())
    rows = [list(r) for r in rows]
    r = draw(st.integers(0, len(rows) - 1))
    c = draw(st.integers(0, len(rows[0]) - 1))
    rows[r][c] = draw(OTHER)
    for _ in range(draw(st.integers(0, 2))):
        rows[draw(st.integers(0, len(rows) - 1))][draw(st.integers(0, len(rows[0]) - 1))] = draw(OTHER)
    return rows, layout, labels, (r, c)


# --------------------------------------------------------------------------------------------
# properties


BLOCK_SIZES = st.sampled_from([1, 2, 3, 5, 8192])  # cells per block of rows: many blocks, or one


@settings(max_examples=400)
@given(plain_ranges(), BLOCK_SIZES)
def test_block_read_equals_cell_read_on_floats_and_blanks(case, block_cells) -> None:
    rows, layout, labels, _ = case
    with mock.patch.object(ranges_module, "_BLOCK_CELLS", block_cells):
        _assert_same(rows, layout, labels)


@settings(max_examples=200)
@given(plain_ranges())
def test_block_read_is_taken_on_floats_and_blanks(case) -> None:
    rows, layout, _, header = case
    start = 1 if header else 0
    block = _plain_block(rows, start, layout == "rowwise")
    assert block is not None
    lines = list(zip(*rows)) if layout == "wide" else rows
    assert [a.tolist() for a in block] == [[v for v in ln[start:] if v is not None] for ln in lines]


def test_groups_from_range_uses_the_block_read(monkeypatch) -> None:
    import sheetfuncs.input.ranges as ranges_module

    taken = []

    def spy(rows, start, transpose):
        out = _plain_block(rows, start, transpose)
        taken.append(out is not None)
        return out

    monkeypatch.setattr(ranges_module, "_plain_block", spy)
    groups_from_range([["A", "B"], [1.0, 2.0], [3.0, None]])
    groups_from_range([["A", 1.0, 2.0], ["B", 3.0, None]], layout="rowwise")
    groups_from_range([[1.0, 2.0], [3.0, None]], labels=False)
    groups_from_range([["A", "B"], [1.0, "n/a"], [3.0, 4.0]])  # text: read cell by cell
    assert taken == [True, True, True, False]


@settings(max_examples=400)
@given(mixed_ranges(), BLOCK_SIZES)
def test_other_cells_take_the_cell_read(case, block_cells) -> None:
    rows, layout, labels, (r, c) = case
    with mock.patch.object(ranges_module, "_BLOCK_CELLS", block_cells):
        _assert_same(rows, layout, labels)
    start = _data_start(rows, layout, labels)
    if start is None:
        return  # refused (an error cell, a NaN, a group with no numbers ...): compared above
    in_data = (r if layout == "wide" else c) >= start
    v = rows[r][c]
    plain = v is None or (isinstance(v, float) and math.isfinite(v))  # np.float64 is a float
    if in_data and not plain:
        assert _plain_block(rows, start, layout == "rowwise") is None


@settings(max_examples=100)
@given(plain_ranges(with_header=True), BLOCK_SIZES)
def test_nan_beside_blanks_is_still_rejected(case, block_cells) -> None:
    rows, layout, _, _ = case
    rows = [list(r) for r in rows]
    rows[-1][-1] = math.nan  # a genuine NaN in the last data cell, blanks possibly elsewhere
    with mock.patch.object(ranges_module, "_BLOCK_CELLS", block_cells):
        fast = _assert_same(rows, layout, False)
    assert fast[0] == "error" and "NaN" in fast[1]
    assert fast[2] == ((len(rows) - 1, len(rows[0]) - 1),)


# --------------------------------------------------------------------------------------------
# examples (invented numbers)


def test_examples_through_the_block_read() -> None:
    rows = [["Zone A", "Zone B", None], [1.5, 2.5, None], [None, 3.5, None], [2.0, None, None]]
    assert _plain_block(rows, 1, False) is not None
    g = groups_from_range(rows)
    assert g.labels == ("Zone A", "Zone B")  # the all-blank third column is ignored
    assert [a.tolist() for a in g.arrays] == [[1.5, 2.0], [2.5, 3.5]]
    g = groups_from_range([["Zone A", 1.5, None, 2.0], ["Zone B", 2.5, 3.5, None]], layout="rowwise")
    assert [a.tolist() for a in g.arrays] == [[1.5, 2.0], [2.5, 3.5]]
    with pytest.raises(InputError, match='group "Zone B" has no numbers'):
        groups_from_range([["Zone A", "Zone B"], [1.5, None], [2.0, None]])
    with pytest.raises(InputError, match="an infinite value at row 3, column 2"):
        groups_from_range([["Zone A", "Zone B"], [1.5, None], [2.0, -math.inf]])
    with pytest.raises(InputError, match=r"NaN \(not a number\) at row 2, column 1"):
        groups_from_range([[2.0, None], [math.nan, 1.0], [None, 3.0]], labels=False)


def _large_range(n_rows: int = 6000, n_cols: int = 4) -> list[list[Any]]:
    """Invented measurements with blanks, a header row, well over one block of rows."""
    rng = np.random.default_rng(7)
    values = np.round(rng.normal(20.0, 1.5, (n_rows, n_cols)), 2).tolist()
    for r, c in zip(rng.integers(2000, n_rows, 300), rng.integers(0, n_cols, 300)):
        values[r][c] = None  # blanks only after the first blocks, which are all floats
    return [[f"Oven {j + 1}" for j in range(n_cols)]] + values


@pytest.mark.parametrize("layout", ["wide", "rowwise"])
def test_large_ranges_over_many_blocks(layout: str) -> None:
    rows = _large_range()
    if layout == "rowwise":
        rows = [list(r) for r in zip(*rows)]
    assert _plain_block(rows, 1, layout == "rowwise") is not None
    _assert_same(rows, layout, "auto")
    late = (5500, 2) if layout == "wide" else (2, 5500)
    for bad in ("n/a", True, math.nan, -math.inf, 4, "#N/A"):
        changed = [list(r) for r in rows]
        changed[late[0]][late[1]] = bad  # in a late block: that block, not the first, decides
        assert _plain_block(changed, 1, layout == "rowwise") is None
        outcome = _assert_same(changed, layout, "auto")
        if bad in ("#N/A",) or (isinstance(bad, float) and not math.isfinite(bad)):
            assert outcome[0] == "error" and outcome[2] == (late,)


def test_ints_bools_and_error_codes_are_not_read_as_floats() -> None:
    # numpy would turn True into 1.0 and a COM error code into a number: the block read must not
    g = groups_from_range([["A", "B"], [1.0, True], [2.0, 3.0], [4.0, 5.0]])
    assert g.arrays[1].tolist() == [3.0, 5.0] and g.ignored_count("logical") == 1
    with pytest.raises(InputError, match="#N/A at row 3, column 2"):
        groups_from_range([["A", "B"], [1.0, 2.0], [2.0, NA_CODE]])
    with pytest.raises(InputError, match="the error #N/A"):
        groups_from_range([["A", "B"], [1.0, "#N/A"], [2.0, 3.0]])


# --------------------------------------------------------------------------------------------
# the harness's read, which skips per-cell work on rows it leaves unchanged, against xlwings'
# own pipeline (reference library; Windows engine stand-in from tests/support/xlwings_engine.py)

from tests.support.xlwings_engine import com_value  # noqa: E402

from sheetfuncs.worksheet import harness  # noqa: E402

HOST_CELLS = st.one_of(
    FLOATS, FLOATS, FLOATS, st.none(),
    st.sampled_from(["", "Zone A", " ", "0", True, False, 0, 4, decimal.Decimal("0"),
                     decimal.Decimal("2.50"), dt.date(2024, 3, 1), dt.datetime(2024, 3, 1, 8, 30),
                     harness.NA, harness.SPILL, harness.DIV0, np.float64(1.5)]),
)


def test_harness_read_matches_xlwings_on_a_large_block(xlwings_pipeline) -> None:
    rows = _large_range(4000, 3)
    rows[2500][1] = ""  # a blank given as empty text, in a late block of rows
    rows[3100][0] = harness.NA
    rows[3900][2] = dt.date(2024, 3, 1)
    for block in (rows, rows[:2400]):  # with and without the cells that need cleaning
        for options in ({"ndim": 2, "err_to_str": True}, {"ndim": 2}):
            expected = xlwings_pipeline.read(None, com_value(block), dict(options))
            assert harness.read_argument(block, options) == expected


@settings(max_examples=300)
@given(
    st.integers(1, 5).flatmap(
        lambda w: st.lists(st.lists(HOST_CELLS, min_size=w, max_size=w), min_size=1, max_size=6)
    ),
    st.sampled_from([{"ndim": 2, "err_to_str": True}, {"ndim": 2}, {"err_to_str": True}]),
    BLOCK_SIZES,
)
def test_harness_read_matches_xlwings_on_random_blocks(xlwings_pipeline, block, options, block_cells) -> None:
    expected = xlwings_pipeline.read(None, com_value(block), dict(options))
    with mock.patch.object(harness, "_BLOCK_CELLS", block_cells):
        got = harness.read_argument(block, options)
    assert got == expected and type(got) is type(expected)
    if options.get("ndim") == 2:
        assert all(type(r) is list for r in got)
        assert all(r is not b for r, b in zip(got, block))  # new lists, the caller's left alone
