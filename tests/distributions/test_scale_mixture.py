"""The maximum-type distributions on many arguments at once, and their error guard.

Sources are named beside each numeric check: scipy.stats.studentized_range (sf and ppf, in the
body of the distribution, where scipy is accurate), scipy.stats.t (the exact reductions: the
range of two means is sqrt(2)|t|, one comparison with a control is a t test), scipy.stats
.tukey_hsd and scipy.stats.dunnett on seeded data with many groups (invented numbers, rounded
to two decimals), and mpmath quadrature of the published known-variance integrals.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy import stats

from sheetfuncs.distributions import scale_mixture as mvt
from sheetfuncs.stats.comparisons import dunnett, pairwise
from sheetfuncs.errors import InputError
from sheetfuncs.distributions.scale_mixture import (
    many_to_one_critical, many_to_one_tail, many_to_one_tails, range_critical, range_criticals,
    range_tail, range_tails,
)
from tests.support.mpmath_refs import many_to_one_normal  # mpmath reference (Dunnett 1955 reduction)

SQRT2 = math.sqrt(2.0)


def many_groups(k: int, seed: int, n_max: int = 11) -> list[np.ndarray]:
    """Seeded invented data: k groups of 2 to n_max values, unequal means and spreads."""
    rng = np.random.default_rng(52000 + seed)
    out = []
    for _ in range(k):
        n = int(rng.integers(2, n_max + 1))
        out.append(np.round(rng.normal(rng.uniform(48, 52), rng.uniform(0.5, 3.0), size=n), 2))
    return out


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


def test_sharing_a_call_does_not_change_a_tail():
    # a tail computed with 40 others agrees with the same tail computed alone (no outside
    # source: both are our numbers; the agreement bounds the effect of sharing the grid)
    rng = np.random.default_rng(3)
    q = np.concatenate(([3.1], rng.uniform(0.01, 12.0, 40)))
    together = range_tails(q, 9, 17.0)
    assert together[0] == pytest.approx(range_tail(3.1, 9, 17.0), rel=1e-12)
    assert together[7] == pytest.approx(range_tail(float(q[7]), 9, 17.0), rel=1e-12)
    # and the family matches the reference in the body (source: scipy.stats.studentized_range)
    for i in (1, 2, 3):
        if together[i] > 1e-6:
            assert together[i] == pytest.approx(stats.studentized_range.sf(q[i], 9, 17.0), rel=1e-9)


def test_range_criticals_match_scipy_ppf_for_many_df():
    # source: scipy.stats.studentized_range.ppf
    dfs = [1.3, 2.75, 5.5, 8.1, 19.9, 44.0, 250.0]
    got = range_criticals(0.05, 7, dfs)
    for d, c in zip(dfs, got):
        assert c == pytest.approx(stats.studentized_range.ppf(0.95, 7, d), rel=1e-9)
        assert c == pytest.approx(range_critical(0.05, 7, d), rel=1e-12)  # alone, own grid


def test_critical_values_far_out_invert_the_t_tail():
    # source: scipy.stats.t.isf; two means (range) and one treatment (many-to-one) reduce to t
    for alpha, df in ((1e-8, 1.0), (1e-6, 3.5), (1e-4, 1e4)):
        assert range_critical(alpha, 2, df) == pytest.approx(SQRT2 * stats.t.isf(alpha / 2, df), rel=1e-10)
        assert many_to_one_critical(alpha, [0.8], df) == pytest.approx(stats.t.isf(alpha / 2, df), rel=1e-10)


def test_many_to_one_tails_of_one_treatment_are_t_tails():
    # source: scipy.stats.t.sf; one comparison with the control is an ordinary t test.
    # 0.95 puts a step of q_j inside a panel (the finer panels are used).
    c = np.array([0.3, 2.0, 6.0, 20.0, 45.0])
    for lam in (0.3, 0.95):
        for df in (2.0, 23.0, 4000.0):
            got = many_to_one_tails(c, [lam], df)
            assert got == pytest.approx(2 * stats.t.sf(c, df), rel=1e-9)


def test_many_to_one_with_repeated_factors_matches_mpmath():
    # source: mpmath quadrature of Dunnett's (1955) one-dimensional form; equal factors are
    # grouped internally, which must not change the result
    lam = [0.6, 0.6, 0.75]
    h = np.array([1.5, 4.0])
    got = many_to_one_tails(h, lam, math.inf)
    for hi, p in zip(h, got):
        assert p == pytest.approx(many_to_one_normal(float(hi), lam), rel=1e-10)


def test_vector_edges_and_checks():
    # common practice: a tail is 1 at 0 and 0 at infinity
    assert list(range_tails([0.0, math.inf, 2.0], 4, [10, 10, math.inf])[:2]) == [1.0, 0.0]
    assert range_tails([2.0], 4, math.inf)[0] == range_tail(2.0, 4, math.inf)
    assert many_to_one_tails([-2.5], [0.7, 0.7], 12)[0] == many_to_one_tail(2.5, [0.7, 0.7], 12)
    with pytest.raises(InputError, match="2 degrees of freedom were given for 3 statistics"):
        range_tails([1.0, 2.0, 3.0], 3, [5, 6])
    with pytest.raises(InputError, match="NaN"):
        range_tails([1.0, float("nan")], 3, 5)
    with pytest.raises(InputError, match="degrees of freedom must be positive"):
        range_criticals(0.05, 3, [5, 0])
    with pytest.raises(InputError, match="k >= 2"):
        range_tails([1.0], 1, 5)


# ------------------------------------------------------------------------------------------
# the error guard and its fallback


def test_a_rejected_sum_falls_back_to_the_adaptive_quadrature(monkeypatch):
    # source: scipy.stats.t.sf and studentized_range.sf; with the guard made impossible to
    # pass, every tail takes the adaptive Gauss-Kronrod path and must still be right
    monkeypatch.setattr(mvt, "_GUARD", -1.0)
    got = range_tails([3.0, 40.0], 2, [7.0, 25.0])
    assert got == pytest.approx(2 * stats.t.sf(np.array([3.0, 40.0]) / SQRT2, [7.0, 25.0]), rel=1e-9)
    assert range_tail(3.5, 5, 20) == pytest.approx(stats.studentized_range.sf(3.5, 5, 20), rel=1e-9)
    assert range_critical(0.05, 3, 10) == pytest.approx(stats.studentized_range.ppf(0.95, 3, 10), rel=1e-9)


def test_a_too_coarse_first_step_is_refined(monkeypatch):
    # source: scipy.stats.t.sf; a first step far too coarse (the guard must notice and halve it)
    monkeypatch.setattr(mvt, "_FIRST_STEP", 8.0)
    calls = []
    real = mvt._evaluate

    def spy(*args):
        calls.append(1)
        return real(*args)

    monkeypatch.setattr(mvt, "_evaluate", spy)
    got = range_tails([3.0, 40.0], 2, 300.0)
    assert len(calls) > 1  # refined at least once
    assert got == pytest.approx(2 * stats.t.sf(np.array([3.0, 40.0]) / SQRT2, 300.0), rel=1e-9)


def test_very_few_degrees_of_freedom_use_the_adaptive_quadrature():
    # source: scipy.stats.t.sf (df below the grid's range still answered correctly)
    assert range_tail(3.0, 2, 0.02) == pytest.approx(2 * stats.t.sf(3.0 / SQRT2, 0.02), rel=1e-9)


# ------------------------------------------------------------------------------------------
# many groups through the comparisons


def test_tukey_and_games_howell_with_many_groups_match_scipy():
    # source: scipy.stats.tukey_hsd, and with equal_var=False (Games & Howell 1976)
    gs = many_groups(7, 1)
    for method, ref in (("tukey", stats.tukey_hsd(*gs)),
                        ("games-howell", stats.tukey_hsd(*gs, equal_var=False))):
        ci = ref.confidence_interval(0.95)
        res = pairwise(gs, method)
        assert len(res.rows) == 21
        pairs = [(i, j) for i in range(7) for j in range(i + 1, 7)]
        for row, (i, j) in zip(res.rows, pairs):
            assert row.p == pytest.approx(ref.pvalue[i, j], rel=1e-8, abs=1e-11), method
            assert row.ci.low == pytest.approx(ci.low[i, j], rel=1e-9, abs=1e-9), method
            assert row.ci.high == pytest.approx(ci.high[i, j], rel=1e-9, abs=1e-9), method


def test_dunnett_with_many_groups_matches_scipy():
    # source: scipy.stats.dunnett (randomised QMC with a fixed random_state; 1e-3 tolerance)
    gs = many_groups(12, 2)
    ref = stats.dunnett(*gs[1:], control=gs[0], random_state=np.random.default_rng(11))
    ci = ref.confidence_interval(0.95)
    res = dunnett(gs, "Group 1")
    for r, row in enumerate(res.rows):
        assert row.statistic == pytest.approx(ref.statistic[r], rel=1e-10)
        assert row.p == pytest.approx(ref.pvalue[r], abs=1e-3)
        width = row.ci.high - row.ci.low
        assert row.ci.low == pytest.approx(ci.low[r], abs=1e-3 * width)
        assert row.ci.high == pytest.approx(ci.high[r], abs=1e-3 * width)


def test_games_howell_shares_critical_values_between_equal_welch_df():
    # common practice: pairs with the same Welch df have the same critical value; two pairs of
    # groups with identical sizes and spreads (shifted copies) share it
    base = [10.1, 10.4, 9.8, 10.2]
    data = {"A": base, "B": [x + 1 for x in base], "C": [x + 2 for x in base]}
    res = pairwise(data, "games-howell")
    assert len(set(res.row_df)) == 1 and len(set(res.multipliers)) == 1
    assert res.multipliers[0] == pytest.approx(
        stats.studentized_range.ppf(0.95, 3, res.row_df[0]) / SQRT2, rel=1e-9
    )  # source: scipy.stats.studentized_range.ppf
