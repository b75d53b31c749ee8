"""Every worksheet function called as xlwings calls it on Windows (through sheetfuncs.harness).

Part 1 checks the harness itself against xlwings' own conversion pipeline (the reference
library), run here with a stand-in for its Windows engine. Part 2 calls every registered function
across layouts, header rows, ignored cells, error cells and one-column ranges, and checks that the
cells show the core's values. Part 3 checks that every input problem gives one line of text.

All measurement values are invented; expected values come from the core called directly
(sheetfuncs.oneway, describe, linear_test, contrast, f_tail, f_critical) and from scipy.stats.
"""

from __future__ import annotations

import datetime as dt
import decimal
import math
from typing import Any

import numpy as np
import pytest
from scipy import stats

from tests.support import ranges
from tests.support.xlwings_engine import CELL_ERRORS, com_value
import sheetfuncs as sf
from sheetfuncs.worksheet import harness
from sheetfuncs.worksheet.harness import BLANK, CALC, DIV0, MISSING, NA, REF, SPILL, VALUE, call, column, is_message
from sheetfuncs.worksheet.convert import MAX_DOUBLE
from sheetfuncs.worksheet.functions import EXAMPLE_SHEET, REGISTRY

# --------------------------------------------------------------------------------------------
# Part 1: the harness against xlwings' pipeline (tests/support/xlwings_engine.py)

_BLOCKS = [
    5.0,
    "long",
    True,
    None,
    NA,
    SPILL,
    decimal.Decimal("12.50"),
    dt.date(2024, 3, 1),
    [[1.0, 2.0, 3.0]],
    [[1.0], [None], [3.0]],
    [[1.0, ""], [NA, "x"], [True, 2]],
    [[DIV0, CALC], [dt.datetime(2024, 3, 1, 8, 30), decimal.Decimal("0.1")], [None, VALUE]],
    [["Head 1", "Head 2"], [0.1, 0.2], [REF, None]],
]


@pytest.mark.parametrize("block", _BLOCKS, ids=[repr(b)[:30] for b in _BLOCKS])
@pytest.mark.parametrize("options", [{"ndim": 2, "err_to_str": True}, {"err_to_str": True}, {"ndim": 2}, {}])
def test_read_matches_xlwings(xlwings_pipeline, block, options) -> None:
    expected = xlwings_pipeline.read(None, com_value(block), dict(options))
    got = harness.read_argument(block, options)
    assert got == expected and type(got) is type(expected)
    if isinstance(got, list) and got and isinstance(got[0], list):
        assert all(type(r) is list for r in got)


_RETURNS = [
    2.5,
    np.float64(0.25),
    math.nan,
    None,
    "sheetfuncs: something is wrong",
    [1.0, None, 3.0],
    [["Source", "df"], ["Factor", np.int64(2)], ["Total", math.nan]],
    [[True, dt.datetime(2024, 1, 2)]],
]


@pytest.mark.parametrize("value", _RETURNS, ids=[repr(v)[:30] for v in _RETURNS])
def test_write_matches_xlwings(xlwings_pipeline, value) -> None:
    expected = xlwings_pipeline.write(value, None, {})
    rows, scalar = harness.write_result(value)
    assert rows == expected
    assert scalar == (not isinstance(value, list))


def test_host_refuses_long_text_in_an_array_result() -> None:
    # common practice: 255 characters of text per cell of an array result, 32,767 in one cell
    with pytest.raises(harness.HostError, match="255"):
        harness.write_result([["Note"], ["x" * 256]])
    assert harness.write_result("x" * 256) == ([["x" * 256]], True)
    assert harness.write_result([["x" * 255]]) == ([["x" * 255]], False)


