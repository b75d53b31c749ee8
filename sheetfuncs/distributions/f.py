"""The F distribution: upper tail and critical values, accurate far into the tail.

The upper tail of F(d1, d2) at x is the regularised incomplete beta function
``I_w(a, b)`` with ``a = d2/2``, ``b = d1/2`` and ``w = d2 / (d2 + d1 x)`` (Abramowitz & Stegun
26.6.2). Evaluating it directly, instead of ``1 - cdf``, keeps the relative accuracy of small
p-values.

Where the tail is not tiny, ``scipy.special.betainc`` / ``betaincc`` evaluate it. Deep in the
tail (below about 1e-200) that routine loses digits as its power terms approach the underflow
threshold, so there the tail is evaluated in log space: ``I_w(a, b) = exp(L) * CF`` with

    L = a ln w + b ln(1 - w) - ln a - ln B(a, b),

where ``ln w = -log1p(r)`` and ``ln(1 - w) = -log1p(1/r)`` for ``r = d1 x / d2`` (no
cancellation), ``ln B`` comes from Stirling's series (DLMF 5.11.1) written so that the large
terms cancel analytically, and ``CF`` is the continued fraction of DLMF 8.17.22 evaluated by the
modified Lentz method. The result keeps a relative accuracy of about 1e-13 down to the smallest
normal double (a logarithm near -690 is itself only known to 1.1e-13); the rounding of ``r``
moves the tail by about ``a * 1.1e-16`` in relative terms, which no evaluation from a double
``x`` can avoid.

Critical values invert the tail: ``scipy.special.betaincinv`` gives a first value, which Newton's
method on ``ln f_tail(e^t) = ln alpha`` polishes with :func:`f_tail` and the density; where that
inverse fails (far tails) the root is bracketed in ``ln x`` and found by Brent's method.
"""

from __future__ import annotations

import math

from scipy import optimize, special

from ..errors import InputError
from ..input import as_real, check_alpha, shown

__all__ = ["f_tail", "f_critical", "check_df", "limit_regime", "MIN_DF"]

#: Below this log-prefactor (about 1e-200) the tail is evaluated in log space.
_DEEP_LOG = -460.0
_HALF_LOG_2PI = 0.5 * math.log(2.0 * math.pi)
_MAX_CF_TERMS = 100_000


#: The smallest degrees of freedom accepted: below it the critical values near alpha = 1 lose
#: their accuracy (checked against mpmath), and no analysis of variance has fewer than one.
MIN_DF = 0.5
#: Up to this size both degrees of freedom go through the incomplete beta function (checked
#: against mpmath and scipy); beyond it the limits of :func:`limit_regime` apply.
_DIRECT_DF = 1e15
#: One df this many times the other is infinite to double precision: F(d1, d2) differs from
#: its one-df limit by a relative O(d_small / d_large).
_LIMIT_RATIO = 1e30
#: Both df this large: F is 1 to double precision (its SD, sqrt(2/d1 + 2/d2), is below 1e-18).
_BOTH_INFINITE = 1e36


def check_df(df1: float, df2: float) -> tuple[float, float]:
    """Validate degrees of freedom: finite numbers from :data:`MIN_DF` up (non-integers allowed)."""
    out = []
    for name, v in (("df1", df1), ("df2", df2)):
        f = as_real(v)
        if f is None:
            raise InputError(f"{name} must be a number, not {shown(v)}")
        if not (math.isfinite(f) and f >= MIN_DF):
            raise InputError(
                f"{name} must be a positive number of at least {MIN_DF:g} (degrees of "
                f"freedom), not {shown(v)}"
            )
        out.append(f)
    return out[0], out[1]


def limit_regime(d1: float, d2: float) -> str | None:
    """How F(d1, d2) is evaluated: None (directly), ``"df1"`` (df1 infinite to double
    precision: F is ``df2 / chi2(df2)``), ``"df2"`` (F is ``chi2(df1) / df1``), ``"both"`` (F
    is 1), or ``"none"`` when both are large but neither limit holds to full accuracy."""
    small, large = min(d1, d2), max(d1, d2)
    if large <= _DIRECT_DF:
        return None
    if small >= _BOTH_INFINITE:
        return "both"
    if large >= _LIMIT_RATIO * small:
        return "df1" if d1 > d2 else "df2"
    return "none"


