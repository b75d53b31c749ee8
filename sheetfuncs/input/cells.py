"""What a cell holds and where it is: the host's error values, A1 references, column letters.

Every front that speaks of cells uses this one grammar: the ranges read from files, the
positions named in messages, the worksheet functions' documentation examples.
"""

from __future__ import annotations

import datetime as _dt
import decimal
import math
import numbers
import re
from dataclasses import dataclass
from typing import Any

import numpy as np

from ..errors import InputError

__all__ = [
    "ERROR_TEXTS", "COM_BASE", "COM_LOW", "COM_HIGH", "COM_NAMES", "COM_ERROR_CODES", "MAX_ROWS", "MAX_COLS",
    "error_text", "is_error_text", "com_error_name", "classify", "cell_position", "column_letters",
    "column_number", "a1_range", "RangeRef", "parse_range",
]

#: Error texts as the host shows them (xlwings' ``err_to_str`` gives the first seven; newer hosts
#: add the rest, which may also arrive as text from CSV exports). LibreOffice Calc shows its other
#: errors as ``Err:`` and a three-digit code (:func:`is_error_text`).
ERROR_TEXTS = frozenset(
    {
        "#NULL!", "#DIV/0!", "#VALUE!", "#REF!", "#NAME?", "#NUM!", "#N/A",
        "#SPILL!", "#CALC!", "#GETTING_DATA", "#FIELD!", "#BLOCKED!", "#CONNECT!",
        "#UNKNOWN!", "#BUSY!", "#PYTHON!",
    }
)

#: COM error codes (``0x800A0000 + xlErr``) that xlwings may pass through unconverted.
COM_LOW, COM_HIGH = -2146826300, -2146826200
COM_NAMES = {
    2000: "#NULL!", 2007: "#DIV/0!", 2015: "#VALUE!", 2023: "#REF!", 2029: "#NAME?",
    2036: "#NUM!", 2042: "#N/A", 2043: "#GETTING_DATA", 2045: "#SPILL!", 2046: "#CONNECT!",
    2047: "#BLOCKED!", 2048: "#UNKNOWN!", 2049: "#FIELD!", 2050: "#CALC!", 2051: "#BUSY!",
}
COM_BASE = -2146828288  # 0x800A0000 as a signed 32-bit integer

#: Each error value's COM code, by name (the inverse of :data:`COM_NAMES`).
COM_ERROR_CODES: dict[str, int] = {name: COM_BASE + number for number, name in COM_NAMES.items()}

#: The host's sheet size (rows, columns).
MAX_ROWS, MAX_COLS = 1_048_576, 16_384


# --------------------------------------------------------------------------------------------
# what a cell holds


def com_error_name(code: int) -> str:
    """The error value a COM error code stands for, e.g. ``#N/A``."""
    return COM_NAMES.get(code - COM_BASE, f"with code {code}")


def is_error_text(s: str) -> bool:
    """Is the (trimmed) text ``s`` an error value: one of :data:`ERROR_TEXTS`, or one of
    LibreOffice Calc's own error values such as ``Err:502``?"""
    return s in ERROR_TEXTS or (len(s) == 7 and s.startswith("Err:") and s[4:].isdigit())


def error_text(v: Any) -> str | None:
    """The error's name if the cell holds a host error value, else None."""
    if isinstance(v, str):
        s = v.strip()
        return s if is_error_text(s) else None
    if isinstance(v, (int, np.integer)) and not isinstance(v, (bool, np.bool_)):
        iv = int(v)
        if COM_LOW <= iv <= COM_HIGH:
            return com_error_name(iv)
    return None


def classify(v: Any) -> tuple[str, Any]:
    """``(kind, value)``: kind is number, blank, text, logical, error, date or other."""
    if v is None:
        return "blank", None
    if isinstance(v, (bool, np.bool_)):
        return "logical", bool(v)
    if isinstance(v, float):
        return "number", v
    if isinstance(v, str):
        if v == "":
            return "blank", None
        s = v.strip()
        if is_error_text(s):
            return "error", s
        return "text", v
    if isinstance(v, (int, np.integer)):
        iv = int(v)
        if COM_LOW <= iv <= COM_HIGH:
            return "error", com_error_name(iv)
        try:
            return "number", float(iv)
        except OverflowError:  # beyond the double range: rejected below as infinite
            return "number", math.inf if iv > 0 else -math.inf
    if isinstance(v, (_dt.datetime, _dt.date, _dt.time)):
        return "date", v
    if isinstance(v, (decimal.Decimal, np.floating)) or isinstance(v, numbers.Real):
        return "number", float(v)
    return "other", v