def test_host_refuses_what_a_cell_cannot_hold() -> None:
    # common practice: a cell holds finite doubles, text up to 32,767 characters, logicals, dates
    for bad in (math.inf, [[1.0, -math.inf]], object(), [[np.bool_(True)]], "x" * 40000, [[1.0], [1.0, 2.0]], []):
        with pytest.raises(harness.HostError):
            harness.write_result(bad)
    with pytest.raises(TypeError):
        harness.host_value(object())
    with pytest.raises(TypeError):
        harness.read_argument([1.0, [2.0]], {"ndim": 2})  # a flat row holds cells, not rows
    with pytest.raises(ValueError):
        harness.ErrorCell("#OOPS!")


@pytest.mark.parametrize("options", [{"ndim": 2, "err_to_str": True}, {"err_to_str": True}])
def test_flat_tuple_is_one_row_as_in_xlwings(xlwings_pipeline, options) -> None:
    # pywin32 hands a horizontal array constant {1,-0.5,-0.5} over as a flat tuple (common practice)
    flat = (1.0, -0.5, "", -0.5)
    expected = xlwings_pipeline.read(None, flat, dict(options))
    assert harness.read_argument(flat, options) == expected
    assert harness.read_argument(list(flat), options) == expected
    sheet = [list(r) for r in EXAMPLE_SHEET]
    assert call("SF_CONTRAST", sheet, (1.0, -0.5, -0.5)) == call("SF_CONTRAST", sheet, [[1.0, -0.5, -0.5]])


def test_error_codes() -> None:
    # COM error codes are 0x800A0000 + the host's error number (#N/A = 2042); xlwings 0.37
    # converts the seven classic ones under err_to_str (its Windows cell_errors table)
    assert NA.com_code == -2146826246 == -2146828288 + 2042
    # the host's error numbers (its published error enumeration, from memory), all 15 of them
    assert {name: code + 2146828288 for name, code in harness.COM_ERROR_CODES.items()} == {
        "#NULL!": 2000, "#DIV/0!": 2007, "#VALUE!": 2015, "#REF!": 2023, "#NAME?": 2029,
        "#NUM!": 2036, "#N/A": 2042, "#GETTING_DATA": 2043, "#SPILL!": 2045, "#CONNECT!": 2046,
        "#BLOCKED!": 2047, "#UNKNOWN!": 2048, "#FIELD!": 2049, "#CALC!": 2050, "#BUSY!": 2051,
    }
    assert [e.com_code for e in (SPILL, CALC)] == [-2146828288 + 2045, -2146828288 + 2050]
    assert harness.XLWINGS_ERROR_TEXTS == CELL_ERRORS
    assert harness.read_argument([[SPILL]], {"ndim": 2, "err_to_str": True}) == [[SPILL.com_code]]
    assert harness.read_argument([[NA]], {"ndim": 2}) == [[None]]  # why err_to_str is needed


def test_call_rules() -> None:
    with pytest.raises(TypeError):
        call("SF_FTAIL", 1.0, 2.0, 3.0, 4.0)
    with pytest.raises(TypeError):
        call("SF_FTAIL", 1.0, 2.0)  # the host does not let a required argument be left out
    with pytest.raises(TypeError):
        call("SF_TABLE", [[1.0]], colour="red")
    with pytest.raises(KeyError):
        call("SF_NOPE", 1.0)
    assert harness.prepare("SF_TABLE", [[1.0, 2.0]], MISSING, False) == [[[1.0, 2.0]], None, False, None]
    assert harness.prepare("SF_FTAIL", 2, [[3.0]], 4.0) == [2.0, 3.0, 4.0]


# --------------------------------------------------------------------------------------------
# Part 2: every function, every layout

# Invented data: fill weight deviation (g) on three filling lines.
GROUPS = {
    "Line 1": [2.1, 1.8, 2.4, 2.0, 1.9],
    "Line 2": [2.6, 2.9, 2.5, 2.8],
    "Line 3": [1.7, 2.0, 1.6, 1.9, 1.8, 2.2],
}
DEFAULT_NAMES = ["Group 1", "Group 2", "Group 3"]
POOLING = ("x", "y", "x")
WEIGHTS = (1.0, -0.5, -0.5)


def long(groups: dict[str, list[float]], header: bool = True) -> list[list[Any]]:
    return ranges.long(groups, header, names=("Line", "Deviation"))


