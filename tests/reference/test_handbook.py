"""NIST/SEMATECH e-Handbook of Statistical Methods, section 7.4.3: the one-way example.

Three levels of a factor with five observations each. Published figures (issue 2 quotes them):
SS treatments 27.897 (df 2), SS error 17.452 (df 12), SS total 45.349 (df 14), MSE 1.454,
F 9.59. The MS for treatments (13.949), the level means and the 5% critical value 3.89 are the
handbook's too, from memory. The data (from memory; they reproduce every published figure
below at its rounding):

    Level 1: 6.9 5.4 5.8 4.6 4.0      Level 2: 8.3 6.8 7.8 9.2 6.5
    Level 3: 8.0 10.5 8.1 6.9 9.3
"""

from __future__ import annotations

from fractions import Fraction

import pytest

import sheetfuncs as sf

DATA = {
    "1": [6.9, 5.4, 5.8, 4.6, 4.0],
    "2": [8.3, 6.8, 7.8, 9.2, 6.5],
    "3": [8.0, 10.5, 8.1, 6.9, 9.3],
}


def rounds_to(value: float, published: str) -> bool:
    """True when value rounds to the published figure at the published number of decimals."""
    decimals = len(published.split(".")[1]) if "." in published else 0
    return round(value, decimals) == float(published)


@pytest.mark.parametrize("exact", [None, False])
def test_handbook_one_way_table(exact):
    # NIST/SEMATECH e-Handbook section 7.4.3, published at three decimals (F at two)
    r = sf.oneway(DATA, exact=exact)
    assert (r.df_between, r.df_within, r.df_total) == (2, 12, 14)
    assert rounds_to(r.ss_between, "27.897")
    assert rounds_to(r.ss_within, "17.452")
    assert rounds_to(r.ss_total, "45.349")
    assert rounds_to(r.ms_between, "13.949")  # from memory
    assert rounds_to(r.ms_within, "1.454")
    assert rounds_to(r.f, "9.59")


def test_handbook_group_means():
    # NIST/SEMATECH e-Handbook section 7.4.3 (from memory): level means 5.34, 7.72, 8.56,
    # grand mean 7.2067
    r = sf.oneway(DATA)
    assert [round(m, 2) for m in r.means] == [5.34, 7.72, 8.56]
    grand = sum(c * m for c, m in zip(r.counts, r.means)) / r.n_total
    assert round(grand, 4) == 7.2067


def test_handbook_exact_rationals():
    # the handbook's sums of squares are decimals: SSE = 17.452 exactly and
    # SS total = 45.349333... = 136048/3000 (exact rational arithmetic, Python fractions)
    r = sf.oneway(DATA)
    assert r.exact
    assert r.ss_within_exact == Fraction("17.452")
    assert r.ss_total_exact == Fraction(136048, 3000)
    assert r.ss_between_exact == Fraction(136048, 3000) - Fraction("17.452")


def test_handbook_significance():
    # NIST/SEMATECH e-Handbook section 7.4.3 (from memory): F = 9.59 exceeds the 5% critical
    # value F(0.05; 2, 12) = 3.89, so the level means differ
    r = sf.oneway(DATA)
    assert round(sf.f_critical(0.05, 2, 12), 2) == 3.89
    assert r.f > sf.f_critical(0.05, 2, 12)
    assert r.p < 0.05
