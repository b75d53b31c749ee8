"""Alternatives to the F test and assumption checks against scipy.stats, on seeded random data.

Reference library: scipy.stats (``f_oneway(equal_var=False)`` for Welch, ``kruskal``,
``levene`` with both centres, ``bartlett``, ``shapiro``, ``normaltest``), run side by side on
the same data. The data are rounded to a few decimals, as typed into a spreadsheet, and drawn
from seeded generators so the checks repeat exactly.
"""

from __future__ import annotations

import numpy as np
import pytest
from scipy import stats

from sheetfuncs.stats.alternatives import kruskal, welch
from sheetfuncs.stats.normality import shapiro_residuals
from sheetfuncs.stats.residuals import residuals
from sheetfuncs.stats.variances import bartlett, levene

SEEDS = range(12)


def random_groups(seed: int, *, ties: bool = False) -> list[np.ndarray]:
    """Seeded groups with unequal sizes, means and spreads (2 to 7 groups of 2 to 30 values)."""
    rng = np.random.default_rng(20240 + seed)
    k = int(rng.integers(2, 8))
    out = []
    for _ in range(k):
        n = int(rng.integers(3, 31))
        x = rng.normal(rng.uniform(40, 60), rng.uniform(0.5, 6.0), size=n)
        out.append(np.round(x, 0 if ties else 2))
    return out


@pytest.mark.parametrize("seed", SEEDS)
def test_welch_matches_scipy_f_oneway_unequal_var(seed):
    # source: scipy.stats.f_oneway(..., equal_var=False), Welch (1951)
    gs = random_groups(seed)
    ref = stats.f_oneway(*gs, equal_var=False)
    res = welch(gs)
    assert res.statistic == pytest.approx(float(ref.statistic), rel=1e-11)
    assert res.p == pytest.approx(float(ref.pvalue), rel=1e-9, abs=1e-300)
    assert res.df1 == len(gs) - 1


@pytest.mark.parametrize("seed", SEEDS)
@pytest.mark.parametrize("ties", [False, True])
def test_kruskal_matches_scipy(seed, ties):
    # source: scipy.stats.kruskal (tie-corrected H, chi-square p-value)
    gs = random_groups(seed, ties=ties)
    ref = stats.kruskal(*gs)
    res = kruskal(gs)
    assert res.statistic == pytest.approx(float(ref.statistic), rel=1e-11)
    assert res.p == pytest.approx(float(ref.pvalue), rel=1e-9)
    n = sum(a.size for a in gs)
    # rank epsilon squared, Tomczak & Tomczak (2014): H (N + 1) / (N^2 - 1), from scipy's H
    assert res.rank_epsilon_squared == pytest.approx(float(ref.statistic) * (n + 1) / (n * n - 1), rel=1e-11)


@pytest.mark.parametrize("seed", SEEDS)
@pytest.mark.parametrize("center", ["median", "mean"])
def test_levene_matches_scipy(seed, center):
    # source: scipy.stats.levene(center="median") (Brown-Forsythe 1974) and center="mean" (Levene 1960)
    gs = random_groups(seed)
    ref = stats.levene(*gs, center=center)
    res = levene(gs, center=center)
    assert res.statistic == pytest.approx(float(ref.statistic), rel=1e-9)
    assert res.p == pytest.approx(float(ref.pvalue), rel=1e-8)
    assert (res.df_between, res.df_within) == (len(gs) - 1, sum(a.size for a in gs) - len(gs))
    assert res.center == center


@pytest.mark.parametrize("seed", SEEDS)
def test_bartlett_matches_scipy(seed):
    # source: scipy.stats.bartlett
    gs = random_groups(seed)
    ref = stats.bartlett(*gs)
    res = bartlett(gs)
    assert res.statistic == pytest.approx(float(ref.statistic), rel=1e-10)
    assert res.p == pytest.approx(float(ref.pvalue), rel=1e-9, abs=1e-300)
    assert res.df == len(gs) - 1


