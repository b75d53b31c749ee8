"""Brown-Forsythe F* for means against statsmodels, on seeded random data.

Reference library: statsmodels ``statsmodels.stats.oneway.anova_oneway(use_var="bf")``. Its
``statistic`` is F*; ``df_num2`` (= k - 1), ``df_denom`` (Satterthwaite) and ``pvalue2`` are the
degrees of freedom and p-value of Brown & Forsythe (1974). (Its ``df_num`` and ``pvalue`` use
Mehrotra's 1997 modified numerator df, which is not the 1974 test.)
"""

from __future__ import annotations

import numpy as np
import pytest
from statsmodels.stats.oneway import anova_oneway

from sheetfuncs.stats.alternatives import brown_forsythe, welch


def random_groups(seed: int) -> list[np.ndarray]:
    rng = np.random.default_rng(31000 + seed)
    k = int(rng.integers(2, 8))
    return [
        np.round(rng.normal(rng.uniform(8, 12), rng.uniform(0.2, 3.0), size=int(rng.integers(2, 25))), 3)
        for _ in range(k)
    ]


@pytest.mark.parametrize("seed", range(15))
def test_brown_forsythe_matches_statsmodels(seed):
    # source: statsmodels anova_oneway(use_var="bf"): statistic, df_num2, df_denom, pvalue2
    gs = random_groups(seed)
    ref = anova_oneway(gs, use_var="bf")
    res = brown_forsythe(gs)
    assert res.statistic == pytest.approx(float(ref.statistic), rel=1e-10)
    assert res.df1 == int(ref.df_num2) == len(gs) - 1
    assert res.df2 == pytest.approx(float(ref.df_denom), rel=1e-10)
    assert res.p == pytest.approx(float(ref.pvalue2), rel=1e-8, abs=1e-300)


@pytest.mark.parametrize("seed", range(6))
def test_welch_matches_statsmodels_unequal(seed):
    # source: statsmodels anova_oneway(use_var="unequal") (Welch 1951), a second reference
    gs = random_groups(seed)
    ref = anova_oneway(gs, use_var="unequal")
    res = welch(gs)
    assert res.statistic == pytest.approx(float(ref.statistic), rel=1e-10)
    assert res.df2 == pytest.approx(float(ref.df_denom), rel=1e-10)
    assert res.p == pytest.approx(float(ref.pvalue), rel=1e-8, abs=1e-300)
