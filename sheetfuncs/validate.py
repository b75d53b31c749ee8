"""Checks of scalar options shared by every analysis (one-line InputError messages)."""

from __future__ import annotations

import math
from typing import Any

from .errors import InputError

__all__ = ["check_conf", "check_alpha", "check_probability", "check_number"]


def check_number(value: Any, name: str) -> float:
    """A finite real number, or an InputError that names the argument."""
    if isinstance(value, bool) or value is None or isinstance(value, str):
        raise InputError(f"sheetfuncs: {name} must be a number, not {value!r}")
    try:
        v = float(value)
    except (TypeError, ValueError):
        raise InputError(f"sheetfuncs: {name} must be a number, not {value!r}") from None
    if not math.isfinite(v):
        raise InputError(f"sheetfuncs: {name} must be a finite number, not {value!r}")
    return v


def check_probability(value: Any, name: str, example: str) -> float:
    """A number strictly between 0 and 1."""
    v = check_number(value, name)
    if not (0.0 < v < 1.0):
        raise InputError(
            f"sheetfuncs: {name} must lie strictly between 0 and 1 (e.g. {example}), not {value!r}"
        )
    return v


def check_conf(conf: Any) -> float:
    """A confidence level in (0, 1)."""
    return check_probability(conf, "the confidence level", "0.95")


def check_alpha(alpha: Any) -> float:
    """A significance level in (0, 1)."""
    return check_probability(alpha, "alpha", "0.05")
