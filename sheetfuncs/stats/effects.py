"""Effect sizes for the one-way analysis of variance, with confidence intervals.

From the one-way sums of squares (SSB between groups with k - 1 df, SSW within groups with
N - k df, SST = SSB + SSW, MSW = SSW / (N - k)):

* eta squared      eta^2 = SSB / SST                                 (Pearson 1905; Cohen 1988, ch. 8)
* omega squared    omega^2 = (SSB - (k - 1) MSW) / (SST + MSW)       (Hays 1963)
* epsilon squared  epsilon^2 = (SSB - (k - 1) MSW) / SST             (Kelley 1935)
* Cohen's f        f = sqrt(eta^2 / (1 - eta^2)) = sqrt(SSB / SSW)   (Cohen 1988, ch. 8)

omega^2 and epsilon^2 correct eta^2 for the chance spread of group means and can come out
negative when F < 1; they are then shown as 0 and a note says so.

Confidence intervals (Steiger 2004, *Psychological Methods* 9, 164-182; Smithson 2003,
*Confidence Intervals*, ch. 4): the observed F is referred to the noncentral F with
df (k - 1, N - k); the equal-tailed interval for the noncentrality lambda has limits with

    P(F' <= F_obs; lambda_low) = 1 - a/2,   P(F' <= F_obs; lambda_high) = a/2,   a = 1 - conf,

each set to 0 when even lambda = 0 cannot reach it. Since lambda = N f^2 for the fixed-effects
model, the limits map to eta^2 = lambda / (lambda + N) and f = sqrt(lambda / N). The limits are
found by a bracketing root finder (Brent's method, after expanding the bracket until it holds a
sign change) on the noncentral F distribution function of
:mod:`sheetfuncs.distributions.noncentral_f`.

The sums of squares are the decimal-exact ones of :func:`sheetfuncs.stats.oneway.oneway` whenever that
path applies, and the point estimates are formed from them exactly and rounded once.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass
from fractions import Fraction
from typing import Any, ClassVar

from scipy import optimize, stats

from ..errors import InputError
from ..distributions import check_df, ncf_cdf
from ..input import as_groups, check_conf, shown
from .moments import compute_moments
from .group_moments import GroupMoments, group_moments, require_two
from .oneway import oneway_of, require_two_groups
from .interval import Interval

__all__ = ["EffectSizes", "effect_sizes", "effect_sizes_of", "noncentrality_interval"]

_BIG = 1.7976931348623157e308

def _pct(conf: float) -> str:
    return f"{conf * 100:.10g}%"


@dataclass(frozen=True)
class EffectSizes:
    """Effect sizes of a one-way analysis of variance.

    Fields: ``eta_squared`` (share of the total sum of squares between groups),
    ``omega_squared`` and ``epsilon_squared`` (bias-corrected shares, truncated at 0; the
    untruncated values are ``omega_squared_raw`` and ``epsilon_squared_raw``), ``cohens_f``
    (``inf`` when there is no variation within groups); ``eta_squared_ci`` and ``cohens_f_ci``
    (:class:`~sheetfuncs.stats.interval.Interval`) at confidence ``conf``, from ``lambda_ci``, the equal-tailed interval for the
    noncentrality of the observed F; ``f``, ``df_between``, ``df_within`` and ``n_total`` of the
    one-way analysis; ``exact`` tells whether the decimal-exact sums of squares were used;
    ``notes`` holds plain-language remarks (truncation, degenerate intervals), and
    ``interval_note`` the one among them about the intervals (``""`` when there is none).
    ``table()`` puts each note in the Note cell of the rows it concerns. When F lies beyond the
    double range although the groups vary within, ``lambda_ci`` is ``(inf, inf)`` and the limits
    for f come from the large-noncentrality limit of the noncentral F.

    Sources: Hays (1963) for omega^2, Kelley (1935) for epsilon^2, Cohen (1988) for f,
    Steiger (2004) and Smithson (2003) for the intervals.
    """

    eta_squared: float
    omega_squared: float
    epsilon_squared: float
    cohens_f: float
    eta_squared_ci: Interval
    cohens_f_ci: Interval
    conf: float
    lambda_ci: Interval
    notes: tuple[str, ...]
    omega_squared_raw: float
    epsilon_squared_raw: float
    f: float
    df_between: int
    df_within: int
    n_total: int
    exact: bool
    interval_note: str = ""

    #: The table's header row.
    HEADER: ClassVar[tuple[str, ...]] = ("Measure", "Value", "CI low", "CI high", "Note")

    def table(self) -> list[list[Any]]:
        """Header row (Measure, Value, CI low, CI high, Note), then one row per measure."""
        ci = f"{_pct(self.conf)} interval from the noncentral F"
        om_note = "bias-corrected share (Hays)"
        ep_note = "bias-corrected share (Kelley)"
        if self.omega_squared_raw < 0:
            om_note += f"; negative ({self.omega_squared_raw:.4g}) shown as 0"
        if self.epsilon_squared_raw < 0:
            ep_note += f"; negative ({self.epsilon_squared_raw:.4g}) shown as 0"
        if self.interval_note:  # said where the intervals are, on both rows that carry one
            ci += f"; {self.interval_note}"
        return [
            list(self.HEADER),
            ["Eta squared", self.eta_squared, *self.eta_squared_ci,
             f"share of the variation between groups; {ci}"],
            ["Omega squared", self.omega_squared, None, None, om_note],
            ["Epsilon squared", self.epsilon_squared, None, None, ep_note],
            ["Cohen's f", self.cohens_f, *self.cohens_f_ci,
             f"SD of the group means over the SD within groups; {ci}"],
        ]


def noncentrality_interval(
    f_obs: float, df1: float, df2: float, conf: float = 0.95
) -> Interval:
    """Equal-tailed interval for the noncentrality of an observed F (Steiger 2004).

    ``lambda_low`` solves ``P(F' <= f_obs; lambda) = 1 - a/2`` and ``lambda_high`` solves
    ``P(F' <= f_obs; lambda) = a/2`` with ``a = 1 - conf``; a limit is 0 when the central F
    (lambda = 0) already lies below its target. ``f_obs = inf`` gives ``(inf, inf)``.
    """
    conf = check_conf(conf)
    d1, d2 = check_df(df1, df2)
    try:
        x = float(f_obs)
    except (TypeError, ValueError):
        raise InputError(f"the F value must be a number, not {shown(f_obs)}") from None
    if math.isnan(x) or isinstance(f_obs, bool):
        raise InputError(f"the F value must be a number, not {shown(f_obs)}")
    if x < 0:
        raise InputError(f"the F value must not be negative, not {shown(f_obs)}")
    if math.isinf(x):
        return Interval(math.inf, math.inf)
    a = 1.0 - conf
    return Interval(_solve_lambda(x, d1, d2, 1.0 - a / 2.0), _solve_lambda(x, d1, d2, a / 2.0))


def _solve_lambda(x: float, d1: float, d2: float, target: float) -> float:
    """The lambda with P(F' <= x; lambda) = target (0 when the central F is already below)."""
    if x <= 0.0 or ncf_cdf(x, d1, d2, 0.0) <= target:
        return 0.0

    def gap(lam: float) -> float:
        return ncf_cdf(x, d1, d2, lam) - target

    # the distribution function falls as lambda grows; the mean of F' is near (d1 + lambda)/d1
    lo, hi = 0.0, min(max(1.0, 2.0 * d1 * x), _BIG)
    while gap(hi) > 0.0:
        if hi >= _BIG:
            return math.inf  # the limit lies beyond the largest double
        lo, hi = hi, min(hi * 4.0, _BIG)
    return float(optimize.brentq(gap, lo, hi, xtol=1e-300, rtol=1e-13, maxiter=500))


def _sqrt_ratio(num: Fraction, den: Fraction) -> float:
    """``sqrt(num / den)`` for ``num >= 0``, ``den > 0``, rounded from the exact ratio without
    overflow or underflow on the way: the ratio is scaled by an even power of two to lie near
    1, its root taken, and half the power added back. ``inf`` only when the root itself lies
    beyond the largest double."""
    r = Fraction(num) / Fraction(den)
    if r == 0:
        return 0.0
    e = r.numerator.bit_length() - r.denominator.bit_length()
    e -= e % 2  # even, so that the root of 2**e is a whole power of two
    m = r / (Fraction(2) ** e) if e >= 0 else r * (Fraction(2) ** -e)  # in (1/4, 4)
    try:
        return math.ldexp(math.sqrt(float(m)), e // 2)
    except OverflowError:
        return math.inf


def _overflow_f_limits(
    ssb: Fraction, ssw: Fraction, dfw: int, n: int, conf: float
) -> Interval:
    """Interval for Cohen's f when the observed F lies beyond the double range (``ssw > 0``).

    The noncentrality is then beyond the double range too, where the noncentral F
    ``(chi'^2(d1, lambda) / d1) / (chi^2(d2) / d2)`` has ``chi'^2 / lambda -> 1`` (relative
    spread about ``1/sqrt(lambda)``), so ``P(F' <= F_obs; lambda) = P(chi^2(d2) >= d2 lambda /
    (d1 F_obs))``: the same limit that :func:`sheetfuncs.distributions.ncf_cdf` uses for large
    noncentrality (Patnaik 1949). Solving for each target gives ``lambda = d1 F_obs q / d2`` with
    ``q`` the chi-square(d2) point, and since ``d1 F_obs = SSB d2 / SSW``,
    ``f = sqrt(lambda / N) = sqrt(SSB q / (SSW N))``, formed without overflow.
    """
    a = 1.0 - conf
    q_lo = float(stats.chi2.ppf(a / 2.0, dfw))  # P(F' <= F_obs) = 1 - a/2 at the lower limit
    q_hi = float(stats.chi2.isf(a / 2.0, dfw))  # ... = a/2 at the upper limit
    return Interval(_sqrt_ratio(ssb * Fraction(q_lo), ssw * n), _sqrt_ratio(ssb * Fraction(q_hi), ssw * n))


def effect_sizes(
    groups: Any, conf: Any = 0.95, *, exact: bool | None = None,
    missing: str = "stop", relabel: Mapping[str, str] | None = None,
) -> EffectSizes:
    """Eta^2, omega^2, epsilon^2 and Cohen's f of the groups, with intervals for eta^2 and f.

    ``groups`` is anything :func:`sheetfuncs.as_groups` accepts; ``conf`` the confidence level
    of the intervals. Formulas and sources: see the module docstring.

    ``missing`` (``"stop"`` or ``"drop"``) and ``relabel`` are as in :func:`sheetfuncs.as_groups`.
    """
    g = as_groups(groups, missing=missing, relabel=relabel)
    require_two_groups(g)
    cf = check_conf(conf)
    return effect_sizes_of(group_moments(g, compute_moments(g, exact)), cf)


def effect_sizes_of(gm: GroupMoments, conf: Any = 0.95) -> EffectSizes:
    """:func:`effect_sizes` from the groups' labels, counts and moments (no values needed)."""
    require_two(gm)
    cf = check_conf(conf)
    res = oneway_of(gm)
    dfb, dfw, n = res.df_between, res.df_within, res.n_total
    if res.exact:
        ssb, ssw, sst = res.ss_between_exact, res.ss_within_exact, res.ss_total_exact
    else:
        ssb, ssw, sst = (Fraction(v) for v in (res.ss_between, res.ss_within, res.ss_total))
    msw = ssw / dfw
    corrected = ssb - dfb * msw
    eta = float(ssb / sst)
    omega_raw = float(corrected / (sst + msw))
    eps_raw = float(corrected / sst)
    f_eff = math.inf if ssw == 0 else _sqrt_ratio(ssb, ssw)
    notes = _negative_notes(omega_raw, eps_raw)
    lam_lo, lam_hi = noncentrality_interval(res.f, dfb, dfw, cf)
    interval_note = _interval_note(res.f, ssw == 0, lam_lo, lam_hi, dfb, dfw, cf)
    if interval_note:
        notes.append(interval_note)
    if math.isinf(res.f) and ssw != 0:
        f_ci = _overflow_f_limits(ssb, ssw, dfw, n, cf)
    else:
        f_ci = Interval(_lambda_to_f(lam_lo, n), _lambda_to_f(lam_hi, n))
    return EffectSizes(
        eta_squared=eta, omega_squared=max(omega_raw, 0.0), epsilon_squared=max(eps_raw, 0.0),
        cohens_f=f_eff, eta_squared_ci=Interval(_lambda_to_eta(lam_lo, n), _lambda_to_eta(lam_hi, n)),
        cohens_f_ci=f_ci, conf=cf, lambda_ci=Interval(lam_lo, lam_hi), notes=tuple(notes),
        omega_squared_raw=omega_raw, epsilon_squared_raw=eps_raw, f=res.f, df_between=dfb,
        df_within=dfw, n_total=n, exact=res.exact, interval_note=interval_note,
    )


def _lambda_to_eta(lam: float, n: int) -> float:
    """Eta squared of a noncentrality: ``lambda / (lambda + N)`` (1 at infinity)."""
    return 1.0 if math.isinf(lam) else lam / (lam + n)


def _lambda_to_f(lam: float, n: int) -> float:
    """Cohen's f of a noncentrality: ``sqrt(lambda / N)``."""
    return math.inf if math.isinf(lam) else math.sqrt(lam / n)


def _negative_notes(omega_raw: float, eps_raw: float) -> list[str]:
    """The note that omega squared or epsilon squared came out negative, if either did."""
    notes: list[str] = []
    negative = [nm for nm, v in (("omega squared", omega_raw), ("epsilon squared", eps_raw)) if v < 0]
    if negative:
        notes.append(
            f"{' and '.join(negative)} came out negative and {'are' if len(negative) > 1 else 'is'} "
            "shown as 0: the group means differ less than chance alone would make them (F < 1)"
        )
    return notes


def _interval_note(f: float, no_within: bool, lam_lo: float, lam_hi: float, dfb: int, dfw: int,
                   cf: float) -> str:
    """The note about the intervals (an infinite F, limits at 0), or ``""``."""
    if math.isinf(f) and no_within:
        return (
            "there is no variation within groups, so F is infinite: eta squared is 1, Cohen's f "
            "is infinite and the intervals collapse onto those values"
        )
    if math.isinf(f):
        return (
            "F lies beyond the largest double (about 1.8e308) and is shown as infinite: the "
            "variation within groups is tiny next to that between them; eta squared and its "
            "limits round to 1, and the limits for Cohen's f come from the large-noncentrality "
            "limit of the noncentral F"
        )
    if lam_hi == 0.0:
        return (
            f"both interval limits are 0: the observed F ({f:.4g}) is below the lower "
            f"{(1 - cf) / 2:g} point of F({dfb}, {dfw}); group means this close together are "
            "unusual, so check the data"
        )
    if lam_lo == 0.0:
        return (
            f"the lower interval limits are 0: at {_pct(cf)} confidence the data are consistent "
            "with no difference between the group means"
        )
    return ""
