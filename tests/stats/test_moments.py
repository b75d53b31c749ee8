"""sheetfuncs.stats.moments: the decimal-exact path and the floating-point path, edge cases.

Reference for exactness: exact rational arithmetic (Python fractions) on the shortest
round-trip decimals of the values (``Fraction(repr(x))``), which is the exact path's definition
(engineering guide, Numbers).
"""

from __future__ import annotations

import math
from fractions import Fraction

import numpy as np
import pytest
from hypothesis import given
from hypothesis import strategies as st

import sheetfuncs as sf
from sheetfuncs import InputError, as_groups
from sheetfuncs.stats.moments import (
    _CHUNK, ExactMoments, FloatMoments, _sample, _sample_scale, compute_moments, decimal_parts,
)


def rational_moments(values) -> tuple[int, Fraction, Fraction]:
    """n, mean and sum of squared deviations of the decimal values, exactly."""
    vals = [Fraction(repr(float(v))) for v in values]
    n = len(vals)
    mean = sum(vals) / n
    return n, mean, sum((v - mean) ** 2 for v in vals)


def assert_exact(arrays) -> ExactMoments:
    mom = compute_moments(as_groups(arrays), exact=True)
    assert isinstance(mom, ExactMoments)
    for g, a in enumerate(arrays):
        n, mean, ss = rational_moments(a)
        assert mom.n[g] == n
        assert mom.mean(g) == mean
        assert mom.ss_group(g) == ss
    return mom


@pytest.mark.parametrize("x, parts", [
    (0.1, (1, -1, 1)), (1234.5, (12345, -1, 5)), (1e20, (1, 20, 1)), (0.0, (0, 0, 1)),
    (-0.001, (-1, -3, 1)), (2.50, (25, -1, 2)), (123456789012345.0, (123456789012345, 0, 15)),
    (0.30000000000000004, (30000000000000004, -17, 17)),
])
def test_decimal_parts_are_the_shortest_round_trip(x, parts):
    # common practice: Python's repr gives the shortest decimal that round-trips the double
    assert decimal_parts(x) == parts


def _slow_scale(values) -> int:
    """The sample's scale one value at a time: the most decimals of any shortest decimal."""
    return max(0, max(-decimal_parts(v)[1] for v in values))


@pytest.mark.parametrize("values", [
    [0.1, 2.0, 3.25], [1234.5, -0.001, 7.0], [0.0, -0.0, 5.0], [250.125] * 3,
    [123456789012345.0, 1.0], [0.5, 1e-7, 3.0], [99999999999999.9],
])
def test_vectorised_sample_scale_matches_the_decimal_reading(values):
    # common practice: repr gives the shortest round-trip decimal (decimal_parts reads it)
    found = _sample_scale(np.array(values))
    assert found is not None
    scale, scaled = found
    assert scale == _slow_scale(values)
    assert [int(r) for r in scaled] == [
        m * 10 ** (e + scale) for m, e, _ in map(decimal_parts, values)
    ]


@pytest.mark.parametrize("values", [
    [0.30000000000000004],          # 17 digits
    [1e-23, 1.0],                   # more than 22 decimals
    [1e20], [1e22, 2e22],           # integers wider than 15 digits
    [123456789012345.0, 0.5],       # 16 digits once both share one scale
    [math.pi],
])
def test_vectorised_sample_scale_gives_way_to_the_decimal_reading(values):
    assert _sample_scale(np.array(values)) is None


@given(st.lists(st.tuples(st.integers(-10**12, 10**12), st.integers(0, 9)), min_size=1, max_size=40))
def test_vectorised_sample_scale_on_random_decimals(pairs):
    # values N / 10**d typed with at most 13 digits: both readings agree whenever the
    # vectorised one applies, and it applies unless a scaled value reaches 15 digits
    values = [float(Fraction(n, 10**d)) for n, d in pairs]
    found = _sample_scale(np.array(values))
    slow = _slow_scale(values)
    widest = max(abs(Fraction(repr(v))) * 10**slow for v in values)
    if widest < 10**15:
        assert found is not None and found[0] == slow
    else:
        assert found is None


