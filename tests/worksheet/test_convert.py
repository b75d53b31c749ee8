"""Cells in and cells out (sheetfuncs.worksheet.convert): arguments by kind, per-group ranges,
values and tables as cells, input problems as one line of text.

The values are invented; the rules checked are the worksheet-function conventions of the
project guide (GUIDE.md) and common practice.
"""

from __future__ import annotations

import datetime as dt
import decimal
import math
from fractions import Fraction

import numpy as np
import pytest

from sheetfuncs.errors import InputError
from sheetfuncs.udfs import SF_TABLE
from sheetfuncs.worksheet.convert import (
    MAX_DOUBLE, TABLE_TEXT_LIMIT, NotANumber, cell_message, check_range_errors, normalise, per_group_column, shape_result,
    to_cell,
)
from sheetfuncs.worksheet.registry import Arg

DATA = Arg("data", "range", "The measurements.")
NAMES = Arg("names", "range", "Group names.", default=None)
CONF = Arg("conf", "number", "Confidence level.", default=0.95)
DF1 = Arg("df1", "number", "Numerator degrees of freedom.")
LAYOUT = Arg("layout", "text", "How the range holds the groups.", default="wide")
LABELS = Arg("labels", "logical", "Labels in the first row?", default="auto")
WEIGHTS = Arg("weights", "range", "One weight per group.")


def reason(call, *args) -> str:
    with pytest.raises(InputError) as info:
        call(*args)
    return info.value.reason


# --------------------------------------------------------------------------------------------
# converting in


def test_missing_or_blank_options_take_their_default() -> None:
    # GUIDE.md: a missing optional argument and a blank cell both mean "use the default"
    for blank in (None, "", "   ", [[None]], [[""]]):
        assert normalise(blank, CONF) == 0.95
        assert normalise(blank, LAYOUT) == "wide"
        assert normalise(blank, LABELS) == "auto"
    assert normalise(None, NAMES) is None and normalise("", NAMES) is None


def test_required_arguments_say_what_is_missing() -> None:
    assert reason(normalise, None, DATA) == "data is missing; select the cells that hold it"
    assert reason(normalise, "", DATA) == "data is missing; select the cells that hold it"
    assert reason(normalise, None, DF1) == "df1 is missing (or its cell is blank); give a number"
    text = Arg("control", "text", "The control group.")
    assert reason(normalise, " ", text) == "control is missing (or its cell is blank); give a value"


def test_ranges_arrive_as_rows() -> None:
    rows = [[1.0, 2.0], [3.0, None]]
    assert normalise(rows, DATA) is rows
    assert normalise(5.0, DATA) == [[5.0]]  # one value typed in place of a range
    block = np.array([[1.0, 2.0]])
    assert normalise(block, DATA) is block


def test_one_value_from_a_one_cell_range_and_not_from_a_larger_one() -> None:
    assert normalise([[0.9]], CONF) == 0.9
    assert normalise(["  long "], LAYOUT) == "long"
    assert reason(normalise, [[0.9, 0.8]], CONF) == (
        "conf must be one value, not a range of 2 cells; point it at a single cell or type the value"
    )


def test_options_by_kind() -> None:
    assert normalise(decimal.Decimal("0.90"), CONF) == 0.9 and type(normalise(2, DF1)) is float
    assert normalise("  rowwise ", LAYOUT) == "rowwise"  # text is trimmed
    assert normalise(3.0, LAYOUT) == "3"  # a number as it reads
    assert normalise(True, LABELS) is True and normalise(" auto", LABELS) == " auto"
    assert reason(normalise, "#N/A", CONF) == "conf holds the error #N/A; fix that cell"
    assert reason(normalise, dt.datetime(2024, 3, 1), DF1) == "df1 is a date; give a number"
    assert "conf" in reason(normalise, "high", CONF)


def test_error_cells_in_a_per_group_range_name_the_cell() -> None:
    check_range_errors([[1.0, -0.5, -0.5]], WEIGHTS)  # nothing to say
    check_range_errors(None, WEIGHTS)
    assert reason(check_range_errors, [[1.0], [-0.5], ["#DIV/0!"]], WEIGHTS) == (
        "the weights range holds the error #DIV/0! at row 3, column 1; fix or clear that cell"
    )


def test_per_group_column() -> None:
    assert per_group_column(None, NAMES) is None
    assert per_group_column([["A"], ["B"], [None], [""]], NAMES) == ["A", "B"]  # blanks at the end
    assert per_group_column([["A", "B", "C"]], NAMES) == ["A", "B", "C"]
    assert reason(per_group_column, [["A"], [None], ["C"]], NAMES) == (
        "entry 2 of names is blank; give one value per group, with no gaps"
    )
    assert "#REF!" in reason(per_group_column, [["A"], ["#REF!"]], NAMES)


# --------------------------------------------------------------------------------------------
# shaping out


def test_to_cell() -> None:
    # GUIDE.md: infinity as the largest double, None as blank, numbers as plain floats; a NaN
    # is a number the core failed to form, never a blank (issue 10)
    assert to_cell(math.inf) == MAX_DOUBLE == 1.7976931348623157e308
    assert to_cell(-math.inf) == -MAX_DOUBLE
    assert to_cell(None) is None
    with pytest.raises(NotANumber):
        to_cell(math.nan)
    assert type(to_cell(np.float64(2.5))) is float and to_cell(np.int64(3)) == 3.0
    assert type(to_cell(7)) is float
    assert to_cell(True) is True and to_cell(np.bool_(False)) is False
    assert to_cell("Head 1") == "Head 1"
    assert to_cell(Fraction(1, 4)) == 0.25
    with pytest.raises(TypeError):
        to_cell(object())


def test_shape_result() -> None:
    assert shape_result(math.inf, "scalar") == MAX_DOUBLE
    assert shape_result([("Source", "df"), ("Factor", 2, None)], "table") == [
        ["Source", "df", None], ["Factor", 2.0, None],
    ]
    with pytest.raises(NotANumber):
        shape_result([("Source", "df"), ("Factor", math.nan)], "table")


def test_tables_come_back_rectangular_with_blanks() -> None:
    out = SF_TABLE([["A", "B"], [1.0, 2.0], [1.5, 2.5], [1.25, None]])
    assert [len(r) for r in out] == [6, 6, 6, 6]
    assert out[0] == ["Source", "df", "SS", "MS", "F", "p"]
    assert out[2][4] is None and out[3][3] is None


def test_cell_message_is_one_line_and_cut_short() -> None:
    assert cell_message(InputError("group \"Head 3\"\nhas no numbers")) == (
        'sheetfuncs: group "Head 3" has no numbers'
    )
    long_label = "x" * 5000
    text = cell_message(InputError(f'group "{long_label}" has no numbers'))
    assert len(text) == 1000 and text.endswith("…") and text.startswith('sheetfuncs: group "xxx')


def test_table_text_is_cut_to_what_an_array_result_keeps() -> None:
    # Excel keeps at most 255 characters of text in a cell of an array a function returns
    # (common practice); a message or other one-cell text keeps its length
    label = "Head " + "x" * 300
    rows = shape_result([["Group", "n"], [label, 3], ["x" * 255, 2]], "table")
    assert TABLE_TEXT_LIMIT == 255
    assert rows[1][0] == label[:254] + "…" and len(rows[1][0]) == 255
    assert rows[2][0] == "x" * 255
    assert shape_result(label, "scalar") == label
