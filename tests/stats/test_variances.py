"""Levene's (and Brown-Forsythe's) and Bartlett's tests of equal variances (sheetfuncs.stats.variances).

Sources are named beside each numeric check: NIST StRD datasets, exact rational arithmetic and
mpmath computed in the test, scipy.stats.levene and scipy.stats.bartlett, and common practice.
"""

from __future__ import annotations

import math
from fractions import Fraction
from statistics import median

import mpmath
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy import stats

from tests.support import nist
from tests.support.assumption_cases import (
    HEADS_WELL_BEHAVED, INTEGER_GROUPS, SMALL_GROUPS, assert_shift_invariant,
)
from tests.support.mpmath_refs import bartlett_statistic
from sheetfuncs import InputError
from sheetfuncs.stats.variances import BartlettResult, LeveneResult, _u_minus_log1p, bartlett, levene

# --------------------------------------------------------------------------------------------
# certified data: NIST StRD


@pytest.mark.parametrize("family", [("SmLs01", "SmLs04", "SmLs07"), ("SmLs03", "SmLs06", "SmLs09")])
def test_nist_offsets_change_nothing(family):
    # source: NIST StRD SmLs datasets (the same values behind 1, 1e6 and 1e12 offsets)
    for fn in (levene, lambda g: levene(g, "mean"), bartlett):
        results = [fn(nist.load(name).groups) for name in family]
        assert results[0] == results[1] == results[2]


def test_nist_smls_levene_and_bartlett_are_exactly_zero():
    # source: NIST StRD SmLs07: every group holds the same values shifted by a constant, so the
    # deviations from each centre are identical and both tests are exactly 0 (p = 1); floating
    # point on the raw values gives about 4e-5 for Levene here (scipy.stats.levene)
    g = nist.load("SmLs07").groups
    for res in (levene(g), levene(g, "mean")):
        assert res.statistic == 0.0 and res.p == 1.0
    assert bartlett(g).statistic == 0.0 and bartlett(g).p == 1.0
    assert float(stats.levene(*g.values()).statistic) > 1e-6  # what the naive route gives


@pytest.mark.parametrize("center", ["median", "mean"])
def test_nist_atmwtag_levene_equals_exact_rational_evaluation(center):
    # source: NIST StRD AtmWtAg values as printed, Levene's formula evaluated in exact rational
    # arithmetic (Python fractions) here in the test
    d = nist.load("AtmWtAg")
    z = []
    for vals in d.text_values.values():
        v = [Fraction(x) for x in vals]
        c = median(v) if center == "median" else sum(v) / len(v)
        z.append([abs(x - c) for x in v])
    n, k = sum(map(len, z)), len(z)
    grand = sum(map(sum, z)) / n
    ssb = sum(len(a) * (sum(a) / len(a) - grand) ** 2 for a in z)
    ssw = sum(sum((x - sum(a) / len(a)) ** 2 for x in a) for a in z)
    exact_f = float(ssb / (k - 1) / (ssw / (n - k)))
    assert levene(d.groups, center).statistic == pytest.approx(exact_f, rel=4e-16)


# --------------------------------------------------------------------------------------------
# accuracy of Bartlett's statistic


def test_u_minus_log1p_against_mpmath():
    # source: mpmath at 40 digits
    mpmath.mp.dps = 40
    for u in [1e-12, -3e-9, 1e-5, -0.0999, 0.0999, 0.1, 0.5, -0.5, 3.0, 100.0]:
        ref = float(mpmath.mpf(u) - mpmath.log1p(mpmath.mpf(u)))
        assert _u_minus_log1p(u) == pytest.approx(ref, rel=1e-14)


def test_bartlett_nearly_equal_variances_against_mpmath():
    # source: Bartlett's textbook formula evaluated with mpmath at 50 digits on the exact
    # decimal values; the variances differ by parts in 1e8, where the plain double-precision
    # formula loses most of its digits
    a = [100.0, 100.2, 100.4, 100.6]
    b = [200.0, 200.2, 200.4, 200.60000002]
    c = [300.0, 300.2, 300.4, 300.6]
    ref = bartlett_statistic([a, b, c])
    assert ref > 0
    assert bartlett([a, b, c]).statistic == pytest.approx(ref, rel=1e-9)


@pytest.mark.parametrize(
    "a,b",
    [
        # variances 1e-8 and 1e4: the ratio s_A^2 / s_p^2 is near 2e-12, so 1 + u keeps few digits
        ([1.0001, 1.0002, 1.0003], [0, 100, 200]),
        # variances 1e-14 and 1e6: the ratio is below 2^-53, where u = ratio - 1 rounds to -1
        ([1.0000001, 1.0000002, 1.0000003], [0, 1000, 2000]),
        # variances 1e-28 and 1e28, 56 orders of magnitude apart
        ([1e-14, 2e-14, 3e-14], [0, 1e14, 2e14]),
    ],
)
def test_bartlett_very_different_variances_against_mpmath(a, b):
    # source: Bartlett's textbook formula with mpmath at 50 digits on the exact decimal values
    # (41.99156280770 for the first case; scipy.stats.bartlett agrees with it there)
    ref = bartlett_statistic([a, b])
    res = bartlett({"A": a, "B": b})
    assert res.exact
    assert res.statistic == pytest.approx(ref, rel=1e-13)
    assert res.p == pytest.approx(float(stats.chi2.sf(ref, 1)), rel=1e-10)


