"""The normality tests' statistics (sheetfuncs.distributions.normality), on plain samples.

Sources are named beside each numeric check: scipy.stats.shapiro (AS R94), scipy.stats.normaltest,
scipy.stats.skewtest and scipy.stats.kurtosistest, run on seeded invented samples (the numbers
have no meaning). The tests of the residuals of grouped data are in tests/stats/test_normality.py
and tests/reference/test_scipy_alternatives.py.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy import stats

from sheetfuncs.errors import InputError
from sheetfuncs.distributions.normality import (
    SHAPIRO_WILK_MAX_N, dagostino_pearson, kurtosis_z, shapiro_wilk, shapiro_wilk_coefficients,
    skewness_z,
)


def sample(n: int, seed: int) -> np.ndarray:
    """Seeded invented values: skewed (gamma), rounded to three decimals."""
    return np.round(np.random.default_rng(7000 + seed).gamma(2.0, 3.0, size=n), 3)


@pytest.mark.parametrize("n", [3, 4, 7, 11, 12, 60, 800, SHAPIRO_WILK_MAX_N])
def test_shapiro_wilk_matches_scipy(n):
    # source: scipy.stats.shapiro (AS R94); its port uses a lower-precision normal quantile
    # (AS 241 PPND7), so W agrees to about 1e-9
    x = sample(n, n)
    w, p = shapiro_wilk(x)
    ref = stats.shapiro(x)
    assert w == pytest.approx(float(ref.statistic), abs=1e-8)
    assert p == pytest.approx(float(ref.pvalue), rel=1e-6)


def test_shapiro_wilk_coefficients_are_normalised_and_antisymmetric():
    # Royston (1992): the coefficients are scaled so that sum a_i^2 = 1, and a_(n+1-i) = -a_i
    for n in (3, 4, 5, 6, 11, 12, 101, 5000):
        a = shapiro_wilk_coefficients(n)
        assert a.size == n
        assert float(np.dot(a, a)) == pytest.approx(1.0, rel=1e-12)
        assert a.tolist() == (-a[::-1]).tolist()
    # Shapiro & Wilk (1965): for n = 3 the coefficients are exactly -sqrt(1/2), 0, sqrt(1/2)
    assert shapiro_wilk_coefficients(3).tolist() == [-math.sqrt(0.5), 0.0, math.sqrt(0.5)]


@pytest.mark.parametrize("n", [8, 20, 150, 9000])
def test_dagostino_pearson_matches_scipy(n):
    # source: scipy.stats.normaltest (D'Agostino-Pearson K^2)
    x = sample(n, n)
    k2, p = dagostino_pearson(x)
    ref = stats.normaltest(x)
    assert k2 == pytest.approx(float(ref.statistic), rel=1e-9)
    assert p == pytest.approx(float(ref.pvalue), rel=1e-7, abs=1e-300)


@pytest.mark.parametrize("n", [8, 30, 2000])
def test_skewness_and_kurtosis_scores_match_scipy(n):
    # source: scipy.stats.skewtest and scipy.stats.kurtosistest (their z statistics)
    x = sample(n, n + 1)
    d = x - x.mean()
    m2, m3, m4 = (float(np.mean(d**j)) for j in (2, 3, 4))
    assert skewness_z(m3 / m2**1.5, n) == pytest.approx(float(stats.skewtest(x).statistic), rel=1e-9)
    assert kurtosis_z(m4 / (m2 * m2), n) == pytest.approx(float(stats.kurtosistest(x).statistic), rel=1e-9)


@pytest.mark.parametrize("scale", [2.0**-700, 2.0**700, 1e-305, 1e305, 1e-80, 1e80])
def test_statistics_do_not_depend_on_the_unit(scale):
    # common practice: W and K^2 are free of the unit of measurement, even where the squares
    # (or, for K^2, the fourth powers) of the values would leave the double range
    x = sample(40, 3)
    for fn in (shapiro_wilk, dagostino_pearson):
        stat, p = fn(x * scale)
        ref_stat, ref_p = fn(x)
        assert stat == pytest.approx(ref_stat, rel=1e-12)
        assert p == pytest.approx(ref_p, rel=1e-10)


@pytest.mark.parametrize(
    "fn,values,message",
    [
        (shapiro_wilk, [1.0, 2.0], r"^sheetfuncs: the Shapiro-Wilk test needs at least 3 values, not 2$"),
        (shapiro_wilk, np.arange(5001.0), r"takes at most 5,000 values .* not 5,001; use the D'Agostino-Pearson"),
        (shapiro_wilk, [1.0, 2.0, math.nan], "needs finite numbers"),
        (shapiro_wilk, [1.0, math.inf, 3.0], "needs finite numbers"),
        (shapiro_wilk, ["a", "b", "c"], "needs numbers"),
        (shapiro_wilk, [4.0, 4.0, 4.0, 4.0], "all values are equal"),
        (dagostino_pearson, np.arange(7.0), r"^sheetfuncs: the D'Agostino-Pearson test needs at least 8 values, not 7$"),
        (dagostino_pearson, [2.0] * 9, "all values are equal"),
    ],
)
def test_bad_samples_get_one_line(fn, values, message):
    with pytest.raises(InputError, match=message) as err:
        fn(values)
    assert "\n" not in str(err.value)


def test_bad_sizes_of_the_scores_and_coefficients():
    with pytest.raises(InputError, match="the skewness test needs at least 8 values, not 7"):
        skewness_z(0.5, 7)
    with pytest.raises(InputError, match="the kurtosis test needs at least 5 values, not 4"):
        kurtosis_z(3.0, 4)
    with pytest.raises(InputError, match="the Shapiro-Wilk test needs at least 3 values, not 2"):
        shapiro_wilk_coefficients(2)
    with pytest.raises(InputError, match="takes at most 5,000 values"):
        shapiro_wilk_coefficients(5001)
