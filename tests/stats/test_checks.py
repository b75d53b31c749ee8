"""Levene, Bartlett, residual normality and checks(): behaviour, bad input, exactness, the rule."""

from __future__ import annotations

import importlib
import math
from fractions import Fraction
from statistics import median, stdev

import mpmath
import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy import stats

from tests.support import nist
from sheetfuncs import InputError, groups_from_range
from sheetfuncs.stats.checks import (
    CAUTION,
    BartlettResult,
    ChecksResult,
    LeveneResult,
    NormalityResult,
    _u_minus_log1p,
    bartlett,
    checks,
    levene,
    residuals,
    shapiro_residuals,
)

# --------------------------------------------------------------------------------------------
# invented cases for the reading rule (invented numbers, not measurements)

#: Invented: fill weights (g) of four filling heads, ten fills each; head 4's SD is four times
#: the others' (0.4 g against 1.6 g).
HEADS_UNEQUAL = {
    "Head 1": [499.54, 499.77, 499.92, 500.04, 500.15, 500.25, 500.36, 500.48, 500.63, 500.86],
    "Head 2": [499.84, 500.07, 500.22, 500.34, 500.45, 500.55, 500.66, 500.78, 500.93, 501.16],
    "Head 3": [499.44, 499.67, 499.82, 499.94, 500.05, 500.15, 500.26, 500.38, 500.53, 500.76],
    "Head 4": [497.67, 498.60, 499.18, 499.66, 500.09, 500.51, 500.94, 501.42, 502.00, 502.93],
}

#: Invented: fill weights (g) of four heads with similar spreads and normal-looking scatter.
HEADS_WELL_BEHAVED = {
    "Head 1": [499.43, 499.74, 499.95, 500.12, 500.28, 500.45, 500.66, 500.97],
    "Head 2": [500.08, 500.37, 500.55, 500.70, 500.83, 500.97, 501.10, 501.25, 501.43, 501.72],
    "Head 3": [499.24, 499.51, 499.68, 499.82, 499.94, 500.05, 500.15, 500.26, 500.38, 500.52,
               500.69, 500.96],
    "Head 4": [499.50, 499.80, 499.99, 500.15, 500.30, 500.45, 500.61, 500.80, 501.10],
}

#: Invented: hardness (Shore A) in four cure-oven zones, six parts each; every zone has one
#: part far above the rest, so the residuals are strongly skewed while the spreads match.
ZONES_SKEWED = {
    "Zone 1": [61.0, 61.1, 61.2, 61.2, 61.3, 63.5],
    "Zone 2": [61.4, 61.5, 61.6, 61.6, 61.7, 63.9],
    "Zone 3": [62.9, 63.0, 63.1, 63.1, 63.2, 65.4],
    "Zone 4": [61.2, 61.3, 61.4, 61.4, 61.5, 63.7],
}

_SKEW15 = [0, 0.1, 0.1, 0.2, 0.2, 0.2, 0.3, 0.3, 0.3, 0.4, 0.4, 0.5, 0.5, 0.6, 3.5]
#: Invented: the same kind of skew with fifteen parts per zone.
ZONES_SKEWED_15 = {
    f"Zone {j + 1}": [round(m + v, 2) for v in _SKEW15] for j, m in enumerate([61.0, 61.4, 62.9, 61.2])
}


# --------------------------------------------------------------------------------------------
# the reading rule


def test_checks_reads_welch_when_one_sd_is_four_times_the_others():
    # acceptance case (issue 4), invented data above
    c = checks(HEADS_UNEQUAL)
    assert c.read == "welch"
    assert c.variances_unequal
    assert c.sd_ratio == pytest.approx(4.0, rel=0.02)
    assert c.levene.p < 0.05
    assert any("Read Welch" in r for r in c.reasons)
    # source: scipy.stats.f_oneway(equal_var=False) for the Welch result carried along
    ref = stats.f_oneway(*HEADS_UNEQUAL.values(), equal_var=False)
    assert c.welch.p == pytest.approx(float(ref.pvalue), rel=1e-9)
    assert c.table()[1][0] == "Read" and c.table()[1][4] == "Welch"
    assert c.table()[1][3] == c.welch.p