wide, rowwise = ranges.wide, ranges.rowwise
LAYOUTS = {"wide": wide, "long": long, "rowwise": rowwise}


def shown(value: Any) -> Any:
    """A core value as the cell shows it (GUIDE.md): blanks for None/NaN, the largest double
    for infinity, plain floats for numbers."""
    if isinstance(value, list):
        return [[shown(v) for v in r] for r in value]
    if value is None or (isinstance(value, float) and math.isnan(value)):
        return BLANK
    if isinstance(value, str) or isinstance(value, bool):
        return value
    v = float(value)
    return math.copysign(MAX_DOUBLE, v) if math.isinf(v) else v


#: Each one-number function and the field of sheetfuncs.OneWayResult it must show.
FIGURES = {
    "SF_SSB": "ss_between", "SF_SSW": "ss_within", "SF_SST": "ss_total",
    "SF_DFB": "df_between", "SF_DFW": "df_within", "SF_DFT": "df_total",
    "SF_MSB": "ms_between", "SF_MSW": "ms_within", "SF_F": "f", "SF_P": "p", "SF_R2": "r_squared",
}


def core_result(name: str, g: Any, **extra: Any) -> Any:
    """What the core gives for function ``name`` on groups ``g`` (the value the cell must show)."""
    if name in FIGURES:
        return getattr(sf.oneway(g), FIGURES[name])
    if name == "SF_TABLE":
        return sf.oneway(g).table(extra.get("factor_name"))
    if name == "SF_GROUPS":
        return sf.describe(g, extra.get("conf", 0.95)).table()
    if name == "SF_GLT":
        return sf.linear_test(g, list(POOLING)).table()
    if name == "SF_CONTRAST":
        return sf.contrast(g, list(WEIGHTS), extra.get("conf", 0.95)).table()
    raise KeyError(name)


def per_group_args(name: str) -> tuple[Any, ...]:
    """Extra range arguments, given as one row (as an array constant would arrive)."""
    if name == "SF_GLT":
        return ([list(POOLING)],)
    if name == "SF_CONTRAST":
        return ([list(WEIGHTS)],)
    return ()


def call_on(name: str, data: Any, *options: Any, layout: Any = MISSING, labels: Any = MISSING) -> Any:
    extra = per_group_args(name)
    named = {}
    if layout is not MISSING:
        named["layout"] = layout
    if labels is not MISSING:
        named["labels"] = labels
    return call(name, data, *extra, *options, **named)


#: The one-way catalog's data functions; the analyses of issue 4 have their own harness tests
#: in tests/test_udfs_analyses.py (which also checks that every data function is covered).
ONEWAY_DATA = set(FIGURES) | {"SF_TABLE", "SF_GROUPS", "SF_GLT", "SF_CONTRAST"}
DATA_FUNCTIONS = sorted(n for n, rec in REGISTRY.items() if rec.args[0].name == "data" and n in ONEWAY_DATA)


def test_every_function_with_data_is_covered() -> None:
    # each data function compares with a core call below; the others have their own tests
    assert set(DATA_FUNCTIONS) == ONEWAY_DATA
    assert {"SF_FROMSTATS", "SF_FTAIL", "SF_FCRIT"} <= set(REGISTRY) - set(DATA_FUNCTIONS)


@pytest.mark.parametrize("header", [True, False], ids=["header", "no-header"])
@pytest.mark.parametrize("layout", list(LAYOUTS))
@pytest.mark.parametrize("name", DATA_FUNCTIONS)
def test_layouts_equal_core(name: str, layout: str, header: bool) -> None:
    data = LAYOUTS[layout](GROUPS, header)
    if layout == "long" and not header:
        expected_groups = GROUPS  # in the long layout the labels live in the first column
    else:
        expected_groups = GROUPS if header else dict(zip(DEFAULT_NAMES, GROUPS.values()))
    got = call_on(name, data, layout=layout if layout != "wide" else MISSING)
    assert got == shown(core_result(name, expected_groups))