def test_exact_sums_for_typical_three_decimal_data():
    rng = np.random.default_rng(5)
    assert_exact([np.round(rng.normal(250, 4, size=n), 3) for n in (5, 40_000, 70_001)])


@pytest.mark.parametrize("decimals, sd", [(6, 300.0), (9, 300.0), (4, 1e6), (2, 1e9), (0, 1e14)])
def test_wide_scaled_integers_stay_exact(decimals, sd):
    # scaled integers up to ~1e15: squares far beyond int64, summed in split int64 blocks
    rng = np.random.default_rng(decimals)
    assert_exact([np.round(rng.normal(250, sd, size=n), decimals) for n in (3, _CHUNK + 17)])


def test_very_wide_ranges_need_python_integers():
    # 1e20 next to 1e-5 in one dataset: scaled by 1e5 the integers reach 1e25 (beyond 2**53)
    mom = assert_exact([[1e20, 1e-5, 3.0, 2.5], [2e20, 5.5, 1e-5]])
    assert mom.scale == 5


def test_values_like_1e20_are_exact():
    mom = assert_exact([[1e20, 2e20, 3e20], [5e20, 4e20, 4.5e20]])
    assert mom.scale == 0


def test_fifteen_significant_digits_are_exact():
    assert_exact([[123456789012345.0, 123456789012344.0, 99999999999999.9],
                   [0.123456789012345, 0.923456789012345]])


def test_tiny_and_scale_beyond_22_decimals():
    # 23 decimals: the vectorised scaling (powers of ten up to 1e22 are exact doubles) gives way
    # to reading each value through its decimal representation
    mom = assert_exact([[1e-23, 2e-23, 3.5e-23], [4e-23, 7e-23]])
    assert mom.scale == 24


def test_one_value_beyond_22_decimals_leaves_the_rest_vectorised(monkeypatch):
    # a sampled value with 23 decimals among 50,000 two-decimal values: the others are still
    # scaled in floats, and only the sample and that value are read through their decimals
    import sheetfuncs.stats.moments as moments_module

    calls = []
    real = moments_module.decimal_parts
    monkeypatch.setattr(moments_module, "decimal_parts", lambda x: calls.append(x) or real(x))
    rng = np.random.default_rng(23)
    a = np.round(rng.normal(50, 2, 30_000), 2)
    a[0] = 1e-23  # the first value is always in the sample
    b = np.round(rng.normal(51, 2, 20_000), 2)
    mom = assert_exact([a, b])
    assert mom.scale == 23
    assert len(calls) <= 2 * len(_sample([a, b]))


def test_mixed_decimals_missed_by_the_sample():
    # 50,000 values with one decimal; three values with five decimals sit where the evenly
    # spaced sample does not look, so the first scale (1 decimal) is too coarse for them and
    # the exact sums are rescaled after the fact
    a = np.round(np.linspace(0, 5000, 50_000), 1)
    a[12_345] = 1.23456
    a[23_457] = 7.00001
    b = np.round(np.linspace(3, 9, 20_001), 1)
    b[101] = 4.99999
    sampled = [v for _, v in _sample([a, b])]
    assert max(-decimal_parts(v)[1] for v in sampled) == 1  # the sample saw one decimal only
    mom = assert_exact([a, b])
    assert mom.scale == 5


def test_sixteen_and_seventeen_digit_values_take_the_float_path():
    # 0.1 + 0.2 is 0.30000000000000004 (17 significant digits), a formula result
    g = as_groups([[0.1 + 0.2, 0.5, 0.7], [0.9, 1.1, 1.25]])
    assert isinstance(compute_moments(g), FloatMoments)
    assert not sf.oneway(g).exact
    g16 = as_groups([[1234567890123456.0, 1.0], [2.0, 3.0]])  # 16 digits, no trailing zero
    assert isinstance(compute_moments(g16), FloatMoments)


