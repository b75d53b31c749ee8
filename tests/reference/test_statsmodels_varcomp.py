"""Variance components against statsmodels' MixedLM fitted by REML on balanced data.

Reference library: ``statsmodels.regression.mixed_linear_model.MixedLM`` (random intercept per
group, REML). For balanced data with a positive between-group estimate the REML estimates equal
the ANOVA estimators (Searle, Casella & McCulloch 1992, ch. 6), so the two must agree; the
acceptance level is 1e-4 relative. The fit uses BFGS with a tight gradient tolerance so that
the optimiser's own stopping error stays far below that level.
"""

from __future__ import annotations

import warnings

import numpy as np
import pytest
import statsmodels.api as sm

from sheetfuncs.stats.varcomp import variance_components


def _reml(y: np.ndarray) -> tuple[float, float]:
    k, n = y.shape
    groups = np.repeat(np.arange(k), n)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")  # convergence chatter from the tight tolerance
        fit = sm.MixedLM(y.ravel(), np.ones((k * n, 1)), groups=groups).fit(
            reml=True, method="bfgs", gtol=1e-12
        )
    return float(np.asarray(fit.cov_re)[0, 0]), float(fit.scale)


@pytest.mark.parametrize(
    "seed,k,n,sd_between,sd_within",
    [
        (20240605, 6, 5, 2.0, 1.0),
        (20240606, 8, 4, 1.5, 1.0),
        (20240607, 12, 6, 3.0, 0.5),
        (20240608, 5, 10, 1.0, 1.0),
    ],
)
def test_reml_agrees_on_balanced_data(seed, k, n, sd_between, sd_within):
    rng = np.random.default_rng(seed)
    y = 50.0 + rng.normal(0, sd_between, (k, 1)) + rng.normal(0, sd_within, (k, n))
    v = variance_components(list(y))
    assert v.between_raw > 0.2 * v.within  # a clearly positive between component
    between, within = _reml(y)
    assert v.between == pytest.approx(between, rel=1e-4)
    assert v.within == pytest.approx(within, rel=1e-4)
    assert v.icc == pytest.approx(between / (between + within), rel=1e-4)
