"""oneway against scipy.stats.f_oneway (reference library) on random well-conditioned data.

Issue 2: at least 200 random datasets with unequal group sizes, F and p within 1e-10 relative.
Seeded, so every run checks the same datasets.
"""

from __future__ import annotations

import numpy as np
import pytest
from scipy import stats

import sheetfuncs as sf


def random_datasets(seed: int, count: int, decimals: int | None):
    """``count`` datasets: 2-8 groups of 2-40 values (sizes differ), means spread so that p
    ranges from about 1 down to far below 1e-10; rounded to ``decimals`` when given."""
    rng = np.random.default_rng(seed)
    out = []
    for _ in range(count):
        k = int(rng.integers(2, 9))
        while True:
            sizes = rng.integers(2, 41, size=k)
            if len(set(sizes.tolist())) > 1:
                break
        centre = rng.uniform(-50, 150)
        spread = 10.0 ** rng.uniform(-1.5, 1.0)
        shift = rng.normal(0, spread * 10.0 ** rng.uniform(-1.5, 0.7), size=k)
        groups = []
        for n, s in zip(sizes, shift):
            g = centre + s + rng.normal(0, spread, size=int(n))
            if decimals is not None:
                g = np.round(g, decimals)
            groups.append([float(v) for v in g])
        out.append(groups)
    return out


@pytest.mark.parametrize("decimals, exact", [(3, None), (None, None), (None, False), (2, False)])
def test_f_and_p_match_scipy_on_200_datasets(decimals, exact):
    # scipy.stats.f_oneway, F and p within 1e-10 relative, 200 seeded datasets per path
    datasets = random_datasets(seed=2024 + (decimals or 0), count=200, decimals=decimals)
    paths = set()
    small_p = 0
    for groups in datasets:
        ref = stats.f_oneway(*groups)
        res = sf.oneway(groups, exact=exact)
        paths.add(res.exact)
        assert res.f == pytest.approx(float(ref.statistic), rel=1e-10, abs=0)
        assert res.p == pytest.approx(float(ref.pvalue), rel=1e-10, abs=0)
        assert res.df_between == len(groups) - 1
        assert res.df_within == sum(map(len, groups)) - len(groups)
        small_p += res.p < 1e-10
    # the decimal data take the exact path, arbitrary doubles or exact=False the float path
    assert paths == {decimals is not None and exact is None}
    assert small_p >= 5  # the comparison covers far tails, not only p near 0.5


def test_group_means_match_numpy():
    # numpy.mean (reference library) per group, within 1e-13 relative
    for groups in random_datasets(seed=99, count=50, decimals=4):
        res = sf.oneway(groups)
        for m, g in zip(res.means, groups):
            assert m == pytest.approx(float(np.mean(g)), rel=1e-13)
