"""The shared quadrature of the maximum-type distributions (sheetfuncs.distributions.scale_mixture).

One grid shared by every argument of a call, the error guard and its fallback, and the checks
of the arguments both distributions share. Sources are named beside each numeric check:
scipy.stats.studentized_range (sf and ppf, in the body of the distribution, where scipy is
accurate) and scipy.stats.t (the range of two means is sqrt(2)|t|).
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy import stats

from sheetfuncs.distributions import scale_mixture
from sheetfuncs.errors import InputError
from sheetfuncs.distributions.studentized_range import range_critical, range_criticals, range_tail, range_tails

SQRT2 = math.sqrt(2.0)


def test_sharing_a_call_does_not_change_a_tail():
    # a tail computed with 40 others agrees with the same tail computed alone (no outside
    # source: both are our numbers; the agreement bounds the effect of sharing the grid)
    rng = np.random.default_rng(3)
    q = np.concatenate(([3.1], rng.uniform(0.01, 12.0, 40)))
    together = range_tails(q, 9, 17.0)
    assert together[0] == pytest.approx(range_tail(3.1, 9, 17.0), rel=1e-12)
    assert together[7] == pytest.approx(range_tail(float(q[7]), 9, 17.0), rel=1e-12)
    # and the family matches the reference in the body (source: scipy.stats.studentized_range)
    for i in (1, 2, 3):
        if together[i] > 1e-6:
            assert together[i] == pytest.approx(stats.studentized_range.sf(q[i], 9, 17.0), rel=1e-9)


def test_shared_argument_checks():
    # the statistics and degrees of freedom are checked once, for both distributions
    with pytest.raises(InputError, match="2 degrees of freedom were given for 3 statistics"):
        range_tails([1.0, 2.0, 3.0], 3, [5, 6])
    with pytest.raises(InputError, match="NaN"):
        range_tails([1.0, float("nan")], 3, 5)
    with pytest.raises(InputError, match="degrees of freedom must be positive"):
        range_criticals(0.05, 3, [5, 0])


# ------------------------------------------------------------------------------------------
# the error guard and its fallback


def test_a_rejected_sum_falls_back_to_the_adaptive_quadrature(monkeypatch):
    # source: scipy.stats.t.sf and studentized_range.sf; with the guard made impossible to
    # pass, every tail takes the adaptive Gauss-Kronrod path and must still be right
    monkeypatch.setattr(scale_mixture, "_GUARD", -1.0)
    got = range_tails([3.0, 40.0], 2, [7.0, 25.0])
    assert got == pytest.approx(2 * stats.t.sf(np.array([3.0, 40.0]) / SQRT2, [7.0, 25.0]), rel=1e-9)
    assert range_tail(3.5, 5, 20) == pytest.approx(stats.studentized_range.sf(3.5, 5, 20), rel=1e-9)
    assert range_critical(0.05, 3, 10) == pytest.approx(stats.studentized_range.ppf(0.95, 3, 10), rel=1e-9)


def test_a_too_coarse_first_step_is_refined(monkeypatch):
    # source: scipy.stats.t.sf; a first step far too coarse (the guard must notice and halve it)
    monkeypatch.setattr(scale_mixture, "_FIRST_STEP", 8.0)
    calls = []
    real = scale_mixture._evaluate

    def spy(*args):
        calls.append(1)
        return real(*args)

    monkeypatch.setattr(scale_mixture, "_evaluate", spy)
    got = range_tails([3.0, 40.0], 2, 300.0)
    assert len(calls) > 1  # refined at least once
    assert got == pytest.approx(2 * stats.t.sf(np.array([3.0, 40.0]) / SQRT2, 300.0), rel=1e-9)


def test_very_few_degrees_of_freedom_use_the_adaptive_quadrature():
    # source: scipy.stats.t.sf (df below the grid's range still answered correctly)
    assert range_tail(3.0, 2, 0.02) == pytest.approx(2 * stats.t.sf(3.0 / SQRT2, 0.02), rel=1e-9)
