"""Calling the worksheet functions the way xlwings does on Windows, with no spreadsheet at hand.

On Windows, xlwings reads every argument of a worksheet function through its conversion
pipeline, calls the function, and converts the return value before the host writes it into the
cells. Off Windows its decorators are no-ops and that pipeline needs a running spreadsheet, so
this module re-implements the conversion for the options each function declares in the registry
(:data:`sheetfuncs.udfs.REGISTRY`). Tests and the benchmark use it; it runs none of xlwings'
code.

What a caller writes for a cell (host values):

* a number: ``float`` (``int`` is accepted too: the host holds every number as a double, so it
  arrives as ``float``); ``decimal.Decimal`` for a currency-formatted cell;
* ``bool`` for a logical, ``str`` for text, ``None`` (or ``""``) for a blank cell;
* ``datetime.datetime`` or ``datetime.date`` for a date (it arrives as a ``datetime``);
* :class:`ErrorCell` for an error value, e.g. :data:`NA` (``#N/A``). The host hands an error over
  as a COM error code; xlwings turns the seven classic codes into their text when the argument is
  read with ``err_to_str=True`` (into a blank otherwise!), and passes newer ones such as
  ``#SPILL!`` and ``#CALC!`` through as the bare integer code.

A range (or an array constant such as ``{1;-0.5;-0.5}``) is a list or tuple of rows; one cell
is just its value. A flat list or tuple of values is one row, as xlwings takes it: pywin32 hands
a horizontal array constant such as ``{1,-0.5,-0.5}`` over as ``(1.0, -0.5, -0.5)``. :data:`MISSING` stands for an argument left out of the formula.

Reading an argument (xlwings 0.37, ``conversion.read`` on a UDF argument):

1. the host value: a block of cells is a tuple of row tuples, one cell is its value;
2. ``Ensure2DStage``: one value becomes ``[[value]]``, a flat sequence one row;
3. the Windows engine's cleaning: ``""`` and ``None`` become ``None``; dates become
   ``datetime``; a classic error code becomes its text (``err_to_str``) or ``None``; rows
   become lists;
4. ``AdjustDimensionsStage``: ``ndim=2`` keeps the rows; no ``ndim`` squeezes (one cell to its
   value, one row or one column to a flat list).

A missing argument arrives as the Python default of its parameter.

Writing the return value (``conversion.write``): one value becomes ``[[value]]`` and a flat list
becomes one row; rows must all be the same length; then each element: NaN and ``None`` become
``""`` (a blank), numpy numbers become ``float``, everything else is kept. The harness finally
checks that the host can hold every element (finite numbers, text of at most 32,767 characters,
or 255 in a cell of an array result, logicals, dates) and raises :class:`HostError` otherwise, because that would be a bug of the
worksheet function, not an input problem.
"""

from __future__ import annotations

import datetime as _dt
import decimal
import math
from collections.abc import Iterable, Sequence
from dataclasses import dataclass
from itertools import chain, filterfalse
from operator import countOf
from typing import Any

import numpy as np

from ..errors import PREFIX
from ..input import COM_ERROR_CODES  # each error value's COM code, by name (re-exported)
from .convert import TABLE_TEXT_LIMIT
from .functions import REGISTRY
from .registry import MISSING, Function

__all__ = [
    "ErrorCell",
    "HostError",
    "MISSING",
    "BLANK",
    "NA", "DIV0", "VALUE", "REF", "NAME", "NUM", "NULL", "SPILL", "CALC",
    "COM_ERROR_CODES",
    "XLWINGS_ERROR_TEXTS",
    "host_value",
    "read_argument",
    "write_result",
    "prepare",
    "finish",
    "call",
    "column",
    "row",
    "is_message",
]

#: What the host shows for a blank result cell: xlwings writes ``""``.
BLANK = ""

#: The codes xlwings 0.37 turns into text under ``err_to_str`` (its Windows ``cell_errors``).
XLWINGS_ERROR_TEXTS: dict[int, str] = {
    COM_ERROR_CODES[name]: name
    for name in ("#DIV/0!", "#N/A", "#NAME?", "#NULL!", "#NUM!", "#REF!", "#VALUE!")
}
_TEXT_LIMIT = 32767


class HostError(Exception):
    """The host could not take what a worksheet function returned (a bug, not an input problem)."""


@dataclass(frozen=True)
class ErrorCell:
    """A cell holding one of the host's error values, e.g. ``ErrorCell("#N/A")``."""

    name: str

    def __post_init__(self) -> None:
        if self.name not in COM_ERROR_CODES:
            raise ValueError(f"unknown error value {self.name!r}")

    @property
    def com_code(self) -> int:
        return COM_ERROR_CODES[self.name]


