"""Per-group variances for the tests that need each group's own (sheetfuncs.stats.group_variances).

Sources are named beside each numeric check: exact rational arithmetic (Python fractions) on
the decimal values, computed here in the test, and common practice. The tests that use these
pieces (Welch, Brown-Forsythe, Levene, Bartlett) are checked against published data and
reference libraries in their own test files.
"""

from __future__ import annotations

import math
from fractions import Fraction

import numpy as np
import pytest

import sheetfuncs as sf
from sheetfuncs import InputError, as_groups
from sheetfuncs.stats.group_variances import (
    centred_group_stats, prepare_with_variances, require_variances, unit_free_moments,
)
from sheetfuncs.stats.moments import compute_moments

#: Invented: viscosity (mPa s) of three lots of a calibration material, a few readings each.
LOTS = {"Lot A": [101.25, 101.5, 100.75, 101.0], "Lot B": [102.0, 103.5, 102.5], "Lot C": [99.5, 100.25]}


def test_every_group_needs_two_values():
    with pytest.raises(InputError, match=r'^sheetfuncs: group "Lot D" has only one value, but the test needs'):
        require_variances(as_groups({**LOTS, "Lot D": [100.0]}), "the test")
    require_variances(as_groups(LOTS), "the test")  # two or more values everywhere: no error
    with pytest.raises(InputError, match="at least two groups"):
        prepare_with_variances({"Lot A": LOTS["Lot A"]}, "the test", None)


def test_prepare_gives_the_groups_and_their_moments():
    g, mom = prepare_with_variances(LOTS, "the test", None)
    assert g.labels == ("Lot A", "Lot B", "Lot C") and mom.exact
    assert mom == compute_moments(as_groups(LOTS), None)


def test_centred_stats_are_the_exact_ones_in_a_power_of_two_unit():
    # source: exact rational arithmetic (Python fractions) on the decimal values
    g = as_groups(LOTS)
    dev, var = centred_group_stats(g, compute_moments(g, None))
    vals = [[Fraction(repr(v)) for v in a] for a in LOTS.values()]
    means = [sum(a) / len(a) for a in vals]
    variances = [sum((x - m) ** 2 for x in a) / (len(a) - 1) for a, m in zip(vals, means)]
    top = max(variances)
    h = (top.numerator.bit_length() - top.denominator.bit_length()) // 2
    unit = Fraction(2) ** h
    assert list(dev) == [float((m - means[0]) / unit) for m in means]
    assert list(var) == [float(v / unit**2) for v in variances]
    assert 0.25 <= max(var) <= 16.0  # the largest variance lies near 1 in the common unit


def test_a_group_of_one_value_has_no_variance():
    # common practice: a single value has no sample variance (nan), but a deviation of its mean
    g = as_groups({"A": [1.0, 2.0, 4.0], "B": [7.0]})
    dev, var = centred_group_stats(g, compute_moments(g, None))
    assert dev[1] != 0.0 and math.isnan(var[1]) and var[0] > 0.0


@pytest.mark.parametrize("scale", [2.0**-700, 2.0**700])
def test_extreme_float_data_are_rescaled_by_a_power_of_two(scale):
    # common practice: the unit-free statistics may be computed on data rescaled exactly
    base = {"A": [1.0 / 3.0, 0.7, 0.9], "B": [1.1, 1.3, 1.7]}
    moved = {k: [v * scale for v in a] for k, a in base.items()}
    g, mom = unit_free_moments(as_groups(moved), False)
    assert not mom.exact
    ratio = g.arrays[0][0] / moved["A"][0]
    assert math.frexp(ratio)[0] == 0.5  # a power of two
    for a, original in zip(g.arrays, moved.values()):
        assert np.array_equal(a, np.asarray(original) * ratio)
    assert all(math.isfinite(mom.ss_group(i)) and mom.ss_group(i) > 0 for i in range(2))


def test_ordinary_and_exact_data_are_left_as_they_are():
    g = as_groups(LOTS)
    same, mom = unit_free_moments(g, None)
    assert same is g and mom.exact
    huge = as_groups({"A": [1e200, 2e200, 4e200], "B": [3e200, 5e200]})
    same, mom = unit_free_moments(huge, None)  # the exact path needs no rescaling
    assert same is huge and mom.exact


def test_means_too_far_apart_for_doubles_get_one_line():
    # found by the fuzz test: subnormal values whose means differ by ~1e310 standard deviations
    rows = [["A", 1, "a", "C", 1], [4e-310, 2e-310, 4.78969999999997e-310, 4.2e-310, 8.153e-310],
            [1.4811e-310, 3.99489999999997e-310, 5e-310, 3e-311, 7.49999999999995e-310]]
    with pytest.raises(InputError) as e:
        sf.welch(sf.groups_from_range(rows, "rowwise"))
    assert e.value.reason == (
        "the group means differ by more than 10^300 times the groups' standard deviations, which "
        "double precision cannot carry; check the data's units"
    )