@pytest.mark.parametrize("name", DATA_FUNCTIONS)
def test_blanks_text_logicals_and_blank_columns_ignored(name: str) -> None:
    data = wide(GROUPS)
    data.insert(3, ["checked", True, None])  # text, a logical and a blank inside the data
    data.append(["", None, "n/a"])
    ranges.with_blank_columns(data)  # an all-blank column in the middle and one at the right edge
    assert call_on(name, data) == shown(core_result(name, GROUPS))


@pytest.mark.parametrize("name", DATA_FUNCTIONS)
def test_decimal_numbers_count_like_floats(name: str) -> None:
    # currency-formatted cells arrive as decimal.Decimal
    data = ranges.as_decimals(wide(GROUPS))
    assert call_on(name, data) == shown(core_result(name, GROUPS))


@pytest.mark.parametrize("name", DATA_FUNCTIONS)
@pytest.mark.parametrize("error", [NA, DIV0, SPILL], ids=["N/A", "DIV0", "SPILL-as-COM-int"])
def test_error_cell_reported_with_its_position(name: str, error) -> None:
    data = wide(GROUPS)
    data[3][2] = error  # 0-based row 3, column 2: the range's row 4, column 3
    out = call_on(name, data)
    assert is_message(out)
    assert error.name in out and "row 4, column 3" in out


@pytest.mark.parametrize("name", DATA_FUNCTIONS)
def test_one_column_range(name: str) -> None:
    """A one-column range arrives as rows of one cell (ndim=2); one group cannot be compared."""
    out = call_on(name, column(["Line 1"] + GROUPS["Line 1"]))
    if name == "SF_GROUPS":
        assert out == shown(sf.describe({"Line 1": GROUPS["Line 1"]}).table())
    else:
        assert is_message(out) and "at least two groups" in out
    # the same column read as rowwise data: one value per group, so no residual df
    out = call_on(name, column(GROUPS["Line 1"]), layout="rowwise", labels=False)
    if name == "SF_GROUPS":
        assert len(out) == 1 + len(GROUPS["Line 1"]) and out[1][3] == BLANK  # SD undefined
    else:
        assert is_message(out)


@pytest.mark.parametrize("name", ["SF_GLT", "SF_CONTRAST"])
def test_per_group_argument_as_column_row_or_longer_range(name: str) -> None:
    values = POOLING if name == "SF_GLT" else WEIGHTS
    expected = shown(core_result(name, GROUPS))
    for given in ([list(values)], column(values), column(list(values) + [None, None]),
                  [list(values) + [None]]):
        assert call(name, wide(GROUPS), given) == expected


def test_numeric_labels_with_labels_true() -> None:
    # lot numbers 1, 2, 3 become labels "1", "2", "3" (GUIDE.md)
    data = wide(GROUPS)
    data[0] = [1, 2, 3]
    out = call("SF_GROUPS", data, MISSING, True)
    assert [r[0] for r in out[1:]] == ["1", "2", "3"]
    assert call("SF_GROUPS", data, MISSING, "auto") != out  # auto: numbers are data


def test_dates_as_labels_are_iso_dates() -> None:
    # GUIDE.md: a date in a label position is written as an ISO date (here: one group per shift day)
    data = wide(GROUPS)
    data[0] = [dt.date(2024, 3, 1), dt.datetime(2024, 3, 2), dt.date(2024, 3, 4)]
    out = call("SF_GROUPS", data, MISSING, True)
    assert [r[0] for r in out[1:]] == ["2024-03-01", "2024-03-02", "2024-03-04"]


def test_options_as_cells() -> None:
    data = wide(GROUPS)
    # a blank option cell means the default; text options are trimmed
    assert call("SF_TABLE", data, None, None, None) == call("SF_TABLE", data)
    assert call("SF_TABLE", data, "  wide ", "TRUE", "  Line ") == shown(sf.oneway(GROUPS).table("Line"))
    assert call("SF_TABLE", data, [["wide"]]) == call("SF_TABLE", data)  # a one-cell range
    out = call("SF_GROUPS", data, MISSING, MISSING, 0.9)
    assert out == shown(sf.describe(GROUPS, 0.9).table())
    assert call("SF_CONTRAST", data, [list(WEIGHTS)], MISSING, MISSING, decimal.Decimal("0.99")) == (
        shown(sf.contrast(GROUPS, list(WEIGHTS), 0.99).table())
    )


