"""sheetfuncs.stats.oneway: result fields, the spill table, summaries, degenerate cases."""

from __future__ import annotations

import dataclasses
import math
from fractions import Fraction

import numpy as np
import pytest
from scipy import stats

import sheetfuncs as sf
from sheetfuncs import InputError

# NIST/SEMATECH e-Handbook section 7.4.3 example (data from memory; see tests/reference)
HANDBOOK = {
    "1": [6.9, 5.4, 5.8, 4.6, 4.0],
    "2": [8.3, 6.8, 7.8, 9.2, 6.5],
    "3": [8.0, 10.5, 8.1, 6.9, 9.3],
}


def test_result_fields_are_consistent():
    r = sf.oneway(HANDBOOK)
    assert r.labels == ("1", "2", "3") and r.counts == (5, 5, 5) and r.k == 3 and r.n_total == 15
    assert (r.df_between, r.df_within, r.df_total) == (2, 12, 14)
    assert r.ms_between == pytest.approx(r.ss_between / 2, rel=1e-15)
    assert r.ms_within == pytest.approx(r.ss_within / 12, rel=1e-15)
    assert r.f == pytest.approx(r.ms_between / r.ms_within, rel=1e-15)
    assert r.r_squared == pytest.approx(r.ss_between / r.ss_total, rel=1e-15)
    assert r.residual_sd == pytest.approx(math.sqrt(r.ms_within), rel=1e-15)
    # reference library: scipy.stats.f.sf for the p-value of the same F
    assert r.p == pytest.approx(float(stats.f.sf(r.f, 2, 12)), rel=1e-12)


def test_result_is_frozen():
    r = sf.oneway(HANDBOOK)
    with pytest.raises(dataclasses.FrozenInstanceError):
        r.f = 1.0  # type: ignore[misc]


def test_table_layout_header_first_then_factor_residual_total():
    t = sf.oneway(HANDBOOK).table()
    assert t[0] == ["Source", "df", "SS", "MS", "F", "p"]
    assert [row[0] for row in t[1:]] == ["Factor", "Residual", "Total"]
    assert t[1][1] == 2 and t[2][1] == 12 and t[3][1] == 14
    assert t[2][4] is None and t[3][3] is None  # no F for the residual row, no MS for total
    assert all(len(row) == 6 for row in t)
    assert sf.oneway(HANDBOOK).table(factor="Filling head")[1][0] == "Filling head"


def test_exact_rationals_add_up():
    r = sf.oneway(HANDBOOK)
    assert r.exact
    assert r.ss_between_exact + r.ss_within_exact == r.ss_total_exact
    assert isinstance(r.ss_total_exact, Fraction)
    assert r.ss_total == float(r.ss_total_exact)


def test_means_follow_group_order():
    r = sf.oneway({"b": [3.0, 5.0], "a": [1.0, 2.0, 3.0]})
    assert r.labels == ("b", "a")
    assert r.means == (4.0, 2.0)


def test_accepts_ranges_mappings_and_sequences_alike():
    seq = [HANDBOOK["1"], HANDBOOK["2"], HANDBOOK["3"]]
    rng = [["1", "2", "3"]] + [list(row) for row in zip(*seq)]
    a, b, c = sf.oneway(HANDBOOK), sf.oneway(seq), sf.oneway(sf.groups_from_range(rng))
    assert a.f == b.f == c.f
    assert b.labels == ("Group 1", "Group 2", "Group 3")


def test_unequal_group_sizes_against_scipy():
    # reference library: scipy.stats.f_oneway
    data = [[10.1, 10.4, 9.8], [11.0, 10.7, 10.9, 11.3, 10.6], [9.9, 10.0]]
    r = sf.oneway(data)
    ref = stats.f_oneway(*data)
    assert r.f == pytest.approx(ref.statistic, rel=1e-12)
    assert r.p == pytest.approx(ref.pvalue, rel=1e-12)


def test_a_group_of_one_value_is_allowed():
    r = sf.oneway([[5.0], [1.0, 2.0, 3.0]])
    assert r.df_within == 2
    ref = stats.f_oneway([5.0], [1.0, 2.0, 3.0])  # reference library
    assert r.f == pytest.approx(ref.statistic, rel=1e-12)


def test_degenerate_cases():
    with pytest.raises(InputError, match="^sheetfuncs: at least two groups are needed to compare means, got 1"):
        sf.oneway({"Only": [1.0, 2.0]})
    with pytest.raises(InputError, match="^sheetfuncs: no residual degrees of freedom"):
        sf.oneway([[1.0], [2.0], [3.0]])
    with pytest.raises(InputError, match="^sheetfuncs: all values are identical"):
        sf.oneway([[4.2, 4.2], [4.2, 4.2, 4.2]])


def test_f_and_p_for_a_huge_but_finite_f():
    # F of about 2.4e19 on (1, 4) df: p is about 1e-38, not zero (survival function, never
    # 1 - cdf); reference library: scipy.stats.f.sf
    r = sf.oneway([[1.0, 1.0 + 1e-9, 1.0 - 1e-9], [5.0, 5.0 + 1e-9, 5.0 - 1e-9]])
    assert r.f > 1e18 and 0.0 < r.p < 1e-30
    assert r.p == pytest.approx(float(stats.f.sf(r.f, 1, 4)), rel=1e-12)


# -- from summaries ----------------------------------------------------------------------------


