"""sheetfuncs.stats.centring: a round constant near the grand mean, and each value minus it,
exactly (the values the report's Audit sheet recomputes the figures from)."""

from __future__ import annotations

from decimal import Decimal

from hypothesis import given, strategies as st

from sheetfuncs import as_groups, oneway
from sheetfuncs.input import demo_groups
from sheetfuncs.stats import centred_values, centring_constant, compute_moments

from tests.support import nist


def test_centring_constant_is_round_and_near_the_mean():
    g = as_groups(nist.load("SmLs09").groups)
    mom = compute_moments(g)
    c = centring_constant(mom, oneway(g))
    assert c == Decimal("1000000000000.4")  # SmLs09 values are 1000000000000.2 ... .6 (NIST)
    g2 = demo_groups()
    assert centring_constant(compute_moments(g2), oneway(g2)) == Decimal("62")


@given(st.lists(st.integers(-10**12, 10**12), min_size=4, max_size=30), st.integers(0, 6),
       st.integers(-10**9, 10**9))
def test_centred_values_are_exact_decimal_differences(ints, scale, shift):
    # Reference: Python's decimal module (exact decimal arithmetic), common practice.
    vals = [float(Decimal(i + shift * 10**scale).scaleb(-scale)) for i in ints]
    half = len(vals) // 2
    g = as_groups({"a": vals[:half], "b": vals[half:]})
    mom = compute_moments(g)
    centre = Decimal(shift)
    for a in g.arrays:
        got = centred_values(a, mom, centre)
        want = [float(Decimal(repr(v)) - centre) for v in a.tolist()]
        assert got.tolist() == want


def test_centred_values_on_the_float_path():
    g = as_groups({"a": [0.1 + 0.2, 0.7 + 0.1, 1 / 3], "b": [2 / 3, 0.5, 0.25]})
    mom = compute_moments(g)
    assert not mom.exact
    centre = centring_constant(mom, oneway(g))
    assert float(centre) == float(centre).__round__()  # a whole number, held exactly
    for a in g.arrays:
        # the IEEE difference of two doubles is the exact difference rounded once
        want = [float(Decimal(v) - centre) for v in a.tolist()]
        assert centred_values(a, mom, centre).tolist() == want
