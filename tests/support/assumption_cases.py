"""Invented data sets (numbers made up for the tests) and checks shared by the tests of the
assumption checks: equal variances, normal residuals and the checks' reading rule."""

from __future__ import annotations

from collections.abc import Callable
from typing import Any

import pytest
from hypothesis import strategies as st

from sheetfuncs import InputError

#: Invented: fill weights (g) of four filling heads, ten fills each; head 4's SD is four times
#: the others' (0.4 g against 1.6 g).
HEADS_UNEQUAL = {
    "Head 1": [499.54, 499.77, 499.92, 500.04, 500.15, 500.25, 500.36, 500.48, 500.63, 500.86],
    "Head 2": [499.84, 500.07, 500.22, 500.34, 500.45, 500.55, 500.66, 500.78, 500.93, 501.16],
    "Head 3": [499.44, 499.67, 499.82, 499.94, 500.05, 500.15, 500.26, 500.38, 500.53, 500.76],
    "Head 4": [497.67, 498.60, 499.18, 499.66, 500.09, 500.51, 500.94, 501.42, 502.00, 502.93],
}

#: Invented: fill weights (g) of four heads with similar spreads and normal-looking scatter.
HEADS_WELL_BEHAVED = {
    "Head 1": [499.43, 499.74, 499.95, 500.12, 500.28, 500.45, 500.66, 500.97],
    "Head 2": [500.08, 500.37, 500.55, 500.70, 500.83, 500.97, 501.10, 501.25, 501.43, 501.72],
    "Head 3": [499.24, 499.51, 499.68, 499.82, 499.94, 500.05, 500.15, 500.26, 500.38, 500.52,
               500.69, 500.96],
    "Head 4": [499.50, 499.80, 499.99, 500.15, 500.30, 500.45, 500.61, 500.80, 501.10],
}

#: Invented: hardness (Shore A) in four cure-oven zones, six parts each; every zone has one
#: part far above the rest, so the residuals are strongly skewed while the spreads match.
ZONES_SKEWED = {
    "Zone 1": [61.0, 61.1, 61.2, 61.2, 61.3, 63.5],
    "Zone 2": [61.4, 61.5, 61.6, 61.6, 61.7, 63.9],
    "Zone 3": [62.9, 63.0, 63.1, 63.1, 63.2, 65.4],
    "Zone 4": [61.2, 61.3, 61.4, 61.4, 61.5, 63.7],
}

_SKEW15 = [0, 0.1, 0.1, 0.2, 0.2, 0.2, 0.3, 0.3, 0.3, 0.4, 0.4, 0.5, 0.5, 0.6, 3.5]
#: Invented: the same kind of skew with fifteen parts per zone.
ZONES_SKEWED_15 = {
    f"Zone {j + 1}": [round(m + v, 2) for v in _SKEW15] for j, m in enumerate([61.0, 61.4, 62.9, 61.2])
}

#: Invented: three small groups for the checks that the tests do not depend on the unit.
SMALL_GROUPS = [[1.0, 2.0, 4.0, 3.5], [1.0, 3.0, 2.5], [6.0, 4.0, 5.0, 5.5]]

#: Groups of whole numbers for the property tests (hypothesis, derandomised in conftest.py).
INTEGER_GROUPS = st.lists(st.lists(st.integers(-60, 60), min_size=2, max_size=9), min_size=2, max_size=5)


def assert_shift_invariant(fn: Callable[[Any], Any], gs: list[list[int]], shift: int) -> None:
    """Common practice: adding a constant to every value changes nothing in a test of spread or
    shape; ``fn`` gives the same statistic on the moved groups, or refuses both."""
    moved = [[v + shift for v in g] for g in gs]
    try:
        a = fn(gs)
    except InputError:
        with pytest.raises(InputError):
            fn(moved)
        return
    b = fn(moved)
    assert b.statistic == pytest.approx(a.statistic, rel=1e-9, abs=1e-12)