def test_checks_reads_oneway_on_a_well_behaved_case():
    # acceptance case (issue 4), invented data above
    c = checks(HEADS_WELL_BEHAVED)
    assert c.read == "oneway"
    assert not c.variances_unequal and not c.residuals_nonnormal
    assert c.sd_ratio <= 2
    assert c.levene.p >= 0.05 and c.normality.p >= 0.05
    assert c.not_available == ()
    assert c.reasons[-1].startswith("No check suggests a problem: read the one-way F")
    assert c.table()[1] == ["Read", c.oneway.f, f"3, {c.oneway.df_within}", c.oneway.p, "One-way F"]


def test_checks_reads_kruskal_for_skewed_residuals_in_small_groups():
    # acceptance case (issue 4), invented data above: equal spreads, skewed residuals, n = 6
    c = checks(ZONES_SKEWED)
    assert c.read == "kruskal"
    assert not c.variances_unequal and c.residuals_nonnormal
    assert c.smallest_n == 6
    assert c.normality.method == "Shapiro-Wilk" and c.normality.p < 0.05
    assert "Kruskal-Wallis" in c.reasons[-1] and "alongside the one-way F" in c.reasons[-1]
    assert c.table()[1][4] == "Kruskal-Wallis, alongside the one-way F"
    # source: scipy.stats.kruskal for the Kruskal-Wallis result carried along
    assert c.kruskal.p == pytest.approx(float(stats.kruskal(*ZONES_SKEWED.values()).pvalue), rel=1e-9)


def test_checks_reads_oneway_for_skewed_residuals_in_groups_of_fifteen():
    # the rule: non-normal residuals call for Kruskal-Wallis only below 15 values per group
    c = checks(ZONES_SKEWED_15)
    assert c.residuals_nonnormal and not c.variances_unequal
    assert c.smallest_n == 15
    assert c.read == "oneway"
    assert "15 or more values" in c.reasons[-1]


def test_checks_alpha_changes_the_reading():
    # the Levene p-value of the unequal case lies far below 0.05; a tiny alpha keeps the SD rule
    c = checks(HEADS_UNEQUAL, alpha=1e-12)
    assert c.alpha == 1e-12 and c.read == "welch"  # still flagged by the SD ratio rule
    assert any("rule of thumb" in r for r in c.reasons)


def test_checks_sd_ratio_alone_flags_unequal_variances():
    # the rule: largest SD more than twice the smallest flags unequal variances even when
    # Levene's test (few values) does not
    gs = {"A": [10.0, 10.2, 10.4], "B": [10.1, 10.8, 11.5]}  # SDs 0.2 and 0.7 (invented)
    c = checks(gs)
    assert c.levene.p >= 0.05
    # reference library: Python's statistics.stdev (exact rational arithmetic), ratio 3.5
    assert c.sd_ratio == pytest.approx(stdev(gs["B"]) / stdev(gs["A"]), rel=1e-12)
    assert c.sd_ratio == pytest.approx(3.5, rel=1e-12)
    assert c.variances_unequal and c.read == "welch"


def test_checks_records_tests_that_cannot_run():
    # a group with zero variance: Bartlett and Welch cannot run; the SD ratio is infinite
    gs = {"A": [5.0, 5.0, 5.0], "B": [4.8, 5.4, 5.1, 4.6], "C": [5.2, 5.9, 5.5]}
    c = checks(gs)
    names = dict(c.not_available)
    assert set(names) == {"Bartlett", "Welch"}
    assert "zero variance" in names["Bartlett"] and not names["Bartlett"].startswith("sheetfuncs")
    assert c.bartlett is None and c.welch is None
    assert math.isinf(c.sd_ratio) and c.variances_unequal
    assert c.read == "oneway"
    assert "Welch's test could not run" in c.reasons[-1] and "may mislead" in c.reasons[-1]
    rows = {r[0]: r for r in c.table()}
    assert rows["Bartlett"][1:4] == [None, None, None]
    assert rows["Bartlett"][4].startswith("not available: ")
    assert rows["Welch"][4].startswith("not available: ")


