"""Effect sizes: formulas, intervals, degenerate cases, bad input (sheetfuncs.stats.effects)."""

from __future__ import annotations

import math

import mpmath
import numpy as np
import pytest
from hypothesis import assume, given, settings, strategies as st
from scipy import special, stats

from tests.support import nist
from sheetfuncs import InputError
from sheetfuncs.stats.effects import effect_sizes, noncentrality_interval


def _seeded_groups(seed: int, k: int = 4, n: int = 9, shift: float = 0.4) -> list[np.ndarray]:
    rng = np.random.default_rng(seed)
    return [rng.normal(10.0 + shift * i, 1.0, n + (i % 3)) for i in range(k)]


def _textbook(groups: list[np.ndarray]) -> dict[str, float]:
    """Sums of squares and effect sizes straight from their textbook definitions, in numpy."""
    allv = np.concatenate(groups)
    grand = allv.mean()
    ssb = sum(g.size * (g.mean() - grand) ** 2 for g in groups)
    ssw = sum(((g - g.mean()) ** 2).sum() for g in groups)
    sst = ((allv - grand) ** 2).sum()
    k, n = len(groups), allv.size
    msw = ssw / (n - k)
    return {
        "eta": ssb / sst,
        # Hays (1963) omega squared, as given by Olejnik & Algina (2003)
        "omega": (ssb - (k - 1) * msw) / (sst + msw),
        # Kelley (1935) epsilon squared
        "eps": (ssb - (k - 1) * msw) / sst,
        # Cohen (1988), ch. 8: f = sqrt(eta^2 / (1 - eta^2))
        "f": math.sqrt((ssb / sst) / (1 - ssb / sst)),
        "F": (ssb / (k - 1)) / msw,
        "N": n,
        "k": k,
    }


@pytest.mark.parametrize("seed", [1, 2, 3, 4, 5])
def test_point_estimates_match_textbook_formulas(seed):
    # textbook formulas: Hays (1963) omega^2, Kelley (1935) epsilon^2, Cohen (1988) f,
    # computed independently above with numpy on the same seeded random data
    groups = _seeded_groups(seed)
    ref = _textbook(groups)
    e = effect_sizes(groups)
    assert e.eta_squared == pytest.approx(ref["eta"], rel=1e-12)
    assert e.omega_squared_raw == pytest.approx(ref["omega"], rel=1e-11)
    assert e.epsilon_squared_raw == pytest.approx(ref["eps"], rel=1e-11)
    assert e.cohens_f == pytest.approx(ref["f"], rel=1e-12)
    assert e.f == pytest.approx(ref["F"], rel=1e-12)


@pytest.mark.parametrize("seed", [11, 12, 13, 14])
@pytest.mark.parametrize("conf", [0.90, 0.95, 0.99])
def test_intervals_match_statsmodels(seed, conf):
    # reference library: statsmodels.stats.oneway.confint_effectsize_oneway (Steiger 2004
    # inversion through scipy's ncfdtrinc). That search stops when the distribution function is
    # within about 2e-5 of its target, which moves the limits by up to ~2e-3 relative; so the
    # limits must agree to 2e-3 and ours must solve the defining equation at least as closely
    # (checked with scipy.special.ncfdtr, the function behind scipy.stats.ncf.cdf).
    from statsmodels.stats.oneway import confint_effectsize_oneway

    groups = _seeded_groups(seed, k=5, n=7, shift=0.6)
    e = effect_sizes(groups, conf=conf)
    d1, d2 = e.df_between, e.df_within
    with np.errstate(divide="ignore"):  # statsmodels divides by a zero lower limit
        ref = confint_effectsize_oneway(e.f, (d1, d2), alpha=1 - conf, nobs=e.n_total)
    targets = (1 - (1 - conf) / 2, (1 - conf) / 2)
    for ours, theirs, target in zip(e.lambda_ci, ref.ci_nc, targets):
        if theirs <= 0:  # statsmodels does not clip at 0 (its docstring says so); we do
            assert ours == 0.0
            continue
        assert ours == pytest.approx(theirs, rel=2e-3)
        ours_gap = abs(special.ncfdtr(d1, d2, ours, e.f) - target)
        theirs_gap = abs(special.ncfdtr(d1, d2, theirs, e.f) - target)
        assert ours_gap <= max(theirs_gap, 1e-13)
    assert e.eta_squared_ci[1] == pytest.approx(ref.eta2[1], rel=2e-3)
    assert e.cohens_f_ci[1] == pytest.approx(ref.ci_f[1], rel=2e-3)


