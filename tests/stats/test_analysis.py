"""sheetfuncs.stats.analysis: every result computed once, for every front."""

from __future__ import annotations

import pytest

import sheetfuncs as sf
from sheetfuncs.stats import Unavailable, analyse

# Invented data: fill weights (g) from three filling heads; head 3 spreads much more.
HEADS = {
    "Head 1": [502.1, 501.8, 502.4, 501.9, 502.0, 502.2],
    "Head 2": [502.6, 502.9, 502.5, 502.8, 503.0, 502.7],
    "Head 3": [500.7, 503.0, 501.6, 504.9, 499.8, 502.3],
}


def test_every_result_equals_its_own_call():
    # common practice: the one analysis must give what each core call gives on its own
    an = analyse(HEADS, alpha=0.05, method="holm", control="Head 1")
    assert an.oneway == sf.oneway(HEADS)
    assert an.describe == sf.describe(HEADS, 0.95)
    assert an.checks == sf.checks(HEADS, 0.05)
    assert an.effects == sf.effect_sizes(HEADS, 0.95)
    assert an.pairwise == sf.pairwise(HEADS, "holm", 0.05)
    assert an.dunnett == sf.dunnett(HEADS, "Head 1", 0.05)
    assert dict(an.letters) == dict(sf.letters(HEADS, "holm", 0.05))
    assert an.method_name == "Holm" and an.conf == 0.95 and an.control == "Head 1"


def test_results_are_shared_not_recomputed():
    an = analyse(HEADS)
    assert an.checks.oneway is an.oneway  # the checks reuse the one-way result
    assert an.letters.comparisons is an.pairwise  # the letters' own comparisons are shown
    assert an.welch is an.checks.welch and an.kruskal is an.checks.kruskal


def test_games_howell_alongside_when_spreads_differ():
    an = analyse(HEADS)
    assert an.checks.variances_unequal
    assert an.unequal_pairs == sf.pairwise(HEADS, "games-howell", 0.05)
    assert analyse(HEADS, method="games-howell").unequal_pairs is None


def test_an_analysis_that_cannot_run_is_unavailable_with_its_reason():
    one = {"A": [1.0, 2.0, 3.0], "B": [5.0]}
    an = analyse(one)
    assert isinstance(an.welch, Unavailable) and not an.welch
    assert "only one value" in an.welch.reason


def test_bad_options_and_an_impossible_oneway_are_input_errors():
    with pytest.raises(sf.InputError, match="alpha"):
        analyse(HEADS, alpha=2)
    with pytest.raises(sf.InputError, match="not one of the groups"):
        analyse(HEADS, control="Head 9")
    with pytest.raises(sf.InputError, match="at least two groups"):
        analyse({"A": [1.0, 2.0]})


def test_the_interval_level_is_one_minus_alpha_unless_given():
    # common practice: intervals at 1 - alpha; the command line's table keeps 95 % group intervals
    assert analyse(HEADS, alpha=0.01).describe == sf.describe(HEADS, 0.99)
    an = analyse(HEADS, alpha=0.01, conf=0.95)
    assert an.conf == 0.95 and an.describe == sf.describe(HEADS, 0.95)
    assert an.effects == sf.effect_sizes(HEADS, 0.95)
    assert an.pairwise == sf.pairwise(HEADS, "tukey", 0.01)  # comparisons stay at alpha
    with pytest.raises(sf.InputError, match="confidence level"):
        analyse(HEADS, conf=1.5)


def test_without_comparisons_the_rest_is_the_same():
    # common practice: leaving out the comparisons changes nothing else
    full = analyse(HEADS, alpha=0.05, control="Head 1")
    short = analyse(HEADS, alpha=0.05, control="Head 1", comparisons=False)
    assert (short.oneway, short.describe, short.checks, short.effects) == (
        full.oneway, full.describe, full.checks, full.effects)
    assert isinstance(short.pairwise, Unavailable) and isinstance(short.letters, Unavailable)
    assert short.pairwise.reason == "not computed: comparisons were not asked for"
    assert short.dunnett is None and short.unequal_pairs is None
