"""Tests of the public API (sheetfuncs/__init__.py): every analysis that takes group data accepts
``missing=`` and ``relabel=`` in one way, passed to ``as_groups``.

No check here needs an outside source: each result is compared with the same function's result
on the cleaned data (common practice: a missing value left out is a value never measured). The
fill weights are invented for these tests.
"""

from __future__ import annotations

import dataclasses
import inspect
import math
from fractions import Fraction
from typing import Any

import numpy as np
import pytest

import sheetfuncs as sf

#: Invented fill weights (g) of three filling heads, with missing values as a pandas user has
#: them: NaN in a float array, None in a list.
DIRTY = {
    "Head 1": np.array([50.2, 50.4, np.nan, 50.1, 50.3, 50.6]),
    "Head 2": [50.9, None, 50.7, 51.0, None, 50.8],
    "Head 3": [50.5, 50.2, 50.6, 50.4, 50.3, 50.1],
}
CLEAN = {
    "Head 1": [50.2, 50.4, 50.1, 50.3, 50.6],
    "Head 2": [50.9, 50.7, 51.0, 50.8],
    "Head 3": [50.5, 50.2, 50.6, 50.4, 50.3, 50.1],
}
DROPPED = (1, 2, 0)

#: Every public analysis that takes group data, with its other arguments.
CALLS: dict[str, tuple[Any, dict[str, Any]]] = {
    "oneway": (sf.oneway, {}),
    "describe": (sf.describe, {}),
    "welch": (sf.welch, {}),
    "brown_forsythe": (sf.brown_forsythe, {}),
    "kruskal": (sf.kruskal, {}),
    "levene": (sf.levene, {}),
    "bartlett": (sf.bartlett, {}),
    "shapiro_residuals": (sf.shapiro_residuals, {}),
    "checks": (sf.checks, {}),
    "pairwise": (sf.pairwise, {}),
    "dunnett": (sf.dunnett, {"control": "Head 1"}),
    "letters": (sf.letters, {}),
    "effect_sizes": (sf.effect_sizes, {}),
    "variance_components": (sf.variance_components, {}),
    "linear_test": (sf.linear_test, {"pooling": ["a", "a", "b"]}),
    "contrast": (sf.contrast, {"weights": [1, -0.5, -0.5]}),
}
#: The results that hold each group's count, and so record the values dropped from each.
RECORDS_DROPPED = {"oneway", "describe", "pairwise", "dunnett"}


def plain(x: Any) -> Any:
    """A result as plain values to compare, without its ``dropped`` record."""
    if dataclasses.is_dataclass(x):
        return {f.name: plain(getattr(x, f.name)) for f in dataclasses.fields(x) if f.name != "dropped"}
    if isinstance(x, (tuple, list)):
        return [plain(v) for v in x]
    if isinstance(x, np.ndarray):
        return plain(x.tolist())
    if isinstance(x, dict):
        return {k: plain(v) for k, v in x.items()}
    if isinstance(x, float) and math.isnan(x):
        return "nan"
    return x


def test_every_public_analysis_of_groups_takes_missing_and_relabel():
    takes_groups = {
        name for name in sf.__all__
        if callable(obj := getattr(sf, name)) and not inspect.isclass(obj)
        and next(iter(inspect.signature(obj).parameters), None) == "groups"
    }
    assert takes_groups == set(CALLS)
    for name in takes_groups:
        params = inspect.signature(getattr(sf, name)).parameters
        assert params["missing"].default == "stop" and params["missing"].kind is inspect.Parameter.KEYWORD_ONLY
        assert params["relabel"].default is None and params["relabel"].kind is inspect.Parameter.KEYWORD_ONLY


@pytest.mark.parametrize("name", sorted(CALLS))
def test_missing_drop_gives_the_result_of_the_cleaned_data(name):
    fn, kwargs = CALLS[name]
    dropped = fn(DIRTY, missing="drop", **kwargs)
    clean = fn(CLEAN, **kwargs)
    assert plain(dropped) == plain(clean)
    if name in RECORDS_DROPPED:
        assert dropped.dropped == DROPPED and clean.dropped == (0, 0, 0)


@pytest.mark.parametrize("name", sorted(CALLS))
def test_missing_stop_is_the_default_and_names_the_value(name):
    fn, kwargs = CALLS[name]
    with pytest.raises(sf.InputError) as e:
        fn(DIRTY, **kwargs)
    assert str(e.value) == (
        'sheetfuncs: NaN (not a number) at position 3 of group "Head 1"; remove it, or pass '
        'missing="drop" to leave missing values out'
    )


@pytest.mark.parametrize("name", sorted(CALLS))
def test_relabel_gives_the_result_of_the_relabelled_data(name):
    fn, kwargs = CALLS[name]
    typo = {"Head 1": CLEAN["Head 1"], "Head 2": CLEAN["Head 2"][:2], "head 2": CLEAN["Head 2"][2:],
            "Head 3": CLEAN["Head 3"]}
    fixed = fn(typo, relabel={"head 2": "Head 2"}, **kwargs)
    assert plain(fixed) == plain(fn(CLEAN, **kwargs))


def test_a_groups_object_keeps_its_own_dropped_counts():
    g = sf.as_groups(DIRTY, missing="drop")
    res = sf.oneway(g)
    assert res.dropped == DROPPED and res.counts == (5, 4, 6)
    assert sf.describe(g).dropped == DROPPED
    assert sf.pairwise(g, missing="stop").dropped == DROPPED
    # the exact sums of squares (common practice: the exact path is used for typed decimals)
    assert res.exact and isinstance(res.ss_within_exact, Fraction)


def test_results_from_summaries_record_no_dropped_values():
    res = sf.oneway_from_summary([3, 3], [1.0, 2.0], [0.5, 0.5], labels=["A", "B"])
    assert res.dropped == (0, 0)