def _no_limit(df1: float, df2: float) -> InputError:
    return InputError(
        f"the F distribution with df1 = {shown(df1)} and df2 = {shown(df2)} cannot be computed "
        f"to full accuracy (both are above {_DIRECT_DF:.0e} but not {_LIMIT_RATIO:.0e} times "
        "apart); check the degrees of freedom"
    )


def _limit_tail(x: float, d1: float, d2: float, regime: str) -> float:
    """P(F > x) in a limit (see :func:`limit_regime`), from the chi-square (gamma) tails."""
    if regime == "both":
        return 1.0 if x < 1.0 else (0.5 if x == 1.0 else 0.0)
    if regime == "df1":  # P(d2 / chi2 > x) = P(chi2(d2) < d2 / x)
        return float(special.gammainc(d2 / 2.0, d2 / (2.0 * x)))
    return float(special.gammaincc(d1 / 2.0, d1 * x / 2.0))  # P(chi2(d1) > d1 x)


def _limit_critical(a: float, d1: float, d2: float, regime: str) -> float:
    """The upper-``a`` point in a limit (see :func:`limit_regime`)."""
    if regime == "both":
        return 1.0
    if regime == "df1":  # a lower chi-square point of 0 (tiny alpha) puts x beyond any double
        low = float(special.gammaincinv(d2 / 2.0, a))
        return d2 / (2.0 * low) if low > 0.0 else math.inf
    return 2.0 * float(special.gammainccinv(d1 / 2.0, a)) / d1


# --------------------------------------------------------------------------------------------
# log-space pieces


def _stirling_correction(x: float) -> float:
    """``lgamma(x) - ((x - 1/2) ln x - x + ln sqrt(2 pi))`` for ``x >= 10`` (Stirling series)."""
    z = 1.0 / (x * x)
    return (
        1.0 / 12.0
        + z * (-1.0 / 360.0
        + z * (1.0 / 1260.0
        + z * (-1.0 / 1680.0
        + z * (1.0 / 1188.0
        + z * (-691.0 / 360360.0
        + z * (1.0 / 156.0
        + z * (-3617.0 / 122400.0)))))))
    ) / x


def _log_beta(a: float, b: float) -> float:
    """``ln B(a, b)`` without the cancellation of ``lgamma(a) + lgamma(b) - lgamma(a + b)``."""
    p, q = (a, b) if a <= b else (b, a)
    s = p + q
    if p >= 10.0:
        corr = _stirling_correction(p) + _stirling_correction(q) - _stirling_correction(s)
        return (
            -0.5 * math.log(q) + _HALF_LOG_2PI + corr
            + (p - 0.5) * math.log(p / s) + q * math.log1p(-p / s)
        )
    if q >= 10.0:
        corr = _stirling_correction(q) - _stirling_correction(s)
        return math.lgamma(p) + corr + p - p * math.log(s) + (q - 0.5) * math.log1p(-p / s)
    return math.lgamma(p) + math.lgamma(q) - math.lgamma(s)


def _beta_cf(a: float, b: float, w: float) -> float:
    """Continued fraction of ``I_w(a, b)`` (DLMF 8.17.22), modified Lentz; ``w < (a+1)/(a+b+2)``."""
    tiny = 1e-300
    eps = 2.0 ** -53
    qab, qap, qam = a + b, a + 1.0, a - 1.0
    c = 1.0
    d = 1.0 - qab * w / qap
    d = 1.0 / (d if abs(d) > tiny else tiny)
    h = d
    for m in range(1, _MAX_CF_TERMS):
        m2 = 2.0 * m
        aa = m * (b - m) * w / ((qam + m2) * (a + m2))
        d = 1.0 + aa * d
        d = 1.0 / (d if abs(d) > tiny else tiny)
        c = 1.0 + aa / c
        c = c if abs(c) > tiny else tiny
        h *= d * c
        aa = -(a + m) * (qab + m) * w / ((a + m2) * (qap + m2))
        d = 1.0 + aa * d
        d = 1.0 / (d if abs(d) > tiny else tiny)
        c = 1.0 + aa / c
        c = c if abs(c) > tiny else tiny
        de = d * c
        h *= de
        if abs(de - 1.0) <= eps:
            return h
    return math.nan  # not reached for w below the mode (convergence takes O(sqrt(a + b)) terms)