def test_from_summary_equals_raw_data_within_1e_12():
    # issue 2: SDs with n - 1; well-conditioned random data, 100 seeded cases
    rng = np.random.default_rng(31)
    for _ in range(100):
        k = int(rng.integers(2, 7))
        groups = [np.round(rng.normal(rng.uniform(5, 50), rng.uniform(0.5, 5), size=int(rng.integers(2, 30))), 3)
                  for _ in range(k)]
        raw = sf.oneway([list(g) for g in groups])
        summ = sf.oneway_from_summary(
            [len(g) for g in groups], [float(np.mean(g)) for g in groups],
            [float(np.std(g, ddof=1)) for g in groups],
        )
        for field in ("ss_between", "ss_within", "ss_total", "ms_between", "ms_within", "f", "p",
                      "r_squared", "residual_sd"):
            assert getattr(summ, field) == pytest.approx(getattr(raw, field), rel=1e-12), field
        assert summ.df_between == raw.df_between and summ.df_within == raw.df_within


def test_from_summary_group_of_one_needs_sd_zero():
    # common practice: a single value has no standard deviation; it adds nothing to SSW
    r = sf.oneway_from_summary([4, 1], [10.5, 12.0], [1.5, 0.0])
    assert r.ss_within_exact == 3 * Fraction("2.25") and r.df_within == 3
    with pytest.raises(sf.InputError, match="count 2 is 1"):
        sf.oneway_from_summary([4, 1], [10.5, 12.0], [1.5, 0.4])


def test_from_summary_names_must_differ():
    with pytest.raises(sf.InputError, match='"Line A" is given to groups 1 and 3'):
        sf.oneway_from_summary([4, 6, 5], [10.5, 12.0, 11.0], [1.5, 2.0, 1.0], ["Line A", "B", "Line A"])


def test_from_summary_exact_decimal_arithmetic():
    # counts, means and SDs as typed; sums of squares as exact decimals
    r = sf.oneway_from_summary([4, 6], [10.5, 12.0], [1.5, 2.0], labels=["Line A", "Line B"])
    assert r.labels == ("Line A", "Line B")
    assert r.ss_within_exact == 3 * Fraction("2.25") + 5 * Fraction(4)
    grand = (4 * Fraction("10.5") + 6 * 12) / 10
    assert r.ss_between_exact == 4 * (Fraction("10.5") - grand) ** 2 + 6 * (12 - grand) ** 2
    assert r.exact


def test_from_summary_accepts_spreadsheet_columns():
    r = sf.oneway_from_summary([[4], [6]], np.array([10.5, 12.0]), (1.5, 2.0))
    assert r.counts == (4, 6)


@pytest.mark.parametrize("args, message", [
    (([4, 6], [1.0], [1.0, 1.0]), "2 counts, 1 means and 2 SDs; give one of each per group"),
    (([4], [1.0], [1.0]), "at least two groups are needed to compare means, got 1"),
    (([4, 2.5], [1.0, 2.0], [1.0, 1.0]), "count 2 is 2.5; counts must be whole numbers of at least 1"),
    (([0, 3], [1.0, 2.0], [1.0, 1.0]), "count 1 is 0; counts must be whole numbers of at least 1"),
    (([4, 3], [1.0, "x"], [1.0, 1.0]), 'mean 2 is "x", not a number'),
    (([4, 3], [1.0, 2.0], [1.0, -0.5]), "SD 2 is negative"),
    (([4, 3], [1.0, float("nan")], [1.0, 1.0]), "mean 2 is nan, not a finite number"),
    (([4, True], [1.0, 2.0], [1.0, 1.0]), "count 2 is TRUE, not a number"),
])
def test_from_summary_bad_input(args, message):
    with pytest.raises(InputError) as e:
        sf.oneway_from_summary(*args)
    assert str(e.value).startswith("sheetfuncs: " + message)


def test_from_summary_label_count_mismatch():
    with pytest.raises(InputError, match="^sheetfuncs: 1 names for 2 groups"):
        sf.oneway_from_summary([3, 3], [1.0, 2.0], [1.0, 1.0], labels=["A"])


def test_from_summary_all_ones_no_residual_df():
    with pytest.raises(InputError, match="^sheetfuncs: no residual degrees of freedom"):
        sf.oneway_from_summary([1, 1], [1.0, 2.0], [0.0, 0.0])


def test_from_sums_equals_oneway_at_any_scale_and_offset():
    # the same exact rationals whatever scale and offset the sums use (common practice:
    # exact integer arithmetic); the Python call through the harness for the reference
    from sheetfuncs.stats import ExactMoments, oneway_from_sums

    groups = {"A": [1.25, 2.5, 3.0], "B": [4.5, 4.75], "C": [0.5, 1.0, 1.125]}
    ref = sf.oneway(groups)
    for scale, offset in ((3, 0), (5, 123456)):
        ints = [[round(v * 10**scale) - offset for v in vs] for vs in groups.values()]
        mom = ExactMoments(scale, offset, tuple(map(len, ints)), tuple(map(sum, ints)),
                           tuple(sum(m * m for m in g) for g in ints))
        res = oneway_from_sums(tuple(groups), mom, notes=("a note",))
        assert dataclasses.replace(res, notes=()) == ref and res.notes == ("a note",)
    with pytest.raises(InputError) as e:
        oneway_from_sums(("A",), ExactMoments(0, 0, (2,), (1,), (1,)))
    assert str(e.value) == (
        'sheetfuncs: at least two groups are needed to compare means, got 1 (only "A"); check '
        "the group column and the filter"
    )
    with pytest.raises(InputError, match=r"^sheetfuncs: 2 groups of sums for 3 labels; give one label per group$"):
        oneway_from_sums(("A", "B", "C"), ExactMoments(0, 0, (2, 2), (1, 1), (1, 1)))
