"""Tests of normality: Shapiro–Wilk (Royston's approximation) and D'Agostino–Pearson.

Shapiro & Wilk (1965), *Biometrika* 52, 591–611, with the coefficients and p-value
approximation of Royston (1992), "Approximating the Shapiro-Wilk W-test for non-normality",
*Statistics and Computing* 2, 117–119 (Royston 1995, *Applied Statistics* 44, 547–551,
algorithm AS R94), for 3 to 5,000 values; for n = 3 the exact distribution of W (Shapiro & Wilk
1965). Above 5,000 values the approximation is not validated.

D'Agostino & Pearson (1973), *Biometrika* 60, 613–622: the omnibus statistic
``K^2 = Z_skew^2 + Z_kurt^2``, referred to chi-square(2), from D'Agostino's (1970) skewness test
(defined from 8 values) and Anscombe & Glynn's (1983) kurtosis test (defined from 5 values), as
set out in D'Agostino, Belanger & D'Agostino (1990), *The American Statistician* 44, 316–321.

Both statistics are free of the unit of measurement; values beyond about 2^±200 are first
rescaled by a power of two (exact), so that the fourth powers of their deviations stay within
the double range.
"""

from __future__ import annotations

import math
from typing import Any

import numpy as np
from scipy import special, stats

from ..errors import InputError

__all__ = [
    "shapiro_wilk", "shapiro_wilk_coefficients", "dagostino_pearson", "skewness_z", "kurtosis_z",
    "SHAPIRO_WILK_MAX_N",
]

#: Largest number of values for the Shapiro–Wilk approximation (Royston 1995).
SHAPIRO_WILK_MAX_N = 5000
#: Fewest values for which D'Agostino's (1970) skewness score is defined (and so the omnibus test).
SKEWNESS_MIN_N = 8
#: Fewest values for which Anscombe & Glynn's (1983) kurtosis score is defined.
KURTOSIS_MIN_N = 5

SHAPIRO_WILK_TEST = "Shapiro-Wilk"
DAGOSTINO_PEARSON_TEST = "D'Agostino-Pearson"
_NO_SPREAD = "all values are equal, so the {test} test has no spread to test; check the data"


def _check_size(n: int, low: int, high: int | None, test: str) -> None:
    """InputError unless ``low <= n`` (and ``n <= high`` when given)."""
    if n < low:
        raise InputError(f"the {test} test needs at least {low} values, not {n}")
    if high is not None and n > high:
        raise InputError(
            f"the {test} test takes at most {high:,} values (beyond them its approximation is "
            f"not validated), not {n:,}; use the D'Agostino-Pearson test instead"
        )


def _checked_sample(x: Any, low: int, high: int | None, test: str) -> np.ndarray:
    """The values as a 1-D float array, checked for size, finiteness and spread, and rescaled
    by a power of two when they lie beyond about 2^±200 (the statistics are free of the unit)."""
    try:
        a = np.asarray(x, dtype=float).ravel()
    except (TypeError, ValueError):
        raise InputError(f"the {test} test needs numbers; the values include something else") from None
    _check_size(a.size, low, high, test)
    if not np.isfinite(a).all():
        raise InputError(f"the {test} test needs finite numbers; the values include NaN or an infinity")
    if float(a.max()) == float(a.min()):
        raise InputError(_NO_SPREAD.format(test=test))
    top = float(np.max(np.abs(a)))
    if not 2.0**-200 < top < 2.0**200:  # fourth powers of the deviations stay normal doubles
        a = np.ldexp(a, -math.frexp(top)[1])
    return a


# Royston (1992): polynomials in u = 1/sqrt(n) for the last two Shapiro–Wilk coefficients
_SW_AN = (0.0, 0.221157, -0.147981, -2.071190, 4.434685, -2.706056)
_SW_AN1 = (0.0, 0.042981, -0.293762, -1.752461, 5.682633, -3.582633)
# Royston (1992): normalising transformation of W; n from 4 to 11 (polynomials in n) ...
_SW_SMALL_GAMMA = (-2.273, 0.459)
_SW_SMALL_MU = (0.5440, -0.39978, 0.025054, -6.714e-4)
_SW_SMALL_SIGMA = (1.3822, -0.77857, 0.062767, -0.0020322)
# ... and from 12 on (polynomials in ln n)
_SW_LARGE_MU = (-1.5861, -0.31082, -0.083751, 0.0038915)
_SW_LARGE_SIGMA = (-0.4803, -0.082676, 0.0030302)


def _poly(coef: tuple[float, ...], x: float) -> float:
    total = 0.0
    for c in reversed(coef):
        total = total * x + c
    return total


def shapiro_wilk_coefficients(n: int) -> np.ndarray:
    """Royston's (1992) approximation to the Shapiro–Wilk coefficients a_1..a_n (3 <= n <= 5000)."""
    _check_size(n, 3, SHAPIRO_WILK_MAX_N, SHAPIRO_WILK_TEST)
    if n == 3:
        r = math.sqrt(0.5)
        return np.array([-r, 0.0, r])
    half = n // 2
    i = np.arange(1, half + 1)
    upper = -special.ndtri((i - 0.375) / (n + 0.25))  # m_n, m_(n-1), ... (positive)
    mm = 2.0 * float(np.dot(upper, upper))
    u = 1.0 / math.sqrt(n)
    root = math.sqrt(mm)
    a_up = np.empty(half)
    a_up[0] = upper[0] / root + _poly(_SW_AN, u)
    if n > 5:
        a_up[1] = upper[1] / root + _poly(_SW_AN1, u)
        phi = (mm - 2 * upper[0] ** 2 - 2 * upper[1] ** 2) / (1 - 2 * a_up[0] ** 2 - 2 * a_up[1] ** 2)
        a_up[2:] = upper[2:] / math.sqrt(phi)
    else:
        phi = (mm - 2 * upper[0] ** 2) / (1 - 2 * a_up[0] ** 2)
        a_up[1:] = upper[1:] / math.sqrt(phi)
    middle = [0.0] if n % 2 else []
    return np.concatenate([-a_up, middle, a_up[::-1]])


