"""linear_test against statsmodels' nested OLS F test (reference library).

The full model gives each group its own mean (one indicator column per group); the reduced model
gives one indicator per pooling label. ``full.compare_f_test(reduced)`` returns the general
linear test's F, p and df difference (statsmodels.regression.linear_model.RegressionResults).
"""

from __future__ import annotations

import numpy as np
import pytest
import statsmodels.api as sm

import sheetfuncs as sf


def indicator_fit(values: np.ndarray, codes: np.ndarray):
    levels = sorted(set(codes.tolist()))
    design = np.column_stack([(codes == c).astype(float) for c in levels])
    return sm.OLS(values, design).fit()


def random_case(rng, decimals):
    k = int(rng.integers(3, 8))
    sizes = rng.integers(2, 25, size=k)
    shifts = rng.normal(0, 1.5, size=k)
    groups = [np.round(10 + s + rng.normal(0, 1, size=int(n)), decimals) for s, n in zip(shifts, sizes)]
    # a random pooling with fewer labels than groups
    n_pools = int(rng.integers(1, k))
    pooling = rng.integers(0, n_pools, size=k)
    pooling[:n_pools] = np.arange(n_pools)  # every pool label is used
    rng.shuffle(pooling)
    return groups, [f"P{p}" for p in pooling]


@pytest.mark.parametrize("decimals, exact", [(3, None), (6, False)])
def test_linear_test_matches_statsmodels_compare_f_test(decimals, exact):
    # statsmodels OLS compare_f_test: F and p within 1e-9 relative, 60 seeded cases
    rng = np.random.default_rng(4321 + decimals)
    for _ in range(60):
        groups, pooling = random_case(rng, decimals)
        values = np.concatenate(groups)
        group_codes = np.concatenate([np.full(len(g), i) for i, g in enumerate(groups)])
        pool_of = {i: p for i, p in enumerate(pooling)}
        pool_codes = np.array([pool_of[i] for i in group_codes.tolist()])
        full = indicator_fit(values, group_codes)
        reduced = indicator_fit(values, pool_codes)
        f_ref, p_ref, df_ref = full.compare_f_test(reduced)
        res = sf.linear_test([list(g) for g in groups], pooling, exact=exact)
        assert res.df_difference == int(df_ref)
        assert res.df_full == int(full.df_resid)
        assert res.df_reduced == int(reduced.df_resid)
        assert res.ss_full == pytest.approx(float(full.ssr), rel=1e-10)
        assert res.ss_reduced == pytest.approx(float(reduced.ssr), rel=1e-10)
        assert res.f == pytest.approx(float(f_ref), rel=1e-9)
        assert res.p == pytest.approx(float(p_ref), rel=1e-9)


def test_pooling_every_group_reproduces_the_one_way_f():
    # general linear test with one shared mean = the one-way F test (Kutner et al. 2.8);
    # checked against statsmodels' intercept-only comparison as well
    rng = np.random.default_rng(77)
    for _ in range(30):
        groups, _ = random_case(rng, 2)
        lists = [list(map(float, g)) for g in groups]
        one = sf.oneway(lists)
        glt = sf.linear_test(lists, ["all"] * len(lists))
        assert glt.f == one.f  # both exact: the same rationals, rounded once
        assert glt.p == one.p
        assert glt.ss_reduced == pytest.approx(one.ss_total, rel=1e-15)
        assert glt.ss_full == pytest.approx(one.ss_within, rel=1e-15)
        values = np.concatenate(groups)
        codes = np.concatenate([np.full(len(g), i) for i, g in enumerate(groups)])
        full = indicator_fit(values, codes)
        f_ref, p_ref, _ = full.compare_f_test(sm.OLS(values, np.ones_like(values)).fit())
        assert one.f == pytest.approx(float(f_ref), rel=1e-9)
