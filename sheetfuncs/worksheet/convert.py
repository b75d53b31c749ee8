"""Cells in and cells out: what a worksheet function does on either side of its one core call.

In: each argument normalised by its kind (:func:`normalise`: the documented default for a
missing argument or a blank cell, one value out of a one-cell range, numbers checked, text
trimmed); a per-group range (pooling labels, contrast weights, the columns of group summaries)
checked for error cells (:func:`check_range_errors`) and read as one flat list
(:func:`per_group_column`).

Out: one value as a cell holds it (:func:`to_cell`: infinity as the largest double, ``None``
as blank, NaN a bug), a table as a rectangle of cells (:func:`shape_result`), and an input
problem as the one line of text the cell shows (:func:`cell_message`).

The rules are the worksheet-function conventions of the project guide. An argument is known
here only by the attributes the conversion reads (:class:`ArgSpec`), which the records of
:mod:`sheetfuncs.worksheet.registry` have.
"""

from __future__ import annotations

import datetime as _dt
import decimal
import math
import numbers
import sys
from typing import Any, Protocol

import numpy as np

from ..errors import InputError, message
from ..input import cell_position, check_number, error_text, format_label, one_line

__all__ = [
    "MAX_DOUBLE",
    "TABLE_TEXT_LIMIT",
    "ArgSpec",
    "normalise",
    "check_range_errors",
    "per_group_column",
    "to_cell",
    "shape_result",
    "cell_message",
    "bug_message",
    "NotANumber",
]

#: The largest double: what a cell shows for an infinite result (the host cannot hold infinity).
MAX_DOUBLE = sys.float_info.max
#: Longest text of a cell of a table result: Excel keeps at most 255 characters of text in an
#: array a function returns (longer text is cut or fails). Longer text (a long group label) is
#: cut to this length, ending in "…".
TABLE_TEXT_LIMIT = 255
#: Longest message a cell gets; a message quoting a huge label is cut short (a cell holds at
#: most 32,767 characters).
_MESSAGE_MAX = 1000


class ArgSpec(Protocol):
    """What the conversion reads of an argument's record (:class:`~.registry.Arg`)."""

    @property
    def name(self) -> str: ...

    @property
    def kind(self) -> str: ...

    @property
    def default(self) -> Any: ...

    @property
    def required(self) -> bool: ...


# --------------------------------------------------------------------------------------------
# converting in


def _one_value(value: Any, arg: ArgSpec) -> Any:
    """A single-value argument as one cell value (a one-cell range arrives as that value)."""
    if isinstance(value, (list, tuple)):
        cells = [c for row in value for c in (row if isinstance(row, (list, tuple)) else [row])]
        if len(cells) == 1:
            return cells[0]
        raise InputError(
            f"{arg.name} must be one value, not a range of {len(cells)} cells; "
            "point it at a single cell or type the value"
        )
    return value


def normalise(value: Any, arg: ArgSpec) -> Any:
    """One argument as its wrapper expects it: defaults filled in, checked by kind."""
    if arg.kind == "range":
        if value is None or (isinstance(value, str) and value == ""):
            if arg.required:
                raise InputError(f"{arg.name} is missing; select the cells that hold it")
            return arg.default
        if not isinstance(value, (list, tuple, np.ndarray)):
            return [[value]]  # one value typed in place of a range
        return value
    value = _one_value(value, arg)
    if value is None or (isinstance(value, str) and value.strip() == ""):
        if arg.required:
            raise InputError(
                f"{arg.name} is missing (or its cell is blank); give "
                + ("a number" if arg.kind == "number" else "a value")
            )
        return arg.default
    err = error_text(value)
    if err is not None:
        raise InputError(f"{arg.name} holds the error {err}; fix that cell")
    if arg.kind == "number":
        if isinstance(value, (_dt.date, _dt.time)):
            raise InputError(f"{arg.name} is a date; give a number")
        return check_number(value, arg.name)
    if arg.kind == "text":
        return format_label(value)  # text trimmed; a number or date as it reads
    return value  # logical: a bool or text such as "auto", read by the core


def check_range_errors(cells: Any, arg: ArgSpec) -> None:
    """Error cells in a per-group range (pooling, weights, summaries) name the cell."""
    if not isinstance(cells, (list, tuple, np.ndarray)):
        return
    for r, row in enumerate(cells):
        for c, v in enumerate(row if isinstance(row, (list, tuple, np.ndarray)) else [row]):
            err = error_text(v)
            if err is not None:
                raise InputError(
                    f"the {arg.name} range holds the error {err} at "
                    f"{cell_position(r, c)}; fix or clear that cell"
                )


def per_group_column(cells: Any, arg: ArgSpec) -> list[Any] | None:
    """A per-group range (one row or one column) as a flat list; blanks at the end are dropped."""
    if cells is None:
        return None
    check_range_errors(cells, arg)
    flat = one_line(cells, arg.name)
    while flat and (flat[-1] is None or (isinstance(flat[-1], str) and flat[-1].strip() == "")):
        flat.pop()
    for i, v in enumerate(flat):
        if v is None or (isinstance(v, str) and v.strip() == ""):
            raise InputError(
                f"entry {i + 1} of {arg.name} is blank; give one value per group, "
                "with no gaps"
            )
    return flat


# --------------------------------------------------------------------------------------------
# shaping out


class NotANumber(ArithmeticError):
    """A result that promises a number came out as NaN: a bug to report, never a blank cell."""


def to_cell(value: Any) -> Any:
    """One result value as a cell holds it: numbers as float, inf as the largest double,
    ``None`` (a cell the result leaves empty on purpose) as blank, text and logicals as they
    are. NaN raises :class:`NotANumber`: a number the core could not form is never shown as a
    blank."""
    if value is None or isinstance(value, str):
        return value
    if isinstance(value, (bool, np.bool_)):
        return bool(value)
    if isinstance(value, (numbers.Real, decimal.Decimal)):
        v = float(value)
        if math.isnan(v):
            raise NotANumber("a result came out as NaN")
        if math.isinf(v):
            return MAX_DOUBLE if v > 0 else -MAX_DOUBLE
        return v
    raise TypeError(f"a result of type {type(value).__name__} cannot go into a cell")


def shape_result(value: Any, result: str) -> Any:
    """A wrapper's return value as cells: one value for a scalar, else rows of equal length,
    text cut to :data:`TABLE_TEXT_LIMIT` characters."""
    if result == "scalar":
        return to_cell(value)
    rows = [[_table_cell(v) for v in row] for row in value]
    width = max((len(r) for r in rows), default=0)
    return [r + [None] * (width - len(r)) for r in rows]


def _table_cell(value: Any) -> Any:
    cell = to_cell(value)
    if isinstance(cell, str) and len(cell) > TABLE_TEXT_LIMIT:
        return cell[: TABLE_TEXT_LIMIT - 1] + "…"
    return cell


def cell_message(err: InputError) -> str:
    """An input problem as the one line of text the cell shows."""
    text = message(err.reason)
    return text if len(text) <= _MESSAGE_MAX else text[: _MESSAGE_MAX - 1] + "…"


def bug_message(name: str, err: BaseException) -> str:
    """The one line a cell shows for an unforeseen error in worksheet function ``name``:
    ``sheetfuncs: SF_PAIRS could not compute this (OverflowError); please report it with the
    cell values``."""
    kind = "a result that is not a number" if isinstance(err, NotANumber) else type(err).__name__
    return message(f"{name} could not compute this ({kind}); please report it with the cell values")
