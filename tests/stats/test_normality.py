"""The normality test of the one-way residuals (sheetfuncs.stats.normality).

Sources are named beside each numeric check: NIST StRD datasets, scipy.stats.shapiro, and common
practice. The statistics themselves are checked on plain samples in
tests/distributions/test_normality.py, and against scipy on random groups in
tests/reference/test_scipy_alternatives.py.
"""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy import stats

from tests.support import nist
from tests.support.assumption_cases import (
    HEADS_WELL_BEHAVED, INTEGER_GROUPS, SMALL_GROUPS, assert_shift_invariant,
)
from sheetfuncs import InputError
from sheetfuncs.stats.normality import NormalityResult, shapiro_residuals


@pytest.mark.parametrize("family", [("SmLs01", "SmLs04", "SmLs07"), ("SmLs03", "SmLs06", "SmLs09")])
def test_nist_offsets_change_nothing(family):
    # source: NIST StRD SmLs datasets (the same values behind 1, 1e6 and 1e12 offsets)
    results = [shapiro_residuals(nist.load(name).groups) for name in family]
    assert results[0] == results[1] == results[2]


def test_nist_smls07_shapiro_equals_scipy_on_smls01():
    # source: scipy.stats.shapiro on the residuals of NIST StRD SmLs01 (small values); SmLs07
    # is the same data behind a 1e12 offset
    g1 = nist.load("SmLs01").groups
    resid = np.concatenate([np.asarray(v) - np.mean(v) for v in g1.values()])
    ref = stats.shapiro(resid)
    res = shapiro_residuals(nist.load("SmLs07").groups)
    assert res.statistic == pytest.approx(float(ref.statistic), abs=1e-8)
    assert res.p == pytest.approx(float(ref.pvalue), rel=1e-6)


def test_normality_too_few_residuals_and_all_zero():
    with pytest.raises(InputError, match=r"^sheetfuncs: only 2 residuals"):
        shapiro_residuals([[1, 2], [3]])
    with pytest.raises(InputError, match=r"^sheetfuncs: all residuals are zero"):
        shapiro_residuals([[1, 1], [3, 3, 3]])


def test_one_group_rejected():
    with pytest.raises(InputError, match=r"^sheetfuncs: at least two groups"):
        shapiro_residuals([[1, 2, 3]])


def test_table_is_ready_to_spill():
    nm = shapiro_residuals(HEADS_WELL_BEHAVED)
    assert nm.table() == [["Test", "Statistic", "n", "p"], ["Shapiro-Wilk (residuals)", nm.statistic, 39, nm.p]]
    assert isinstance(nm, NormalityResult)


@pytest.mark.parametrize("scale", [1e-200, 1e200])
def test_extreme_magnitudes(scale):
    # common practice: the test does not depend on the unit of measurement
    moved = [[v * scale for v in g] for g in SMALL_GROUPS]
    assert shapiro_residuals(moved).statistic == pytest.approx(shapiro_residuals(SMALL_GROUPS).statistic, rel=1e-12)


# --------------------------------------------------------------------------------------------
# properties (hypothesis, derandomised in conftest.py)


@settings(max_examples=50)
@given(INTEGER_GROUPS, st.integers(-10**6, 10**6))
def test_shift_invariance(gs, shift):
    # common practice: adding a constant to every value changes nothing in the test
    assert_shift_invariant(shapiro_residuals, gs, shift)
