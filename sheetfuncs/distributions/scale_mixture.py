"""The shared quadrature of maximum-type scale mixtures: the studentized range and many-to-one t.

Both distributions are scale mixtures. With ``S = sqrt(chi2_df / df)`` (the ratio of an
estimated to the true standard deviation, density ``f_df``), a statistic ``T = Z / S`` built
from normal variables ``Z`` has upper tail

    P(max-type(T) > c) = integral_0^inf f_df(s) P(max-type(Z) > c s) ds,

    f_df(s) = 2 (df/2)^(df/2) s^(df - 1) exp(-df s^2 / 2) / Gamma(df/2).

The known-variance tail of each distribution, the inner integral, lives in its own module:
:mod:`.studentized_range` (Tukey 1953) and :mod:`.many_to_one` (Dunnett 1955). This module
integrates such a tail over the distribution of ``S`` and inverts the result.

Numerical method (deterministic, no random numbers). The inner integrals use composite
10-point Gauss-Legendre panels (0.5 wide, finer across the steps of ``q_j``), over a range
outside of which the integrand is below 1e-17 of the result.

The outer integral is taken in ``t = log s``, where the integrand ``w_df(t) tail(c e^t)``
(``w_df`` the density of ``log S``) is smooth, bell-shaped and decays at least exponentially
on both sides, by the trapezoid rule: for such integrands its error falls like
``exp(-2 pi d / h)`` with the step ``h`` (Trefethen & Weideman 2014, *SIAM Review* 56,
385-458). The rule is truncated where simple bounds on the tail (one pair, and Bonferroni's
sum over all pairs) show that the integrand is below ``exp(-45)`` of its peak. The nodes sit on
one grid in ``log r = log c + t`` shared by every argument of a call, so one evaluation of the
inner tail at a node serves every statistic, degrees of freedom and Newton step that needs it.
Error guard: each sum is compared with the sum over every other node (step ``2h``, which the
rule contains); it is accepted when the two agree to 1e-7 relative, which, the error being
squared when the step halves, leaves the accepted sum accurate far below 1e-10. Otherwise the
step is halved; an argument that still fails, or whose degrees of freedom make the grid
unreasonable, is integrated by adaptive Gauss-Kronrod quadrature (QUADPACK, through
``scipy.integrate.quad``, relative tolerance 1e-10) over ``s`` from 0 to the point that ``S``
exceeds with probability 1e-17 (the tail is decreasing, so the part left out is below 1e-17 of
the result), and a case where that too does not converge raises an error rather than give a
wrong number.

Critical values are found by Newton's method on ``log P`` against ``log c`` (the derivative
comes from the same nodes: ``dP / dlog c = df E[(S^2 - 1) tail(c S)]``), safeguarded by
bisection inside the single-comparison and Bonferroni bounds, for many degrees of freedom at
once; Brent's method on the same bracket serves known variance (``df = inf``) and the
fallback.
"""

from __future__ import annotations

import math
import warnings
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from typing import Any

import numpy as np
from scipy import integrate, optimize, special, stats

from ..errors import InputError

__all__ = [
    "Family", "mixture_tails", "mixture_criticals", "gauss_legendre_panels", "panel_breaks",
    "check_scale_df", "check_scale_dfs", "check_statistics", "check_tail_alpha",
    "GL_X", "GL_W", "LOG_SQRT_2PI",
]

#: Nodes and weights of the 10-point Gauss-Legendre rule on [-1, 1].
GL_X, GL_W = np.polynomial.legendre.leggauss(10)
LOG_SQRT_2PI = 0.5 * math.log(2.0 * math.pi)
_EPSREL = 1e-10


# --------------------------------------------------------------------------------------------
# helpers