@pytest.mark.parametrize("seed", SEEDS)
def test_shapiro_residuals_matches_scipy_shapiro(seed):
    # source: scipy.stats.shapiro (AS R94) on the residuals y - group mean computed by numpy.
    # scipy's port uses a lower-precision normal quantile (AS 241 PPND7), so W agrees to ~1e-9.
    gs = random_groups(seed)
    resid = np.concatenate([a - a.mean() for a in gs])
    ref = stats.shapiro(resid)
    res = shapiro_residuals(gs)
    assert res.method == "Shapiro-Wilk"
    assert res.n == resid.size
    assert res.statistic == pytest.approx(float(ref.statistic), abs=1e-8)
    assert res.p == pytest.approx(float(ref.pvalue), rel=1e-6)


@pytest.mark.parametrize("n", [3, 4, 5, 6, 7, 11, 12, 13, 40, 500, 5000])
def test_shapiro_wilk_sizes_match_scipy(n):
    # source: scipy.stats.shapiro on the same residuals, across the small-n (3, 4..11) and
    # large-n (12..5000) branches of Royston's approximation; skewed data give small p-values.
    # The second group has one value, whose zero residual is left out.
    rng = np.random.default_rng(n)
    a = np.round(rng.gamma(2.0, 3.0, size=n), 3)
    res = shapiro_residuals([a, [50.0]])
    ref = stats.shapiro(a - a.mean())
    assert res.n == n
    assert res.statistic == pytest.approx(float(ref.statistic), abs=1e-8)
    assert res.p == pytest.approx(float(ref.pvalue), rel=1e-6)


def test_shapiro_wilk_three_values_exact_distribution():
    # source: scipy.stats.shapiro with n = 3 (exact distribution of W, Shapiro & Wilk 1965)
    gs = [[1.0, 2.0, 4.5], [7.0]]
    res = shapiro_residuals(gs)
    ref = stats.shapiro([1.0, 2.0, 4.5])
    assert res.n == 3 and res.left_out == ("Group 2",)
    assert res.statistic == pytest.approx(float(ref.statistic), abs=1e-12)
    assert res.p == pytest.approx(float(ref.pvalue), rel=1e-9)


@pytest.mark.parametrize("seed", [1, 2])
def test_above_5000_residuals_matches_scipy_normaltest(seed):
    # source: scipy.stats.normaltest (D'Agostino-Pearson K^2) on the residuals
    rng = np.random.default_rng(seed)
    gs = [np.round(rng.standard_t(8, size=2100) + 10 * i, 3) for i in range(3)]
    resid = np.concatenate([a - a.mean() for a in gs])
    ref = stats.normaltest(resid)
    res = shapiro_residuals(gs)
    assert res.method == "D'Agostino-Pearson" and res.n == 6300
    assert res.statistic == pytest.approx(float(ref.statistic), rel=1e-9)
    assert res.p == pytest.approx(float(ref.pvalue), rel=1e-7, abs=1e-300)


@pytest.mark.parametrize("seed", SEEDS)
def test_residuals_match_numpy(seed):
    # source: numpy, y - mean(y) per group
    gs = random_groups(seed)
    for mine, a in zip(residuals(gs), gs):
        np.testing.assert_allclose(mine, a - a.mean(), rtol=0, atol=1e-12)


def test_two_groups_welch_is_welch_t_squared():
    # source: scipy.stats.ttest_ind(equal_var=False): for two groups Welch's F is t squared
    # with the same Welch-Satterthwaite df and p-value
    rng = np.random.default_rng(7)
    a, b = np.round(rng.normal(10, 1, 9), 2), np.round(rng.normal(11, 3, 14), 2)
    t = stats.ttest_ind(a, b, equal_var=False)
    res = welch([a, b])
    assert res.statistic == pytest.approx(float(t.statistic) ** 2, rel=1e-11)
    assert res.p == pytest.approx(float(t.pvalue), rel=1e-9)
    assert res.df2 == pytest.approx(float(t.df), rel=1e-11)


def test_two_groups_kruskal_is_mann_whitney_asymptotic():
    # source: scipy.stats.mannwhitneyu(use_continuity=False, method="asymptotic"): for two
    # groups the tie-corrected H is the square of the tie-corrected normal score
    rng = np.random.default_rng(8)
    a, b = np.round(rng.normal(10, 2, 11), 0), np.round(rng.normal(12, 2, 13), 0)
    mw = stats.mannwhitneyu(a, b, use_continuity=False, method="asymptotic")
    res = kruskal([a, b])
    assert res.p == pytest.approx(float(mw.pvalue), rel=1e-9)