def test_checks_with_a_group_of_one_value():
    # a single value: Levene, Bartlett and Welch need every group's variance; the normality
    # test leaves the group out; Kruskal-Wallis runs
    gs = {"A": [5.1, 5.3, 4.9, 5.0], "B": [6.0], "C": [5.6, 5.2, 5.9, 5.4]}
    c = checks(gs)
    assert set(dict(c.not_available)) == {"Levene (median)", "Bartlett", "Welch"}
    assert c.normality.left_out == ("B",) and c.normality.n == 8
    assert c.kruskal is not None
    assert c.reasons[0].startswith("Levene's test (median-centred) could not run")
    assert c.reasons[-1].startswith("No check that could run suggests a problem")


def test_checks_without_enough_residuals():
    gs = {"A": [1.0, 2.0], "B": [5.0]}
    c = checks(gs)
    assert "Normal residuals" in dict(c.not_available)
    assert not c.residuals_nonnormal
    assert any("could not be tested" in r for r in c.reasons)


def test_checks_table_layout_and_fields():
    c = checks(HEADS_WELL_BEHAVED)
    t = c.table()
    assert t[0] == ["Check", "Statistic", "df", "p", "Reading"]
    assert [r[0] for r in t[1:]] == [
        "Read", "Levene (median)", "Largest / smallest SD", "Bartlett", "Shapiro-Wilk (residuals)",
        "Smallest group size", "One-way F", "Welch", "Kruskal-Wallis",
    ]
    assert all(len(r) == 5 for r in t)
    assert isinstance(c, ChecksResult) and c.caution == CAUTION
    assert "judgement" in c.caution
    assert c.levene.center == "median"
    with pytest.raises(AttributeError):
        c.read = "welch"  # frozen


@pytest.mark.parametrize("alpha", [0, 1, -0.1, "0.05", None, float("nan")])
def test_checks_rejects_bad_alpha(alpha):
    with pytest.raises(InputError, match=r"^sheetfuncs: alpha"):
        checks(HEADS_WELL_BEHAVED, alpha=alpha)


def test_checks_needs_a_possible_oneway_analysis():
    with pytest.raises(InputError, match="all values are identical"):
        checks([[2, 2], [2, 2, 2]])
    with pytest.raises(InputError, match="at least two groups"):
        checks([[1, 2, 3]])


def test_checks_accepts_spreadsheet_ranges():
    cells = [["Head 1", "Head 2"], [10.0, 10.1], [10.2, 10.8], [10.4, "void"], [None, 11.5]]
    c = checks(groups_from_range(cells))
    # reference library: statistics.stdev of the numbers in each column (text and blanks left
    # out, as the host's own functions do), ratio 3.5
    ratio = stdev([10.1, 10.8, 11.5]) / stdev([10.0, 10.2, 10.4])
    assert c.read == "welch" and c.sd_ratio == pytest.approx(ratio, rel=1e-12)


# --------------------------------------------------------------------------------------------
# certified data: NIST StRD


@pytest.mark.parametrize("family", [("SmLs01", "SmLs04", "SmLs07"), ("SmLs03", "SmLs06", "SmLs09")])
def test_nist_offsets_change_nothing(family):
    # source: NIST StRD SmLs datasets (the same values behind 1, 1e6 and 1e12 offsets)
    for fn in (levene, lambda g: levene(g, "mean"), bartlett, shapiro_residuals):
        results = [fn(nist.load(name).groups) for name in family]
        assert results[0] == results[1] == results[2]
    reads = [checks(nist.load(name).groups) for name in family]
    assert reads[0].reasons == reads[1].reasons == reads[2].reasons


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


def test_nist_smls07_shapiro_equals_scipy_on_smls01():
    # source: scipy.stats.shapiro on the residuals of NIST StRD SmLs01 (small values); SmLs07
    # is the same data behind a 1e12 offset
    g1 = nist.load("SmLs01").groups
    resid = np.concatenate([np.asarray(v) - np.mean(v) for v in g1.values()])
    ref = stats.shapiro(resid)
    res = shapiro_residuals(nist.load("SmLs07").groups)
    assert res.statistic == pytest.approx(float(ref.statistic), abs=1e-8)
    assert res.p == pytest.approx(float(ref.pvalue), rel=1e-6)