def test_bartlett_first_case_matches_scipy():
    # reference library: scipy.stats.bartlett (double precision is enough on these data)
    a, b = [1.0001, 1.0002, 1.0003], [0, 100, 200]
    ref = stats.bartlett(a, b)
    assert bartlett([a, b]).statistic == pytest.approx(float(ref.statistic), rel=1e-12)
    assert bartlett([a, b], exact=False).statistic == pytest.approx(float(ref.statistic), rel=1e-12)


def test_bartlett_float_path_with_very_different_variances():
    # reference library: scipy.stats.bartlett on the same doubles (the float path works on the
    # doubles, not their decimal values); the variance ratio is below 2^-53
    a, b = [1.0000001, 1.0000002, 1.0000003], [0, 1000, 2000]
    ref = stats.bartlett(a, b)
    res = bartlett({"A": a, "B": b}, exact=False)
    assert not res.exact
    assert res.statistic == pytest.approx(float(ref.statistic), rel=1e-12)


# --------------------------------------------------------------------------------------------
# bad input and degenerate cases


def test_levene_group_of_one_value():
    with pytest.raises(InputError, match=r'^sheetfuncs: group "B" has only one value.*Levene'):
        levene({"A": [1, 2, 3], "B": [4]})


def test_levene_every_value_tied_at_its_centre():
    with pytest.raises(InputError, match=r"^sheetfuncs: every value's distance from its group median is zero"):
        levene([[1, 1, 1], [2, 2]])


def test_levene_equal_distances_everywhere():
    with pytest.raises(InputError, match=r"^sheetfuncs: every value's distance from its group mean is the same"):
        levene([[1, 3], [5, 7], [0, 2]], center="mean")


def test_levene_no_spread_within_deviations_is_infinite():
    # GUIDE: zero within-group variation with different means gives F = inf and p = 0
    res = levene([[1, 3], [0, 4]])
    assert math.isinf(res.statistic) and res.p == 0.0


@pytest.mark.parametrize("center", ["trimmed", 1, True])
def test_levene_bad_center(center):
    with pytest.raises(InputError, match=r'^sheetfuncs: center must be "median"'):
        levene([[1, 2, 3], [2, 4, 7]], center=center)


def test_levene_center_is_forgiving_about_case_and_blanks():
    gs = [[1, 2, 3.5], [2, 4, 7]]
    assert levene(gs, " Mean ") == levene(gs, "mean")
    assert levene(gs, None) == levene(gs, "") == levene(gs)


def test_bartlett_zero_variance_and_single_value():
    with pytest.raises(InputError, match=r'^sheetfuncs: group "B" has zero variance.*Bartlett'):
        bartlett({"A": [1, 2, 3], "B": [4, 4]})
    with pytest.raises(InputError, match=r'^sheetfuncs: group "B" has only one value.*Bartlett'):
        bartlett({"A": [1, 2, 3], "B": [4]})


@pytest.mark.parametrize("fn", [levene, bartlett])
def test_one_group_rejected(fn):
    with pytest.raises(InputError, match=r"^sheetfuncs: at least two groups"):
        fn([[1, 2, 3]])


def test_tables_are_ready_to_spill():
    gs = HEADS_WELL_BEHAVED
    lv, bt = levene(gs), bartlett(gs)
    assert lv.table() == [["Test", "Statistic", "df1", "df2", "p"], ["Levene (median)", lv.statistic, 3, 35, lv.p]]
    assert levene(gs, "mean").table()[1][0] == "Levene (mean)"
    assert bt.table() == [["Test", "Statistic", "df", "p"], ["Bartlett", bt.statistic, 3, bt.p]]
    assert isinstance(lv, LeveneResult) and isinstance(bt, BartlettResult)


@pytest.mark.parametrize("scale", [1e-200, 1e200])
def test_extreme_magnitudes(scale):
    # common practice: the tests do not depend on the unit of measurement
    moved = [[v * scale for v in g] for g in SMALL_GROUPS]
    for fn in (levene, lambda g: levene(g, "mean"), bartlett):
        assert fn(moved).statistic == pytest.approx(fn(SMALL_GROUPS).statistic, rel=1e-12)


# --------------------------------------------------------------------------------------------
# properties (hypothesis, derandomised in conftest.py)


@settings(max_examples=50)
@given(INTEGER_GROUPS, st.integers(-10**6, 10**6))
def test_shift_invariance(gs, shift):
    # common practice: adding a constant to every value changes neither test
    for fn in (levene, lambda g: levene(g, "mean"), bartlett):
        assert_shift_invariant(fn, gs, shift)
