"""Power, sample size, detectable effect and plans (sheetfuncs.stats.planning)."""

from __future__ import annotations

import numpy as np
import pytest
from scipy import stats

from sheetfuncs import InputError
from sheetfuncs.stats.planning import (
    cohens_f_from_difference,
    detectable_effect,
    plan,
    power,
    sample_size,
)


def test_power_at_cohen_medium_effect():
    # from memory: Cohen (1988) ch. 8 power table (u = 3, alpha = .05), n = 45, f = .25 -> power .80
    assert round(power(4, 45, 0.25), 2) == 0.80
    assert power(4, 44, 0.25) < 0.80 <= power(4, 45, 0.25)


def test_power_is_alpha_without_effect_and_one_for_a_huge_one():
    # common practice: power tends to alpha as f -> 0 and to 1 as f grows
    assert power(3, 10, 1e-9, alpha=0.05) == pytest.approx(0.05, rel=1e-9)
    assert power(3, 10, 50.0) == 1.0


def test_power_grows_with_n_and_f():
    ps = [power(4, n, 0.3) for n in range(2, 40)]
    assert all(a < b for a, b in zip(ps, ps[1:]))
    ps = [power(4, 10, f) for f in np.linspace(0.05, 1.5, 30)]
    assert all(a < b for a, b in zip(ps, ps[1:]))


@pytest.mark.parametrize("k,f,target,alpha", [(4, 0.25, 0.8, 0.05), (3, 0.4, 0.9, 0.01), (6, 0.1, 0.8, 0.05), (2, 1.3, 0.95, 0.05)])
def test_sample_size_is_the_smallest_sufficient_n(k, f, target, alpha):
    n = sample_size(k, f, target, alpha)
    assert power(k, n, f, alpha) >= target
    if n > 2:
        assert power(k, n - 1, f, alpha) < target


def test_sample_size_two_when_already_enough():
    assert sample_size(3, 5.0, 0.8) == 2


def test_tiny_effect_plans_stay_fast_and_finite():
    # lambda stays near 10 while n grows huge; the search must not hang
    n = sample_size(4, 1e-5, 0.8)
    assert 2.0e10 < n < 4.0e10
    assert power(4, n, 1e-5) >= 0.8 > power(4, n - 1, 1e-5)


def test_too_small_effect_is_a_clear_error():
    with pytest.raises(InputError, match="too small to plan for"):
        sample_size(4, 1e-9, 0.8)


@pytest.mark.parametrize("k,n,target,alpha", [(4, 45, 0.8, 0.05), (2, 10, 0.5, 0.1), (8, 3, 0.99, 0.001), (3, 200, 0.8, 0.05)])
def test_detectable_effect_inverts_power(k, n, target, alpha):
    f = detectable_effect(k, n, target, alpha)
    assert power(k, n, f, alpha) == pytest.approx(target, abs=1e-11)


@pytest.mark.parametrize(
    "call,match",
    [
        (lambda: power(1, 10, 0.25), "k \\(the number of groups\\) must be a whole number from 2 to 10,000"),
        (lambda: power(2.5, 10, 0.25), "whole number"),
        (lambda: power(3, 1, 0.25), "n \\(values per group\\) must be a whole number from 2 to 100,000,000,000"),
        (lambda: power(3, 7.5, 0.25), "whole number"),
        (lambda: power(3, True, 0.25), "must be a number"),
        (lambda: power(3, 10, 0), "effect size f must be greater than 0"),
        (lambda: power(3, 10, -0.2), "effect size f must be greater than 0"),
        (lambda: power(3, 10, float("nan")), "finite number"),
        (lambda: power(3, 10, 0.25, alpha=0), "alpha must lie strictly between 0 and 1"),
        (lambda: power(3, 10, 0.25, alpha=1.0), "alpha"),
        (lambda: power(3, 10, 0.25, alpha="5%"), "alpha must be a number"),
        (lambda: sample_size(3, 0.25, power=1.0), "power must lie strictly between 0 and 1"),
        (lambda: sample_size(3, 0.25, power=0), "power must lie strictly between 0 and 1"),
        (lambda: sample_size(3, 0.25, power=0.04), "must be greater than alpha"),
        (lambda: detectable_effect(3, 10, power=1.2), "power must lie strictly between 0 and 1"),
        (lambda: detectable_effect(3, 10, power=0.05, alpha=0.05), "must be greater than alpha"),
        (lambda: detectable_effect(3, 1), "n \\(values per group\\)"),
        (lambda: plan(3, n=10), "exactly two of"),
        (lambda: plan(3, n=10, cohens_f=0.3, power=0.8), "exactly two of"),
    ],
)
def test_bad_input_is_one_clear_line(call, match):
    with pytest.raises(InputError, match=match) as info:
        call()
    msg = str(info.value)
    assert msg.startswith("sheetfuncs: ") and "\n" not in msg