def test_exact_true_explains_why_it_is_impossible():
    with pytest.raises(InputError) as e:
        sf.oneway({"Zone A": [1.5, 2.5], "Zone B": [0.1 + 0.2, 0.7]}, exact=True)
    assert str(e.value) == (
        "sheetfuncs: the exact path needs every value to have at most 15 significant digits, but "
        '0.30000000000000004 in group "Zone B" has 17; round the data or use exact=False'
    )


def test_exact_false_forces_floats_even_for_typed_data():
    g = as_groups([[1.5, 2.5, 3.0], [4.0, 4.5]])
    mom = compute_moments(g, exact=False)
    assert isinstance(mom, FloatMoments)
    res = sf.oneway(g, exact=False)
    assert not res.exact and res.ss_between_exact is None


def test_float_path_group_differences_survive_shared_leading_digits():
    # values 1e12 + small decimals: group means differ in the 13th digit; the differences of
    # the computed means agree with exact rational arithmetic on the binary values
    a = [1e12 + 0.1 * i for i in range(7)]
    b = [1e12 + 0.3 + 0.1 * i for i in range(5)]
    mom = compute_moments(as_groups([a, b]), exact=False)
    ref = sum(map(Fraction, b)) / len(b) - sum(map(Fraction, a)) / len(a)
    assert mom.mean_differences(0)[1] == pytest.approx(float(ref), rel=1e-15)
    assert all(math.isfinite(v) for v in mom.m2)


def test_float_path_falls_back_to_two_passes_when_the_sample_misses():
    # the evenly spaced sample (every 1000th value) sees only zeros while the other values sit
    # near 1e8: summing about the sample mean alone would lose about three digits
    # (1 + (mean - shift)^2 / variance ~ 1e3); the second pass about the mean keeps them.
    # Reference: exact rational arithmetic on the binary values (Python fractions).
    rng = np.random.default_rng(8)
    a = 1e8 + rng.normal(0.0, 1e-3, size=64_000)
    a[::1000] = 0.0
    mom = compute_moments(as_groups([a, [1.0, 2.0]]), exact=False)
    vals = [Fraction(float(v)) for v in a]
    mean = sum(vals) / len(vals)
    ss = sum((v - mean) ** 2 for v in vals)
    assert mom.ss_group(0) == pytest.approx(float(ss), rel=1e-14)
    assert mom.mean(0) == pytest.approx(float(mean), rel=1e-15)


def test_exact_mean_differences():
    mom = compute_moments(as_groups([[1.5, 2.5], [4.25, 4.75], [0.1, 0.2, 0.3]]))
    assert mom.mean_differences(0) == (Fraction(0), Fraction(5, 2), Fraction(-9, 5))
    assert mom.means()[1] == Fraction(9, 2)


def test_pooled_parts_match_rational_arithmetic():
    groups = [[1.5, 2.25, 3.0], [4.0, 4.5], [0.125, 9.75, 3.5, 2.0]]
    mom = compute_moments(as_groups(groups))
    pooled = groups[0] + groups[2]
    _, _, ss02 = rational_moments(pooled)
    _, _, ss1 = rational_moments(groups[1])
    assert mom.ss_within_parts([[0, 2], [1]]) == ss02 + ss1
    fmom = compute_moments(as_groups(groups), exact=False)
    assert fmom.ss_within_parts([[0, 2], [1]]) == pytest.approx(float(ss02 + ss1), rel=1e-14)


def test_zero_within_group_variance_with_different_means_gives_infinite_f():
    for exact in (None, False):
        r = sf.oneway({"A": [2.5, 2.5, 2.5], "B": [3.0, 3.0]}, exact=exact)
        assert r.f == math.inf and r.p == 0.0
        assert r.ss_within == 0.0 and r.ms_within == 0.0 and r.residual_sd == 0.0
        assert r.r_squared == 1.0


