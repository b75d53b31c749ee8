"""The noncentral F distribution (sheetfuncs.distributions.noncentral_f): both tails, far out.

Sources are named beside each numeric check: mpmath (the Poisson-mixture series at 40 digits),
scipy.stats.f and scipy.special.ncfdtr.
"""

from __future__ import annotations

import mpmath
import numpy as np
import pytest
from scipy import special, stats

from sheetfuncs.distributions.noncentral_f import PATNAIK_FROM, ncf_cdf, ncf_sf


def _mp_ncf_sf(x: float, d1: float, d2: float, lam: float) -> float:
    """P(F' > x) as the Poisson mixture of central tails (Johnson, Kotz & Balakrishnan 1995,
    *Continuous Univariate Distributions* 2, ch. 30), summed with mpmath at 40 digits."""
    with mpmath.workdps(40):
        x, d1, d2, half = mpmath.mpf(x), mpmath.mpf(d1), mpmath.mpf(d2), mpmath.mpf(lam) / 2
        w = d2 / (d2 + d1 * x)  # tail of F(d1 + 2j, d2) at x is I_w(d2/2, d1/2 + j)
        total = mpmath.mpf(0)
        j = 0
        weight = mpmath.exp(-half)
        while True:
            term = weight * mpmath.betainc(d2 / 2, d1 / 2 + j, 0, w, regularized=True)
            total += term
            if j > half and weight < mpmath.mpf(10) ** -45:
                break
            j += 1
            weight *= half / j
        return float(total)


@pytest.mark.parametrize(
    "x,d1,d2,lam",
    [(2.7, 3, 36, 11.25), (8.0, 2, 12, 0.5), (40.0, 4, 20, 3.0), (1.2, 1, 100, 60.0), (3.0, 9, 90, 120.0)],
)
def test_ncf_tails_against_mpmath(x, d1, d2, lam):
    # reference library: mpmath (Poisson-mixture series, 40 digits)
    ref = _mp_ncf_sf(x, d1, d2, lam)
    assert ncf_sf(x, d1, d2, lam) == pytest.approx(ref, rel=1e-9)
    assert ncf_cdf(x, d1, d2, lam) == pytest.approx(1.0 - ref, rel=1e-9, abs=1e-15)


def test_far_upper_tail_is_relative_accurate():
    # reference library: mpmath; a survival function keeps relative accuracy where 1 - cdf is 0
    ref = _mp_ncf_sf(400.0, 3, 40, 2.0)
    assert ref < 1e-20
    assert ncf_sf(400.0, 3, 40, 2.0) == pytest.approx(ref, rel=1e-8)


def test_zero_noncentrality_is_the_central_f():
    # reference library: scipy.stats.f (scipy 1.17's ncf.sf is wrong exactly at nc = 0)
    assert ncf_sf(2.5, 3, 36, 0.0) == pytest.approx(stats.f.sf(2.5, 3, 36), rel=1e-13)
    assert ncf_cdf(2.5, 3, 36, 0.0) == pytest.approx(stats.f.cdf(2.5, 3, 36), rel=1e-13)


@pytest.mark.parametrize("d1,d2", [(1, 2), (3, 36), (9, 1000), (4, 50000)])
def test_patnaik_branch_joins_the_series_at_the_switch(d1, d2):
    # reference library: scipy.special.ncfdtr just above the switch point, where it is slow but exact
    lam = PATNAIK_FROM * 1.5
    for x in np.linspace(0.8, 1.2, 5) * (d1 + lam) / d1:
        assert ncf_cdf(float(x), d1, d2, lam) == pytest.approx(
            float(special.ncfdtr(d1, d2, lam, x)), abs=1e-9
        )