def test_residuals_exact_for_large_offsets():
    # source: NIST StRD SmLs07 group 1 as printed: 1000000000000.4, .3, .5, ... with mean
    # 1000000000000.4, so the residuals are the decimals 0, -0.1, 0.1, ...
    d = nist.load("SmLs07")
    first = residuals(d.groups)[0]
    expected = [float(Fraction(t) - sum(map(Fraction, d.text_values["1"])) / 21) for t in d.text_values["1"]]
    assert first.tolist() == expected


# --------------------------------------------------------------------------------------------
# accuracy of Bartlett's statistic


def test_u_minus_log1p_against_mpmath():
    # source: mpmath at 40 digits
    mpmath.mp.dps = 40
    for u in [1e-12, -3e-9, 1e-5, -0.0999, 0.0999, 0.1, 0.5, -0.5, 3.0, 100.0]:
        ref = float(mpmath.mpf(u) - mpmath.log1p(mpmath.mpf(u)))
        assert _u_minus_log1p(u) == pytest.approx(ref, rel=1e-14)


def _bartlett_mpmath(groups, dps=50):
    """Bartlett's textbook formula evaluated with mpmath on the exact decimal values."""
    mpmath.mp.dps = dps
    groups = [[mpmath.mpf(repr(float(x))) for x in g] for g in groups]

    def var(g):
        m = sum(g) / len(g)
        return sum((x - m) ** 2 for x in g) / (len(g) - 1)

    v = [var(g) for g in groups]
    ns = [len(g) for g in groups]
    n, k = sum(ns), len(ns)
    sp = sum((ni - 1) * vi for ni, vi in zip(ns, v)) / (n - k)
    num = (n - k) * mpmath.log(sp) - sum((ni - 1) * mpmath.log(vi) for ni, vi in zip(ns, v))
    corr = 1 + (sum(mpmath.mpf(1) / (ni - 1) for ni in ns) - mpmath.mpf(1) / (n - k)) / (3 * (k - 1))
    return float(num / corr)


def test_bartlett_nearly_equal_variances_against_mpmath():
    # source: Bartlett's textbook formula evaluated with mpmath at 50 digits on the exact
    # decimal values; the variances differ by parts in 1e8, where the plain double-precision
    # formula loses most of its digits
    a = [100.0, 100.2, 100.4, 100.6]
    b = [200.0, 200.2, 200.4, 200.60000002]
    c = [300.0, 300.2, 300.4, 300.6]
    ref = _bartlett_mpmath([a, b, c])
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
    ref = _bartlett_mpmath([a, b])
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


def test_checks_answer_when_variances_differ_by_more_than_the_double_precision():
    # the case above once crashed checks(); Bartlett now answers (mpmath, as above) and the
    # one SD many times the other reads Welch (the rule of docs/checks.md)
    gs = {"A": [1.0000001, 1.0000002, 1.0000003], "B": [0, 1000, 2000]}
    c = checks(gs)
    assert c.bartlett is not None
    assert c.bartlett.statistic == pytest.approx(_bartlett_mpmath(gs.values()), rel=1e-13)
    assert c.not_available == () or all(name != "Bartlett" for name, _ in c.not_available)
    assert c.variances_unequal


def test_checks_record_an_unexpected_numerical_failure(monkeypatch):
    # a secondary test that fails on a numerical problem it did not foresee is recorded as not
    # available, with the reason, and the other checks still answer
    # the module (its name is also the name of the function the package exports)
    mod = importlib.import_module("sheetfuncs.stats.checks")

    def failing(*args, **kwargs):
        raise ValueError("math domain error")

    monkeypatch.setattr(mod, "bartlett", failing)
    c = mod.checks(HEADS_WELL_BEHAVED)
    assert c.bartlett is None
    why = dict(c.not_available)["Bartlett"]
    assert "math domain error" in why and "\n" not in why
    row = next(r for r in c.table() if r[0] == "Bartlett")
    assert row[1:4] == [None, None, None] and row[4].startswith("not available: the computation failed")
    assert c.read == "oneway" and c.levene is not None and c.welch is not None

    def overflowing(*args, **kwargs):
        raise OverflowError("math range error")

    monkeypatch.setattr(mod, "kruskal", overflowing)
    c = mod.checks(HEADS_WELL_BEHAVED)
    assert c.kruskal is None and "math range error" in dict(c.not_available)["Kruskal-Wallis"]


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