def test_whole_numbers_may_arrive_as_floats():
    # a spreadsheet passes every number as a float
    assert power(4.0, 45.0, 0.25) == power(4, 45, 0.25)
    assert isinstance(sample_size(4.0, 0.25), int)


def test_plan_solves_each_unknown():
    p = plan(4, cohens_f=0.25, power=0.8)
    assert p.solved_for == "n" and p.n == sample_size(4, 0.25) and p.target_power == 0.8
    assert p.power == pytest.approx(power(4, p.n, 0.25))
    assert (p.df_between, p.df_within, p.n_total) == (3, 4 * (p.n - 1), 4 * p.n)
    assert p.noncentrality == pytest.approx(4 * p.n * 0.0625)
    q = plan(4, n=20, power=0.9)
    assert q.solved_for == "cohens_f" and q.cohens_f == pytest.approx(detectable_effect(4, 20, 0.9))
    r = plan(4, n=20, cohens_f=0.3)
    assert r.solved_for == "power" and r.power == pytest.approx(power(4, 20, 0.3))
    assert r.target_power is None


def test_plan_table_layout():
    t = plan(4, cohens_f=0.25, power=0.8).table()
    assert t[0] == ["Quantity", "Value", "Note"]
    names = [row[0] for row in t[1:]]
    assert names[:3] == ["Groups", "Values per group", "Total values"]
    assert all(len(row) == 3 for row in t)
    by = {row[0]: row for row in t[1:]}
    assert by["Values per group"][2] == "solved for"
    assert by["Critical F"][1] == pytest.approx(stats.f.isf(0.05, 3, 176), rel=1e-12)  # scipy.stats.f


# --------------------------------------------------------------------------------------------
# the effect as a difference in the response's units


def _f_of_means(means: list[float], sd: float) -> float:
    # Cohen's definition, computed from the means themselves: SD of the means (divisor k) / SD within
    m = np.asarray(means, dtype=float)
    return float(np.sqrt(np.mean((m - m.mean()) ** 2)) / sd)


def test_f_from_difference_by_hand():
    # from memory: two groups D apart give f = D / (2 S)
    assert cohens_f_from_difference(2, 3.0, 1.5) == pytest.approx(1.0, rel=1e-15)
    assert cohens_f_from_difference(2, 1.0, 1.0) == pytest.approx(0.5, rel=1e-15)
    # hand check, K = 4, D = 2, S = 1: means -1, 0, 0, 1 -> SD of the means sqrt(2/4) -> f = 0.70711
    assert cohens_f_from_difference(4, 2.0, 1.0) == pytest.approx(0.7071067811865476, rel=1e-15)
    assert cohens_f_from_difference(4, 2.0, 1.0) == pytest.approx(_f_of_means([-1, 0, 0, 1], 1.0))
    # whole numbers may arrive as floats, as from a spreadsheet
    assert cohens_f_from_difference(5.0, 0.8, 0.4) == pytest.approx(_f_of_means([0, 0.4, 0.4, 0.4, 0.8], 0.4))


