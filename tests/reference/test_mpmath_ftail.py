"""f_tail against mpmath's regularised incomplete beta function at 50 significant digits.

Reference: mpmath.betainc(d2/2, d1/2, 0, w, regularized=True) with w = d2 / (d2 + d1 x) formed
in 50-digit arithmetic from the double x (Abramowitz & Stegun 26.6.2). Tolerance: relative
error <= 1e-12 (issue 2).

Chosen range, stated honestly: denominator df up to 5000 and numerator df up to 1000. The
upper tail behaves like w^(d2/2), so rounding the ratio d1 x / d2 to a double (half a unit,
1.1e-16 relative) moves the tail by about (d2/2) * 1.1e-16 relative; at d2 = 5000 that is 2.8e-13,
still inside the tolerance, while at d2 = 10^5 it would be 5.6e-12, which no double-precision
evaluation from a double x can promise. Tails are taken from about 1 down to 1e-307 (the smallest
normal double is 2.2e-308), with 1e-300 included explicitly.
"""

from __future__ import annotations

import math

import mpmath
import numpy as np
import pytest

from sheetfuncs import f_critical, f_tail

mpmath.mp.dps = 50
TOL = 1e-12

DF_PAIRS = [
    (1, 1), (1, 2), (2, 2), (1, 5), (2, 5), (3, 10), (4, 7), (5, 20), (2, 27), (9, 40),
    (3, 60), (1, 100), (20, 200), (3, 300), (50, 50), (100, 3), (200, 2), (30, 1),
    (10, 1000), (7, 2000), (1, 5000), (1000, 1000), (0.5, 3.5), (2.5, 11.3), (17.25, 64.5),
]
LOG10_TAILS = [-0.001, -0.3, -1, -2, -5, -10, -30, -60, -100, -150, -199, -201, -250,
               -280, -300, -305, -307]


def reference_tail(x: float, d1: float, d2: float) -> mpmath.mpf:
    """P(F > x) in 50-digit arithmetic (A&S 26.6.2), x taken exactly as the double given."""
    xm, a, b = mpmath.mpf(x), mpmath.mpf(d2) / 2, mpmath.mpf(d1) / 2
    w = mpmath.mpf(d2) / (mpmath.mpf(d2) + mpmath.mpf(d1) * xm)
    return mpmath.betainc(a, b, 0, w, regularized=True)


def relative_error(got: float, ref: mpmath.mpf) -> float:
    return float(abs((mpmath.mpf(got) - ref) / ref))


@pytest.mark.parametrize("d1,d2", DF_PAIRS)
def test_f_tail_matches_mpmath_from_the_body_to_1e_minus_307(d1, d2):
    # mpmath 50 digits; x chosen (via f_critical) so that the tails span 1 .. 1e-307
    checked = 0
    for lp in LOG10_TAILS:
        x = f_critical(10.0**lp, d1, d2)
        if not math.isfinite(x):
            # the critical value exceeds the largest double: check that the tail there really
            # is larger than the one asked for (F(1,1) cannot reach below about 1e-154)
            assert reference_tail(1.7976931348623157e308, d1, d2) > mpmath.mpf(10) ** lp
            continue
        ref = reference_tail(x, d1, d2)
        got = f_tail(x, d1, d2)
        assert relative_error(got, ref) <= TOL, (d1, d2, lp, x, got, mpmath.nstr(ref, 20))
        checked += 1
    assert checked >= 8


@pytest.mark.parametrize("d1,d2,x", [
    (4, 20, 6.35490807605072e30),       # a tail of 1e-300 with one-way-sized df
    (2, 27, 1.0e22),                    # three groups of ten, a gigantic F
    (9, 40, 2.7e15),
    (50, 50, 3564758725921.479),
    (1000, 1000, 13.717318941023075),   # many df: the tail is already tiny at F = 13.7
    (3, 300, 10076.451319555412),
])
def test_f_tail_near_1e_minus_300(d1, d2, x):
    # mpmath 50 digits, deep tail around 1e-300 (issue 2: tails down to 1e-300 included)
    ref = reference_tail(x, d1, d2)
    assert mpmath.mpf("1e-310") < ref < mpmath.mpf("1e-250")
    assert relative_error(f_tail(x, d1, d2), ref) <= TOL


def test_f_tail_matches_mpmath_on_random_points():
    # mpmath 50 digits at 300 seeded random (df1, df2, x), x log-uniform over 1e-3 .. 1e6
    rng = np.random.default_rng(20240607)
    worst = 0.0
    for _ in range(300):
        d1 = float(rng.integers(1, 60))
        d2 = float(rng.integers(1, 3000))
        x = float(10.0 ** rng.uniform(-3, 6))
        ref = reference_tail(x, d1, d2)
        if ref < mpmath.mpf("1e-307"):
            continue  # below the normal doubles: the double result cannot carry 12 digits
        err = relative_error(f_tail(x, d1, d2), ref)
        worst = max(worst, err)
        assert err <= TOL, (d1, d2, x)
    assert worst > 0.0  # the comparison really ran on values that are not all trivial


def test_f_tail_body_values_match_mpmath():
    # mpmath 50 digits at ordinary one-way results (tails between 0.9 and 1e-6)
    for d1, d2, x in [(2, 12, 9.59), (2, 12, 0.3), (3, 36, 2.87), (1, 4, 7.71), (5, 100, 1.0),
                      (9, 20, 0.05), (1, 1, 1.0), (2, 2, 1.0)]:
        ref = reference_tail(x, d1, d2)
        assert relative_error(f_tail(x, d1, d2), ref) <= TOL, (d1, d2, x)
