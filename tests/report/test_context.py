"""The report's context: one analysis with the report's names, the decimals figures are shown
with, and the Audit sheet's centring constant and centred values (exact decimal differences).

The centring itself is :mod:`sheetfuncs.stats.centring`; it is checked here because the report
is what shows it.
"""

from __future__ import annotations

from decimal import Decimal

import numpy as np
from hypothesis import given, strategies as st

from sheetfuncs import as_groups, oneway
from sheetfuncs.input.demo import demo_groups
from sheetfuncs.report.context import prepare
from sheetfuncs.stats import centred_values, centring_constant
from sheetfuncs.stats.moments import compute_moments

from tests.support import nist


def test_float_path_decimals_follow_the_spread():
    # invented: formula-result weights (g) around 250 with SD about 2: decimals from the SD,
    # two more for means (common practice), not a fixed four
    rng = np.random.default_rng(3)
    g = {f"Cell {i}": (250 + 2 * rng.standard_normal(8)).tolist() for i in range(3)}
    an = prepare(g)
    assert not an.exact
    assert an.precision.value == 2 and an.precision.mean == 4


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
