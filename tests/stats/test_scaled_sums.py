"""sheetfuncs.stats.scaled_sums: exact chunked sums of scaled integers.

Reference: exact integer arithmetic (Python fractions and integers) on the shortest round-trip
decimals of the values, ``Fraction(repr(x))``: common practice, and the exact path's definition
(engineering guide, Numbers).
"""

from __future__ import annotations

from fractions import Fraction

import numpy as np
import pytest

from sheetfuncs.stats import scaled_sums as scaled_sums_module
from sheetfuncs.stats.scaled_sums import DOT_ROW, EXACT_CHUNK, MAX_VECTOR_SCALE, dot_rows, scaled_sums


def reference(values, scale: int, offset: int) -> tuple[int, int, int, list[float]]:
    """Count, sum and sum of squares of ``value * 10**scale - offset`` over the values whose
    shortest decimal has at most ``scale`` decimals and 15 digits, exactly; and the others
    (which must be left to be read one by one)."""
    s = q = 0
    left = []
    for v in values:
        f = Fraction(repr(float(v))) * 10**scale
        digits = len(repr(abs(f.numerator)).rstrip("0") or "0")
        if f.denominator != 1 or digits > 15:
            left.append(float(v))
            continue
        m = f.numerator - offset
        s, q = s + m, q + m * m
    return len(values), s, q, left


def check_group(values, scale: int, offset: int, got: tuple[int, int, int, list[float]]) -> None:
    """The sums equal the reference over the values not left over; the values that cannot be
    scaled are all left over (scaled integers of 2**53 or more may be left over as well, for
    the one-by-one reading, which is exact)."""
    n, s, q, left = got
    used = list(values)
    for v in left:
        used.remove(v)
    assert reference(used, scale, offset)[:3] == (len(used), s, q)
    assert n == len(values)
    rest = list(left)
    for v in reference(values, scale, offset)[3]:
        rest.remove(v)  # a ValueError if a value that cannot be scaled was summed
    assert all(abs(v) * 10**scale >= 2**53 for v in rest), rest


def awkward_group(rng: np.random.Generator, n: int) -> np.ndarray:
    """Decimal data of one random kind, with a few awkward values mixed in."""
    kind = rng.integers(0, 5)
    d = int(rng.integers(0, 7))
    if kind == 0:  # typed data near a large level: uncentred squares too wide
        a = np.round(rng.normal(10.0 ** rng.integers(3, 11), 5.0, n), d)
    elif kind == 1:  # integers near 2**53
        a = (2**53 - rng.integers(1, 10**6, n)).astype(np.float64)
    elif kind == 2:  # small values and zeros of both signs
        a = np.round(rng.uniform(-1, 1, n), d)
        a[rng.integers(0, n, 3)] = [0.0, -0.0, -0.0]
    elif kind == 3:  # a wide range: huge and tiny magnitudes together
        a = np.round(rng.normal(0, 1, n), d) * 10.0 ** rng.integers(-3, 13, n)
    else:  # typical three-decimal measurements
        a = np.round(rng.normal(250, 4, n), 3)
    if n > 3:  # values with more decimals or digits than the scale admits
        a[rng.integers(0, n, 2)] = [0.1 + 0.2, 1 / 3]
    return a


@pytest.mark.parametrize("seed", range(6))
def test_sums_equal_integer_arithmetic_on_awkward_values(seed):
    # common practice: exact integer arithmetic on Fraction(repr(x)) as the reference
    rng = np.random.default_rng(seed)
    sizes = [1, 2, 8191, EXACT_CHUNK + 8193]  # across dot rows and chunks
    arrays = [awkward_group(rng, int(rng.choice(sizes))) for _ in range(3)]
    scale = int(rng.integers(0, 8))
    offset = int(rng.integers(-10**9, 10**9)) * int(rng.choice([0, 1, 10**4]))
    ns, ss, qs, left = scaled_sums(arrays, scale, offset)
    for g, a in enumerate(arrays):
        check_group(a.tolist(), scale, offset, (ns[g], ss[g], qs[g], left[g]))


def test_uncentred_and_centred_chunks_add_up_in_one_group():
    # common practice: sum (r - c) = sum r - n c and sum (r - c)^2 = sum r^2 - 2 c sum r + n c^2
    small = np.round(np.linspace(-2.0, 2.0, EXACT_CHUNK), 3)  # uncentred squares fit
    wide = np.round(np.linspace(9.0e5, 9.1e5, EXACT_CHUNK), 3)  # centring needed
    a = np.concatenate([small, wide, small[:100]])
    offset = 905_000_000
    ns, ss, qs, left = scaled_sums([a], 3, offset)
    n, s, q, rest = reference(a.tolist(), 3, offset)
    assert (ns[0], ss[0], qs[0], left[0]) == (n, s, q, rest)


def test_sixteen_digit_scaled_values_need_trailing_zeros():
    # common practice: 1234567890123450 has 15 significant digits, 1234567890123451 has 16
    a = np.array([1234567890123450.0, 1234567890123451.0, 5.0] * 3)
    ns, ss, qs, left = scaled_sums([a], 0, 0)
    assert sorted(left[0]) == [1234567890123451.0] * 3
    assert (ss[0], qs[0]) == reference(a.tolist(), 0, 0)[1:3]


def test_a_scale_beyond_22_decimals_leaves_every_value_to_be_read_one_by_one():
    # common practice: 10.0**23 is not exact, so nothing is scaled in floats
    a = np.array([1e-23, 2e-23])
    assert scaled_sums([a], MAX_VECTOR_SCALE + 1, 0) == ([2], [0], [0], [[1e-23, 2e-23]])


@pytest.mark.parametrize("scale", [0, 3])
def test_squares_just_past_two_to_the_53_are_still_exact(scale):
    # common practice: above 2**53 a double holds only even integers, so a float sum of odd
    # squares whose total passes 2**53 drops units; the sums must come out exact all the same
    rng = np.random.default_rng(4)  # a float dot product of these squares is 1 unit off
    r = rng.integers(1_000_000, 1_200_000, 8192)  # 8192 squares sum to about 1.1 * 2**53
    a = r / 10.0**scale
    got = scaled_sums([a, a[:5]], scale, 0)
    for g, values in enumerate([a, a[:5]]):
        check_group(values.tolist(), scale, 0, tuple(x[g] for x in got))
    assert got[2][0] == sum(int(v) ** 2 for v in r) and got[3][0] == []


def test_numpy_without_vecdot_gives_the_same_sums(monkeypatch):
    # the in-memory sheetfuncs call with numpy 2's vecdot as the reference: numpy 1.x has none,
    # and each run of DOT_ROW values then takes its own dot product
    rng = np.random.default_rng(11)
    arrays = [np.round(rng.normal(250, 4, n), 3) for n in (5, DOT_ROW, 3 * DOT_ROW + 7)]
    arrays.append(np.round(rng.normal(9e5, 4, EXACT_CHUNK + 9), 3))  # centred sums
    with_vecdot = scaled_sums(arrays, 3, 250_000)
    monkeypatch.setattr(scaled_sums_module, "_VECDOT", None)
    assert scaled_sums(arrays, 3, 250_000) == with_vecdot
    assert dot_rows(arrays[2]) == pytest.approx(
        [float(np.dot(arrays[2][i : i + DOT_ROW], arrays[2][i : i + DOT_ROW]))
         for i in range(0, arrays[2].size, DOT_ROW)], rel=1e-15)
