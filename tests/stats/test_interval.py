"""sheetfuncs.stats.interval: the one interval type of every result."""

from __future__ import annotations

import dataclasses

import sheetfuncs as sf
from sheetfuncs.stats import Interval


def test_an_interval_is_a_pair_with_names():
    ci = Interval(1.5, 2.5)
    low, high = ci
    assert (low, high) == (ci.low, ci.high) == (1.5, 2.5)
    assert ci == (1.5, 2.5) and repr(ci) == "Interval(low=1.5, high=2.5)"


def test_every_interval_of_every_result_is_an_interval():
    # invented data: three filling heads
    heads = {"A": [1.0, 1.2, 0.9, 1.1], "B": [1.6, 1.4, 1.5, 1.7], "C": [1.0, 1.1, 1.2, 0.8]}
    found = []
    results = [
        sf.describe(heads).groups[0], sf.contrast(heads, [1, -0.5, -0.5]),
        sf.pairwise(heads).rows[0], sf.effect_sizes(heads), sf.variance_components(heads),
    ]
    for res in results:
        for f in dataclasses.fields(res):
            if f.name == "ci" or f.name.endswith("_ci"):
                found.append(f.name)
                assert isinstance(getattr(res, f.name), Interval), f.name
    assert len(found) == 10  # ci (3), eta_squared_ci, cohens_f_ci, lambda_ci, and four components