@pytest.mark.parametrize("f_obs,d1,d2", [(3.2, 3, 36), (0.9, 2, 12), (25.0, 5, 200), (4.1, 1, 8)])
def test_limits_solve_the_defining_equations(f_obs, d1, d2):
    # definition (Steiger 2004): P(F' <= F_obs; lambda_low) = 0.975, P(...; lambda_high) = 0.025,
    # checked with scipy.stats.ncf, the reference library
    lo, hi = noncentrality_interval(f_obs, d1, d2, 0.95)
    assert hi > 0
    assert stats.ncf.cdf(f_obs, d1, d2, hi) == pytest.approx(0.025, abs=1e-12)
    if lo > 0:
        assert stats.ncf.cdf(f_obs, d1, d2, lo) == pytest.approx(0.975, abs=1e-12)
    else:
        assert stats.f.cdf(f_obs, d1, d2) <= 0.975


def test_huge_f_uses_the_large_noncentrality_branch_smoothly():
    # reference library: scipy.special.ncfdtr at lambda ~ 2e8 (slow but still accurate there);
    # our limit (found with Patnaik's approximation above 1e8) must satisfy its equation
    f_obs, d1, d2 = 1.0e8, 3, 40
    lo, hi = noncentrality_interval(f_obs, d1, d2, 0.95)
    assert lo > 1e8 and hi > lo
    assert special.ncfdtr(d1, d2, hi, f_obs) == pytest.approx(0.025, abs=1e-7)
    assert special.ncfdtr(d1, d2, lo, f_obs) == pytest.approx(0.975, abs=1e-7)


def test_nist_certified_r_squared_is_eta_squared():
    # certified values: NIST StRD one-way ANOVA datasets; eta^2 = SSB / SST = certified R^2
    for name in ("SiRstv", "AtmWtAg", "SmLs01", "SmLs04", "SmLs07"):
        ds = nist.load(name)
        e = effect_sizes(ds.groups)
        cert = ds.certified
        assert nist.lre(e.eta_squared, cert.r_squared) >= 9.5, name
        assert nist.lre(e.cohens_f, math.sqrt(cert.ss_between / cert.ss_within)) >= 9.5, name
        assert e.exact


def test_negative_omega_and_epsilon_are_truncated_with_a_note():
    # from memory (common practice): omega^2 < 0 exactly when F < 1; here F is about 0.08
    groups = [[10.0, 12.0, 11.0, 9.0], [10.5, 11.0, 10.0, 11.5], [11.0, 10.0, 12.0, 10.0]]
    e = effect_sizes(groups)
    assert e.f < 1
    assert e.omega_squared_raw < 0 and e.epsilon_squared_raw < 0
    assert e.omega_squared == 0.0 and e.epsilon_squared == 0.0
    assert any("negative" in nt for nt in e.notes)
    assert e.eta_squared > 0


def test_tiny_f_gives_zero_interval_with_a_note():
    # identical group means: F = 0, below every point of F; both limits must be 0
    groups = [[1.0, 2.0, 3.0], [3.0, 2.0, 1.0], [2.0, 1.0, 3.0]]
    e = effect_sizes(groups)
    assert e.f == 0.0
    assert e.lambda_ci == (0.0, 0.0)
    assert e.eta_squared_ci == (0.0, 0.0)
    assert e.cohens_f_ci == (0.0, 0.0)
    assert any("both interval limits are 0" in nt for nt in e.notes)
    t = e.table()  # the note reaches the sheet, on both rows that carry an interval
    assert "both interval limits are 0" in t[1][4] and "both interval limits are 0" in t[4][4]
    assert "both interval limits" not in t[2][4] + t[3][4]


def test_no_within_variation_gives_infinite_f():
    # common practice: zero within-group variance with different means gives F = inf
    e = effect_sizes([[1.0, 1.0, 1.0], [2.0, 2.0], [4.0, 4.0, 4.0]])
    assert math.isinf(e.f) and math.isinf(e.cohens_f)
    assert e.eta_squared == 1.0
    assert e.eta_squared_ci == (1.0, 1.0)
    assert e.cohens_f_ci == (math.inf, math.inf)
    assert e.omega_squared == 1.0 and e.epsilon_squared == 1.0
    assert any("infinite" in nt for nt in e.notes)
    t = e.table()
    assert "no variation within groups" in t[1][4] and "no variation within groups" in t[4][4]


def _exact_ss(groups):
    """SSB and SSW of the decimal values, with mpmath at 60 digits."""
    mpmath.mp.dps = 60
    gs = [[mpmath.mpf(repr(float(x))) for x in g] for g in groups]
    allv = [x for g in gs for x in g]
    grand = sum(allv) / len(allv)
    means = [sum(g) / len(g) for g in gs]
    ssb = sum(len(g) * (m - grand) ** 2 for g, m in zip(gs, means))
    ssw = sum(sum((x - m) ** 2 for x in g) for g, m in zip(gs, means))
    return ssb, ssw, len(allv)


