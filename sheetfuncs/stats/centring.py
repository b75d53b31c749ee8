"""A round centring constant near the grand mean, and each value minus it, exactly.

A spreadsheet's own floating-point functions reproduce the exact sums of squares from values
centred on a round number near the grand mean: the report's Audit sheet recalculates its figures
from them. The constant is the mean rounded at the leading digit of the SD, and each centred
value is the exact decimal difference, rounded once.
"""

from __future__ import annotations

import math
from decimal import Decimal
from fractions import Fraction

import numpy as np

from .moments import ExactMoments, FloatMoments
from .oneway import OneWayResult

__all__ = ["centring_constant", "centred_values"]


def centring_constant(mom: ExactMoments | FloatMoments, ow: OneWayResult) -> Decimal:
    """A round number near the grand mean: the mean rounded at the leading digit of the SD.

    On the decimal-exact path it is never finer than the data's own decimals; on the
    floating-point path it is a whole number that a double holds exactly.
    """
    n = ow.n_total
    if isinstance(mom, ExactMoments):
        grand = Fraction(mom.offset * n + sum(mom.s), n * mom.denom)
    else:
        grand = Fraction(math.fsum(c * m for c, m in zip(mom.n, mom.means())) / n)
    sd = math.sqrt(ow.ss_total / ow.df_total) if ow.df_total > 0 else 0.0
    e = int(math.floor(math.log10(sd))) if sd > 0 and math.isfinite(sd) else 0
    if isinstance(mom, ExactMoments):
        e = max(e, -mom.scale)
    else:
        e = max(e, 0)
    step = Fraction(10) ** e
    q = math.floor(grand / step + Fraction(1, 2))
    c = Decimal(q).scaleb(e)
    if not isinstance(mom, ExactMoments):
        c = Decimal(float(c))  # a double exactly, so that x - C rounds once
    return c


def centred_values(a: np.ndarray, mom: ExactMoments | FloatMoments, centre: Decimal) -> np.ndarray:
    """``value - centre`` for every value, as the exact decimal difference rounded once.

    Decimal-exact path: each value is its shortest decimal ``r / 10**D`` (``r`` an integer);
    with ``K = centre * 10**D`` (an integer), ``(r - K) / 10**D`` is formed from exact integers
    and one correctly rounded division. Values the vectorised reading cannot settle go through
    :class:`decimal.Decimal`. Floating-point path: the centre is a double, and the IEEE
    subtraction is itself the exact difference rounded once.
    """
    x = np.asarray(a, dtype=np.float64)
    if not isinstance(mom, ExactMoments):
        return x - float(centre)
    scale = mom.scale
    if scale <= 22:
        k_int = int(centre.scaleb(scale))
        if abs(k_int) < 2**53:
            p10 = 10.0**scale
            r = np.rint(x * p10)
            d = r - float(k_int)
            ok = (r / p10 == x) & (np.abs(r) < 1e15) & (np.abs(d) < 2.0**53)
            out = d / p10
            if not ok.all():
                idx = np.flatnonzero(~ok)
                out[idx] = [float(Decimal(repr(v)) - centre) for v in x[idx].tolist()]
            return out
    return np.array([float(Decimal(repr(v)) - centre) for v in x.tolist()], dtype=np.float64)