def test_groups_interval_against_scipy() -> None:
    # reference library: scipy.stats.t interval for the mean of one group
    out = call("SF_GROUPS", wide(GROUPS))
    x = np.array(GROUPS["Line 2"])
    lo, hi = stats.t.interval(0.95, x.size - 1, loc=x.mean(), scale=stats.sem(x))
    assert out[2][5] == pytest.approx(lo, rel=1e-12) and out[2][6] == pytest.approx(hi, rel=1e-12)


def test_table_against_scipy_f_oneway() -> None:
    # reference library: scipy.stats.f_oneway
    res = stats.f_oneway(*GROUPS.values())
    out = call("SF_TABLE", long(GROUPS), "long")
    assert out[1][4] == pytest.approx(res.statistic, rel=1e-12)
    assert out[1][5] == pytest.approx(res.pvalue, rel=1e-10)
    assert call("SF_P", rowwise(GROUPS), "rowwise") == pytest.approx(res.pvalue, rel=1e-10)


def test_infinite_f_shows_as_the_largest_double() -> None:
    # GUIDE.md: no within-group variation with different means gives F = inf, p = 0
    data = [["A", "B"], [1.0, 2.0], [1.0, 2.0], [1.0, 2.0]]
    assert call("SF_F", data) == MAX_DOUBLE == 1.7976931348623157e308
    assert call("SF_P", data) == 0.0
    table = call("SF_TABLE", data)
    assert table[1][4] == MAX_DOUBLE and table[1][5] == 0.0
    assert call("SF_F", data) > 1e300  # comparisons in the sheet still work


def test_fromstats_equals_core_and_raw_data() -> None:
    # oneway_from_summary on the same figures; and (within 1e-12) the raw-data analysis
    counts = [len(v) for v in GROUPS.values()]
    means = [float(np.mean(v)) for v in GROUPS.values()]
    sds = [float(np.std(v, ddof=1)) for v in GROUPS.values()]
    expected = shown(sf.oneway_from_summary(counts, means, sds, list(GROUPS)).table())
    got = call("SF_FROMSTATS", column(counts), column(means), column(sds), column(list(GROUPS)))
    assert got == expected
    # as rows, with blanks at the end of a longer range, and without names
    assert call("SF_FROMSTATS", [counts + [None]], [means], column(sds + [None])) == shown(
        sf.oneway_from_summary(counts, means, sds).table()
    )
    # selected with their header cells (common practice: a QA sheet keeps a header row)
    assert call("SF_FROMSTATS", column(["n"] + counts), column(["Mean"] + means), column(["SD"] + sds),
                column(["Line"] + list(GROUPS))) == expected
    assert is_message(call("SF_FROMSTATS", column(counts), column(means), column(sds), column(["A", "B"])))
    raw = sf.oneway(GROUPS)
    assert got[1][4] == pytest.approx(raw.f, rel=1e-12)
    assert got[2][2] == pytest.approx(raw.ss_within, rel=1e-12)


def test_f_distribution_functions() -> None:
    # reference library: scipy.stats.f survival and inverse survival functions
    assert call("SF_FTAIL", 4.1, 2, 14) == sf.f_tail(4.1, 2, 14)
    assert call("SF_FTAIL", 4.1, 2, 14) == pytest.approx(stats.f.sf(4.1, 2, 14), rel=1e-12)
    assert call("SF_FCRIT", 0.05, 2, 14) == pytest.approx(stats.f.isf(0.05, 2, 14), rel=1e-12)
    # arguments given as one-cell references and as Decimal
    assert call("SF_FCRIT", [[0.05]], [[2.0]], decimal.Decimal(14)) == sf.f_critical(0.05, 2, 14)
    # a far tail stays a positive number
    assert call("SF_FTAIL", 1e6, 3, 40) == pytest.approx(stats.f.sf(1e6, 3, 40), rel=1e-10)