def test_cohens_f_beyond_the_double_range_of_its_square():
    # SSB / SSW is about 3e309, beyond the largest double, while f = sqrt(SSB / SSW) is about
    # 5.8e154 (SSW = 2e-290 is still within the range of a double): reference values from
    # mpmath at 60 digits on the decimal values
    groups = [[1e10], [2e-145, 0.0]]
    e = effect_sizes(groups)
    ssb, ssw, n = _exact_ss(groups)
    assert e.cohens_f == pytest.approx(float(mpmath.sqrt(ssb / ssw)), rel=1e-15)
    assert math.isinf(e.f) and e.eta_squared == 1.0
    # the F overflows although the groups vary within: the note says so, not "no variation"
    assert e.interval_note.startswith("F lies beyond the largest double")
    assert not any("no variation within groups" in nt for nt in e.notes)
    t = e.table()
    assert "F lies beyond the largest double" in t[4][4]
    # limits for f: the large-noncentrality limit of the noncentral F (Patnaik 1949), where
    # P(F' <= F_obs; lambda) = P(chi2(d2) >= lambda SSW / SSB), so f = sqrt(SSB q / (SSW N)) with
    # q the chi-square(d2) points of scipy.stats.chi2 (here d2 = 1), evaluated with mpmath
    q_lo, q_hi = stats.chi2.ppf(0.025, 1), stats.chi2.isf(0.025, 1)
    lo = float(mpmath.sqrt(ssb * mpmath.mpf(float(q_lo)) / (ssw * n)))
    hi = float(mpmath.sqrt(ssb * mpmath.mpf(float(q_hi)) / (ssw * n)))
    assert e.cohens_f_ci == pytest.approx((lo, hi), rel=1e-14)
    assert e.cohens_f_ci[0] < e.cohens_f < e.cohens_f_ci[1]


def test_overflow_limits_continue_the_noncentral_f_interval():
    # where F is large but finite, the intervals from the noncentral F (sheetfuncs.distributions.noncentral_f's
    # distribution function, checked against scipy.stats.ncf elsewhere) and from its
    # large-noncentrality limit must agree: the relative spread of the noncentral chi-square is
    # about 1/sqrt(lambda), here below 1e-6 (common practice)
    from fractions import Fraction

    from sheetfuncs.stats.effects import _overflow_f_limits
    from sheetfuncs.stats.oneway import oneway

    groups = [[1.0, 1.000001, 1.000002], [5.0, 5.000001, 5.000002], [9.0, 9.000001, 9.000002]]
    e = effect_sizes(groups)
    r = oneway(groups)
    assert 1e12 < e.f < 1e15
    limit = _overflow_f_limits(Fraction(r.ss_between_exact), Fraction(r.ss_within_exact), r.df_within, r.n_total, 0.95)
    assert limit == pytest.approx(e.cohens_f_ci, rel=1e-6)


def test_cohens_f_overflows_only_when_the_root_does():
    # exact powers of two (common practice): the root of 2^2100 lies beyond the double range
    from fractions import Fraction

    from sheetfuncs.stats.effects import _sqrt_ratio

    assert _sqrt_ratio(Fraction(2) ** 2100, Fraction(1)) == math.inf
    assert _sqrt_ratio(Fraction(2) ** 2046, Fraction(1)) == 2.0**1023
    assert _sqrt_ratio(Fraction(1), Fraction(2) ** 2100) == 2.0**-1050  # subnormal, still there
    assert _sqrt_ratio(Fraction(1), Fraction(2) ** 2200) == 0.0  # below the smallest double
    assert _sqrt_ratio(Fraction(0), Fraction(3)) == 0.0
    assert _sqrt_ratio(Fraction(9, 4), Fraction(1)) == 1.5


def test_lower_limit_zero_note():
    groups = _seeded_groups(7, k=3, n=5, shift=0.2)
    e = effect_sizes(groups)
    # F is about 0.66, below the central F's upper 2.5% point, so the lower limit is 0 while
    # the upper one is not (scipy.stats.f gives the points the two limits are judged against)
    assert stats.f.cdf(e.f, 2, e.df_within) < 0.975
    assert stats.f.cdf(e.f, 2, e.df_within) > 0.025
    assert e.lambda_ci[0] == 0.0 and e.lambda_ci[1] > 0
    assert any("lower interval limits are 0" in nt for nt in e.notes)
    assert e.interval_note.startswith("the lower interval limits are 0")
    t = e.table()
    assert "lower interval limits are 0" in t[1][4] and "lower interval limits are 0" in t[4][4]
    big = effect_sizes(_seeded_groups(7, k=3, n=30, shift=2.0))
    assert big.lambda_ci[0] > 0 and big.eta_squared_ci[0] > 0
    assert not any("lower interval limits" in nt for nt in big.notes)


