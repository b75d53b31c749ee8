"""GroupMoments and the analyses computed from labels, counts and moments without values.

Sources of the checks: the in-memory sheetfuncs call (the same function on the groups' values),
compared bit for bit through ``repr``; messages as written.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from sheetfuncs.errors import InputError
from sheetfuncs.input import as_groups
from sheetfuncs.stats import (
    ExactMoments, GroupMoments, Unavailable, analyse, analyse_of, bartlett, bartlett_of, brown_forsythe,
    brown_forsythe_of, compute_moments, describe, describe_of, group_moments, kruskal, kruskal_from_counts,
    levene_result, moments_only, variance_components, variance_components_of, welch, welch_of,
)

LOTS = {"Lot A": [10.1, 10.3, 9.9, 10.0], "Lot B": [10.6, 10.4, 10.9, 10.5, 10.7], "Lot C": [9.8, 9.7, 10.2]}  # invented


def _gm(data) -> GroupMoments:
    g = as_groups(data)
    return group_moments(g, compute_moments(g))


def test_in_memory_functions_equal_their_moments_form():
    # the in-memory sheetfuncs call, bit for bit
    gm = _gm(LOTS)
    assert repr(welch_of(gm)) == repr(welch(LOTS))
    assert repr(bartlett_of(gm)) == repr(bartlett(LOTS))
    assert repr(brown_forsythe_of(gm)) == repr(brown_forsythe(LOTS))
    assert repr(variance_components_of(gm)) == repr(variance_components(LOTS))
    assert gm.labels == ("Lot A", "Lot B", "Lot C") and gm.counts == (4, 5, 3) and gm.n_total == 12 and gm.exact


def test_describe_without_values_has_no_extremes():
    # the in-memory sheetfuncs call for n, mean, SD and interval; min, median, max need values
    got = describe_of(_gm(LOTS))
    mem = describe(LOTS)
    for a, b in zip(got, mem):
        assert (a.n, a.mean, a.sd, a.ci) == (b.n, b.mean, b.sd, b.ci)
        assert math.isnan(a.min) and math.isnan(a.median) and math.isnan(a.max)


def test_analyse_of_without_second_passes_says_why():
    # the in-memory sheetfuncs call for what the moments give; the rest Unavailable in one line
    gm = _gm(LOTS)
    an = analyse_of(gm)
    mem = analyse(LOTS)
    assert an.groups is None and an.summary is gm and an.labels == mem.groups.labels
    assert repr(an.oneway) == repr(mem.oneway) and repr(an.pairwise) == repr(mem.pairwise)
    assert an.kruskal == Unavailable(
        "Kruskal-Wallis", "Kruskal-Wallis needs the ranks of the values, not available from per-group sums alone"
    )
    na = dict(an.checks.not_available)
    assert na["Levene (median)"] == (
        "Levene's test needs each value's distance from its group median, not available from per-group sums alone"
    )
    assert an.checks.reasons[0] == (
        "Levene's test (median-centred) could not run: Levene's test needs each value's distance from its "
        "group median, not available from per-group sums alone."
    )
    assert an.checks.table()[2][-1].startswith("not available: Levene's test needs")


def test_analyse_of_with_the_tests_given_equals_analyse():
    # the in-memory sheetfuncs call, bit for bit, when the value-based tests are supplied
    mem = analyse(LOTS)
    c = mem.checks
    g = mem.groups
    extremes = [(s.min, s.median, s.max) for s in mem.describe]
    an = analyse_of(_gm(LOTS), levene=c.levene, normality=c.normality, kruskal=c.kruskal, extremes=extremes)
    assert repr(an.checks) == repr(c) and repr(an.describe) == repr(mem.describe)
    assert an.counts == g.counts and an.k == 3 and an.dropped == (0, 0, 0)


def test_moments_only_checks_its_shape():
    mom = ExactMoments(1, 0, (2, 3), (5, 9), (13, 29))
    with pytest.raises(InputError, match=r"^sheetfuncs: 2 groups of sums for 3 labels; give one label per group$"):
        moments_only(("a", "b", "c"), mom)
    with pytest.raises(InputError, match=r'^sheetfuncs: group "b" has no numbers; give it values or leave it out$'):
        moments_only(("a", "b"), ExactMoments(0, 0, (2, 0), (1, 0), (1, 0)))
    with pytest.raises(InputError, match=r"^sheetfuncs: at least two groups are needed to compare means, got 1 "):
        analyse_of(moments_only(("a",), ExactMoments(0, 0, (2,), (1,), (1,))))


def test_float_underflow_is_recorded_and_refused():
    # common practice: sums of squares below the double range are refused, not shown as zero
    data = {"A": [1e-200, 2e-200, 3e-200], "B": [4e-200, 6e-200, 5e-200]}
    g = as_groups(data)
    gm = group_moments(g, compute_moments(g, False))
    assert gm.underflow_groups == (0, 1)
    with pytest.raises(InputError, match="differ by too little"):
        describe_of(gm)


@pytest.mark.parametrize("seed", range(20))
def test_kruskal_from_counts_equals_kruskal(seed):
    # the in-memory sheetfuncs call on the same values, bit for bit (ties: one or no decimals)
    rng = np.random.default_rng(seed)
    arrays = [np.round(rng.normal(10, 2, int(rng.integers(1, 40))), int(rng.integers(0, 2))) + 0.0 for _ in range(int(rng.integers(2, 6)))]
    values, groups, counts = [], [], []
    for i, a in enumerate(arrays):
        u, c = np.unique(a, return_counts=True)
        values += u.tolist()
        groups += [i] * u.size
        counts += c.tolist()
    order = rng.permutation(len(values))  # the table arrives in any order
    got = kruskal_from_counts(len(arrays), np.array(values)[order], np.array(groups)[order], np.array(counts)[order])
    assert repr(got) == repr(kruskal(arrays))


def test_kruskal_from_counts_messages():
    with pytest.raises(InputError, match="^sheetfuncs: every value is the same, so the Kruskal-Wallis test"):
        kruskal_from_counts(2, np.array([1.0, 1.0]), np.array([0, 1]), np.array([3, 2]))
    with pytest.raises(InputError, match="^sheetfuncs: group 2 has no values in the table of counts$"):
        kruskal_from_counts(2, np.array([1.0, 2.0]), np.array([0, 0]), np.array([3, 2]))


def test_levene_result_all_distances_equal():
    from fractions import Fraction as F
    with pytest.raises(InputError, match="^sheetfuncs: every value's distance from its group median is the same"):
        levene_result("median", [2, 2], [F(2), F(2)], [F(2), F(2)], (F(1), F(1)))