def gauss_legendre_panels(breaks: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Nodes and weights of 10-point Gauss-Legendre panels between consecutive break points."""
    a, b = breaks[:-1], breaks[1:]
    half = 0.5 * (b - a)
    mid = 0.5 * (b + a)
    x = (mid[:, None] + half[:, None] * GL_X[None, :]).ravel()
    w = (half[:, None] * GL_W[None, :]).ravel()
    return x, w


def panel_breaks(lo: float, hi: float, features: Sequence[tuple[float, float]] = ()) -> np.ndarray:
    """Break points 0.5 apart on [lo, hi], closer (one feature width) around each feature."""
    parts = [np.linspace(lo, hi, max(2, int(math.ceil((hi - lo) / 0.5)) + 1))]
    for centre, width in features:
        if width >= 0.5:
            continue
        a = max(lo, centre - 10.0 * width)
        b = min(hi, centre + 10.0 * width)
        if b > a:
            parts.append(np.linspace(a, b, int(math.ceil((b - a) / width)) + 1))
    br = np.unique(np.concatenate(parts))
    keep = np.concatenate(([True], np.diff(br) > 1e-12 * max(1.0, abs(hi))))
    br = br[keep]
    br[-1] = hi
    return br


def _stirling_tail(h: float) -> float:
    """``lgamma(h) - ((h - 1/2) log h - h + log sqrt(2 pi))``, accurate for every h > 0."""
    if h < 20.0:
        return math.lgamma(h) - ((h - 0.5) * math.log(h) - h + LOG_SQRT_2PI)
    r = 1.0 / (h * h)
    return (1.0 / h) * (1.0 / 12 - r * (1.0 / 360 - r * (1.0 / 1260 - r / 1680)))


def _scale_logpdf(s: float, df: float) -> float:
    """Log density of ``S = sqrt(chi2_df / df)`` at ``s > 0``, without cancellation for big df."""
    h = 0.5 * df
    e = (s - 1.0) * (s + 1.0)  # s^2 - 1
    log_s2 = math.log1p(e) if abs(e) < 0.5 else 2.0 * math.log(s)
    # log 2 + h log h - lgamma(h) + (df - 1) log s - h s^2, rearranged
    return (
        math.log(2.0) + 0.5 * math.log(h) - LOG_SQRT_2PI - _stirling_tail(h)
        + h * (log_s2 - e) - 0.5 * log_s2
    )


def check_scale_df(df: float) -> float:
    """One positive number of degrees of freedom (``inf`` = known variance), else InputError."""
    try:
        v = float(df)
    except (TypeError, ValueError):
        raise InputError(f"degrees of freedom must be a number, not {df!r}") from None
    if math.isnan(v) or v <= 0:
        raise InputError(f"degrees of freedom must be positive, not {df!r}")
    return v


def _adaptive_mixture(tail: Callable[[float], float], c: float, df: float) -> float:
    """``E[tail(c S)]`` with ``S = sqrt(chi2_df / df)``; ``df = inf`` means ``S = 1``."""
    if c <= 0.0:
        return 1.0
    if math.isinf(c):
        return 0.0
    if math.isinf(df):
        return min(1.0, tail(c))
    s_hi = math.sqrt(stats.chi2.isf(1e-17, df) / df)
    # break points: across the body of the density of S (its spread is about 1/sqrt(2 df), so
    # for large df the density is a narrow spike that must not fall inside one long interval),
    # and around the peak of f(s) tail(c s), which moves towards 0 as c grows
    sd = 1.0 / math.sqrt(2.0 * df)
    pts = [1.0 + j * sd for j in (-10.0, -6.0, -3.0, -1.0, 0.0, 1.0, 3.0, 6.0)]
    peak = math.sqrt(max(df - 1.0, 0.0) / (df + c * c))
    spread = 1.0 / math.sqrt(2.0 * (df + c * c))
    pts += [peak - 3 * spread, peak, peak + 3 * spread]
    pts += [x / c for x in (2.0, 5.0, 10.0)]
    pts = sorted({p for p in pts if 1e-3 * sd < p < s_hi * (1 - 1e-12)})

    def integrand(s: float) -> float:  # Gauss-Kronrod never evaluates the end points
        return math.exp(_scale_logpdf(s, df)) * tail(c * s)

    with warnings.catch_warnings():
        warnings.simplefilter("ignore", integrate.IntegrationWarning)
        val, err = integrate.quad(
            integrand, 0.0, s_hi, points=pts or None, epsabs=0.0, epsrel=_EPSREL, limit=400
        )
    if val > 1e-290 and err > 1e-7 * val:
        # never seen on the tested range of arguments; a wrong number must not pass silently
        raise ArithmeticError(
            f"the quadrature did not converge (c={c!r}, df={df!r}, estimate {val!r} "
            f"+/- {err!r}); please report this case"
        )
    return min(1.0, max(0.0, val))


def _solve(tail: Callable[[float], float], alpha: float, lo: float, hi: float) -> float:
    """The c with ``tail(c) = alpha``, tail decreasing, bracketed by ``[lo, hi]``."""
    target = math.log(alpha)
    seen: dict[float, float] = {}

    def f(c: float) -> float:  # remembered: the bracket checks and Brent share end points
        if c not in seen:
            p = tail(c)
            seen[c] = (math.log(p) if p > 0 else -1e308) - target
        return seen[c]

    for _ in range(60):
        if f(lo) > 0:
            break
        lo *= 0.8
    for _ in range(60):
        if f(hi) < 0:
            break
        hi *= 1.25
    return float(optimize.brentq(f, lo, hi, xtol=1e-13, rtol=1e-12, maxiter=200))


def check_tail_alpha(alpha: float) -> float:
    """An upper-tail probability strictly between 0 and 1, else InputError."""
    a = float(alpha)
    if not (0.0 < a < 1.0):
        raise InputError(f"alpha must lie strictly between 0 and 1, not {alpha!r}")
    return a


def check_statistics(values: Any, what: str) -> np.ndarray:
    """A 1-D float array of statistics; NaN is refused."""
    out = np.array([float(v) for v in np.ravel(np.asarray(values, dtype=object))], dtype=float)
    if np.isnan(out).any():
        raise InputError(f"the {what} is not a number (NaN)")
    return out


def check_scale_dfs(df: Any, size: int) -> np.ndarray:
    """Degrees of freedom, one per statistic (a single value serves all)."""
    vals = [check_scale_df(v) for v in np.ravel(np.asarray(df, dtype=object))]
    if len(vals) == 1:
        return np.full(size, vals[0])
    if len(vals) != size:
        raise InputError(
            f"{len(vals)} degrees of freedom were given for {size} statistics; give "
            "one value, or one per statistic"
        )
    return np.array(vals, dtype=float)

# --------------------------------------------------------------------------------------------
# the outer integral: trapezoid rule in log s on one grid shared by every argument of a call

_H0 = 0.125  # the coarsest step in t = log s
_FIRST_STEP = 0.5  # the first step, in widths 1/sqrt(2 df + kappa) of the integrand's peak
_FINEST = 30  # grid keys count steps of base / 2**_FINEST, so every level's nodes share keys
_LOG_CUT = 45.0  # the rule stops where the integrand is below exp(-45) of its peak
_GUARD = 1e-7  # the sums on every node and on every other node must agree to this, relatively
_REFINE = 5  # step halvings tried before the adaptive quadrature takes over
_MAX_NODES = 40000  # per argument; beyond that the adaptive quadrature takes over
_MIN_DF = 0.05  # below this the density of log S decays too slowly for the grid
_BISECT = 40  # bisection steps that place each rule's peak and ends (to 1e-12 of the bracket)


def _x_minus_expm1(x: np.ndarray) -> np.ndarray:
    """``x - (e^x - 1)`` without cancellation near 0 (the series below |x| = 1/4)."""
    out = x - np.expm1(x)
    small = np.abs(x) < 0.25
    if small.any():
        xs = x[small]
        acc = np.full(xs.shape, 1.0 / math.factorial(20))
        for n in range(19, 1, -1):  # sum_{n>=2} x^n/n!, Horner; the terms left out are < 1e-30
            acc = 1.0 / math.factorial(n) + xs * acc
        out[small] = -xs * xs * acc
    return out


def _log_w_const(df: np.ndarray) -> np.ndarray:
    """The constant of ``log w_df(t) = const + (df/2) (2t - expm1(2t))``, w the density of log S."""
    h = 0.5 * df
    st = np.empty_like(h)
    small = h < 20.0
    hs = h[small]
    st[small] = special.gammaln(hs) - ((hs - 0.5) * np.log(hs) - hs + LOG_SQRT_2PI)
    hb = h[~small]
    r = 1.0 / (hb * hb)
    st[~small] = (1.0 / hb) * (1.0 / 12 - r * (1.0 / 360 - r * (1.0 / 1260 - r / 1680)))
    return math.log(2.0) + 0.5 * np.log(h) - LOG_SQRT_2PI - st


@dataclass(frozen=True)
class Family:
    """One maximum-type distribution: its inner tail and the bounds that place the nodes.

    ``inner(r)`` is the known-variance tail at an array of ``r > 0``; every marginal
    comparison is ``|N(0, rho^2)| > r``, so the tail lies between ``2 Phi(-r/rho)`` (one
    comparison) and ``count`` times that (Bonferroni); ``kappa`` is a bound on the extra
    curvature of ``log inner(e^u)`` in its body beyond the normal tail's (it sets the first
    step; the error guard refines it where needed); ``scalar`` the same tail for one ``r``.
    """

    inner: Callable[[np.ndarray], np.ndarray]
    scalar: Callable[[float], float]
    rho: float
    count: int
    kappa: float


class _Table:
    """The inner tail at grid keys, each computed once per call (not shared between calls).

    Node ``key`` sits at ``log r = key * base / 2**_FINEST``; ``base`` (the coarsest step,
    at most ``_H0``) is fixed by the first arguments that use the table.
    """

    def __init__(self, inner: Callable[[np.ndarray], np.ndarray]) -> None:
        self._inner = inner
        self._keys = np.empty(0, dtype=np.int64)
        self._vals = np.empty(0, dtype=float)
        self.base = 0.0

    def __call__(self, keys: np.ndarray) -> np.ndarray:
        uk, inv = np.unique(keys, return_inverse=True)
        pos = np.searchsorted(self._keys, uk)
        found = np.zeros(uk.size, dtype=bool)
        inside = pos < self._keys.size
        found[inside] = self._keys[pos[inside]] == uk[inside]
        new = uk[~found]
        if new.size:
            vals = self._inner(np.exp(new * (self.base / 2.0**_FINEST)))
            allk = np.concatenate((self._keys, new))
            allv = np.concatenate((self._vals, vals))
            order = np.argsort(allk, kind="stable")
            self._keys, self._vals = allk[order], allv[order]
            pos = np.searchsorted(self._keys, uk)
        return self._vals[pos][inv]


def _regions(c: np.ndarray, df: np.ndarray, const: np.ndarray, fam: Family
             ) -> tuple[np.ndarray, np.ndarray]:
    """``[t_a, t_b]`` outside which ``w_df(t) tail(c e^t)`` is below exp(-45) of its peak.

    Both bounds on the tail are log-concave in ``t``, as is ``w_df``; the peak of the lower
    bound's integrand (a lower bound of the true peak) is found by bisection on its slope, and
    the crossings of the upper bound's integrand with exp(-45) times it by bisection from
    points where simple bounds on ``w_df`` lie below that level.
    """
    hh = 0.5 * df
    log_n = math.log(fam.count)

    def log_one(t: np.ndarray) -> np.ndarray:
        return math.log(2.0) + special.log_ndtr(-c * np.exp(t) / fam.rho)

    def log_w(t: np.ndarray) -> np.ndarray:
        return const + hh * _x_minus_expm1(2.0 * t)

    def upper(t: np.ndarray) -> np.ndarray:
        return log_w(t) + np.minimum(0.0, log_n + log_one(t))

    def slope(t: np.ndarray) -> np.ndarray:
        x = c * np.exp(t) / fam.rho
        mills = np.exp(-0.5 * x * x - LOG_SQRT_2PI - special.log_ndtr(-x))
        return -df * np.expm1(2.0 * t) - x * mills

    lo = np.minimum(-1.0, -np.log(c) - 8.0)
    hi = np.zeros_like(c)
    for _ in range(_BISECT):
        mid = 0.5 * (lo + hi)
        up = slope(mid) > 0.0
        lo, hi = np.where(up, mid, lo), np.where(up, hi, mid)
    tm = 0.5 * (lo + hi)
    level = log_w(tm) + log_one(tm) - _LOG_CUT
    a = np.minimum(tm - 1.0, (level - const - hh) / df - 1.0)  # log w <= const + df t + df/2
    b = tm.copy()
    for _ in range(_BISECT):
        mid = 0.5 * (a + b)
        above = upper(mid) >= level
        a, b = np.where(above, a, mid), np.where(above, mid, b)
    t_a = a
    a = tm.copy()
    b = np.maximum(tm, 0.0) + np.sqrt(np.maximum(const - level, 0.0) / df) + 1.0  # log w <= const - df t^2
    for _ in range(_BISECT):
        mid = 0.5 * (a + b)
        above = upper(mid) >= level
        a, b = np.where(above, mid, a), np.where(above, b, mid)
    return t_a, b


def _evaluate(c: np.ndarray, df: np.ndarray, const: np.ndarray, t_a: np.ndarray,
              t_b: np.ndarray, level: np.ndarray, table: _Table
              ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Trapezoid sums on step h = base / 2**level and on step 2h, and dP/dlog c, per argument."""
    m = c.size
    hl = table.base / np.exp2(level)
    lc = np.log(c)
    i_lo = np.ceil((lc + t_a) / hl).astype(np.int64)
    i_hi = np.floor((lc + t_b) / hl).astype(np.int64)
    count = np.maximum(i_hi - i_lo + 1, 0)
    which = np.repeat(np.arange(m), count)
    first = np.cumsum(count) - count
    i = i_lo[which] + (np.arange(which.size) - first[which])
    keys = np.left_shift(i, (_FINEST - level).astype(np.int64)[which])
    t = i * hl[which] - lc[which]
    terms = np.exp(const[which] + 0.5 * df[which] * _x_minus_expm1(2.0 * t)) * table(keys)
    fine = np.bincount(which, terms, minlength=m) * hl
    coarse = np.bincount(which, np.where(i % 2 == 0, terms, 0.0), minlength=m) * (2.0 * hl)
    deriv = df * np.bincount(which, terms * np.expm1(2.0 * t), minlength=m) * hl
    return fine, coarse, deriv