def test_table_layout():
    e = effect_sizes(_seeded_groups(3))
    t = e.table()
    assert t[0] == ["Measure", "Value", "CI low", "CI high", "Note"]
    assert [r[0] for r in t[1:]] == ["Eta squared", "Omega squared", "Epsilon squared", "Cohen's f"]
    assert all(len(r) == 5 for r in t)
    assert t[1][1:4] == [e.eta_squared, *e.eta_squared_ci]
    assert t[4][1:4] == [e.cohens_f, *e.cohens_f_ci]
    assert "95%" in t[1][4]


def test_result_is_frozen():
    e = effect_sizes(_seeded_groups(3))
    with pytest.raises(AttributeError):
        e.eta_squared = 0.5  # type: ignore[misc]


def test_exact_path_is_used_for_typed_values():
    # the decimal-exact sums of squares: values with a large constant part lose nothing
    # (common practice: such data defeat one-pass float formulas)
    base = 1e9
    groups = [[base + 0.1, base + 0.3, base + 0.2], [base + 0.4, base + 0.6, base + 0.5]]
    e = effect_sizes(groups)
    # by hand: SSB = 6 * 0.15^2 = 0.135, SSW = 4 * 0.01 = 0.04, SST = 0.175
    assert e.exact
    assert e.eta_squared == pytest.approx(0.135 / 0.175, rel=1e-14)
    assert e.cohens_f == pytest.approx(math.sqrt(0.135 / 0.04), rel=1e-14)


@pytest.mark.parametrize(
    "groups,conf,match",
    [
        ([[1.0, 2.0, 3.0]], 0.95, "at least two groups"),
        ([[1.0, 2.0], [3.0, 4.0]], 1.5, "confidence level"),
        ([[1.0, 2.0], [3.0, 4.0]], 0, "confidence level"),
        ([[1.0, 2.0], [3.0, 4.0]], "high", "confidence level"),
        ([[5.0, 5.0], [5.0, 5.0]], 0.95, "identical"),
        ([[1.0], [2.0]], 0.95, "residual degrees of freedom"),
    ],
)
def test_bad_input_messages(groups, conf, match):
    with pytest.raises(InputError, match=match) as info:
        effect_sizes(groups, conf=conf)
    msg = str(info.value)
    assert msg.startswith("sheetfuncs: ") and "\n" not in msg


@pytest.mark.parametrize("args", [(-1.0, 2, 10), (float("nan"), 2, 10), (2.0, 0, 10), (2.0, 2, -3), ("x", 2, 10)])
def test_noncentrality_interval_bad_input(args):
    with pytest.raises(InputError, match="^sheetfuncs: "):
        noncentrality_interval(*args)


@settings(max_examples=40)
@given(
    st.lists(
        st.lists(st.integers(min_value=0, max_value=60), min_size=2, max_size=8),
        min_size=2,
        max_size=5,
    ),
    st.sampled_from([0.8, 0.9, 0.95, 0.99]),
)
def test_properties(raw, conf):
    groups = [[v / 4.0 for v in g] for g in raw]
    flat = [v for g in groups for v in g]
    assume(len(set(flat)) >= 2)  # every value identical is rejected, tested above
    e = effect_sizes(groups, conf=conf)
    lo, hi = e.eta_squared_ci
    assert 0.0 <= lo <= hi <= 1.0
    assert 0.0 <= e.cohens_f_ci[0] <= e.cohens_f_ci[1]
    if e.epsilon_squared_raw >= 0:  # the corrected numerator is positive: omega^2 <= epsilon^2
        assert e.omega_squared_raw <= e.epsilon_squared_raw <= e.eta_squared + 1e-15
    else:
        assert e.epsilon_squared_raw <= e.omega_squared_raw < 0
    assert 0.0 <= e.omega_squared <= 1.0 and 0.0 <= e.epsilon_squared <= 1.0
    if not math.isinf(e.f):
        wider = effect_sizes(groups, conf=min(conf + 0.009, 0.999))
        assert wider.lambda_ci[0] <= e.lambda_ci[0] + 1e-9
        assert wider.lambda_ci[1] >= e.lambda_ci[1] - 1e-9