# --------------------------------------------------------------------------------------------
# Part 3: every input problem gives one line of text


PROBLEMS = [
    # (label, function, arguments, phrase in the message)
    ("error cell", "SF_TABLE", ([["A", "B"], [1.0, NA], [2.0, 3.0]],), "#N/A at row 2, column 2"),
    ("error in the label row", "SF_F", ([["A", REF], [1.0, 2.0], [2.0, 3.0]],), "#REF!"),
    ("one group only", "SF_TABLE", ([["A", None], [1.0, None], [2.0, None]],), "at least two groups"),
    ("labelled group with no numbers", "SF_P", ([["A", "B"], [1.0, "x"], [2.0, None]],), 'group "B" has no numbers'),
    ("unlabelled line of text only", "SF_P", ([[1.0, "x"], [2.0, True]], MISSING, False), "has no numbers"),
    ("no numbers at all", "SF_GROUPS", ([["A", "B"], [None, None]],), "has no numbers"),
    ("date in the data", "SF_SSB", ([["A", "B"], [1.0, dt.date(2024, 5, 1)], [2.0, 3.0]],), "dates are not measurements"),
    ("all values identical", "SF_TABLE", ([["A", "B"], [1.0, 1.0], [1.0, 1.0]],), "all values are identical"),
    ("no residual df", "SF_MSW", ([["A", "B"], [1.0, 2.0]],), "no residual degrees of freedom"),
    ("duplicate label", "SF_TABLE", ([["A", "A"], [1.0, 2.0], [1.5, 2.5]],), 'the label "A"'),
    ("unknown layout", "SF_TABLE", (wide(GROUPS), "tall"), "unknown layout"),
    ("bad labels option", "SF_TABLE", (wide(GROUPS), MISSING, "maybe"), "labels must be"),
    ("long layout width", "SF_TABLE", (wide(GROUPS), "long"), "exactly two columns"),
    ("long value without label", "SF_TABLE", ([["L", "V"], ["A", 1.0], [None, 2.0], ["B", 3.0]], "long"), "no group label"),
    ("conf out of range", "SF_GROUPS", (wide(GROUPS), MISSING, MISSING, 1.5), "strictly between 0 and 1"),
    ("conf as text", "SF_CONTRAST", (wide(GROUPS), [list(WEIGHTS)], MISSING, MISSING, "high"), "must be a number"),
    ("conf as a logical", "SF_GROUPS", (wide(GROUPS), MISSING, MISSING, True), "must be a number"),
    ("conf holds an error", "SF_GROUPS", (wide(GROUPS), MISSING, MISSING, DIV0), "#DIV/0!"),
    ("option given a range", "SF_TABLE", (wide(GROUPS), [["wide", "long"]]), "not a range of 2 cells"),
    ("weights do not sum to zero", "SF_CONTRAST", (wide(GROUPS), [[1.0, 1.0, -1.0]]), "sum to zero"),
    ("weights all zero", "SF_CONTRAST", (wide(GROUPS), [[0.0, 0.0, 0.0]]), "all contrast weights are zero"),
    ("too few weights", "SF_CONTRAST", (wide(GROUPS), [[1.0, -1.0]]), "2 weights for 3 groups"),
    ("text weight", "SF_CONTRAST", (wide(GROUPS), [[1.0, "half", -0.5]]), "not a number"),
    ("weight holds an error", "SF_CONTRAST", (wide(GROUPS), [[1.0, NA, -0.5]]), "#N/A at row 1, column 2"),
    ("pooling length", "SF_GLT", (wide(GROUPS), [["x", "y"]]), "2 pooling labels for 3 groups"),
    ("pooling reduces nothing", "SF_GLT", (wide(GROUPS), [["x", "y", "z"]]), "reduced model is the full"),
    ("pooling as a block", "SF_GLT", (wide(GROUPS), [["x", "y"], ["x", "z"]]), "block of 2 rows and 2 columns"),
    ("weights as a block", "SF_CONTRAST", (wide(GROUPS), [[1, -1], [0, None]]), "block of 2 rows and 2 columns"),
    ("summary as a block", "SF_FROMSTATS", ([[5, 4], [3, 6]], column([1.0, 2.0, 3.0, 4.0]), column([0.1, 0.2, 0.3, 0.4])), "counts fill a block"),
    ("pooling holds an error", "SF_GLT", (wide(GROUPS), column(["x", CALC, "x"])), "#CALC!"),
    ("pooling label blank", "SF_GLT", (wide(GROUPS), [["x", None, "x"]]), "is blank"),
    ("summary lengths", "SF_FROMSTATS", (column([5, 4]), column([1.0, 2.0, 3.0]), column([0.1, 0.2])), "give one of each"),
    ("summary count not whole", "SF_FROMSTATS", (column([5, 4.5]), column([1.0, 2.0]), column([0.1, 0.2])), "whole numbers"),
    ("summary negative SD", "SF_FROMSTATS", (column([5, 4]), column([1.0, 2.0]), column([0.1, -0.2])), "negative"),
    ("summary gap", "SF_FROMSTATS", (column([5, None, 4]), column([1.0, 2.0, 3.0]), column([0.1, 0.2, 0.3])), "entry 2 of counts is blank"),
    ("summary error", "SF_FROMSTATS", (column([5, 4]), column([1.0, VALUE]), column([0.1, 0.2])), "#VALUE!"),
    ("summary one group", "SF_FROMSTATS", (column([5]), column([1.0]), column([0.1])), "at least two groups"),
    ("summary SD for one value", "SF_FROMSTATS", (column([5, 1]), column([1.0, 2.0]), column([0.1, 0.2])), "count 2 is 1"),
    ("summary names twice", "SF_FROMSTATS", (column([5, 4]), column([1.0, 2.0]), column([0.1, 0.2]), column(["A", "A"])), 'name "A" is given to groups 1 and 2'),
    ("summary text count", "SF_FROMSTATS", (column(["n", 5, 4]), column([1.0, 2.0, 3.0]), column([0.1, 0.2, 0.3])), 'count 1 is "n", not a number'),
    ("df negative", "SF_FTAIL", (2.0, -1, 10), "df1 must be a positive number"),
    ("x blank", "SF_FTAIL", (None, 2, 10), "x is missing"),
    ("x as text", "SF_FTAIL", ("big", 2, 10), "x must be a number"),
    ("x as a date", "SF_FTAIL", (dt.date(2024, 1, 1), 2, 10), "x is a date"),
    ("alpha out of range", "SF_FCRIT", (1.2, 2, 10), "alpha must lie strictly between 0 and 1"),
    ("df holds an error", "SF_FCRIT", (0.05, NA, 10), "df1 holds the error #N/A"),
    ("df given a range", "SF_FCRIT", (0.05, column([2.0, 3.0]), 10), "not a range of 2 cells"),
]


@pytest.mark.parametrize("name, args, phrase", [p[1:] for p in PROBLEMS], ids=[p[0] for p in PROBLEMS])
def test_input_problem_gives_one_line_of_text(name: str, args: tuple, phrase: str) -> None:
    out = call(name, *args)
    assert is_message(out), out
    assert phrase in out, out


def test_every_function_has_an_input_problem_test() -> None:
    covered = {p[1] for p in PROBLEMS}
    figures_covered = covered & set(FIGURES)
    oneway_catalog = ONEWAY_DATA | {"SF_FROMSTATS", "SF_FTAIL", "SF_FCRIT"}
    assert oneway_catalog - set(FIGURES) <= covered and figures_covered
    # and every figure function turns the core's error into a message the same way
    for name in FIGURES:
        assert is_message(call(name, [["A", None], [1.0, None]]))
