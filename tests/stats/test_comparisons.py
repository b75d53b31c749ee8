"""Pairwise comparisons and Dunnett's many-to-one comparisons (sheetfuncs.stats.comparisons).

Sources are named beside each numeric check: NIST StRD datasets (certified MSE), textbook
formulas computed independently in the test (Scheffé 1953), scipy.stats.t (bounds),
scipy.stats.tukey_hsd and scipy.stats.dunnett on seeded data with many groups (invented numbers,
rounded to two decimals), and scipy.stats.studentized_range. The distributions behind the
comparisons are tested in tests/distributions/. Library-against-library checks on random data
live in tests/reference/test_scipy_pairwise.py and test_statsmodels_multipletests.py.
"""

from __future__ import annotations

import dataclasses
import functools
import math
from fractions import Fraction

import numpy as np
import pytest
from scipy import stats

from tests.support import nist
from sheetfuncs.errors import InputError
from sheetfuncs.input import groups_from_range
from sheetfuncs.stats.comparisons import METHODS, PairwiseResult, dunnett, pairwise

SQRT2 = math.sqrt(2.0)

# Invented data: fill weight (g) from four filling heads; head 3 runs heavy.
HEADS = {
    "Head 1": [250.2, 250.5, 249.9, 250.1, 250.4, 250.0],
    "Head 2": [250.3, 250.6, 250.2, 250.0, 250.5],
    "Head 3": [251.1, 251.4, 250.9, 251.3, 251.0, 251.2, 251.5],
    "Head 4": [250.1, 249.8, 250.3, 250.2, 250.0, 249.9],
}
POOLED = ("tukey", "bonferroni", "holm", "sidak", "scheffe")


@functools.lru_cache(maxsize=None)
def heads(method: str) -> PairwiseResult:
    """The comparisons of HEADS by one method, computed once for all tests."""
    return pairwise(HEADS, method)


# ------------------------------------------------------------------------------------------
# layout of the result


def test_rows_cover_every_pair_once_in_group_order():
    res = heads("tukey")
    assert [(r.group_a, r.group_b) for r in res.rows] == [
        ("Head 1", "Head 2"), ("Head 1", "Head 3"), ("Head 1", "Head 4"),
        ("Head 2", "Head 3"), ("Head 2", "Head 4"), ("Head 3", "Head 4"),
    ]
    means = {k: np.mean(v) for k, v in HEADS.items()}
    for r in res.rows:
        assert r.difference == pytest.approx(means[r.group_a] - means[r.group_b], abs=1e-12)
        assert r.ci.low < r.difference < r.ci.high
        assert r.differs == (r.p < res.alpha)
    assert res.method == "tukey" and res.alpha == 0.05
    assert res.pair("Head 3", "Head 1") is res.rows[1]
    assert ("Head 1", "Head 3") in res.differing_pairs()


def test_table_spills_header_first_with_the_interval_label():
    for method, label in (
        ("tukey", "simultaneous 95%"), ("scheffe", "simultaneous 95%"),
        ("bonferroni", "simultaneous 95%"), ("sidak", "simultaneous 95%"),
        ("holm", "Bonferroni 95% (Holm rows)"), ("games-howell", "approximate 95% (Games–Howell)"),
    ):
        res = heads(method)
        tab = res.table()
        assert res.interval == label
        assert tab[0][:4] == ["Group A", "Group B", "Difference", "SE"]
        assert tab[0][4] == f"CI low ({label})" and tab[0][5] == f"CI high ({label})"
        assert tab[0][6] == res.statistic_name and tab[0][7:] == ["p", "Differs"]
        assert len(tab) == 1 + 6 and all(len(row) == 9 for row in tab)
        assert isinstance(tab[1][8], bool)
    assert pairwise(HEADS, "tukey", alpha=0.01).interval == "simultaneous 99%"
    assert dunnett(HEADS, "Head 1", alpha=0.1).interval == "simultaneous 90%"


def test_results_are_frozen():
    res = pairwise(HEADS, "bonferroni")
    with pytest.raises(dataclasses.FrozenInstanceError):
        res.alpha = 0.1  # type: ignore[misc]
    with pytest.raises(dataclasses.FrozenInstanceError):
        res.rows[0].p = 0.5  # type: ignore[misc]
    assert isinstance(res, PairwiseResult)


def test_statistic_names():
    assert [heads(m).statistic_name for m in METHODS] == ["q", "q", "t", "t", "t", "F"]
    assert dunnett(HEADS, "Head 1").statistic_name == "t"


