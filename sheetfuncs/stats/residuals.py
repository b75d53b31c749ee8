"""Residuals and absolute deviations of each group, formed around a value of the group.

The residuals are ``y_ij - ybar_i``; each is formed as ``(y_ij - r_i) - (ybar_i - r_i)``
around a value ``r_i`` of the group, with the exact mean on the decimal-exact path, so data
with many constant leading digits keep their residuals' precision. A group of one value has
a residual of exactly zero, which carries no information (the normality test of
:mod:`sheetfuncs.stats.normality` leaves such groups out).

The absolute deviations from each group's median or mean (Levene's test) are formed the same
way, in the same unit.
"""

from __future__ import annotations

from fractions import Fraction
from typing import Any

import numpy as np

from ..input import Groups, as_groups
from .moments import ExactMoments, FloatMoments, compute_moments

__all__ = ["Deviations", "residuals"]


def _middle_pair(a: np.ndarray) -> tuple[float, float]:
    """The lower and upper middle values of a group (equal when its size is odd)."""
    n = a.size
    if n % 2:
        v = float(np.partition(a, n // 2)[n // 2])
        return v, v
    part = np.partition(a, (n // 2 - 1, n // 2))
    return float(part[n // 2 - 1]), float(part[n // 2])


def _decimal_integers(g: Groups, mom: ExactMoments | FloatMoments) -> list[np.ndarray] | None:
    """Each group's values as whole numbers ``m`` with ``value = m / 10**scale`` (as float64,
    exact below 1e15), when the decimal-exact path applies to every value; else ``None``.

    ``rint(x * 10**D)`` is the decimal integer when ``rint(x * 10**D) / 10**D == x`` and it has
    at most 15 digits (the argument of :mod:`sheetfuncs.stats.moments`).
    """
    if not mom.exact or mom.scale > 22:
        return None
    p10 = 10.0**mom.scale
    out = []
    for a in g.arrays:
        with np.errstate(over="ignore", invalid="ignore"):  # huge values fail the test below
            r = np.rint(a * p10)
            if not (np.all(np.abs(r) < 1e15) and np.all(r / p10 == a)):
                return None
        out.append(r)
    return out


class Deviations:
    """Residuals and absolute deviations of every group, in one common unit.

    On the decimal-exact path the unit is ``10**-scale`` of the data's unit and every value is
    its decimal integer, so differences between values are exact; each group's residuals are
    ``(m - r) - (mean - r)`` around a value ``r`` of the group, with the exact mean, rounded
    once. Otherwise the same is done in floating point on the values themselves.
    """

    def __init__(self, g: Groups, mom: ExactMoments | FloatMoments) -> None:
        self.g, self.mom = g, mom
        self.ints = _decimal_integers(g, mom)
        self.unit = 10.0 ** -mom.scale if self.ints is not None else 1.0

    def _values(self, i: int) -> np.ndarray:
        return self.ints[i] if self.ints is not None else self.g.arrays[i]

    def residuals(self, i: int) -> np.ndarray:
        """Residuals of group i, in the common unit."""
        v = self._values(i)
        ref, _ = _middle_pair(v)
        if self.ints is not None:
            shift = float(self.mom.mean(i) * self.mom.denom - Fraction(ref))
        elif self.mom.exact:
            shift = float(self.mom.mean(i) - Fraction(ref))
        else:
            shift = float(self.mom.mean(i)) - ref
        return (v - ref) - shift

    def abs_from_median(self, i: int) -> np.ndarray:
        """|value - group median|, in the common unit (exact on the decimal-integer path)."""
        v = self._values(i)
        lo, hi = _middle_pair(v)
        return np.abs((v - lo) - (hi - lo) * 0.5)

    def abs_from_mean(self, i: int) -> np.ndarray:
        return np.abs(self.residuals(i))


def residuals(groups: Any, *, exact: bool | None = None) -> tuple[np.ndarray, ...]:
    """The one-way residuals ``y_ij - ybar_i`` of each group, in group order."""
    g = as_groups(groups)
    dev = Deviations(g, compute_moments(g, exact))
    return tuple(dev.residuals(i) * dev.unit for i in range(g.k))