@pytest.mark.parametrize("k", [3, 4, 6])
def test_difference_midway_is_the_least_favourable_configuration(k):
    # common practice (Cohen 1988, ch. 8): among means spanning D, the others midway give the smallest f
    rng = np.random.default_rng(k)
    least = cohens_f_from_difference(k, 1.0, 1.0)
    for _ in range(50):
        inner = rng.uniform(0.0, 1.0, k - 2).tolist()
        assert _f_of_means([0.0, 1.0, *inner], 1.0) >= least - 1e-15
    assert _f_of_means([0.0, 1.0, *[0.5] * (k - 2)], 1.0) == pytest.approx(least, rel=1e-14)


@pytest.mark.parametrize(("k", "d", "s", "n"), [(2, 1.0, 1.0, 20), (3, 2.5, 1.8, 7), (4, 0.3, 0.2, 11), (8, 4.0, 3.0, 30)])
def test_plan_in_units_agrees_with_statsmodels(k, d, s, n):
    # reference library: statsmodels FTestAnovaPower (noncentral F, nobs = k n) with f from the means
    from statsmodels.stats.power import FTestAnovaPower

    f_means = _f_of_means([0.0, d, *[d / 2] * (k - 2)], s)
    ref = FTestAnovaPower().power(effect_size=f_means, nobs=k * n, alpha=0.05, k_groups=k)
    r = plan(k, n=n, difference=d, sd=s)
    assert r.solved_for == "power" and (r.difference, r.sd) == (d, s)
    assert r.power == pytest.approx(ref, rel=1e-9)
    q = plan(k, power=0.8, difference=d, sd=s)
    assert q.solved_for == "n" and q.power >= 0.8
    at_n = FTestAnovaPower().power(effect_size=f_means, nobs=k * q.n, alpha=0.05, k_groups=k)
    assert q.power == pytest.approx(at_n, rel=1e-9)
    if q.n > 2:  # one fewer per group falls short (statsmodels)
        assert FTestAnovaPower().power(effect_size=f_means, nobs=k * (q.n - 1), alpha=0.05, k_groups=k) < 0.8


def test_plan_in_units_table_says_what_was_given():
    t = plan(4, power=0.8, difference=2.5, sd=1.8).table()
    by = {row[0]: row for row in t[1:]}
    assert by["Difference"][1:] == [2.5, "given: two means this far apart, the others midway (response units)"]
    assert by["SD within groups"][1:] == [1.8, "given (response units)"]
    assert by["Effect size f"][2] == "difference / (SD x sqrt(2 x groups))"
    assert "Difference" not in {row[0] for row in plan(4, power=0.8, cohens_f=0.3).table()}


@pytest.mark.parametrize(
    ("call", "match"),
    [
        (lambda: cohens_f_from_difference(3, 0, 1), "the difference to detect must be greater than 0, not 0"),
        (lambda: cohens_f_from_difference(3, -2, 1), "the difference to detect must be greater than 0, not -2"),
        (lambda: cohens_f_from_difference(3, 1, -0.5), "the SD within groups must be greater than 0, not -0.5"),
        (lambda: cohens_f_from_difference(3, "wide", 1), "the difference to detect must be a number"),
        (lambda: cohens_f_from_difference(3, 1e300, 1e-300), "cannot be planned for; check the difference and the SD"),
        (lambda: cohens_f_from_difference(1, 1, 1), "k \\(the number of groups\\)"),
        (lambda: plan(3, power=0.8, difference=1.0), "difference was given without sd"),
        (lambda: plan(3, power=0.8, sd=1.0), "sd was given without difference"),
        (lambda: plan(3, power=0.8, cohens_f=0.2, difference=1.0, sd=1.0), "either cohens_f or difference and sd"),
        (lambda: plan(3, n=10, power=0.8, difference=1.0, sd=1.0), "exactly two of"),
    ],
)
def test_bad_difference_is_one_clear_line(call, match):
    with pytest.raises(InputError, match=match) as info:
        call()
    msg = str(info.value)
    assert msg.startswith("sheetfuncs: ") and "\n" not in msg