def cell_position(row: int, col: int) -> str:
    """1-based position of a 0-based cell within a range: ``row 3, column 2``."""
    return f"row {row + 1}, column {col + 1}"


# --------------------------------------------------------------------------------------------
# A1 references


def column_letters(col: int) -> str:
    """1-based column number as letters: 1 -> A, 27 -> AA."""
    if col < 1:
        raise ValueError("column numbers start at 1")
    out = ""
    while col:
        col, rem = divmod(col - 1, 26)
        out = chr(65 + rem) + out
    return out


def column_number(letters: str) -> int:
    """Column letters as a 1-based number: A -> 1, AA -> 27 (either case)."""
    n = 0
    for ch in letters.upper():
        n = n * 26 + (ord(ch) - 64)
    return n


@dataclass(frozen=True)
class RangeRef:
    """A parsed range reference: 1-based bounds; ``max_row``/``max_col`` ``None`` = open."""

    min_row: int
    min_col: int
    max_row: int | None
    max_col: int | None
    sheet: str | None = None

    def a1(self, last_row: int | None = None, last_col: int | None = None) -> str:
        """The reference in A1 form; an open side is closed at ``last_row``/``last_col`` when
        given, else written as the host writes it (``B:E`` for whole columns, ``2:40`` for
        whole rows)."""
        if self.max_row is None and last_row is None and self.min_row == 1:
            c2 = self.max_col if self.max_col is not None else (last_col or self.min_col)
            return f"{column_letters(self.min_col)}:{column_letters(c2)}"
        if self.max_col is None and last_col is None and self.min_col == 1:
            r2 = self.max_row if self.max_row is not None else (last_row or self.min_row)
            return f"{self.min_row}:{r2}"
        r2 = self.max_row if self.max_row is not None else (last_row or self.min_row)
        c2 = self.max_col if self.max_col is not None else (last_col or self.min_col)
        return a1_range(self.min_row, self.min_col, r2, c2)


def a1_range(r1: int, c1: int, r2: int, c2: int) -> str:
    first = f"{column_letters(c1)}{r1}"
    if (r1, c1) == (r2, c2):
        return first
    return f"{first}:{column_letters(c2)}{r2}"


_CELL = r"\$?([A-Za-z]{1,3})\$?([0-9]{1,7})"
_RE_CELLS = re.compile(rf"^{_CELL}(?::{_CELL})?$")
_RE_COLS = re.compile(r"^\$?([A-Za-z]{1,3}):\$?([A-Za-z]{1,3})$")
_RE_ROWS = re.compile(r"^\$?([0-9]{1,7}):\$?([0-9]{1,7})$")
_RE_SHEET = re.compile(r"^(?:'((?:[^']|'')+)'|([^'!]+))!(.+)$")


def parse_range(text: str) -> RangeRef | None:
    """Parse ``A1:F40``, ``$B$2:$E$30``, ``B:E``, ``2:40``, ``C5`` or ``'Lot data'!A1:F40``.

    Returns ``None`` when the text is not an A1 reference (it may then be a defined name);
    raises :class:`InputError` for a reference outside the sheet's size.
    """
    s = text.strip()
    sheet = None
    m = _RE_SHEET.match(s)
    if m:
        sheet = (m.group(1).replace("''", "'") if m.group(1) is not None else m.group(2)).strip()
        s = m.group(3).strip()
    ref: RangeRef | None = None
    if (m := _RE_CELLS.match(s)) is not None:
        c1, r1 = column_number(m.group(1)), int(m.group(2))
        if m.group(3) is None:
            c2, r2 = c1, r1
        else:
            c2, r2 = column_number(m.group(3)), int(m.group(4))
        ref = RangeRef(min(r1, r2), min(c1, c2), max(r1, r2), max(c1, c2), sheet)
    elif (m := _RE_COLS.match(s)) is not None:
        c1, c2 = column_number(m.group(1)), column_number(m.group(2))
        ref = RangeRef(1, min(c1, c2), None, max(c1, c2), sheet)
    elif (m := _RE_ROWS.match(s)) is not None:
        r1, r2 = int(m.group(1)), int(m.group(2))
        ref = RangeRef(min(r1, r2), 1, max(r1, r2), None, sheet)
    if ref is None:
        return None
    rows = [r for r in (ref.min_row, ref.max_row) if r is not None]
    cols = [c for c in (ref.min_col, ref.max_col) if c is not None]
    if min(rows) < 1 or max(rows) > MAX_ROWS or min(cols) < 1 or max(cols) > MAX_COLS:
        raise InputError(
            f"the range {text.strip()} lies outside a sheet (rows 1 to {MAX_ROWS:,}, "
            "columns A to XFD); check the reference"
        )
    return ref
