"""sheetfuncs.fdist: edge values, argument checks and the log-space pieces of the deep tail."""

from __future__ import annotations

import math

import mpmath
import numpy as np
import pytest
from scipy import stats

from sheetfuncs import InputError, f_critical, f_tail
from sheetfuncs.distributions import f as fdist


def test_edges_of_the_support():
    # common practice: P(F > x) is 1 for x <= 0 and 0 at infinity
    assert f_tail(0.0, 3, 10) == 1.0
    assert f_tail(-2.5, 3, 10) == 1.0
    assert f_tail(math.inf, 3, 10) == 0.0
    assert f_tail(5e-324, 3, 10) == 1.0


def test_body_agrees_with_scipy_survival_function():
    # reference library: scipy.stats.f.sf, in the body of the distribution
    rng = np.random.default_rng(11)
    for _ in range(200):
        d1, d2 = int(rng.integers(1, 30)), int(rng.integers(2, 200))
        x = float(rng.uniform(0.01, 8.0))
        ref = float(stats.f.sf(x, d1, d2))
        assert f_tail(x, d1, d2) == pytest.approx(ref, rel=1e-12, abs=0)


def test_tail_is_monotone_and_continuous_across_the_log_space_switch():
    # common practice: the tail decreases with x; here also across the switch (near 1e-200)
    # from the library routine to the log-space evaluation
    for d1, d2 in [(3, 10), (4, 20), (20, 200), (50, 50)]:
        x0 = f_critical(1e-200, d1, d2)
        xs = x0 * np.linspace(0.97, 1.03, 121)
        tails = [f_tail(float(x), d1, d2) for x in xs]
        assert all(a > b for a, b in zip(tails, tails[1:]))
        ratios = [b / a for a, b in zip(tails, tails[1:])]
        # neighbouring points differ by a smooth factor: no jump at the switch
        assert max(ratios) / min(ratios) < 1.05


def test_log_beta_matches_mpmath():
    # mpmath 40 digits: ln B(a, b) of the Stirling form stays within 1e-13 (absolute), where
    # lgamma(a) + lgamma(b) - lgamma(a + b) loses up to about 1e-12 by cancellation
    mpmath.mp.dps = 40
    for a in (0.5, 1.0, 2.5, 9.5, 10.0, 25.0, 100.0, 1000.0, 2500.0):
        for b in (0.5, 1.5, 5.0, 10.0, 50.0, 500.0, 1000.0):
            ref = mpmath.log(mpmath.beta(a, b))
            assert abs(fdist._log_beta(a, b) - float(ref)) <= 1e-13 * max(1.0, abs(float(ref))), (a, b)


def test_deep_tail_continued_fraction_against_mpmath_betainc():
    # mpmath 50 digits: I_w(a, b) from exp(log prefactor) * continued fraction (DLMF 8.17.22)
    mpmath.mp.dps = 50
    for a, b, r in [(10.0, 2.0, 1e30), (25.0, 25.0, 3.5e12), (500.0, 5.0, 3.0), (2.0, 0.5, 1e150)]:
        w = 1.0 / (1.0 + r)
        log_pre = fdist._log_prefactor(a, b, r, math.log(r))
        got = math.exp(log_pre + math.log(fdist._beta_cf(a, b, w)))
        wm = 1 / (1 + mpmath.mpf(r))
        ref = mpmath.betainc(a, b, 0, wm, regularized=True)
        assert abs(got - ref) / ref < 1e-12, (a, b, r)


def test_huge_ratio_that_overflows_is_handled_in_log_space():
    # mpmath 50 digits: d1 * x / d2 overflows the double range here, the tail does not
    mpmath.mp.dps = 50
    x = 5.99231044954105e306
    ref = mpmath.betainc(mpmath.mpf(1) / 2, 15, 0, 1 / (1 + 30 * mpmath.mpf(x)), regularized=True)
    got = f_tail(x, 30, 1)
    assert got > 0
    assert abs(got - ref) / ref < 1e-12


def test_non_integer_degrees_of_freedom_are_allowed():
    # reference library: scipy.stats.f.sf with fractional df (e.g. Welch-type statistics)
    assert f_tail(2.0, 2.5, 13.7) == pytest.approx(float(stats.f.sf(2.0, 2.5, 13.7)), rel=1e-12)


@pytest.mark.parametrize("bad, word", [
    (0, "df1 must be a positive number"),
    (-1, "df1 must be a positive number"),
    (math.nan, "df1 must be a positive number"),
    (math.inf, "df1 must be a positive number"),
    ("three", "df1 must be a number"),
    (True, "df1 must be a number"),
    (None, "df1 must be a number"),
])
def test_bad_degrees_of_freedom(bad, word):
    with pytest.raises(InputError) as e:
        f_tail(1.0, bad, 10)
    assert str(e.value).startswith("sheetfuncs: " + word)
    with pytest.raises(InputError, match="df2 must be"):
        f_critical(0.05, 3, bad)


def test_bad_f_value():
    with pytest.raises(InputError, match=r"^sheetfuncs: the F value is not a number \(NaN\)$"):
        f_tail(math.nan, 2, 10)
    with pytest.raises(InputError, match="^sheetfuncs: the F value must be a number, not \"big\"$"):
        f_tail("big", 2, 10)


@pytest.mark.parametrize("alpha", [0, 1, -0.1, 1.5, math.nan])
def test_alpha_outside_zero_one(alpha):
    with pytest.raises(InputError, match="^sheetfuncs: alpha must lie strictly between 0 and 1"):
        f_critical(alpha, 2, 10)


@pytest.mark.parametrize("alpha", ["0.05", True, None])
def test_alpha_not_a_number(alpha):
    with pytest.raises(InputError, match="^sheetfuncs: alpha must be a number"):
        f_critical(alpha, 2, 10)


def test_critical_value_for_large_alpha_uses_the_lower_branch():
    # reference library: scipy.stats.f.isf for alpha >= 0.5
    for alpha in (0.5, 0.75, 0.99, 0.999999):
        got = f_critical(alpha, 4, 20)
        assert got == pytest.approx(float(stats.f.isf(alpha, 4, 20)), rel=1e-11)
        assert f_tail(got, 4, 20) == pytest.approx(alpha, rel=1e-13)


def test_critical_value_where_the_library_inverse_gives_nan():
    # mpmath 50 digits: scipy's betaincinv returns NaN for F(3, 10) at 1e-200; the bracketing
    # solver takes over and the tail at the answer is 1e-200 to 12 digits
    mpmath.mp.dps = 50
    x = f_critical(1e-200, 3, 10)
    assert math.isfinite(x)
    w = mpmath.mpf(10) / (10 + 3 * mpmath.mpf(x))
    ref = mpmath.betainc(5, 1.5, 0, w, regularized=True)
    assert abs(ref / mpmath.mpf("1e-200") - 1) < 1e-12
