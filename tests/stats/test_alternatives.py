"""Welch, Brown-Forsythe F* and Kruskal-Wallis: behaviour, bad input, exactness, properties."""

from __future__ import annotations

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy import stats

from tests.support import nist
from sheetfuncs import InputError, groups_from_range, oneway
from sheetfuncs.stats.alternatives import (
    BrownForsytheResult,
    KruskalResult,
    WelchResult,
    brown_forsythe,
    kruskal,
    welch,
)


# --------------------------------------------------------------------------------------------
# certified data: NIST StRD SmLs01/04/07 hold the same values behind 1, 1e6 and 1e12 offsets


@pytest.mark.parametrize("fn", [welch, brown_forsythe, kruskal])
@pytest.mark.parametrize("family", [("SmLs01", "SmLs04", "SmLs07"), ("SmLs02", "SmLs05", "SmLs08")])
def test_nist_offsets_change_nothing(fn, family):
    # source: NIST StRD SmLs datasets (same residual structure behind growing constant leading
    # digits); the decimal-exact path must give the same answer to the last bit
    results = [fn(nist.load(name).groups) for name in family]
    assert results[0] == results[1] == results[2]


def test_nist_smls07_welch_equals_scipy_on_smls01():
    # source: scipy.stats.f_oneway(equal_var=False) on NIST StRD SmLs01 (small values, well
    # conditioned); SmLs07 is the same data behind a 1e12 offset
    ref = stats.f_oneway(*nist.load("SmLs01").groups.values(), equal_var=False)
    res = welch(nist.load("SmLs07").groups)
    assert res.statistic == pytest.approx(float(ref.statistic), rel=1e-13)


@pytest.mark.parametrize("name", ["SmLs01", "SmLs04", "SmLs07", "SmLs03", "SmLs09"])
def test_nist_brown_forsythe_equals_certified_f_for_equal_sizes(name):
    # source: NIST StRD certified F (2.1e1 for SmLs01-09 with their group sizes); with equal
    # group sizes F* equals the one-way F (Brown & Forsythe 1974), so F* is certified too
    d = nist.load(name)
    res = brown_forsythe(d.groups)
    assert res.statistic == pytest.approx(d.certified.f, rel=1e-14)
    assert res.exact


def test_nist_atmwtag_brown_forsythe_and_welch_for_two_groups():
    # source: NIST StRD AtmWtAg, certified F = 1.59467335677930e1 (two groups of 24): with two
    # equal-sized groups Welch's F and F* both equal the one-way F (common practice identity)
    d = nist.load("AtmWtAg")
    assert brown_forsythe(d.groups).statistic == pytest.approx(d.certified.f, rel=1e-13)
    assert welch(d.groups).statistic == pytest.approx(d.certified.f, rel=1e-13)


# --------------------------------------------------------------------------------------------
# hand calculations


def test_kruskal_hand_calculation_no_ties():
    # source: hand calculation from the Kruskal-Wallis (1952) formula: ranks 1,2 | 3,4;
    # H = 12/(4*5) * (3^2/2 + 7^2/2) - 3*5 = 2.4; epsilon^2 = 2.4 * 5 / 15 = 0.8
    res = kruskal({"A": [1.5, 2.5], "B": [3.5, 4.5]})
    assert res.statistic == pytest.approx(2.4, rel=1e-15)
    assert res.df == 1
    assert res.rank_epsilon_squared == pytest.approx(0.8, rel=1e-15)
    assert res.tie_correction == 1.0
    assert res.mean_ranks == (1.5, 3.5)
    assert res.p == pytest.approx(float(stats.chi2.sf(2.4, 1)), rel=1e-14)  # scipy.stats.chi2


def test_kruskal_hand_calculation_with_ties():
    # source: hand calculation: values 1,1,2 | 2,3,3 -> ranks 1.5,1.5,3.5 | 3.5,5.5,5.5;
    # R = 6.5, 14.5; H0 = 12/42 * (6.5^2 + 14.5^2)/3 - 21 = 3.047619...; ties t=2,2,2:
    # C = 1 - 3*6/210 = 0.9142857...; H = H0 / C = 3.3333...
    res = kruskal([[1, 1, 2], [2, 3, 3]])
    h0 = 12 / 42 * (6.5**2 + 14.5**2) / 3 - 21
    assert res.tie_correction == pytest.approx(1 - 18 / 210, rel=1e-15)
    assert res.statistic == pytest.approx(h0 / (1 - 18 / 210), rel=1e-14)


def test_welch_two_groups_hand_calculation():
    # source: hand calculation of Welch's t^2 = (m1 - m2)^2 / (s1^2/n1 + s2^2/n2):
    # A = 1,2,3 (m 2, s^2 1), B = 4,6,8,10 (m 7, s^2 20/3): t^2 = 25 / (1/3 + 5/3) = 12.5;
    # df = (2)^2 / ((1/3)^2/2 + (5/3)^2/3) = 4 / (1/18 + 25/27) = 4.0754716...
    res = welch([[1, 2, 3], [4, 6, 8, 10]])
    assert res.statistic == pytest.approx(12.5, rel=1e-14)
    assert res.df2 == pytest.approx(4 / (1 / 18 + 25 / 27), rel=1e-14)
    bf = brown_forsythe([[1, 2, 3], [4, 6, 8, 10]])
    assert bf.statistic == pytest.approx(12.5, rel=1e-14)  # k = 2: F* is Welch's t^2 too
    assert bf.df2 == pytest.approx(res.df2, rel=1e-14)


