"""Checks of scalar options shared by every analysis (one-line InputError messages)."""

from __future__ import annotations

import math
from typing import Any

from .errors import InputError

__all__ = ["check_conf", "check_alpha", "check_probability", "check_number", "shown", "as_real"]


def shown(value: Any) -> str:
    """A value as a spreadsheet user would recognise it in a message: ``TRUE``, ``blank``,
    ``3`` (not ``3.0``), ``"text"``."""
    if value is None or (isinstance(value, str) and value.strip() == ""):
        return "blank"
    if isinstance(value, bool):
        return "TRUE" if value else "FALSE"
    if isinstance(value, str):
        return f'"{value}"'
    if isinstance(value, float):
        if math.isfinite(value) and value == int(value) and abs(value) < 1e16:
            return str(int(value))
        return repr(value)
    if isinstance(value, int):
        return str(value)
    return str(value)


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
        raise InputError(f"sheetfuncs: {name} must be a number, not {shown(value)}")
    if not math.isfinite(v):
        raise InputError(f"sheetfuncs: {name} must be a finite number, not {shown(value)}")
    return v


def check_probability(value: Any, name: str, example: str) -> float:
    """A number strictly between 0 and 1."""
    v = as_real(value)
    if v is None:
        raise InputError(f"sheetfuncs: {name} must be a number, not {shown(value)}")
    if not (0.0 < v < 1.0):
        raise InputError(
            f"sheetfuncs: {name} must lie strictly between 0 and 1 (e.g. {example}), not {shown(value)}"
        )
    return v


def check_conf(conf: Any) -> float:
    """A confidence level in (0, 1)."""
    return check_probability(conf, "the confidence level", "0.95")


def check_alpha(alpha: Any) -> float:
    """A significance level in (0, 1)."""
    return check_probability(alpha, "alpha", "0.05")
