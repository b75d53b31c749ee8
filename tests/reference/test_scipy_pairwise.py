"""Pairwise and many-to-one comparisons against scipy.stats, on seeded random data.

Reference library: scipy.stats, run side by side on the same data:

* ``tukey_hsd`` (Tukey–Kramer) and ``tukey_hsd(equal_var=False)`` (Games–Howell): differences,
  p-values and 95% / 99% intervals;
* ``dunnett``: p-values and intervals; scipy integrates the multivariate t by randomised
  quasi-Monte Carlo, so it runs with a fixed ``random_state`` and is compared at 1e-3;
* ``studentized_range`` (its ``sf`` and ``ppf``) for our own studentized-range code in the body
  of the distribution, and ``t.sf`` for the two cases where the maximum-type distributions
  reduce exactly to Student's t (two means; one treatment against a control), which checks our
  tails far below scipy's ``studentized_range.sf`` (computed as one minus the distribution
  function, it stops being accurate below about 1e-11).

Data are rounded to two decimals, as typed into a spreadsheet, from seeded generators.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy import stats

from sheetfuncs.distributions import many_to_one_critical, many_to_one_tail, range_critical, range_tail
from sheetfuncs.stats.comparisons import dunnett, pairwise


def random_groups(seed: int, k_max: int = 6) -> list[np.ndarray]:
    """Seeded groups: 2 to k_max groups of 3 to 25 values, unequal means and spreads."""
    rng = np.random.default_rng(31000 + seed)
    k = int(rng.integers(2, k_max + 1))
    out = []
    for _ in range(k):
        n = int(rng.integers(3, 26))
        out.append(np.round(rng.normal(rng.uniform(48, 52), rng.uniform(0.5, 3.0), size=n), 2))
    return out


def _pairs(k: int) -> list[tuple[int, int]]:
    return [(i, j) for i in range(k) for j in range(i + 1, k)]


@pytest.mark.parametrize("seed", range(6))
def test_tukey_kramer_matches_scipy_tukey_hsd(seed):
    # source: scipy.stats.tukey_hsd (Tukey-Kramer for unequal sizes)
    gs = random_groups(seed)
    ref = stats.tukey_hsd(*gs)
    for conf in (0.95, 0.99) if seed < 2 else (0.95,):
        res = pairwise(gs, "tukey", alpha=1 - conf)
        ci = ref.confidence_interval(conf)
        assert len(res.rows) == len(gs) * (len(gs) - 1) // 2
        for row, (i, j) in zip(res.rows, _pairs(len(gs))):
            assert row.difference == pytest.approx(ref.statistic[i, j], rel=1e-12, abs=1e-12)
            assert row.p == pytest.approx(ref.pvalue[i, j], rel=1e-8, abs=1e-11)
            assert row.ci.low == pytest.approx(ci.low[i, j], rel=1e-9, abs=1e-9)
            assert row.ci.high == pytest.approx(ci.high[i, j], rel=1e-9, abs=1e-9)
            assert row.differs == (ref.pvalue[i, j] < 1 - conf)


@pytest.mark.parametrize("seed", range(4))
def test_games_howell_matches_scipy_tukey_hsd_unequal_var(seed):
    # source: scipy.stats.tukey_hsd(..., equal_var=False), Games & Howell (1976)
    gs = random_groups(100 + seed, k_max=4)
    ref = stats.tukey_hsd(*gs, equal_var=False)
    ci = ref.confidence_interval(0.95)
    res = pairwise(gs, "games-howell")
    for row, (i, j) in zip(res.rows, _pairs(len(gs))):
        assert row.difference == pytest.approx(ref.statistic[i, j], rel=1e-12, abs=1e-12)
        assert row.p == pytest.approx(ref.pvalue[i, j], rel=1e-8, abs=1e-11)
        assert row.ci.low == pytest.approx(ci.low[i, j], rel=1e-9, abs=1e-9)
        assert row.ci.high == pytest.approx(ci.high[i, j], rel=1e-9, abs=1e-9)


@pytest.mark.parametrize("seed", range(4))
def test_dunnett_matches_scipy_dunnett(seed):
    # source: scipy.stats.dunnett (randomised QMC with a fixed random_state; 1e-3 tolerance)
    gs = random_groups(200 + seed, k_max=5)
    if len(gs) < 3:
        gs.append(np.round(np.random.default_rng(seed).normal(50.5, 1.0, 9), 2))
    control = seed % len(gs)
    treat = [x for i, x in enumerate(gs) if i != control]
    ref = stats.dunnett(*treat, control=gs[control], random_state=np.random.default_rng(7))
    ci = ref.confidence_interval(0.95)
    res = dunnett(gs, f"Group {control + 1}")
    assert res.control == f"Group {control + 1}"
    assert len(res.rows) == len(gs) - 1
    for r, row in enumerate(res.rows):
        assert row.group_b == f"Group {control + 1}"
        assert row.statistic == pytest.approx(ref.statistic[r], rel=1e-10)
        assert row.p == pytest.approx(ref.pvalue[r], abs=1e-3)
        width = row.ci.high - row.ci.low
        assert row.ci.low == pytest.approx(ci.low[r], abs=1e-3 * width)
        assert row.ci.high == pytest.approx(ci.high[r], abs=1e-3 * width)


@pytest.mark.parametrize(
    "q,k,df",
    [(0.5, 3, 5), (2.0, 4, 12), (3.5, 5, 20), (4.2, 6, 2.5), (5.0, 10, 40), (6.0, 3, 1),
     (7.0, 8, 200), (9.0, 4, 30), (3.0, 20, 60)],
)
def test_range_tail_matches_scipy_studentized_range_in_the_body(q, k, df):
    # source: scipy.stats.studentized_range.sf (accurate where p is well above 1e-11)
    assert range_tail(q, k, df) == pytest.approx(stats.studentized_range.sf(q, k, df), rel=1e-9)


@pytest.mark.parametrize("alpha,k,df", [(0.05, 3, 10), (0.01, 5, 30), (0.10, 8, 6.5), (0.05, 12, 120)])
def test_range_critical_matches_scipy_studentized_range_ppf(alpha, k, df):
    # source: scipy.stats.studentized_range.ppf
    ref = stats.studentized_range.ppf(1 - alpha, k, df)
    assert range_critical(alpha, k, df) == pytest.approx(ref, rel=1e-9)


@pytest.mark.parametrize("q,df", [(3.0, 7), (12.0, 10), (40.0, 25), (150.0, 60), (9.0, 1.5)])
def test_range_tail_of_two_means_is_the_t_tail_far_into_the_tail(q, df):
    # source: scipy.stats.t.sf; with two means Q = sqrt(2) |t| exactly (common practice)
    ref = 2 * stats.t.sf(q / math.sqrt(2), df)
    assert range_tail(q, 2, df) == pytest.approx(ref, rel=1e-9)


@pytest.mark.parametrize("c,df,lam", [(2.0, 10, 0.7), (8.0, 15, 0.3), (25.0, 40, 0.9), (60.0, 80, 0.5)])
def test_many_to_one_tail_of_one_treatment_is_the_t_tail(c, df, lam):
    # source: scipy.stats.t.sf; one comparison with the control is an ordinary t test
    assert many_to_one_tail(c, [lam], df) == pytest.approx(2 * stats.t.sf(c, df), rel=1e-9)


def test_many_to_one_critical_of_one_treatment_is_the_t_quantile():
    # source: scipy.stats.t.isf
    for alpha, df in ((0.05, 12), (0.01, 4), (0.2, 100)):
        assert many_to_one_critical(alpha, [0.6], df) == pytest.approx(stats.t.isf(alpha / 2, df), rel=1e-10)


def test_tukey_for_two_groups_is_the_pooled_t_test():
    # source: scipy.stats.ttest_ind (pooled variance); with two groups every method is this test
    gs = random_groups(300)[:2]
    ref = stats.ttest_ind(gs[0], gs[1])
    ci = ref.confidence_interval(0.95)
    for method in ("tukey", "bonferroni", "holm", "sidak", "scheffe"):
        row = pairwise(gs, method).rows[0]
        assert row.p == pytest.approx(ref.pvalue, rel=1e-9), method
        assert row.ci.low == pytest.approx(ci.low, rel=1e-9), method
        assert row.ci.high == pytest.approx(ci.high, rel=1e-9), method
    row = dunnett(gs, "Group 1").rows[0]
    assert row.p == pytest.approx(ref.pvalue, rel=1e-9)
    assert row.statistic == pytest.approx(-ref.statistic, rel=1e-12)  # treatment minus control
