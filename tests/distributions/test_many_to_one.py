"""Dunnett's many-to-one t (sheetfuncs.distributions.many_to_one): tails and critical values.

Sources are named beside each numeric check: scipy.stats.t (one comparison with a control is a
t test), mpmath quadrature of Dunnett's (1955) one-dimensional form, and Dunnett's table
recalled from memory (marked so).
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy import stats

from sheetfuncs.errors import InputError
from sheetfuncs.distributions.many_to_one import many_to_one_critical, many_to_one_tail, many_to_one_tails
from tests.support.mpmath_refs import many_to_one_normal  # mpmath reference (Dunnett 1955 reduction)


# ------------------------------------------------------------------------------------------
# one argument


@pytest.mark.parametrize(
    "h,lam",
    [(2.2, [0.5 ** 0.5] * 3), (7.0, [0.5 ** 0.5] * 2), (5.5, [0.95, 0.2, 0.6])],
)
def test_many_to_one_known_variance_matches_mpmath(h, lam):
    # source: mpmath quadrature of Dunnett's (1955) one-dimensional form
    assert many_to_one_tail(h, lam, math.inf) == pytest.approx(many_to_one_normal(h, lam), rel=1e-10)


@pytest.mark.parametrize("m,table", [(1, 1.96), (2, 2.21), (3, 2.35), (4, 2.44), (5, 2.51)])
def test_dunnett_critical_values_agree_with_published_table(m, table):
    # source: Dunnett's two-sided 5% table, equal group sizes, infinite df, from memory
    assert many_to_one_critical(0.05, [0.5 ** 0.5] * m, math.inf) == pytest.approx(table, abs=6e-3)


def test_many_to_one_critical_values_invert_the_tails():
    lam = [0.6, 0.7, 0.8]
    c = many_to_one_critical(0.01, lam, 23)
    assert many_to_one_tail(c, lam, 23) == pytest.approx(0.01, rel=1e-9)


def test_many_to_one_arguments_are_checked():
    with pytest.raises(InputError, match=r"\[0, 1\)"):
        many_to_one_tail(2.0, [1.0], 10)


# ------------------------------------------------------------------------------------------
# many arguments in one call


def test_many_to_one_tails_of_one_treatment_are_t_tails():
    # source: scipy.stats.t.sf; one comparison with the control is an ordinary t test.
    # 0.95 puts a step of q_j inside a panel (the finer panels are used).
    c = np.array([0.3, 2.0, 6.0, 20.0, 45.0])
    for lam in (0.3, 0.95):
        for df in (2.0, 23.0, 4000.0):
            got = many_to_one_tails(c, [lam], df)
            assert got == pytest.approx(2 * stats.t.sf(c, df), rel=1e-9)


def test_many_to_one_with_repeated_factors_matches_mpmath():
    # source: mpmath quadrature of Dunnett's (1955) one-dimensional form; equal factors are
    # grouped internally, which must not change the result
    lam = [0.6, 0.6, 0.75]
    h = np.array([1.5, 4.0])
    got = many_to_one_tails(h, lam, math.inf)
    for hi, p in zip(h, got):
        assert p == pytest.approx(many_to_one_normal(float(hi), lam), rel=1e-10)


def test_many_to_one_critical_values_far_out_invert_the_t_tail():
    # source: scipy.stats.t.isf; one treatment against the control reduces to t
    for alpha, df in ((1e-8, 1.0), (1e-6, 3.5), (1e-4, 1e4)):
        assert many_to_one_critical(alpha, [0.8], df) == pytest.approx(stats.t.isf(alpha / 2, df), rel=1e-10)


def test_many_to_one_vector_edges():
    # common practice: the two-sided tail is symmetric in the statistic
    assert many_to_one_tails([-2.5], [0.7, 0.7], 12)[0] == many_to_one_tail(2.5, [0.7, 0.7], 12)