# --------------------------------------------------------------------------------------------
# degenerate cases and bad input


def test_equal_means_give_zero_statistic_and_p_one():
    # common practice: identical group means give F = 0 and p = 1
    gs = [[1, 2, 3], [0, 2, 4], [2, 2.5, 1.5]]
    assert welch(gs).statistic == pytest.approx(0.0, abs=1e-15) and welch(gs).p == 1.0
    assert brown_forsythe(gs).statistic == 0.0 and brown_forsythe(gs).p == 1.0


def test_group_of_one_value_rejected_where_variance_needed():
    for fn, name in ((welch, "Welch"), (brown_forsythe, "Brown-Forsythe")):
        with pytest.raises(InputError, match=r'^sheetfuncs: group "B" has only one value.*' + name):
            fn({"A": [1, 2, 3], "B": [4], "C": [5, 6]})


def test_group_of_one_value_allowed_in_kruskal():
    # source: scipy.stats.kruskal accepts a group of one value
    gs = [[1.0, 2.0, 3.0], [4.0], [5.0, 6.0]]
    assert kruskal(gs).statistic == pytest.approx(float(stats.kruskal(*gs).statistic), rel=1e-13)


def test_zero_variance_rejected_by_welch():
    with pytest.raises(InputError, match=r'^sheetfuncs: group "B" has zero variance.*Welch'):
        welch({"A": [1, 2, 3], "B": [4, 4, 4]})


def test_one_zero_variance_group_allowed_in_brown_forsythe():
    # source: statsmodels anova_oneway(use_var="bf") on the same data
    from statsmodels.stats.oneway import anova_oneway

    gs = [[1.0, 2.0, 3.0], [4.0, 4.0, 4.0], [2.0, 5.0, 3.0, 6.0]]
    ref = anova_oneway(gs, use_var="bf")
    res = brown_forsythe(gs)
    assert res.statistic == pytest.approx(float(ref.statistic), rel=1e-13)
    assert res.df2 == pytest.approx(float(ref.df_denom), rel=1e-13)


def test_all_zero_variance_rejected_by_brown_forsythe():
    with pytest.raises(InputError, match=r"^sheetfuncs: every group has zero variance"):
        brown_forsythe([[1, 1], [2, 2, 2]])


def test_all_values_tied_rejected_by_kruskal():
    with pytest.raises(InputError, match=r"^sheetfuncs: every value is the same.*Kruskal-Wallis"):
        kruskal([[3, 3], [3, 3, 3]])


@pytest.mark.parametrize("fn", [welch, brown_forsythe, kruskal])
def test_one_group_rejected(fn):
    with pytest.raises(InputError, match=r"^sheetfuncs: at least two groups"):
        fn({"A": [1, 2, 3]})


@pytest.mark.parametrize("fn", [welch, brown_forsythe, kruskal])
@pytest.mark.parametrize("bad", [[[1, 2], [3, "x"]], [[1, 2], [3, float("nan")]], "text", 5])
def test_bad_values_give_one_line_messages(fn, bad):
    with pytest.raises(InputError) as e:
        fn(bad)
    msg = str(e.value)
    assert msg.startswith("sheetfuncs: ") and "\n" not in msg


def test_exact_true_on_inexact_data_is_a_clear_error():
    with pytest.raises(InputError, match="exact path"):
        welch([[0.1 + 0.2, 1.0, 2.0], [3.0, 4.0, 5.5]], exact=True)


def test_float_path_agrees_with_exact_path():
    # source: scipy.stats.f_oneway(equal_var=False); both paths agree with it
    gs = [[10.1, 10.4, 9.8, 10.0], [11.2, 10.1, 12.5], [9.9, 9.7, 10.2, 10.6, 9.5]]
    ref = float(stats.f_oneway(*gs, equal_var=False).statistic)
    assert welch(gs).exact and not welch(gs, exact=False).exact
    assert welch(gs).statistic == pytest.approx(ref, rel=1e-13)
    assert welch(gs, exact=False).statistic == pytest.approx(ref, rel=1e-13)
    assert brown_forsythe(gs, exact=False).statistic == pytest.approx(brown_forsythe(gs).statistic, rel=1e-13)


@pytest.mark.parametrize("scale", [1e-200, 1e200])
def test_extreme_magnitudes_do_not_overflow(scale):
    # common practice: the statistics do not depend on the unit of measurement
    base = [[1.0, 2.0, 4.0, 3.5], [1.0, 3.0, 2.5], [6.0, 4.0, 5.0, 5.5]]
    big = [[v * scale for v in g] for g in base]
    assert welch(big).statistic == pytest.approx(welch(base).statistic, rel=1e-12)
    assert brown_forsythe(big).statistic == pytest.approx(brown_forsythe(base).statistic, rel=1e-12)
    assert kruskal(big) == kruskal(base)


