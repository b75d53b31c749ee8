"""The one-way residuals of each group (sheetfuncs.stats.residuals).

Sources are named beside each numeric check: NIST StRD datasets with exact rational arithmetic
computed in the test, and common practice. Residuals on random data are compared with numpy in
tests/reference/test_scipy_alternatives.py.
"""

from __future__ import annotations

from fractions import Fraction

import pytest

from tests.support import nist
from sheetfuncs.stats.residuals import residuals


def test_residuals_exact_for_large_offsets():
    # source: NIST StRD SmLs07 group 1 as printed: 1000000000000.4, .3, .5, ... with mean
    # 1000000000000.4, so the residuals are the decimals 0, -0.1, 0.1, ...
    d = nist.load("SmLs07")
    first = residuals(d.groups)[0]
    expected = [float(Fraction(t) - sum(map(Fraction, d.text_values["1"])) / 21) for t in d.text_values["1"]]
    assert first.tolist() == expected


def test_a_group_of_one_value_has_a_zero_residual():
    # source: exact rational arithmetic (Python fractions) on the decimal values; a single
    # value is its own group mean (common practice)
    a = [12.5, 12.75, 12.0]
    res = residuals({"A": a, "B": [13.25]})
    assert res[1].tolist() == [0.0]
    mean = sum(map(Fraction, a)) / 3
    # each residual is two roundings from the exact one: (m - r) - (mean - r) around a value r
    assert res[0].tolist() == pytest.approx([float(Fraction(x) - mean) for x in a], rel=3e-16)
