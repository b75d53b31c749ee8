"""Bonferroni, Holm and Šidák adjusted p-values against statsmodels ``multipletests``.

Reference library: ``statsmodels.stats.multitest.multipletests`` (methods ``bonferroni``,
``holm``, ``sidak``), applied to unadjusted two-sided t-test p-values that the test computes on
its own with numpy and ``scipy.stats.t.sf`` from the textbook pooled-variance formulas
(MSE = within-group sum of squares / (N - k), SE = sqrt(MSE (1/n_a + 1/n_b)), df = N - k).
Intervals are checked against the textbook Bonferroni and Šidák intervals (Bonferroni 1936;
Šidák 1967), computed the same independent way. Data: seeded, rounded to two decimals.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy import stats
from statsmodels.stats.multitest import multipletests

from sheetfuncs.stats.comparisons import pairwise


def random_groups(seed: int) -> list[np.ndarray]:
    """Seeded groups: 3 to 7 groups of 2 to 20 values; some means far apart (tiny p-values)."""
    rng = np.random.default_rng(41000 + seed)
    k = int(rng.integers(3, 8))
    out = []
    for _ in range(k):
        n = int(rng.integers(2, 21))
        mean = rng.choice([20.0, 20.5, 21.0, 30.0])
        out.append(np.round(rng.normal(mean, rng.uniform(0.3, 2.0), size=n), 2))
    return out


def textbook_raw(gs: list[np.ndarray]):
    """Unadjusted pooled t tests for every pair, computed independently of sheetfuncs."""
    k = len(gs)
    n_total = sum(len(x) for x in gs)
    df = n_total - k
    mse = sum(float(((x - x.mean()) ** 2).sum()) for x in gs) / df
    diffs, ses, ps = [], [], []
    for i in range(k):
        for j in range(i + 1, k):
            d = gs[i].mean() - gs[j].mean()
            se = math.sqrt(mse * (1 / len(gs[i]) + 1 / len(gs[j])))
            diffs.append(d)
            ses.append(se)
            ps.append(2 * stats.t.sf(abs(d) / se, df))
    return np.array(diffs), np.array(ses), np.array(ps), df


@pytest.mark.parametrize("seed", range(10))
@pytest.mark.parametrize("method", ["bonferroni", "holm", "sidak"])
def test_adjusted_p_matches_statsmodels_multipletests(seed, method):
    # source: statsmodels.stats.multitest.multipletests(method=...) on textbook raw p-values
    gs = random_groups(seed)
    _, _, raw, _ = textbook_raw(gs)
    reject, adjusted, _, _ = multipletests(raw, alpha=0.05, method=method)
    res = pairwise(gs, method, alpha=0.05)
    got = np.array([r.p for r in res.rows])
    np.testing.assert_allclose(got, adjusted, rtol=1e-9, atol=1e-300)
    assert [r.differs for r in res.rows] == [bool(x) for x in reject]
    assert all(0.0 <= p <= 1.0 for p in got)


@pytest.mark.parametrize("seed", range(5))
def test_bonferroni_and_sidak_intervals_match_textbook(seed):
    # source: textbook intervals d +/- t(alpha/(2m); df) SE (Bonferroni) and
    # d +/- t((1 - (1 - alpha)^(1/m))/2; df) SE (Šidák 1967); Holm rows show the Bonferroni ones
    gs = random_groups(50 + seed)
    d, se, _, df = textbook_raw(gs)
    m = len(d)
    for method, per in (
        ("bonferroni", 0.05 / m),
        ("holm", 0.05 / m),
        ("sidak", 1 - (1 - 0.05) ** (1 / m)),
    ):
        crit = stats.t.isf(per / 2, df)
        res = pairwise(gs, method)
        np.testing.assert_allclose([r.ci.low for r in res.rows], d - crit * se, rtol=1e-9, atol=1e-11)
        np.testing.assert_allclose([r.ci.high for r in res.rows], d + crit * se, rtol=1e-9, atol=1e-11)
        np.testing.assert_allclose([r.statistic for r in res.rows], d / se, rtol=1e-9)


def test_tiny_p_values_keep_their_relative_accuracy():
    # source: statsmodels multipletests (sidak uses -expm1(m log1p(-p)), as we do), raw p from
    # scipy.stats.t.sf far in the tail
    gs = [np.round(np.linspace(10, 10.2, 12), 3), np.round(np.linspace(30, 30.2, 12), 3),
          np.round(np.linspace(10.05, 10.25, 12), 3)]
    _, _, raw, _ = textbook_raw(gs)
    assert raw.min() < 1e-30
    for method in ("bonferroni", "holm", "sidak"):
        _, adjusted, _, _ = multipletests(raw, method=method)
        got = [r.p for r in pairwise(gs, method).rows]
        np.testing.assert_allclose(got, adjusted, rtol=1e-9, atol=0)
