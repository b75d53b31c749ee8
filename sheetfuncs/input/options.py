"""Checks of scalar options shared by every analysis (one-line InputError messages)."""

from __future__ import annotations

import decimal
import math
from typing import Any

from ..errors import InputError

__all__ = [
    "check_conf", "check_alpha", "check_probability", "check_number", "one_line", "shown",
    "as_real", "check_whole", "check_range",
]

#: Longest text a message quotes from a cell (a longer one is cut with "…").
_SHOWN_TEXT = 60


def shown(value: Any) -> str:
    """A value as a spreadsheet user would recognise it in a message: ``TRUE``, ``blank``,
    ``3`` (not ``3.0``), ``"text"``."""
    if value is None or (isinstance(value, str) and value.strip() == ""):
        return "blank"
    if isinstance(value, bool):
        return "TRUE" if value else "FALSE"
    if isinstance(value, str):
        text = " ".join(value.split())
        return f'"{text}"' if len(text) <= _SHOWN_TEXT else f'"{text[:_SHOWN_TEXT - 1]}…"'
    if isinstance(value, float):
        if math.isfinite(value) and value == int(value) and abs(value) < 1e16:
            return str(int(value))
        return repr(value)
    if isinstance(value, int):
        if abs(value) < 10**16:
            return str(value)
        mant, exp = f"{decimal.Decimal(value):.5e}".split("e")  # any size, unlike float()
        return f"{mant.rstrip('0').rstrip('.')}e{exp}"
    text = str(value)
    return text if len(text) <= _SHOWN_TEXT else text[: _SHOWN_TEXT - 1] + "…"


def as_real(value: Any) -> float | None:
    """The value as a float, or None when it is not a number (text, blank, a logical value)."""
    if isinstance(value, bool) or value is None or isinstance(value, str):
        return None
    try:
        return float(value)
    except OverflowError:  # an integer beyond the largest double
        return math.inf if value > 0 else -math.inf
    except (TypeError, ValueError):
        return None


def check_number(value: Any, name: str) -> float:
    """A finite real number, or an InputError that names the argument."""
    v = as_real(value)
    if v is None:
        raise InputError(f"{name} must be a number, not {shown(value)}")
    if not math.isfinite(v):
        raise InputError(f"{name} must be a finite number, not {shown(value)}")
    return v


def check_probability(value: Any, name: str, example: str) -> float:
    """A number strictly between 0 and 1."""
    v = as_real(value)
    if v is None:
        raise InputError(f"{name} must be a number, not {shown(value)}")
    if not (0.0 < v < 1.0):
        raise InputError(
            f"{name} must lie strictly between 0 and 1 (e.g. {example}), not {shown(value)}"
        )
    return v


def check_range(value: Any, name: str, low: float, high: float, example: str) -> float:
    """A number from ``low`` to ``high`` (both included), or an InputError that names the
    argument and the range, e.g. ``alpha must be a number from 1e-10 to 0.5 (e.g. 0.05)``."""
    v = check_number(value, name)
    if not (low <= v <= high):
        raise InputError(
            f"{name} must be a number from {low:g} to {high:g} (e.g. {example}), not {shown(value)}"
        )
    return v


def check_whole(value: Any, name: str, low: int, high: int) -> int:
    """A whole number from ``low`` to ``high``, or an InputError that names the argument and the
    range, e.g. ``k (the number of groups) must be a whole number from 2 to 10,000, not 1e+308``."""
    v = check_number(value, name)
    if not (low <= v <= high) or v != math.floor(v):
        raise InputError(
            f"{name} must be a whole number from {low:,} to {high:,}, not {shown(value)}"
        )
    return int(v)


def check_conf(conf: Any) -> float:
    """A confidence level in (0, 1)."""
    return check_probability(conf, "the confidence level", "0.95")


def check_alpha(alpha: Any) -> float:
    """A significance level in (0, 1)."""
    return check_probability(alpha, "alpha", "0.05")


def _blank(v: Any) -> bool:
    return v is None or (isinstance(v, str) and v.strip() == "")


def one_line(cells: Any, name: str) -> list[Any]:
    """A per-group argument (one row or one column of cells, or a flat list) as a flat list.

    A column drawn wider than its values (the other columns entirely blank), or a row drawn
    taller, still reads as that column or row. A block of several rows and columns that all
    hold values has no one order of the groups: that is an input error, rather than reading it
    in some order without a word. Blanks are kept (the caller says what a gap means).
    """
    if isinstance(cells, (str, bytes)) or not hasattr(cells, "__iter__"):
        return [cells]
    items = list(cells)
    is_row = [isinstance(r, (list, tuple)) or getattr(r, "ndim", 0) >= 1 for r in items]
    if not any(is_row):
        return items  # a flat list of values
    rows = [list(r) if row else [r] for r, row in zip(items, is_row)]
    used_rows = [r for r in rows if not all(map(_blank, r))]
    width = max(map(len, rows))
    used_cols = [j for j in range(width) if any(j < len(r) and not _blank(r[j]) for r in rows)]
    if len(used_rows) > 1 and len(used_cols) > 1:
        raise InputError(
            f"{name} fill a block of {len(used_rows)} rows and {len(used_cols)} "
            "columns; give one per group in a single row or column"
        )
    if len(rows) > 1 and len(used_cols) == 1:  # a column
        j = used_cols[0]
        return [r[j] if j < len(r) else None for r in rows]
    if len(used_rows) == 1:  # a row
        return list(used_rows[0])
    return [v for r in rows for v in r]  # nothing but blanks
