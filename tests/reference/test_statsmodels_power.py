"""Power, sample size and detectable effect side by side with statsmodels' FTestAnovaPower.

Reference library: ``statsmodels.stats.power.FTestAnovaPower`` (noncentral F with
nc = f^2 nobs and df (k_groups - 1, nobs - k_groups), the same balanced one-way model).
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from statsmodels.stats.power import FTestAnovaPower

from sheetfuncs.stats.planning import detectable_effect, power, sample_size

RNG = np.random.default_rng(20240603)
CASES = [
    (int(RNG.integers(2, 9)), int(RNG.integers(2, 60)), float(RNG.uniform(0.08, 1.2)),
     float(RNG.choice([0.01, 0.05, 0.1])))
    for _ in range(12)
]


@pytest.mark.parametrize("k,n,f,alpha", CASES)
def test_power_agrees(k, n, f, alpha):
    ref = FTestAnovaPower().power(effect_size=f, nobs=k * n, alpha=alpha, k_groups=k)
    assert power(k, n, f, alpha) == pytest.approx(ref, rel=1e-9, abs=1e-12)


@pytest.mark.parametrize("k,n,f,alpha", CASES)
def test_sample_size_is_the_ceiling_of_the_continuous_solution(k, n, f, alpha):
    target = 0.8
    nobs = FTestAnovaPower().solve_power(effect_size=f, nobs=None, alpha=alpha, power=target, k_groups=k)
    per_group = float(np.squeeze(nobs)) / k
    ours = sample_size(k, f, target, alpha)
    if per_group <= 2:
        assert ours == 2
    else:
        assert ours == math.ceil(per_group - 1e-7)


@pytest.mark.parametrize("k,n,f,alpha", CASES)
def test_detectable_effect_agrees(k, n, f, alpha):
    target = 0.9
    ref = FTestAnovaPower().solve_power(effect_size=None, nobs=k * n, alpha=alpha, power=target, k_groups=k)
    assert detectable_effect(k, n, target, alpha) == pytest.approx(float(np.squeeze(ref)), rel=1e-6)
