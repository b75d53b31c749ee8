"""checks(): the reading rule, tests that cannot run, bad input (sheetfuncs.stats.checks).

Sources are named beside each numeric check: scipy.stats (f_oneway, kruskal), Python's
statistics module, mpmath (Bartlett's textbook formula), NIST StRD datasets, and common
practice. The invented data sets are in tests/support/assumption_cases.py.
"""

from __future__ import annotations

import importlib
import math
from statistics import stdev

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy import stats

from tests.support import nist
from tests.support.assumption_cases import HEADS_UNEQUAL, HEADS_WELL_BEHAVED, ZONES_SKEWED, ZONES_SKEWED_15
from tests.support.mpmath_refs import bartlett_statistic
from sheetfuncs import InputError, groups_from_range
from sheetfuncs.stats.checks import CAUTION, ChecksResult, checks

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


def test_checks_answer_when_variances_differ_by_more_than_the_double_precision():
    # the case above once crashed checks(); Bartlett now answers (mpmath, as above) and the
    # one SD many times the other reads Welch (the rule of docs/checks.md)
    gs = {"A": [1.0000001, 1.0000002, 1.0000003], "B": [0, 1000, 2000]}
    c = checks(gs)
    assert c.bartlett is not None
    assert c.bartlett.statistic == pytest.approx(bartlett_statistic(gs.values()), rel=1e-13)
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
# certified data: NIST StRD


@pytest.mark.parametrize("family", [("SmLs01", "SmLs04", "SmLs07"), ("SmLs03", "SmLs06", "SmLs09")])
def test_nist_offsets_change_nothing(family):
    # source: NIST StRD SmLs datasets (the same values behind 1, 1e6 and 1e12 offsets)
    reads = [checks(nist.load(name).groups) for name in family]
    assert reads[0].reasons == reads[1].reasons == reads[2].reasons


# --------------------------------------------------------------------------------------------
# properties (hypothesis, derandomised in conftest.py)


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
