"""Calc's argument values -> what xlwings hands the same wrapper in Excel, and results back in
Calc's shape (sheetfuncs/worksheet/calc/host.py). No LibreOffice runs: the arguments are built as
Calc's UNO bridge hands them to the component (numbers as float, blanks as '', text, inline arrays
as rows, a left-out argument as None). The reference for every example is the harness, which
tests/worksheet/test_xlwings_real.py checks against xlwings' own code.
"""

from __future__ import annotations

import datetime as dt
from typing import Any

import pytest

from sheetfuncs.udfs import REGISTRY
from sheetfuncs.worksheet import harness
from sheetfuncs.worksheet.calc.build import cell_range_argument
from sheetfuncs.worksheet.calc.host import CalcRange, argument, call, error_name, range_cells, to_calc
from sheetfuncs.worksheet.docs import resolve
from sheetfuncs.worksheet.functions import EXAMPLE_SHEET
from sheetfuncs.worksheet.registry import MISSING, Arg, Ref

LOGICAL = Arg("labels", "logical", "Labels.", default="auto")
NUMBER = Arg("alpha", "number", "Alpha.", default=0.05)


def _calc_value(v: Any) -> Any:
    """One cell or constant as Calc hands it over: numbers (and logicals) as float, blank ''."""
    if v is None:
        return ""
    if isinstance(v, (bool, int, float)):
        return float(v)
    return v


def _calc_rows(rows: Any) -> tuple[tuple[Any, ...], ...]:
    return tuple(tuple(_calc_value(v) for v in row) for row in rows)


def _calc_argument(value: Any, spec: Arg, cells: tuple[tuple[Any, ...], ...]) -> Any:
    """An example argument as Calc passes it: a data reference as a cell range, any other
    reference or inline array as rows of values, a left-out argument as None."""
    if isinstance(value, Ref):
        rows = resolve(value, cells)
        if cell_range_argument(spec.name):
            kinds = {(r, c): "logical" for r, row in enumerate(rows) for c, v in enumerate(row) if isinstance(v, bool)}
            return CalcRange(_calc_rows(rows), kinds=kinds)
        return _calc_rows(rows)
    if value is MISSING:
        return None
    if isinstance(value, tuple):
        return _calc_rows(value)
    return _calc_value(value)


def _harness_argument(value: Any, cells: tuple[tuple[Any, ...], ...]) -> Any:
    return resolve(value, cells) if isinstance(value, Ref) else value


def _shown(calc: Any) -> Any:
    """Calc's rows as the harness shows a table (lists of rows), a value as it is."""
    return [list(row) for row in calc] if isinstance(calc, tuple) else calc


def _same(a: Any, b: Any) -> bool:
    """Equal and of the same type, cell by cell (numbers exactly, text equal); a logical of the
    harness (``a``) is the number 1 or 0 in Calc (``b``), Calc's own form of TRUE and FALSE."""
    if isinstance(a, list):
        return isinstance(b, list) and len(a) == len(b) and all(map(_same, a, b))
    if isinstance(a, bool):
        return type(b) is float and b == float(a)
    return type(a) is type(b) and a == b


# --------------------------------------------------------------------------------------------
# the cells of a range argument


def test_range_cells_blanks_and_errors() -> None:
    rng = CalcRange(
        (("Head A", "Head B", ""), (1.5, "", "cap lost"), (0.0, 2.0, 3.0)),
        errors={(1, 1): 32767, (2, 0): 502, (2, 1): 532},
    )
    assert range_cells(rng) == [["Head A", "Head B", None], [1.5, "#N/A", "cap lost"], ["Err:502", "#DIV/0!", 3.0]]


def test_error_names() -> None:
    # Calc's error codes (from memory: LibreOffice's FormulaError numbers as Calc shows them)
    assert [error_name(c) for c in (32767, 532, 503, 519, 524, 525, 521)] == [
        "#N/A", "#DIV/0!", "#NUM!", "#VALUE!", "#REF!", "#NAME?", "#NULL!"]
    assert error_name(502) == "Err:502" and error_name(504.0) == "Err:504"


def test_range_cells_logicals_and_dates() -> None:
    rng = CalcRange(
        ((1.0, 0.0, 45000.5), (0.25, "text", 7.0)),
        kinds={(0, 0): "logical", (0, 1): "logical", (0, 2): "date", (1, 0): "time", (1, 1): "date",
               (5, 5): "date"},
    )
    cells = range_cells(rng)
    assert cells[0][:2] == [True, False] and type(cells[0][0]) is bool
    # serial 45000.5 from Calc's default null date 1899-12-30 is 2023-03-15 at noon (from memory,
    # checked on a calendar: serial 45000 is 15 March 2023)
    assert cells[0][2] == dt.datetime(2023, 3, 15, 12, 0)
    assert cells[1] == [dt.datetime(1899, 12, 30, 6, 0), "text", 7.0]  # a time alone is on day zero
    # another null date (the 1904 date system, common practice in old Mac workbooks)
    assert range_cells(CalcRange(((0.0, 1.5),), kinds={(0, 0): "date", (0, 1): "date"}, null_date=(1904, 1, 1))) == [
        [dt.datetime(1904, 1, 1), dt.datetime(1904, 1, 2, 12, 0)]]


def test_error_wins_over_a_format() -> None:
    rng = CalcRange(((0.0,),), errors={(0, 0): 519}, kinds={(0, 0): "logical"})
    assert range_cells(rng) == [["#VALUE!"]]


# --------------------------------------------------------------------------------------------
# any other argument