def test_spreadsheet_range_goes_through_the_one_cleaning_step():
    rows = [["A", "B", "C"], [1.2, 2.0, 1.1], [1.4, "n/a", 1.3], [1.1, 2.2, None], [1.3, 2.1, 1.2]]
    res = pairwise(groups_from_range(rows), "bonferroni")
    assert [(r.group_a, r.group_b) for r in res.rows] == [("A", "B"), ("A", "C"), ("B", "C")]
    assert res.counts == (4, 3, 3)


# ------------------------------------------------------------------------------------------
# bad input


def test_unknown_method_lists_the_methods():
    with pytest.raises(InputError) as e:
        pairwise(HEADS, "lsd")
    msg = str(e.value)
    assert msg.startswith("sheetfuncs: ") and "\n" not in msg
    for m in METHODS:
        assert f'"{m}"' in msg
    with pytest.raises(InputError, match="dunnett"):
        pairwise(HEADS, "dunnett")
    with pytest.raises(InputError, match="unknown comparison method"):
        pairwise(HEADS, 3)


def test_method_names_are_forgiving():
    for name, canon in (("Tukey-Kramer", "tukey"), ("Games_Howell", "games-howell"),
                        ("Šidák", "sidak"), ("Scheffé", "scheffe"), (" HOLM ", "holm")):
        assert pairwise(HEADS, name, 0.05).method == canon


@pytest.mark.parametrize("alpha", [0, 1, 1.5, -0.1, "x", None, float("nan")])
def test_alpha_outside_zero_one_is_refused(alpha):
    with pytest.raises(InputError, match="^sheetfuncs: "):
        pairwise(HEADS, "bonferroni", alpha=alpha)


def test_games_howell_needs_two_values_per_group():
    data = {"A": [1.0, 1.2, 1.1], "B": [2.0], "C": [1.5, 1.7]}
    with pytest.raises(InputError, match='group "B" has only one value') as e:
        pairwise(data, "games-howell")
    assert "Games–Howell" in str(e.value)
    assert len(pairwise(data, "tukey").rows) == 3  # pooled methods can use it


def test_games_howell_refuses_zero_variance():
    data = {"A": [1.0, 1.2, 1.1], "B": [2.0, 2.0, 2.0], "C": [1.5, 1.7, 1.6]}
    with pytest.raises(InputError, match='group "B" has zero variance'):
        pairwise(data, "games-howell")


def test_unknown_control_names_the_label_and_the_groups():
    with pytest.raises(InputError) as e:
        dunnett(HEADS, "Head 9")
    msg = str(e.value)
    assert '"Head 9"' in msg and '"Head 1"' in msg and '"Head 4"' in msg
    assert msg.startswith("sheetfuncs: ")


def test_missing_control_is_refused():
    for blank in (None, "", "  "):
        with pytest.raises(InputError, match="no control group given"):
            dunnett(HEADS, blank)


def test_numeric_control_label_matches_its_shortest_form():
    data = {1: [5.1, 5.3, 5.2], 2: [5.6, 5.8, 5.7], 3: [5.0, 5.2, 5.1]}
    res = dunnett(data, 3.0)
    assert res.control == "3" and [r.group_a for r in res.rows] == ["1", "2"]


def test_one_group_is_refused():
    with pytest.raises(InputError, match="at least two groups"):
        pairwise({"A": [1.0, 2.0]})
    with pytest.raises(InputError, match="at least two groups"):
        dunnett({"A": [1.0, 2.0]}, "A")


def test_no_residual_degrees_of_freedom_is_refused():
    with pytest.raises(InputError, match="no residual degrees of freedom"):
        pairwise({"A": [1.0], "B": [2.0]})


def test_all_values_identical_is_refused():
    with pytest.raises(InputError, match="identical"):
        pairwise({"A": [1.0, 1.0], "B": [1.0, 1.0]}, "scheffe")


# ------------------------------------------------------------------------------------------
# degenerate but answered


@pytest.mark.parametrize("method", POOLED)
def test_no_within_group_variation(method):
    data = {"A": [1.0, 1.0, 1.0], "B": [2.0, 2.0, 2.0], "C": [1.0, 1.0]}
    res = pairwise(data, method)
    ab, ac, bc = res.rows
    assert math.isinf(ab.statistic) and ab.p == 0.0 and ab.differs
    assert ac.statistic == 0.0 and ac.p == 1.0 and not ac.differs
    assert ab.ci.low == ab.ci.high == -1.0
    assert res.notes


