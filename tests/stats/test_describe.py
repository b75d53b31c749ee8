"""sheetfuncs.stats.describe: per-group summaries against numpy and scipy (reference libraries)."""

from __future__ import annotations

import math
from fractions import Fraction

import numpy as np
import pytest
from scipy import stats

import sheetfuncs as sf
from sheetfuncs import InputError

LOTS = {  # invented calibration-material lot readings
    "Lot 11": [4.012, 4.018, 4.009, 4.015, 4.011],
    "Lot 12": [4.021, 4.019, 4.025],
    "Lot 13": [4.008, 4.006, 4.012, 4.010, 4.007, 4.009],
}


@pytest.mark.parametrize("exact", [None, False])
def test_summaries_match_numpy_and_scipy(exact):
    d = sf.describe(LOTS, exact=exact)
    assert [s.label for s in d] == list(LOTS) and len(d) == 3
    for s, values in zip(d, LOTS.values()):
        a = np.array(values)
        assert s.n == a.size
        assert s.mean == pytest.approx(float(a.mean()), rel=1e-15)
        assert s.sd == pytest.approx(float(a.std(ddof=1)), rel=1e-12)
        assert s.se == pytest.approx(float(stats.sem(a)), rel=1e-12)
        lo, hi = stats.t.interval(0.95, a.size - 1, loc=a.mean(), scale=stats.sem(a))
        assert s.ci.low == pytest.approx(lo, rel=1e-13) and s.ci.high == pytest.approx(hi, rel=1e-13)
        assert (s.min, s.median, s.max) == (a.min(), float(np.median(a)), a.max())


def test_table_layout():
    t = sf.describe(LOTS).table()
    assert t[0] == ["Group", "n", "Mean", "SD", "SE", "CI low", "CI high", "Min", "Median", "Max"]
    assert [row[0] for row in t[1:]] == list(LOTS)
    assert all(len(row) == 10 for row in t)


def test_lookup_by_label():
    d = sf.describe(LOTS)
    assert d["Lot 12"].n == 3
    with pytest.raises(KeyError):
        d["Lot 99"]


def test_confidence_level_99():
    # reference library: scipy.stats.t.interval at 99%
    d = sf.describe(LOTS, conf=0.99)
    a = np.array(LOTS["Lot 11"])
    lo, hi = stats.t.interval(0.99, a.size - 1, loc=a.mean(), scale=stats.sem(a))
    assert d["Lot 11"].ci.low == pytest.approx(lo, rel=1e-13)
    assert d.conf == 0.99


def test_group_of_one_value_has_no_sd():
    d = sf.describe({"A": [2.5], "B": [1.0, 2.0]})
    s = d["A"]
    assert s.n == 1 and s.mean == 2.5 and s.min == s.median == s.max == 2.5
    assert all(math.isnan(v) for v in (s.sd, s.se, s.ci.low, s.ci.high))


def test_sd_is_exact_for_values_with_shared_leading_digits():
    # values 1e12 + decimals: the SD from exact rationals (Python fractions) is sqrt(0.01)
    d = sf.describe({"A": [1e12 + 0.1, 1e12 + 0.2, 1e12 + 0.3]})
    vals = [Fraction("1000000000000.1"), Fraction("1000000000000.2"), Fraction("1000000000000.3")]
    m = sum(vals) / 3
    var = sum((v - m) ** 2 for v in vals) / 2
    assert var == Fraction(1, 100)
    assert d["A"].sd == pytest.approx(0.1, rel=1e-15)
    assert d.exact


@pytest.mark.parametrize("conf", [0, 1, 1.5, "95%", None, float("nan")])
def test_bad_confidence_level(conf):
    with pytest.raises(InputError, match="^sheetfuncs: the confidence level must"):
        sf.describe(LOTS, conf=conf)