def _log_ratio(x: float, d1: float, d2: float) -> tuple[float, float]:
    """``(r, ln r)`` for ``r = d1 x / d2``; ``r`` may overflow to ``inf`` while ``ln r`` stays finite."""
    r = d1 * x / d2
    if math.isinf(r) or r == 0.0 or not (1e-300 < r < 1e300):
        return r, math.log(d1) + math.log(x) - math.log(d2)
    return r, math.log(r)


def _log1p_ratio(r: float, log_r: float) -> float:
    """``ln(1 + r)``, also when ``r`` itself overflowed."""
    if r > 1e300:
        return log_r + math.log1p(math.exp(-log_r))
    return math.log1p(r)


def _log_prefactor(a: float, b: float, r: float, log_r: float) -> float:
    """``ln(w^a (1-w)^b / (a B(a, b)))`` for ``w = 1/(1+r)``, computed without cancellation."""
    l1p = _log1p_ratio(r, log_r)
    log_w = -l1p
    log_1mw = -math.log1p(math.exp(-log_r)) if r > 1.0 else log_r - l1p
    return a * log_w + b * log_1mw - math.log(a) - _log_beta(a, b)


def _log_x_density(x: float, d1: float, d2: float) -> float:
    """``ln(x * pdf(x))`` of F(d1, d2): ``b ln r - (a + b) ln(1 + r) - ln B(a, b)``."""
    a, b = d2 / 2.0, d1 / 2.0
    r, log_r = _log_ratio(x, d1, d2)
    return b * log_r - (a + b) * _log1p_ratio(r, log_r) - _log_beta(a, b)


def _tail(x: float, d1: float, d2: float) -> float:
    """Upper tail at a finite ``x > 0`` (degrees of freedom already checked)."""
    a, b = d2 / 2.0, d1 / 2.0
    r, log_r = _log_ratio(x, d1, d2)
    if r == 0.0:
        return 1.0
    w = 1.0 / (1.0 + r) if r < 1e300 else math.exp(-_log1p_ratio(r, log_r))
    if w < (a + 1.0) / (a + b + 2.0):
        log_pre = _log_prefactor(a, b, r, log_r)
        if log_pre < _DEEP_LOG:
            cf = _beta_cf(a, b, w)
            if math.isfinite(cf) and cf > 0.0:
                return math.exp(log_pre + math.log(cf))
    if r > 1.0:
        # w is small: I_w(a, b) holds the tail without cancellation
        return float(special.betainc(a, b, w))
    # x is moderate: the tail is 1 - I_v(b, a) with v = 1 - w; use the complement directly
    v = r / (1.0 + r)
    return float(special.betaincc(b, a, v))


def f_tail(x: float, df1: float, df2: float) -> float:
    """P(F > x) for F ~ F(df1, df2), from the survival function (never ``1 - cdf``).

    ``x = inf`` gives 0; ``x <= 0`` gives 1. Relative accuracy is kept down to the smallest
    normal double (about 1e-308); see the module docstring.
    """
    d1, d2 = check_df(df1, df2)
    xv = as_real(x)
    if xv is None:
        raise InputError(f"the F value must be a number, not {shown(x)}")
    if math.isnan(xv):
        raise InputError("the F value is not a number (NaN)")
    if xv <= 0:
        return 1.0
    if math.isinf(xv):
        return 0.0
    regime = limit_regime(d1, d2)
    if regime == "none":
        raise _no_limit(df1, df2)
    p = _tail(xv, d1, d2) if regime is None else _limit_tail(xv, d1, d2, regime)
    if not 0.0 <= p <= 1.0:
        raise InputError(
            f"the F tail at {shown(x)} with df1 = {shown(df1)} and df2 = {shown(df2)} cannot be "
            "computed to full accuracy; check the degrees of freedom"
        )
    return p


