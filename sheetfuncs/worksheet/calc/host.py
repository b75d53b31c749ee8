"""What Calc hands a worksheet function, and what it takes back: the host mapping for Calc.

The component (:mod:`.component`, running inside LibreOffice) gives each argument as Calc
passes it; this module turns it into what xlwings' cleaning gives the same function in Excel,
calls the function's wrapper (the very one xlwings calls, so the conversion in, the core call
and the shaping out are shared), and shapes the result as Calc takes it. Only the host
mapping differs:

* a cell-range argument (``data``) arrives as :class:`CalcRange`: the cell values
  (``getDataArray``: ``''`` for a blank, a float for a number, text), the error cells with
  Calc's error codes, and the cells formatted as logicals or dates. A blank becomes ``None``,
  an error cell its error's name (``#N/A``; Calc's own errors as Calc shows them, ``Err:502``),
  a logical ``True``/``False``, a date a ``datetime``: as xlwings hands them over in Excel;
* any other argument arrives as a value: ``None`` when left out, a float, text, or rows of
  values for a range or an inline array (``((1.0, -0.5, -0.5),)``); ``''`` is a blank, and
  Calc's logicals are numbers, so a logical argument's 1 or 0 is TRUE or FALSE;
* the result goes back as a number or one line of text, a table as rows of equal length with
  ``''`` in the cells the table leaves blank (``None`` would show as an error in Calc), a
  logical as 1 or 0 (Calc's own form of TRUE and FALSE), and a
  table function's message as a table of one cell (Calc takes a table function's result only as
  rows of values: the interface declares it so).
"""

from __future__ import annotations

import datetime as _dt
from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field
from typing import Any

from ..convert import bug_message
from ..functions import REGISTRY
from ..registry import Arg

__all__ = ["CALC_ERRORS", "CalcRange", "error_name", "range_cells", "argument", "call", "to_calc",
           "read_failure"]

#: Calc's error codes that have an error value of their own, by the text Calc shows.
CALC_ERRORS: Mapping[int, str] = {
    32767: "#N/A", 532: "#DIV/0!", 503: "#NUM!", 519: "#VALUE!", 524: "#REF!", 525: "#NAME?",
    521: "#NULL!",
}


@dataclass(frozen=True)
class CalcRange:
    """A cell-range argument as the component reads it from Calc.

    ``values`` are the rows of ``getDataArray``; ``errors`` maps (row, column) within the range
    to Calc's error code; ``kinds`` maps (row, column) to ``logical``, ``date`` or ``time`` for
    cells whose number format says so; ``null_date`` is the document's day zero; ``blanks`` is
    False when Calc found no empty cell in the range: the rows then go on as they are (a formula
    cell showing empty text stays ``''``, which the cleaning reads as a blank too).
    """

    values: Sequence[Sequence[Any]]
    errors: Mapping[tuple[int, int], int] = field(default_factory=dict)
    kinds: Mapping[tuple[int, int], str] = field(default_factory=dict)
    null_date: tuple[int, int, int] = (1899, 12, 30)
    blanks: bool = True


def error_name(code: int) -> str:
    """What Calc shows for error ``code``: ``#N/A`` for 32767, ``Err:502`` for 502."""
    return CALC_ERRORS.get(int(code), f"Err:{int(code)}")


def _blank(v: Any) -> Any:
    return None if (v is None or (type(v) is str and v == "")) else v


def _kind_value(v: Any, kind: str, null_date: tuple[int, int, int]) -> Any:
    if not isinstance(v, float):
        return v
    if kind == "logical":
        return v != 0.0
    return _dt.datetime(*null_date) + _dt.timedelta(days=v)


def _clean_row(row: Sequence[Any]) -> Sequence[Any]:
    """One row with ``None`` for its blanks; a row without blanks is kept as it is (the usual
    row of measurements: the test runs at C speed, and the wrapper reads rows as sequences)."""
    if "" not in row:
        return row
    return [_blank(v) for v in row]


def range_cells(rng: CalcRange) -> list[Sequence[Any]]:
    """The cells of a range argument as xlwings' cleaning hands them over in Excel."""
    rows: list[Any] = list(map(_clean_row, rng.values)) if rng.blanks else list(rng.values)
    for r in {r for r, _ in rng.kinds} | {r for r, _ in rng.errors}:
        if r < len(rows):
            rows[r] = list(rows[r])
    for (r, c), kind in rng.kinds.items():
        if r < len(rows) and c < len(rows[r]):
            rows[r][c] = _kind_value(rows[r][c], kind, rng.null_date)
    for (r, c), code in rng.errors.items():
        if r < len(rows) and c < len(rows[r]):
            rows[r][c] = error_name(code)
    return rows


def argument(value: Any, arg: Arg) -> Any:
    """One argument as the wrapper receives it from xlwings in Excel."""
    if isinstance(value, CalcRange):
        return range_cells(value)
    if isinstance(value, (tuple, list)):
        return [[_blank(v) for v in (row if isinstance(row, (tuple, list)) else (row,))]
                for row in value]
    value = _blank(value)
    if arg.kind == "logical" and isinstance(value, float) and value in (0.0, 1.0):
        return value == 1.0  # Calc holds TRUE and FALSE as 1 and 0
    return value


def to_calc(shown: Any, result: str) -> Any:
    """A wrapper's result as Calc takes it: a value, or rows with ``''`` for blank cells (a
    message of a table function as one row of one cell)."""
    if result == "scalar":
        return "" if shown is None else shown
    if isinstance(shown, str):  # a message: one line in the first cell
        return ((shown,),)
    return tuple(tuple(_calc_value(v) for v in row) for row in shown)


def _calc_value(v: Any) -> Any:
    """One cell of a table for Calc: ``''`` for blank, a logical as the number 1 or 0 (Calc
    has no logical type: TRUE is 1; format the column as Boolean to read TRUE and FALSE)."""
    if v is None:
        return ""
    if v is True or v is False:
        return 1.0 if v else 0.0
    return v


def call(name: str, given: Sequence[Any]) -> Any:
    """Call worksheet function ``name`` with the arguments as Calc gave them."""
    rec = REGISTRY[name]
    if len(given) != len(rec.args):
        return bug_message(name, TypeError(f"{len(given)} arguments for {len(rec.args)}"))
    try:
        values = [argument(v, a) for v, a in zip(given, rec.args)]
    except Exception as err:  # the last guard: one line in the cell
        return bug_message(name, err)
    return to_calc(rec.call(*values), rec.result)


def read_failure(name: str, err: BaseException) -> str:
    """The one line a cell shows when Calc's cells could not be read."""
    return bug_message(name, err)