def _mixture(c: np.ndarray, df: np.ndarray, fam: Family, table: _Table
             ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """``(P, dP/dlog c, accepted)`` for ``0 < c < inf`` and finite df, on the shared grid."""
    m = c.size
    p = np.full(m, np.nan)
    dp = np.full(m, np.nan)
    ok = np.zeros(m, dtype=bool)
    todo = df >= _MIN_DF
    if not todo.any():
        return p, dp, ok
    const = np.zeros(m)
    t_a = np.zeros(m)
    t_b = np.zeros(m)
    idx = np.flatnonzero(todo)
    const[idx] = _log_w_const(df[idx])
    t_a[idx], t_b[idx] = _regions(c[idx], df[idx], const[idx], fam)
    span = t_b - t_a
    with np.errstate(divide="ignore", invalid="ignore"):
        want = _FIRST_STEP * np.minimum.reduce([
            np.full(m, 2.0 * _H0), 1.0 / np.sqrt(2.0 * df + fam.kappa), span / 20.0,
        ])
    if table.base == 0.0:  # the first use: the coarsest step that the arguments want
        table.base = float(np.max(want[todo]))
    with np.errstate(divide="ignore", invalid="ignore"):
        level = np.maximum(0, np.ceil(np.log2(table.base / want))).astype(np.int64)
    reach = np.abs(np.log(c)) + np.maximum(np.abs(t_a), np.abs(t_b))  # the largest |log r|
    for _ in range(_REFINE + 1):
        todo &= (level <= _FINEST) & (span / (table.base / np.exp2(level)) <= _MAX_NODES)
        todo &= reach < table.base * 2.0 ** (60 - _FINEST)  # keys stay far inside int64
        idx = np.flatnonzero(todo)
        if idx.size == 0:
            break
        fine, coarse, deriv = _evaluate(
            c[idx], df[idx], const[idx], t_a[idx], t_b[idx], level[idx], table
        )
        good = (np.abs(fine - coarse) <= _GUARD * fine) | (fine < 1e-290)
        done = idx[good]
        p[done], dp[done], ok[done] = fine[good], deriv[good], True
        todo[done] = False
        level[idx[~good]] += 1
    return p, dp, ok


def mixture_tails(c: np.ndarray, df: np.ndarray, fam: Family) -> np.ndarray:
    """Upper tails at ``c`` (c >= 0 or inf) with degrees of freedom ``df`` (may be inf)."""
    out = np.empty(c.size)
    out[c <= 0.0] = 1.0
    out[np.isposinf(c)] = 0.0
    body = (c > 0.0) & np.isfinite(c)
    known = body & np.isinf(df)
    if known.any():
        out[known] = np.minimum(1.0, fam.inner(c[known]))
    idx = np.flatnonzero(body & ~known)
    if idx.size:
        p, _, ok = _mixture(c[idx], df[idx], fam, _Table(fam.inner))
        out[idx[ok]] = np.clip(p[ok], 0.0, 1.0)
        for j in idx[~ok]:
            out[j] = _adaptive_mixture(fam.scalar, float(c[j]), float(df[j]))
    return out


def mixture_criticals(alpha: float, df: np.ndarray, lo: np.ndarray, hi: np.ndarray, fam: Family
               ) -> np.ndarray:
    """The c with tail(c) = alpha for each df, bracketed by [lo, hi] (hi at most 1.001 x
    Bonferroni's value, from which Newton starts)."""
    out = np.full(df.size, np.nan)
    target = math.log(alpha)
    act = np.flatnonzero(np.isfinite(df) & (df >= _MIN_DF))
    table = _Table(fam.inner)
    v = np.log(hi[act] / 1.001)
    v_lo, v_hi = np.log(lo[act]), np.log(hi[act])
    for _ in range(60):
        if act.size == 0:
            break
        p, dp, ok = _mixture(np.exp(v), df[act], fam, table)
        with np.errstate(divide="ignore", invalid="ignore"):
            g = np.log(p) - target
            step = -g * p / dp
        v_lo = np.where(ok & (g > 0.0), v, v_lo)
        v_hi = np.where(ok & (g <= 0.0), v, v_hi)
        new = v + step
        conv = ok & (np.abs(step) < 1e-8)  # then the error of `new` is of order step^2
        bad = ~np.isfinite(new) | (new < v_lo) | (new > v_hi)
        new = np.where(bad & ~conv, 0.5 * (v_lo + v_hi), new)
        out[act[conv]] = np.exp(new[conv])
        keep = ok & ~conv
        act, v, v_lo, v_hi = act[keep], new[keep], v_lo[keep], v_hi[keep]
    for j in np.flatnonzero(np.isnan(out)):  # known variance, and the fallback
        d = float(df[j])
        if math.isinf(d):
            def tail(x: float) -> float:
                return min(1.0, fam.scalar(x))
        else:
            def tail(x: float, d: float = d) -> float:
                return _adaptive_mixture(fam.scalar, x, d)
        out[j] = _solve(tail, alpha, float(lo[j]), float(hi[j]))
    return out