def _newton_critical(x: float, a: float, d1: float, d2: float) -> float | None:
    """Newton's method on ``ln f_tail(e^t) = ln a`` from a good first value; None if it stalls."""
    target = math.log(a)
    t = math.log(x)
    for _ in range(12):
        xt = math.exp(t)
        if not math.isfinite(xt) or xt <= 0.0:
            return None
        tail = _tail(xt, d1, d2)
        if not (tail > 0.0):
            return None
        # d ln(tail) / dt = -x pdf(x) / tail
        slope = math.exp(_log_x_density(xt, d1, d2) - math.log(tail))
        if not (slope > 0.0 and math.isfinite(slope)):
            return None
        step = (math.log(tail) - target) / slope
        t += step
        if abs(step) <= 4e-16 * max(1.0, abs(t)):
            return math.exp(t)
        if abs(step) > 1.0:
            return None
    return None


def _solve_critical(a: float, d1: float, d2: float) -> float:
    """Root of ``ln f_tail(x) = ln a``: bracketed in ``ln x``, then refined in ``x``."""
    target = math.log(a)
    top = math.log(1.7976931348623157e308)

    def g(x: float) -> float:
        return math.log(max(f_tail(x, d1, d2), 5e-324)) - target

    # bracket [exp(lo), exp(hi)] with g > 0 at the left end and g <= 0 at the right end
    if g(1.0) > 0:
        lo, hi = 0.0, 1.0
        while g(math.exp(hi)) > 0:
            lo, hi = hi, 2.0 * hi
            if hi >= top:
                if g(1.7976931348623157e308) > 0:
                    return math.inf  # the critical value exceeds the largest double
                hi = top
                break
    else:
        lo, hi = -1.0, 0.0
        while g(math.exp(lo)) <= 0:
            hi, lo = lo, 2.0 * lo
            if lo < -740.0:
                return 0.0
    x_lo, x_hi = math.exp(lo), min(math.exp(hi), 1.7976931348623157e308)
    return optimize.brentq(g, x_lo, x_hi, xtol=1e-300, rtol=4.0 * 2.0 ** -52, maxiter=500)


def f_critical(alpha: float, df1: float, df2: float) -> float:
    """The x with P(F > x) = alpha for F ~ F(df1, df2); ``inf`` beyond the largest double."""
    d1, d2 = check_df(df1, df2)
    a = check_alpha(alpha)
    regime = limit_regime(d1, d2)
    if regime == "none":
        raise _no_limit(df1, df2)
    if regime is not None:
        return _checked_critical(_limit_critical(a, d1, d2, regime), alpha, df1, df2)
    with special.errstate(all="ignore"):
        if a < 0.5:
            w = float(special.betaincinv(d2 / 2.0, d1 / 2.0, a))  # w = d2 / (d2 + d1 x)
            x = (d2 / d1) * ((1.0 - w) / w) if 0.0 < w < 1.0 else math.nan
        else:
            v = float(special.betainccinv(d1 / 2.0, d2 / 2.0, a))  # v = d1 x / (d2 + d1 x)
            x = (d2 / d1) * (v / (1.0 - v)) if 0.0 < v < 1.0 else math.nan
    if math.isfinite(x) and x > 0.0:
        polished = _newton_critical(x, a, d1, d2)
        if polished is not None:
            return polished
    return _checked_critical(_solve_critical(a, d1, d2), alpha, df1, df2)


def _checked_critical(x: float, alpha: float, df1: float, df2: float) -> float:
    """A critical value, or an InputError when the solver found none (never NaN)."""
    if math.isnan(x) or x < 0.0:
        raise InputError(
            f"the critical F for alpha = {shown(alpha)} with df1 = {shown(df1)} and df2 = "
            f"{shown(df2)} cannot be computed to full accuracy; check the degrees of freedom"
        )
    return x