@pytest.mark.parametrize("exact", [None, False])
def test_sums_of_squares_beyond_the_double_range_are_rejected(exact):
    with pytest.raises(InputError, match="^sheetfuncs: the values are too large for double-precision"):
        sf.oneway([[1e200, 2e200, 3e200], [5e200, 7e200]], exact=exact)
    with pytest.raises(InputError, match="^sheetfuncs: the values differ by too little for double-precision"):
        sf.oneway([[1e-300, 2e-300, 3e-300], [5e-300, 6e-300]], exact=exact)


# --------------------------------------------------------------------------------------------
# overflow-safe float moments (issue 10): the data are summed in a power-of-two unit


def _fraction_ss(groups: list[list[float]]) -> tuple[Fraction, Fraction]:
    """Reference: exact rational arithmetic (fractions): within and total sums of squares."""
    fr = [[Fraction(x) for x in g] for g in groups]
    within = sum((sum((x - sum(g) / len(g)) ** 2 for x in g) for g in fr), Fraction(0))
    every = [x for g in fr for x in g]
    grand = sum(every) / len(every)
    return within, sum(((x - grand) ** 2 for x in every), Fraction(0))


def _as_groups(groups: list[list[float]]) -> sf.Groups:
    return as_groups({f"G{i}": g for i, g in enumerate(groups)})


@pytest.mark.parametrize("scale", [1e-300, 1e-160, 1e100, 1e140, 1e150])
@pytest.mark.parametrize("exact", [False, None])
def test_sums_of_squares_at_extreme_scales_match_fractions(scale, exact):
    # 17-digit values force the float path when exact is None; the SS stay below 1e300
    base = [[0.30000000000000004, 1.25, 2.5], [3.75, 0.1 + 0.7, 4.0], [2.0, 2.125, 1 / 3]]
    groups = [[x * scale for x in g] for g in base]
    mom = compute_moments(_as_groups(groups), exact)
    within, total = _fraction_ss(groups)
    if float(total) < 1e-290:
        return  # below the double range of a sum of squares: the analyses say so
    assert mom.ss_within_parts([[0], [1], [2]]) == pytest.approx(float(within), rel=1e-14)
    assert mom.ss_within_parts([[0, 1, 2]]) == pytest.approx(float(total), rel=1e-14)


@pytest.mark.parametrize("groups", [
    [[1e154, -1.2e154, 0.30000000000000004], [1.1e154, -0.9e154, 0.5e154]],
    [[1e200, 2e200, 3.0000000000000004e200], [-1e200, 0.0, 1e200]],
    [[1e300, -1e300, 0.30000000000000004], [1.7e308, -1.7e308, 1e308]],
    [[-1e308, 1e308, 1.7976931348623157e308], [-1.7976931348623157e308, 5e-324, 1.0]],
])
def test_sums_of_squares_beyond_the_double_range_are_inf_not_an_error(groups):
    # reference: exact rational arithmetic (fractions): the SS exceed the largest double
    mom = compute_moments(_as_groups(groups), False)
    within, total = _fraction_ss(groups)
    assert total > Fraction(1e300)
    ssw, sst = mom.ss_within_parts([[0], [1]]), mom.ss_within_parts([[0, 1]])
    for got, ref in ((ssw, within), (sst, total)):
        if ref >= Fraction(1.7976931348623157e308):
            assert got == math.inf
        else:
            assert got == pytest.approx(float(ref), rel=1e-13)
    assert all(math.isfinite(m) for m in mom.means())


def test_subnormal_values_are_summed_in_a_normal_unit():
    # reference: exact rational arithmetic (fractions); the SS itself underflows to 0, the
    # analyses then say the values differ by too little (check_float_zero_spread)
    groups = [[5e-324, 1e-323, 1.5e-323], [2e-323, 2.5e-323, 3.0000000000000004e-310]]
    mom = compute_moments(_as_groups(groups), False)
    assert mom.exp2 < -1000
    within, _ = _fraction_ss(groups)
    unit = mom.ss_within_parts([[0], [1]])
    assert unit == float(within) == 0.0 or unit == pytest.approx(float(within), rel=1e-13)
    assert mom.means()[0] == 1e-323  # the mean of 1, 2 and 3 times the smallest subnormal