def test_argument_values() -> None:
    assert argument(None, NUMBER) is None  # left out
    assert argument("", NUMBER) is None  # a blank cell
    assert argument(0.01, NUMBER) == 0.01 and argument("tukey", NUMBER) == "tukey"
    assert argument(1.0, NUMBER) == 1.0 and type(argument(1.0, NUMBER)) is float
    assert argument(1.0, LOGICAL) is True and argument(0.0, LOGICAL) is False  # Calc's TRUE, FALSE
    assert argument(2.0, LOGICAL) == 2.0 and argument("auto", LOGICAL) == "auto"


def test_argument_arrays() -> None:
    # {1;-0.5;-0.5} as Calc passes an inline array
    assert argument(((1.0, -0.5, -0.5),), NUMBER) == [[1.0, -0.5, -0.5]]
    assert argument(((1.0,), ("",), ("B",)), NUMBER) == [[1.0], [None], ["B"]]
    rng = CalcRange((("", 2.0),))
    assert argument(rng, NUMBER) == [[None, 2.0]]


def test_to_calc() -> None:
    assert to_calc(None, "scalar") == "" and to_calc(0.25, "scalar") == 0.25
    assert to_calc("sheetfuncs: no data", "scalar") == "sheetfuncs: no data"
    assert to_calc("sheetfuncs: no data", "table") == (("sheetfuncs: no data",),)
    assert to_calc([["Source", "F"], ["Factor", None]], "table") == (("Source", "F"), ("Factor", ""))


# --------------------------------------------------------------------------------------------
# every registry example, against the harness


def _example_calls(name: str) -> tuple[Any, Any]:
    rec = REGISTRY[name]
    cells = rec.example.cells or EXAMPLE_SHEET
    args = rec.example.args
    given = [_calc_argument(v, a, cells) for v, a in zip(args, rec.args)] + [None] * (len(rec.args) - len(args))
    return call(name, given), harness.call(name, *(_harness_argument(v, cells) for v in args))


@pytest.mark.parametrize("name", list(REGISTRY))
def test_example_equals_harness(name) -> None:
    calc, reference = _example_calls(name)
    if REGISTRY[name].result == "table":
        assert isinstance(calc, tuple) and all(isinstance(r, tuple) for r in calc), f"{name}: rows for Calc"
        assert len({len(r) for r in calc}) == 1, f"{name}: rows of equal length"
    assert _same(reference, _shown(calc)), f"{name}: Calc's result differs from the harness"
    assert not harness.is_message(_shown(calc)), f"{name}: the example gives a message"


def test_blank_result_cells_are_empty_text() -> None:
    calc, reference = _example_calls("SF_TABLE")
    blanks = [(r, c) for r, row in enumerate(reference) for c, v in enumerate(row) if v == harness.BLANK]
    assert blanks and all(calc[r][c] == "" for r, c in blanks)  # harness BLANK '' is Calc's ''


def test_wrong_argument_count_is_one_line() -> None:
    shown = call("SF_P", [CalcRange(_calc_rows(EXAMPLE_SHEET))])
    assert harness.is_message(shown) and "SF_P" in shown


# --------------------------------------------------------------------------------------------
# cells the functions do not take as measurements, as with xlwings


def _sheet_with(r: int, c: int, value: Any) -> list[list[Any]]:
    rows = [list(row) for row in EXAMPLE_SHEET]
    rows[r][c] = value
    return rows


@pytest.mark.parametrize(("code", "cell"), [(32767, harness.NA), (532, harness.DIV0), (502, "Err:502")])
def test_error_cell_names_its_position(code, cell) -> None:
    rng = CalcRange(_calc_rows(EXAMPLE_SHEET), errors={(3, 1): code})
    shown = call("SF_P", [rng, None, None])
    assert harness.is_message(shown)
    assert shown == harness.call("SF_P", _sheet_with(3, 1, cell)), "Calc and xlwings name the error alike"
    assert f"error {error_name(code)} at row 4, column 2 of the range" in shown, shown
    table = call("SF_TABLE", [rng, None, None, None])
    assert table == ((harness.call("SF_TABLE", _sheet_with(3, 1, cell)),),)


def test_date_and_logical_cells_as_with_xlwings() -> None:
    rows = _calc_rows(EXAMPLE_SHEET)
    dated = CalcRange(rows, kinds={(2, 0): "date"})
    expected = harness.call("SF_P", _sheet_with(2, 0, dt.datetime(1899, 12, 30) + dt.timedelta(days=1.49)))
    assert call("SF_P", [dated, None, None]) == expected and harness.is_message(expected)
    logical = CalcRange(_calc_rows(_sheet_with(2, 0, True)), kinds={(2, 0): "logical"})
    assert call("SF_P", [logical, None, None]) == harness.call("SF_P", _sheet_with(2, 0, True))
    assert isinstance(call("SF_P", [logical, None, None]), float)  # a logical is left out, not an error


def test_rows_without_blanks_go_on_as_they_are() -> None:
    rows = (("Head A", "Head B"), (1.5, 2.0), (1.7, 2.4))
    cleaned = range_cells(CalcRange(rows, blanks=False))
    assert cleaned == list(rows) and all(a is b for a, b in zip(cleaned, rows))
    # a formula cell showing empty text ('' with no empty cell in the range) is still a blank to
    # the core: the same p-value as the harness gives with that cell blank (the Python call)
    with_text = (("Head A", "Head B"), (1.5, 2.0), (1.7, ""), (1.6, 2.4))
    given = [CalcRange(with_text, blanks=False), None, None]
    assert call("SF_P", given) == harness.call("SF_P", [list(r) for r in with_text])