# --------------------------------------------------------------------------------------------
# fronts' needs: any accepted input, spill tables


def test_accepts_spreadsheet_ranges():
    # source: scipy.stats.f_oneway(equal_var=False) and kruskal on the cleaned numbers
    cells = [["Line A", "Line B", "Line C"], [5.1, 6.0, 5.5], [4.9, None, 5.9], [5.3, 6.8, "n/a"],
             [5.0, 7.1, 5.2]]
    g = groups_from_range(cells)
    ref = stats.f_oneway([5.1, 4.9, 5.3, 5.0], [6.0, 6.8, 7.1], [5.5, 5.9, 5.2], equal_var=False)
    assert welch(g).statistic == pytest.approx(float(ref.statistic), rel=1e-12)
    assert kruskal(g).p == pytest.approx(
        float(stats.kruskal([5.1, 4.9, 5.3, 5.0], [6.0, 6.8, 7.1], [5.5, 5.9, 5.2]).pvalue), rel=1e-12
    )


def test_tables_are_ready_to_spill():
    gs = {"A": [1, 2, 3, 4], "B": [2, 4, 6, 9], "C": [3, 3.5, 2.5, 4]}
    w, b, k = welch(gs), brown_forsythe(gs), kruskal(gs)
    assert w.table() == [["Test", "Statistic", "df1", "df2", "p"], ["Welch", w.statistic, 2, w.df2, w.p]]
    assert b.table()[0] == ["Test", "Statistic", "df1", "df2", "p"]
    assert b.table()[1] == ["Brown-Forsythe F*", b.statistic, 2, b.df2, b.p]
    assert k.table() == [
        ["Test", "Statistic", "df", "p", "Rank epsilon squared"],
        ["Kruskal-Wallis", k.statistic, 2, k.p, k.rank_epsilon_squared],
    ]
    for r in (w, b, k):
        with pytest.raises(AttributeError):
            r.p = 0.5  # frozen
    assert isinstance(w, WelchResult) and isinstance(b, BrownForsytheResult) and isinstance(k, KruskalResult)


# --------------------------------------------------------------------------------------------
# properties (hypothesis, derandomised in conftest.py)

_group = st.lists(st.integers(-50, 50), min_size=2, max_size=9)
_groups = st.lists(_group, min_size=2, max_size=5)


def _has_spread(gs) -> bool:
    return all(len(set(g)) > 1 for g in gs)


@settings(max_examples=60)
@given(_groups, st.integers(-1000, 1000), st.integers(1, 40))
def test_affine_invariance(gs, shift, factor):
    # common practice: location-scale changes of the measurement unit change none of the tests
    moved = [[shift + factor * v for v in g] for g in gs]
    if len(set(sum(gs, []))) > 1:
        assert kruskal(moved) == kruskal(gs)
    if _has_spread(gs):
        a, b = welch(gs), welch(moved)
        assert b.statistic == pytest.approx(a.statistic, rel=1e-11, abs=1e-300)
        assert b.df2 == pytest.approx(a.df2, rel=1e-11)
        c, d = brown_forsythe(gs), brown_forsythe(moved)
        assert d.statistic == pytest.approx(c.statistic, rel=1e-11, abs=1e-300)


@settings(max_examples=60)
@given(_groups)
def test_kruskal_depends_only_on_ranks(gs):
    # Kruskal & Wallis (1952): H is a function of the ranks, so a strictly increasing
    # transformation of the data (here x -> x^3 + 7x) leaves it unchanged
    if len(set(sum(gs, []))) < 2:
        with pytest.raises(InputError):
            kruskal(gs)
        return
    bent = [[v**3 + 7 * v for v in g] for g in gs]
    a, b = kruskal(gs), kruskal(bent)
    assert a == b
    assert 0.0 <= a.rank_epsilon_squared <= 1.0 + 1e-15
    assert 0.0 <= a.p <= 1.0


@settings(max_examples=60)
@given(_groups)
def test_balanced_equal_variance_brown_forsythe_is_oneway_f(gs):
    # Brown & Forsythe (1974): with equal group sizes F* equals the one-way F
    n = min(len(g) for g in gs)
    gs = [g[:n] for g in gs]
    if not all(len(set(g)) > 1 for g in gs):
        return
    bf, ow = brown_forsythe(gs), oneway(gs)
    assert bf.statistic == pytest.approx(ow.f, rel=1e-12, abs=1e-300)


@settings(max_examples=40)
@given(st.lists(st.lists(st.floats(-1e6, 1e6, allow_nan=False), min_size=2, max_size=8), min_size=2, max_size=4))
def test_never_crashes_on_floats(gs):
    # bad or degenerate input gives an InputError, never another exception or a NaN
    for fn in (welch, brown_forsythe, kruskal):
        try:
            r = fn(gs)
        except InputError as e:
            assert str(e).startswith("sheetfuncs: ")
            continue
        assert not math.isnan(r.statistic) and 0.0 <= r.p <= 1.0
