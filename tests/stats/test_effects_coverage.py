"""Coverage of the effect-size intervals by a seeded simulation (sheetfuncs.stats.effects).

For normal data with a true noncentrality lambda > 0 the equal-tailed noncentral-F inversion
(Steiger 2004) misses on each side with probability (1 - conf)/2 exactly, so over 2,000
simulated datasets the observed coverage must lie within three binomial standard errors of the
nominal level (common practice for Monte Carlo checks).
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from sheetfuncs.stats.effects import effect_sizes

REPS = 2000


def _se(p: float, reps: int = REPS) -> float:
    return math.sqrt(p * (1.0 - p) / reps)


@pytest.mark.parametrize(
    "seed,means,sizes,conf",
    [
        # balanced, true lambda = 10 * sum((mu - mean)^2) = 12.5
        (20240601, (0.0, 0.5, 1.0, 1.5), (10, 10, 10, 10), 0.95),
        # unbalanced, 90% intervals
        (20240602, (0.0, 0.0, 0.8), (6, 9, 12), 0.90),
    ],
)
def test_coverage_within_three_standard_errors(seed, means, sizes, conf):
    rng = np.random.default_rng(seed)
    mu = np.repeat(np.asarray(means, dtype=float), sizes)
    n_total = mu.size
    grand = mu.mean()
    lam = float(((mu - grand) ** 2).sum())  # sigma = 1: lambda = sum n_i (mu_i - mu)^2 / sigma^2
    eta_true = lam / (lam + n_total)
    f_true = math.sqrt(lam / n_total)
    # draw every dataset at once (vectorised), then split into groups
    draws = mu[None, :] + rng.standard_normal((REPS, n_total))
    cuts = np.cumsum(sizes)[:-1]

    eta_hits = f_hits = below = above = 0
    for row in draws:
        e = effect_sizes(np.split(row, cuts), conf=conf)
        lo, hi = e.lambda_ci
        below += lam < lo
        above += lam > hi
        eta_hits += e.eta_squared_ci[0] <= eta_true <= e.eta_squared_ci[1]
        f_hits += e.cohens_f_ci[0] <= f_true <= e.cohens_f_ci[1]

    tail = (1.0 - conf) / 2.0
    for hits in (eta_hits, f_hits):
        assert abs(hits / REPS - conf) <= 3 * _se(conf), (hits / REPS, conf)
    # each tail on its own misses with probability (1 - conf) / 2
    assert abs(below / REPS - tail) <= 3 * _se(tail)
    assert abs(above / REPS - tail) <= 3 * _se(tail)