def test_dunnett_no_within_group_variation():
    res = dunnett({"A": [1.0, 1.0], "B": [2.0, 2.0], "C": [1.0, 1.0]}, "A")
    assert res.rows[0].p == 0.0 and math.isinf(res.rows[0].statistic)
    assert res.rows[1].p == 1.0 and res.rows[1].statistic == 0.0


# ------------------------------------------------------------------------------------------
# formulas


def test_scheffe_matches_the_textbook_formula():
    # source: Scheffé (1953), Biometrika 40, 87-104: F = d^2 / ((k - 1) SE^2) on (k - 1, N - k);
    # interval d +/- sqrt((k - 1) F(alpha; k - 1, N - k)) SE; computed here with numpy/scipy
    gs = [np.array(v) for v in HEADS.values()]
    k = len(gs)
    df = sum(len(x) for x in gs) - k
    mse = sum(((x - x.mean()) ** 2).sum() for x in gs) / df
    s = math.sqrt((k - 1) * stats.f.isf(0.05, k - 1, df))
    res = heads("scheffe")
    pairs = [(i, j) for i in range(k) for j in range(i + 1, k)]
    for row, (i, j) in zip(res.rows, pairs):
        d = gs[i].mean() - gs[j].mean()
        se = math.sqrt(mse * (1 / len(gs[i]) + 1 / len(gs[j])))
        f = d * d / ((k - 1) * se * se)
        assert row.se == pytest.approx(se, rel=1e-12)
        assert row.statistic == pytest.approx(f, rel=1e-10)
        assert row.p == pytest.approx(stats.f.sf(f, k - 1, df), rel=1e-9)
        assert row.ci.low == pytest.approx(d - s * se, rel=1e-10)
        assert row.ci.high == pytest.approx(d + s * se, rel=1e-10)


def test_adjustments_are_ordered_as_theory_says():
    # Holm never exceeds Bonferroni, Šidák never exceeds Bonferroni (Holm 1979; Šidák 1967)
    b, h, s = heads("bonferroni"), heads("holm"), heads("sidak")
    for rb, rh, rs in zip(b.rows, h.rows, s.rows):
        assert rh.p <= rb.p + 1e-15 and rs.p <= rb.p + 1e-15
        assert rh.ci.low == rb.ci.low
        assert rs.ci.high - rs.ci.low <= rb.ci.high - rb.ci.low
        assert 0 <= rb.p <= 1


def test_nist_certified_mse_and_exact_differences():
    # source: NIST StRD SmLs07 (certified within-group mean square 0.01; values near 1e12)
    d = nist.load("SmLs07")
    res = pairwise(d.groups, "bonferroni")
    assert res.exact
    assert res.ms_within == pytest.approx(d.certified.ms_within, rel=1e-14)
    exact_means = {
        lab: sum(Fraction(t) for t in texts) / len(texts) for lab, texts in d.text_values.items()
    }
    for row in res.rows:
        na, nb = len(d.groups[row.group_a]), len(d.groups[row.group_b])
        assert row.difference == float(exact_means[row.group_a] - exact_means[row.group_b])
        assert row.se == pytest.approx(math.sqrt(d.certified.ms_within * (1 / na + 1 / nb)), rel=1e-14)


def test_nist_atomic_weights_two_groups():
    # source: NIST StRD AtmWtAg (certified within mean square 2.28155932971014e-10);
    # with two groups Tukey's q is sqrt(2)|t| (common practice)
    d = nist.load("AtmWtAg")
    res = pairwise(d.groups, "tukey")
    row = res.rows[0]
    assert res.ms_within == pytest.approx(d.certified.ms_within, rel=1e-13)
    assert row.statistic == pytest.approx(math.sqrt(2 * d.certified.f), rel=1e-12)


def test_games_howell_uses_each_pairs_own_variances_and_welch_df():
    # source: Games & Howell (1976); Welch-Satterthwaite df, computed here independently
    res = heads("games-howell")
    gs = list(HEADS.values())
    v = [np.var(x, ddof=1) / len(x) for x in gs]
    df = (v[0] + v[2]) ** 2 / (v[0] ** 2 / (len(gs[0]) - 1) + v[2] ** 2 / (len(gs[2]) - 1))
    row = res.pair("Head 1", "Head 3")
    assert row.se == pytest.approx(math.sqrt(v[0] + v[2]), rel=1e-12)
    assert res.row_df[1] == pytest.approx(df, rel=1e-12)
    assert res.ms_within is None and res.df_within is None


def test_tukey_kramer_unequal_sizes_note():
    assert any("conservative" in n for n in heads("tukey").notes)
    equal = {k: v[:5] for k, v in HEADS.items()}
    assert not pairwise(equal).notes