def shapiro_wilk(x: Any) -> tuple[float, float]:
    """``(W, p)`` of the Shapiro–Wilk test for 3 <= n <= 5000 values (Royston 1992, 1995)."""
    x = _checked_sample(x, 3, SHAPIRO_WILK_MAX_N, SHAPIRO_WILK_TEST)
    n = x.size
    xs = np.sort(x - float(np.median(x)))
    a = shapiro_wilk_coefficients(n)
    d = xs - float(xs.mean())
    ssq = float(np.dot(d, d))
    w = min(float(np.dot(a, d)) ** 2 / ssq, 1.0)
    if n == 3:
        # exact distribution for n = 3 (Shapiro & Wilk 1965)
        p = 6.0 / math.pi * (math.asin(math.sqrt(w)) - math.asin(math.sqrt(0.75)))
        return w, min(max(p, 0.0), 1.0)
    if w >= 1.0:
        return 1.0, 1.0
    lw = math.log1p(-w)
    if n <= 11:
        gamma = _poly(_SW_SMALL_GAMMA, n)
        if gamma - lw <= 0.0:
            return w, 0.0
        y = -math.log(gamma - lw)
        mu = _poly(_SW_SMALL_MU, n)
        sigma = math.exp(_poly(_SW_SMALL_SIGMA, n))
    else:
        ln = math.log(n)
        y = lw
        mu = _poly(_SW_LARGE_MU, ln)
        sigma = math.exp(_poly(_SW_LARGE_SIGMA, ln))
    p = float(stats.norm.sf((y - mu) / sigma))
    return w, p


def skewness_z(b1: float, n: int) -> float:
    """D'Agostino's (1970) normal score for the sample skewness ``b1 = m3 / m2^1.5`` of n >= 8 values."""
    _check_size(n, SKEWNESS_MIN_N, None, "skewness")
    y = b1 * math.sqrt((n + 1.0) * (n + 3.0) / (6.0 * (n - 2.0)))
    beta2 = (
        3.0 * (n * n + 27.0 * n - 70.0) * (n + 1.0) * (n + 3.0)
        / ((n - 2.0) * (n + 5.0) * (n + 7.0) * (n + 9.0))
    )
    w2 = -1.0 + math.sqrt(2.0 * (beta2 - 1.0))
    delta = 1.0 / math.sqrt(0.5 * math.log(w2))
    alpha = math.sqrt(2.0 / (w2 - 1.0))
    return delta * math.asinh(y / alpha)


def kurtosis_z(b2: float, n: int) -> float:
    """Anscombe & Glynn's (1983) normal score for the sample kurtosis ``b2 = m4 / m2^2`` of n >= 5 values."""
    _check_size(n, KURTOSIS_MIN_N, None, "kurtosis")
    mean = 3.0 * (n - 1.0) / (n + 1.0)
    var = 24.0 * n * (n - 2.0) * (n - 3.0) / ((n + 1.0) ** 2 * (n + 3.0) * (n + 5.0))
    x = (b2 - mean) / math.sqrt(var)
    sqrt_beta1 = (
        6.0 * (n * n - 5.0 * n + 2.0) / ((n + 7.0) * (n + 9.0))
        * math.sqrt(6.0 * (n + 3.0) * (n + 5.0) / (n * (n - 2.0) * (n - 3.0)))
    )
    a = 6.0 + 8.0 / sqrt_beta1 * (2.0 / sqrt_beta1 + math.sqrt(1.0 + 4.0 / sqrt_beta1**2))
    term1 = 1.0 - 2.0 / (9.0 * a)
    denom = 1.0 + x * math.sqrt(2.0 / (a - 4.0))
    if denom == 0.0:
        return math.copysign(math.inf, -1.0)
    term2 = math.copysign(abs((1.0 - 2.0 / a) / denom) ** (1.0 / 3.0), denom)
    return (term1 - term2) / math.sqrt(2.0 / (9.0 * a))


def dagostino_pearson(x: Any) -> tuple[float, float]:
    """``(K2, p)``: the omnibus statistic ``Z_skew^2 + Z_kurt^2`` of n >= 8 values and its
    chi-square(2) tail (D'Agostino & Pearson 1973)."""
    x = _checked_sample(x, SKEWNESS_MIN_N, None, DAGOSTINO_PEARSON_TEST)
    n = x.size
    d = x - float(x.mean())
    d2 = d * d
    m2 = float(d2.mean())
    m3 = float((d2 * d).mean())
    m4 = float((d2 * d2).mean())
    k2 = skewness_z(m3 / m2**1.5, n) ** 2 + kurtosis_z(m4 / (m2 * m2), n) ** 2
    return k2, float(stats.chi2.sf(k2, 2))