NA, DIV0, VALUE, REF, NAME, NUM, NULL, SPILL, CALC = (
    ErrorCell(n) for n in ("#N/A", "#DIV/0!", "#VALUE!", "#REF!", "#NAME?", "#NUM!", "#NULL!", "#SPILL!", "#CALC!")
)

#: Cell types that the host hand-over and the cleaning leave exactly as they are (``""`` aside,
#: which becomes ``None``): the per-cell routine is the identity on them.
_PLAIN = frozenset({float, type(None)})
_UNCHANGED = frozenset({float, type(None), bool, str, decimal.Decimal})


def host_value(v: Any) -> Any:
    """What the host hands over through COM for one cell value."""
    t = type(v)
    if t is float or v is None or t is bool or t is str:
        return v
    if t is int:
        return float(v)
    if isinstance(v, ErrorCell):
        return v.com_code
    if isinstance(v, _dt.datetime):
        return v
    if isinstance(v, _dt.date):
        return _dt.datetime(v.year, v.month, v.day)
    if isinstance(v, decimal.Decimal):
        return v
    if isinstance(v, np.floating):
        return float(v)
    raise TypeError(f"a cell cannot hold {v!r} ({t.__name__}); use a number, text, bool, None, date or ErrorCell")


def _clean(v: Any, err_to_str: bool) -> Any:
    """The Windows engine's cleaning of one value read from the host."""
    if v is None or (type(v) is str and v == ""):
        return None
    if isinstance(v, _dt.datetime):
        return _dt.datetime(v.year, v.month, v.day, v.hour, v.minute, v.second, v.microsecond)
    if type(v) is int and v in XLWINGS_ERROR_TEXTS:
        return XLWINGS_ERROR_TEXTS[v] if err_to_str else None
    return v


def _as_rows(value: Sequence[Any]) -> list[Sequence[Any]]:
    if not value:
        raise TypeError("a range needs at least one cell")
    first = type(value[0])
    if not (first in (list, tuple) and countOf(map(type, value), first) == len(value)):
        if not all(isinstance(r, (list, tuple)) for r in value):
            raise TypeError("give a range as rows of cells, e.g. [[1.0, 2.0], [3.0, None]] (see column() and row())")
    width = len(value[0])
    if width == 0 or countOf(map(len, value), width) != len(value):
        raise TypeError("a range is a rectangle: every row needs the same number of cells")
    return list(value)


def _unchanged(cells: Iterable[Any], kinds: set[type]) -> bool:
    """Would the per-cell routine leave every one of ``cells`` (whose types are ``kinds``) alone?"""
    if kinds <= _PLAIN:
        return True
    # the other unchanged types, except the empty string (a blank: it becomes None); only falsy
    # cells can be "", and filterfalse finds them at C speed
    return kinds <= _UNCHANGED and "" not in filterfalse(None, cells)


def _clean_row(r: Sequence[Any], err_to_str: bool) -> list[Any]:
    """One row as the Windows engine cleans it: host value, then cleaning, cell by cell."""
    if _unchanged(r, set(map(type, r))):
        return list(r)
    return [_clean(host_value(v), err_to_str) for v in r]


#: Cells per block of rows in :func:`_clean_rows` (a block stays in the processor's cache).
_BLOCK_CELLS = 8192