def test_dunnett_rows_and_intervals():
    res = dunnett(HEADS, "Head 1")
    assert [(r.group_a, r.group_b) for r in res.rows] == [
        ("Head 2", "Head 1"), ("Head 3", "Head 1"), ("Head 4", "Head 1"),
    ]
    assert res.method == "dunnett" and res.method_name == "Dunnett"
    crit = res.multipliers[0]
    # the simultaneous critical value lies between one t test and Bonferroni (source: scipy.stats.t)
    assert stats.t.isf(0.025, res.df_within) < crit < stats.t.isf(0.025 / 3, res.df_within)
    for r in res.rows:
        assert r.ci.high - r.ci.low == pytest.approx(2 * crit * r.se, rel=1e-12)
    assert res.pair("Head 3", "Head 1").differs


def test_the_documented_examples_match():
    # source: the worked examples of docs/comparisons.md (keeps the page and the code in step)
    res = heads("tukey")
    row = res.pair("Head 1", "Head 3")
    assert round(row.difference, 3) == -1.017 and round(row.ci.low, 3) == -1.356
    assert f"{row.p:.2g}" == "3.2e-07" and row.differs
    assert round(res.multipliers[0], 2) == 2.80
    d = dunnett(HEADS, "Head 1")
    assert round(d.multipliers[0], 2) == 2.54
    assert [f"{r.p:.2g}" for r in d.rows] == ["0.61", "1.7e-07", "0.59"]


# ------------------------------------------------------------------------------------------
# many groups: the distributions on many arguments at once


def many_groups(k: int, seed: int, n_max: int = 11) -> list[np.ndarray]:
    """Seeded invented data: k groups of 2 to n_max values, unequal means and spreads."""
    rng = np.random.default_rng(52000 + seed)
    out = []
    for _ in range(k):
        n = int(rng.integers(2, n_max + 1))
        out.append(np.round(rng.normal(rng.uniform(48, 52), rng.uniform(0.5, 3.0), size=n), 2))
    return out


def test_tukey_and_games_howell_with_many_groups_match_scipy():
    # source: scipy.stats.tukey_hsd, and with equal_var=False (Games & Howell 1976)
    gs = many_groups(7, 1)
    for method, ref in (("tukey", stats.tukey_hsd(*gs)),
                        ("games-howell", stats.tukey_hsd(*gs, equal_var=False))):
        ci = ref.confidence_interval(0.95)
        res = pairwise(gs, method)
        assert len(res.rows) == 21
        pairs = [(i, j) for i in range(7) for j in range(i + 1, 7)]
        for row, (i, j) in zip(res.rows, pairs):
            assert row.p == pytest.approx(ref.pvalue[i, j], rel=1e-8, abs=1e-11), method
            assert row.ci.low == pytest.approx(ci.low[i, j], rel=1e-9, abs=1e-9), method
            assert row.ci.high == pytest.approx(ci.high[i, j], rel=1e-9, abs=1e-9), method


def test_dunnett_with_many_groups_matches_scipy():
    # source: scipy.stats.dunnett (randomised QMC with a fixed random_state; 1e-3 tolerance)
    gs = many_groups(12, 2)
    ref = stats.dunnett(*gs[1:], control=gs[0], random_state=np.random.default_rng(11))
    ci = ref.confidence_interval(0.95)
    res = dunnett(gs, "Group 1")
    for r, row in enumerate(res.rows):
        assert row.statistic == pytest.approx(ref.statistic[r], rel=1e-10)
        assert row.p == pytest.approx(ref.pvalue[r], abs=1e-3)
        width = row.ci.high - row.ci.low
        assert row.ci.low == pytest.approx(ci.low[r], abs=1e-3 * width)
        assert row.ci.high == pytest.approx(ci.high[r], abs=1e-3 * width)


def test_games_howell_shares_critical_values_between_equal_welch_df():
    # common practice: pairs with the same Welch df have the same critical value; two pairs of
    # groups with identical sizes and spreads (shifted copies) share it
    base = [10.1, 10.4, 9.8, 10.2]
    data = {"A": base, "B": [x + 1 for x in base], "C": [x + 2 for x in base]}
    res = pairwise(data, "games-howell")
    assert len(set(res.row_df)) == 1 and len(set(res.multipliers)) == 1
    assert res.multipliers[0] == pytest.approx(
        stats.studentized_range.ppf(0.95, 3, res.row_df[0]) / SQRT2, rel=1e-9
    )  # source: scipy.stats.studentized_range.ppf
