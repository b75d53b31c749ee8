"""The studentized range (sheetfuncs.distributions.studentized_range): tails and critical values.

Sources are named beside each numeric check: scipy.stats.studentized_range (sf and ppf, in the
body of the distribution, where scipy is accurate), scipy.stats.t (the exact reduction: the
range of two means is sqrt(2)|t|; Bonferroni bounds), mpmath quadrature of the published
known-variance integral, and studentized-range tables recalled from memory (marked so).
"""

from __future__ import annotations

import math

import mpmath as mp
import numpy as np
import pytest
from scipy import stats

from sheetfuncs.errors import InputError
from sheetfuncs.distributions.studentized_range import range_critical, range_criticals, range_tail, range_tails

SQRT2 = math.sqrt(2.0)


# ------------------------------------------------------------------------------------------
# one argument


def _mp_range_tail_normal(r: float, k: int) -> float:
    """P(range of k standard normals > r) by mpmath at 60 digits (published integral)."""
    with mp.workdps(60):
        r = mp.mpf(r)

        def f(z):
            a = mp.ncdf(z)
            return k * mp.npdf(z) * (a ** (k - 1) - (a - mp.ncdf(z - r)) ** (k - 1))

        return float(mp.quad(f, [-mp.inf, -5, 0, r / 2, r / 2 + 5, mp.inf]))


@pytest.mark.parametrize("r,k", [(1.0, 3), (3.3, 5), (12.0, 3), (20.0, 6)])
def test_range_tail_known_variance_matches_mpmath(r, k):
    # source: mpmath quadrature of P(R > r) = k int phi(z)[Phi(z)^(k-1) - (Phi(z)-Phi(z-r))^(k-1)]
    assert range_tail(r, k, math.inf) == pytest.approx(_mp_range_tail_normal(r, k), rel=1e-11)


@pytest.mark.parametrize("q,k,df", [(15.0, 4, 30), (40.0, 5, 12), (80.0, 3, 60), (25.0, 8, 200)])
def test_range_tail_far_in_the_tail_lies_within_bonferroni_bounds(q, k, df):
    # source: scipy.stats.t.sf; each pair's |t| > q/sqrt(2) gives
    # max_pair <= P(Q > q) <= (k choose 2) * pair (Bonferroni inequality)
    pair = 2 * stats.t.sf(q / math.sqrt(2), df)
    p = range_tail(q, k, df)
    assert pair < p <= k * (k - 1) / 2 * pair * (1 + 1e-12)
    assert p < 1e-9  # far below where one-minus-cdf methods stop being accurate


@pytest.mark.parametrize(
    "alpha,k,df,table",
    [(0.05, 3, 10, 3.877), (0.05, 4, 20, 3.958), (0.01, 3, 10, 5.270), (0.05, 10, 60, 4.646),
     (0.05, 2, math.inf, 2.772), (0.05, 5, 1, 37.08)],
)
def test_range_critical_values_agree_with_published_tables(alpha, k, df, table):
    # source: studentized range tables (e.g. Harter 1960 as reprinted in textbooks), from memory
    assert range_critical(alpha, k, df) == pytest.approx(table, abs=6e-3)


def test_range_critical_values_invert_the_tails():
    c = range_critical(0.05, 5, 17)
    assert range_tail(c, 5, 17) == pytest.approx(0.05, rel=1e-9)


def test_range_arguments_are_checked():
    with pytest.raises(InputError, match="k >= 2"):
        range_tail(3.0, 1, 10)
    with pytest.raises(InputError, match="degrees of freedom"):
        range_tail(3.0, 3, 0)
    with pytest.raises(InputError, match="alpha"):
        range_critical(1.0, 3, 10)
    assert range_tail(0.0, 3, 10) == 1.0 and range_tail(math.inf, 3, 10) == 0.0


# ------------------------------------------------------------------------------------------
# many arguments in one call


def test_range_tails_match_scipy_in_the_body_for_many_q_and_df():
    # source: scipy.stats.studentized_range.sf (accurate where p is well above 1e-11)
    q = np.array([0.4, 1.5, 2.9, 3.7, 4.4, 5.2, 6.0, 3.3])
    df = np.array([3.5, 7.0, 12.0, 25.0, 1.7, 60.0, 140.0, 9.25])
    got = range_tails(q, 6, df)
    for qi, di, p in zip(q, df, got):
        assert p == pytest.approx(stats.studentized_range.sf(qi, 6, di), rel=1e-9)


def test_range_tails_keep_relative_accuracy_deep_in_the_tail():
    # source: scipy.stats.t.sf; with two means Q = sqrt(2)|t| exactly (common practice)
    q = np.array([2.0, 9.0, 30.0, 80.0, 150.0, 15.0, 60.0, 7.0])
    df = np.array([1.2, 1.2, 4.0, 30.0, 60.0, 300.0, 2500.0, 1e5])
    got = range_tails(q, 2, df)
    ref = 2 * stats.t.sf(q / SQRT2, df)
    assert (ref < 1e-60).sum() >= 2  # the check reaches far below one-minus-cdf methods
    assert got == pytest.approx(ref, rel=1e-9)


def test_range_criticals_match_scipy_ppf_for_many_df():
    # source: scipy.stats.studentized_range.ppf
    dfs = [1.3, 2.75, 5.5, 8.1, 19.9, 44.0, 250.0]
    got = range_criticals(0.05, 7, dfs)
    for d, c in zip(dfs, got):
        assert c == pytest.approx(stats.studentized_range.ppf(0.95, 7, d), rel=1e-9)
        assert c == pytest.approx(range_critical(0.05, 7, d), rel=1e-12)  # alone, own grid


def test_range_critical_values_far_out_invert_the_t_tail():
    # source: scipy.stats.t.isf; the range of two means reduces to sqrt(2)|t|
    for alpha, df in ((1e-8, 1.0), (1e-6, 3.5), (1e-4, 1e4)):
        assert range_critical(alpha, 2, df) == pytest.approx(SQRT2 * stats.t.isf(alpha / 2, df), rel=1e-10)


def test_range_vector_edges_and_checks():
    # common practice: a tail is 1 at 0 and 0 at infinity
    assert list(range_tails([0.0, math.inf, 2.0], 4, [10, 10, math.inf])[:2]) == [1.0, 0.0]
    assert range_tails([2.0], 4, math.inf)[0] == range_tail(2.0, 4, math.inf)
    with pytest.raises(InputError, match="k >= 2"):
        range_tails([1.0], 1, 5)