def _clean_rows(rows: list[Sequence[Any]], err_to_str: bool) -> list[list[Any]]:
    """Every row cleaned (lists of cells), with no per-cell work where it would change nothing.

    The first row (often a row of labels) is checked on its own; the others in blocks of rows,
    one C-speed pass over a block's cell types. When all of them are floats (the usual block of
    measurements) or otherwise unchanged, the rows are only copied into lists; else each row of
    the block is checked alone.
    """
    out = [_clean_row(rows[0], err_to_str)]
    step = max(1, _BLOCK_CELLS // len(rows[0]))
    for i in range(1, len(rows), step):
        part = rows[i:i + step]
        kinds = list(map(type, chain.from_iterable(part)))
        if kinds.count(float) == len(kinds) or _unchanged(chain.from_iterable(part), set(kinds)):
            out += map(list, part)
        else:
            out += [_clean_row(r, err_to_str) for r in part]
    return out


def read_argument(value: Any, options: dict[str, Any]) -> Any:
    """One argument as the worksheet function receives it, for the xlwings ``options`` declared."""
    err_to_str = bool(options.get("err_to_str", False))
    if isinstance(value, (list, tuple)):
        if value and not isinstance(value[0], (list, tuple)):
            value = [value]  # a flat sequence is one row (xlwings' Ensure2DStage)
        cleaned = _clean_rows(_as_rows(value), err_to_str)
    else:
        cleaned = [[_clean(host_value(value), err_to_str)]]
    ndim = options.get("ndim")
    if ndim == 2:
        return cleaned
    if ndim is not None:
        raise ValueError(f"the harness covers ndim=2 and the default, not ndim={ndim!r}")
    if len(cleaned) == 1:
        return cleaned[0][0] if len(cleaned[0]) == 1 else cleaned[0]
    if len(cleaned[0]) == 1:
        return [r[0] for r in cleaned]
    return cleaned


def _prepare(x: Any) -> Any:
    """xlwings' preparation of one element for writing (Windows engine)."""
    if isinstance(x, (_dt.date, _dt.datetime)):
        return x
    if isinstance(x, (np.floating, float)) and np.isnan(x):
        return BLANK
    if isinstance(x, np.number):
        return float(x)
    if x is None:
        return BLANK
    return x


def _host_check(x: Any) -> None:
    t = type(x)
    if t is float:
        if not math.isfinite(x):
            raise HostError(f"the host cannot hold the number {x!r}; return the largest double instead")
    elif t is str:
        if len(x) > _TEXT_LIMIT:
            raise HostError(f"text of {len(x)} characters is longer than a cell holds")
    elif t is int:
        if abs(x) > 2**53:
            raise HostError(f"the integer {x} is too large for a cell")
    elif not (t is bool or isinstance(x, _dt.date)):
        raise HostError(f"the host cannot hold {x!r} ({t.__name__})")


def write_result(value: Any, options: dict[str, Any] | None = None) -> tuple[list[list[Any]], bool]:
    """The return value as xlwings hands it to the host: ``(rows, scalar)``."""
    if options:
        raise ValueError(f"the harness covers plain returns, not options {options!r}")
    if isinstance(value, np.ndarray):
        value = value.tolist()
    if isinstance(value, (list, tuple)):
        if not value:
            raise HostError("an empty result cannot be written")
        rows = list(value) if isinstance(value[0], (list, tuple)) else [value]
        if any(len(r) != len(rows[0]) for r in rows):
            raise HostError("all rows of a result must have the same length")
        scalar = False
    else:
        rows, scalar = [[value]], True
    out = [[_prepare(x) for x in r] for r in rows]
    for r in out:
        for x in r:
            _host_check(x)
            if not scalar and type(x) is str and len(x) > TABLE_TEXT_LIMIT:
                raise HostError(f"text of {len(x)} characters in an array result; Excel keeps at most {TABLE_TEXT_LIMIT}")
    return out, scalar


def _record(name: str) -> Function:
    try:
        return REGISTRY[name]
    except KeyError:
        raise KeyError(f"no worksheet function {name!r}; known: {', '.join(REGISTRY)}") from None


def prepare(name: str, *args: Any, **named: Any) -> list[Any]:
    """The arguments exactly as xlwings passes them to function ``name``."""
    rec = _record(name)
    if len(args) > len(rec.args):
        raise TypeError(f"{name} takes at most {len(rec.args)} arguments, got {len(args)}")
    given = list(args) + [MISSING] * (len(rec.args) - len(args))
    names = [a.name for a in rec.args]
    for key, value in named.items():
        if key not in names:
            raise TypeError(f"{name} has no argument {key!r}")
        given[names.index(key)] = value
    out = []
    for a, v in zip(rec.args, given):
        if v is MISSING:
            if a.required:
                raise TypeError(f"{name}: the host does not allow leaving out {a.name}")
            out.append(None)  # every optional parameter defaults to None
        else:
            out.append(read_argument(v, a.xlwings_options))
    return out


def finish(name: str, returned: Any) -> Any:
    """What the cell shows: the value for a scalar return, else the spilled rows."""
    rows, scalar = write_result(returned, dict(_record(name).ret_options))
    return rows[0][0] if scalar else rows


def call(name: str, *args: Any, **named: Any) -> Any:
    """Call worksheet function ``name`` as the host and xlwings would, and return what it shows."""
    rec = _record(name)
    return finish(name, rec.call(*prepare(name, *args, **named)))


def column(values: Iterable[Any]) -> list[list[Any]]:
    """A one-column range from its values."""
    return [[v] for v in values]


def row(values: Iterable[Any]) -> list[list[Any]]:
    """A one-row range from its values."""
    return [list(values)]


def is_message(shown: Any) -> bool:
    """Does the cell show one line of ``sheetfuncs: ...`` text?"""
    return isinstance(shown, str) and shown.startswith(PREFIX) and "\n" not in shown