def test_normality_too_few_residuals_and_all_zero():
    with pytest.raises(InputError, match=r"^sheetfuncs: only 2 residuals"):
        shapiro_residuals([[1, 2], [3]])
    with pytest.raises(InputError, match=r"^sheetfuncs: all residuals are zero"):
        shapiro_residuals([[1, 1], [3, 3, 3]])


@pytest.mark.parametrize("fn", [levene, bartlett, shapiro_residuals])
def test_one_group_rejected(fn):
    with pytest.raises(InputError, match=r"^sheetfuncs: at least two groups"):
        fn([[1, 2, 3]])


def test_tables_are_ready_to_spill():
    gs = HEADS_WELL_BEHAVED
    lv, bt, nm = levene(gs), bartlett(gs), shapiro_residuals(gs)
    assert lv.table() == [["Test", "Statistic", "df1", "df2", "p"], ["Levene (median)", lv.statistic, 3, 35, lv.p]]
    assert levene(gs, "mean").table()[1][0] == "Levene (mean)"
    assert bt.table() == [["Test", "Statistic", "df", "p"], ["Bartlett", bt.statistic, 3, bt.p]]
    assert nm.table() == [["Test", "Statistic", "n", "p"], ["Shapiro-Wilk (residuals)", nm.statistic, 39, nm.p]]
    assert isinstance(lv, LeveneResult) and isinstance(bt, BartlettResult) and isinstance(nm, NormalityResult)


@pytest.mark.parametrize("scale", [1e-200, 1e200])
def test_extreme_magnitudes(scale):
    # common practice: the tests do not depend on the unit of measurement
    base = [[1.0, 2.0, 4.0, 3.5], [1.0, 3.0, 2.5], [6.0, 4.0, 5.0, 5.5]]
    moved = [[v * scale for v in g] for g in base]
    for fn in (levene, lambda g: levene(g, "mean"), bartlett, shapiro_residuals):
        assert fn(moved).statistic == pytest.approx(fn(base).statistic, rel=1e-12)


# --------------------------------------------------------------------------------------------
# properties (hypothesis, derandomised in conftest.py)

_groups = st.lists(st.lists(st.integers(-60, 60), min_size=2, max_size=9), min_size=2, max_size=5)


@settings(max_examples=50)
@given(_groups, st.integers(-10**6, 10**6))
def test_shift_invariance(gs, shift):
    # common practice: adding a constant to every value changes none of the checks
    moved = [[v + shift for v in g] for g in gs]
    for fn in (levene, lambda g: levene(g, "mean"), bartlett, shapiro_residuals):
        try:
            a = fn(gs)
        except InputError:
            with pytest.raises(InputError):
                fn(moved)
            continue
        b = fn(moved)
        assert b.statistic == pytest.approx(a.statistic, rel=1e-9, abs=1e-12)


@settings(max_examples=50)
@given(st.lists(st.lists(st.floats(-1e4, 1e4, allow_nan=False), min_size=1, max_size=8), min_size=2, max_size=4))
def test_checks_never_crash(gs):
    # checks() answers, or gives a one-line InputError when no one-way analysis is possible
    try:
        c = checks(gs)
    except InputError as e:
        assert str(e).startswith("sheetfuncs: ") and "\n" not in str(e)
        return
    assert c.read in ("oneway", "welch", "kruskal")
    assert all(isinstance(r, str) and r for r in c.reasons)
    if c.normality is not None:
        assert 0.0 < c.normality.statistic <= 1.0 and 0.0 <= c.normality.p <= 1.0
    for r in (c.levene, c.bartlett, c.welch, c.kruskal):
        if r is not None:
            assert 0.0 <= r.p <= 1.0 and not math.isnan(r.statistic)
    assert len(c.table()) == 10
