"""Property tests (hypothesis): invariances of the one-way analysis.

Data are generated as integers over a power of ten, N / 10**d, and every transformed data set is
built again from integers (never by float arithmetic on the floats), so each transformed value is
itself the exact decimal the transform describes:

* adding the decimal constant C / 10**e:  (N * 10**e + C * 10**d) / 10**(d + e)
* scaling by 10**s:                       N * 10**s / 10**d   (or N / 10**(d - s))

On the exact path the sums of squares are then exactly invariant (shift) or exactly multiplied
by 10**(2s) (scale), so F and p must be equal to the last bit. On the floating-point path
(exact=False) the binary values differ from the decimals by up to half a unit in the last
place; with data whose largest magnitude stays below 1000 within-group SDs and a between-group
share (R squared) of at least 1e-3, F and p agree within 1e-12 relative (the common-practice
bound for a well-conditioned problem).
"""

from __future__ import annotations

import math
from fractions import Fraction

from hypothesis import assume, event, given, settings
from hypothesis import strategies as st

import sheetfuncs as sf

INTS = st.integers(min_value=-10**6, max_value=10**6)
GROUP_INTS = st.lists(st.lists(INTS, min_size=2, max_size=12), min_size=2, max_size=6)
DECIMALS = st.integers(min_value=0, max_value=4)


def as_floats(groups_int: list[list[int]], denominator: int) -> list[list[float]]:
    """Each value is the double nearest to N / denominator (Python's int / int is exact-rounded)."""
    return [[n / denominator for n in g] for g in groups_int]


def not_degenerate(groups_int: list[list[int]]) -> bool:
    flat = [n for g in groups_int for n in g]
    return len(set(flat)) > 1 and any(len(set(g)) > 1 for g in groups_int)


def well_conditioned(groups: list[list[float]]) -> bool:
    r = sf.oneway(groups)
    if r.ms_within == 0 or r.r_squared < 1e-3:
        return False
    biggest = max(abs(v) for g in groups for v in g)
    return biggest < 1e3 * r.residual_sd


def rel(a: float, b: float) -> float:
    return 0.0 if a == b else abs(a - b) / max(abs(a), abs(b))


@settings(max_examples=150)
@given(GROUP_INTS, DECIMALS)
def test_exact_sums_of_squares_add_up(groups_int, d):
    assume(not_degenerate(groups_int))
    r = sf.oneway(as_floats(groups_int, 10**d))
    assert r.exact
    assert r.ss_between_exact + r.ss_within_exact == r.ss_total_exact
    # and they are the sums of squares of the decimals themselves (exact rational arithmetic)
    vals = [[Fraction(n, 10**d) for n in g] for g in groups_int]
    n_all = sum(map(len, vals))
    grand = sum(map(sum, vals)) / n_all
    assert r.ss_total_exact == sum((v - grand) ** 2 for g in vals for v in g)


@settings(max_examples=150)
@given(GROUP_INTS, DECIMALS, st.randoms(use_true_random=False))
def test_reordering_groups_and_values(groups_int, d, rnd):
    assume(not_degenerate(groups_int))
    base = as_floats(groups_int, 10**d)
    shuffled = [list(g) for g in base]
    for g in shuffled:
        rnd.shuffle(g)
    rnd.shuffle(shuffled)
    a, b = sf.oneway(base), sf.oneway(shuffled)
    assert a.exact and b.exact
    assert a.f == b.f and a.p == b.p  # exact path: to the last bit
    assert a.ss_total_exact == b.ss_total_exact
    if well_conditioned(base):
        event("float path compared")
        fa, fb = sf.oneway(base, exact=False), sf.oneway(shuffled, exact=False)
        assert rel(fa.f, fb.f) <= 1e-12 and rel(fa.p, fb.p) <= 1e-12


@settings(max_examples=150)
@given(GROUP_INTS, DECIMALS, st.integers(min_value=-10**6, max_value=10**6),
       st.integers(min_value=0, max_value=3))
def test_adding_a_decimal_constant(groups_int, d, c_int, e):
    assume(not_degenerate(groups_int))
    base = as_floats(groups_int, 10**d)
    shifted_int = [[n * 10**e + c_int * 10**d for n in g] for g in groups_int]
    shifted = as_floats(shifted_int, 10 ** (d + e))  # (N / 10**d) + (C / 10**e), exactly
    a, b = sf.oneway(base), sf.oneway(shifted)
    assert a.exact and b.exact
    assert a.ss_between_exact == b.ss_between_exact and a.ss_within_exact == b.ss_within_exact
    assert a.f == b.f and a.p == b.p
    if well_conditioned(base) and well_conditioned(shifted):
        event("float path compared")
        fa, fb = sf.oneway(base, exact=False), sf.oneway(shifted, exact=False)
        assert rel(fa.f, fb.f) <= 1e-12 and rel(fa.p, fb.p) <= 1e-12


@settings(max_examples=150)
@given(GROUP_INTS, DECIMALS, st.integers(min_value=-4, max_value=4))
def test_scaling_by_a_power_of_ten(groups_int, d, s):
    assume(not_degenerate(groups_int))
    base = as_floats(groups_int, 10**d)
    if s >= 0:
        scaled = [[n * 10**s / 10**d for n in g] for g in groups_int]
    else:
        scaled = as_floats(groups_int, 10 ** (d - s))
    a, b = sf.oneway(base), sf.oneway(scaled)
    assert a.exact and b.exact
    assert b.ss_within_exact == a.ss_within_exact * Fraction(10) ** (2 * s)
    assert a.f == b.f and a.p == b.p
    if well_conditioned(base):
        event("float path compared")
        fa, fb = sf.oneway(base, exact=False), sf.oneway(scaled, exact=False)
        assert rel(fa.f, fb.f) <= 1e-12 and rel(fa.p, fb.p) <= 1e-12


@settings(max_examples=100)
@given(GROUP_INTS, DECIMALS)
def test_float_path_agrees_with_the_exact_path_on_well_conditioned_data(groups_int, d):
    assume(not_degenerate(groups_int))
    groups = as_floats(groups_int, 10**d)
    assume(well_conditioned(groups))
    a, b = sf.oneway(groups), sf.oneway(groups, exact=False)
    assert rel(a.f, b.f) <= 1e-12 and rel(a.p, b.p) <= 1e-12
    assert rel(a.ss_within, b.ss_within) <= 1e-12


@settings(max_examples=100)
@given(GROUP_INTS, DECIMALS)
def test_pooling_everything_equals_the_one_way_test(groups_int, d):
    assume(not_degenerate(groups_int))
    groups = as_floats(groups_int, 10**d)
    one = sf.oneway(groups)
    glt = sf.linear_test(groups, ["all"] * len(groups))
    assert glt.f == one.f and glt.p == one.p
    assert math.isclose(glt.ss_reduced, one.ss_total, rel_tol=1e-15)
