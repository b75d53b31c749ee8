"""Maximum-type distributions for multiple comparisons: studentized range and many-to-one t.

Both distributions are scale mixtures. With ``S = sqrt(chi2_df / df)`` (the ratio of an
estimated to the true standard deviation, density ``f_df``), a statistic ``T = Z / S`` built
from normal variables ``Z`` has upper tail

    P(max-type(T) > c) = integral_0^inf f_df(s) P(max-type(Z) > c s) ds,

    f_df(s) = 2 (df/2)^(df/2) s^(df - 1) exp(-df s^2 / 2) / Gamma(df/2).

Studentized range (Tukey 1953; the double-integral form used, e.g., by Copenhaver & Holland
1988, *J. Statist. Comput. Simul.* 30, 1-15). For ``k`` independent standard normals with range
``R``,

    P(R > r) = k integral phi(z) [Phi(z)^(k-1) - (Phi(z) - Phi(z - r))^(k-1)] dz,

written as ``Phi(z)^(k-1) * (1 - (1 - Phi(z - r)/Phi(z))^(k-1))`` and evaluated with ``expm1``
and ``log1p`` so that the tail keeps its relative accuracy far below 1e-15 (never as one minus
the distribution function).

Many-to-one multivariate t (Dunnett 1955, *JASA* 50, 1096-1121). When the correlations have the
product form ``rho_ij = l_i l_j`` the normals can be written ``Z_j = l_j U + sqrt(1 - l_j^2) E_j``
with ``U, E_1, ..., E_m`` independent standard normals, so the two-sided probability reduces to
one integral over ``U``:

    P(max_j |Z_j| > h) = integral phi(u) [1 - prod_j (1 - q_j(u))] du,
    q_j(u) = Phi((l_j u - h)/s_j) + Phi((-h - l_j u)/s_j),   s_j = sqrt(1 - l_j^2),

again evaluated as ``-expm1(sum log1p(-q_j))`` for relative accuracy in the tail.

Numerical method (deterministic, no random numbers): the inner integrals use composite
10-point Gauss-Legendre panels (0.5 wide, finer across the steps of ``q_j``), over a range
outside of which the integrand is below 1e-17 of the result; the outer integral over ``s`` runs
from 0 to the point that ``S`` exceeds with probability 1e-17 (the tail is decreasing, so the
part left out is below 1e-17 of the result), by adaptive Gauss-Kronrod quadrature (QUADPACK,
through ``scipy.integrate.quad``, relative tolerance 1e-10) with break points across the body of
the density of ``S`` and around the peak of the integrand. Critical values are found by Brent's
method between the single-comparison and the Bonferroni bounds.
"""

from __future__ import annotations

import math
import warnings
from collections.abc import Callable, Sequence

import numpy as np
from scipy import integrate, optimize, special, stats

from .errors import InputError

__all__ = ["range_tail", "range_critical", "many_to_one_tail", "many_to_one_critical"]

_GL_X, _GL_W = np.polynomial.legendre.leggauss(10)
_LOG_SQRT_2PI = 0.5 * math.log(2.0 * math.pi)
_EPSREL = 1e-10


# --------------------------------------------------------------------------------------------
# helpers


def _panels(breaks: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Nodes and weights of 10-point Gauss-Legendre panels between consecutive break points."""
    a, b = breaks[:-1], breaks[1:]
    half = 0.5 * (b - a)
    mid = 0.5 * (b + a)
    x = (mid[:, None] + half[:, None] * _GL_X[None, :]).ravel()
    w = (half[:, None] * _GL_W[None, :]).ravel()
    return x, w


def _breaks(lo: float, hi: float, features: Sequence[tuple[float, float]] = ()) -> np.ndarray:
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
        return math.lgamma(h) - ((h - 0.5) * math.log(h) - h + _LOG_SQRT_2PI)
    r = 1.0 / (h * h)
    return (1.0 / h) * (1.0 / 12 - r * (1.0 / 360 - r * (1.0 / 1260 - r / 1680)))


def _scale_logpdf(s: float, df: float) -> float:
    """Log density of ``S = sqrt(chi2_df / df)`` at ``s > 0``, without cancellation for big df."""
    h = 0.5 * df
    e = (s - 1.0) * (s + 1.0)  # s^2 - 1
    log_s2 = math.log1p(e) if abs(e) < 0.5 else 2.0 * math.log(s)
    # log 2 + h log h - lgamma(h) + (df - 1) log s - h s^2, rearranged
    return (
        math.log(2.0) + 0.5 * math.log(h) - _LOG_SQRT_2PI - _stirling_tail(h)
        + h * (log_s2 - e) - 0.5 * log_s2
    )


def _check_df(df: float) -> float:
    try:
        v = float(df)
    except (TypeError, ValueError):
        raise InputError(f"sheetfuncs: degrees of freedom must be a number, not {df!r}") from None
    if math.isnan(v) or v <= 0:
        raise InputError(f"sheetfuncs: degrees of freedom must be positive, not {df!r}")
    return v


def _scale_mixture(tail: Callable[[float], float], c: float, df: float) -> float:
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
            f"sheetfuncs: the quadrature did not converge (c={c!r}, df={df!r}, estimate {val!r} "
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


def _check_alpha(alpha: float) -> float:
    a = float(alpha)
    if not (0.0 < a < 1.0):
        raise InputError(f"sheetfuncs: alpha must lie strictly between 0 and 1, not {alpha!r}")
    return a


# --------------------------------------------------------------------------------------------
# studentized range


def _fixed_panels(lo: float, hi: float) -> tuple[np.ndarray, np.ndarray]:
    return _panels(_breaks(lo, hi))


# the range integrand lives within 8.5 of z = r/2 (see _range_tail_normal): one fixed grid
_RANGE_Y, _RANGE_W = _fixed_panels(-8.5, 8.5)


def _range_tail_normal(r: float, k: int) -> float:
    """P(R > r) for the range R of k independent standard normal variables.

    The integrand is below ``k^2 phi(z) Phi(z - r) <= k^2 exp(-(z - r/2)^2 - r^2/4) / (2 pi)``,
    while the result is at least ``2 Phi(-r / sqrt 2)``, and below ``phi(z)`` everywhere; so
    ``z`` in ``r/2 +/- 8.5`` loses less than 1e-17 of the result for every ``r >= 0``.
    """
    if r <= 0.0:
        return 1.0
    z = _RANGE_Y + 0.5 * r
    la = special.log_ndtr(z)
    lb = special.log_ndtr(z - r)
    ratio = np.exp(np.minimum(lb - la, 0.0))
    with np.errstate(divide="ignore"):
        term = -np.expm1((k - 1) * np.log1p(-ratio))
    logf = math.log(k) - 0.5 * z * z - _LOG_SQRT_2PI + (k - 1) * la
    return float(np.dot(_RANGE_W, np.exp(logf) * term))


def range_tail(q: float, k: int, df: float) -> float:
    """P(Q > q) for the studentized range Q of k means with df degrees of freedom.

    ``df`` may be ``inf`` (known variance). Accurate in relative terms far into the tail.
    """
    kk = int(k)
    if kk != k or kk < 2:
        raise InputError(f"sheetfuncs: the studentized range needs k >= 2 means, not {k!r}")
    d = _check_df(df)
    qv = float(q)
    if math.isnan(qv):
        raise InputError("sheetfuncs: the studentized range value is not a number (NaN)")
    return _scale_mixture(lambda r: _range_tail_normal(r, kk), qv, d)


def range_critical(alpha: float, k: int, df: float) -> float:
    """The q with P(Q > q) = alpha for the studentized range of k means with df df."""
    a = _check_alpha(alpha)
    kk = int(k)
    if kk != k or kk < 2:
        raise InputError(f"sheetfuncs: the studentized range needs k >= 2 means, not {k!r}")
    d = _check_df(df)
    t = stats.norm if math.isinf(d) else stats.t(d)
    lo = 0.999 * math.sqrt(2.0) * float(t.isf(a / 2.0))
    hi = 1.001 * math.sqrt(2.0) * float(t.isf(a / (kk * (kk - 1))))
    return _solve(lambda c: range_tail(c, kk, d), a, lo, hi)


# --------------------------------------------------------------------------------------------
# many-to-one (Dunnett)


def _check_lambdas(lambdas: Sequence[float]) -> tuple[np.ndarray, np.ndarray]:
    lam = np.asarray([float(v) for v in lambdas], dtype=np.float64)
    if lam.size < 1:
        raise InputError("sheetfuncs: the many-to-one distribution needs at least one comparison")
    if not np.all((lam >= 0.0) & (lam < 1.0)):
        raise InputError("sheetfuncs: correlation factors must lie in [0, 1)")
    return lam, np.sqrt((1.0 - lam) * (1.0 + lam))


def _many_to_one_tail_normal(h: float, lam: np.ndarray, sig: np.ndarray) -> float:
    """P(max_j |Z_j| > h) for standard normals with correlations lam_i lam_j."""
    if h <= 0.0:
        return 1.0
    hi = math.sqrt(h * h + 80.0)
    feats = [(h / l, s / l) for l, s in zip(lam.tolist(), sig.tolist()) if l > 0.0]
    u, w = _panels(_breaks(0.0, hi, feats))
    lu = u[:, None] * lam[None, :]
    q = special.ndtr((lu - h) / sig) + special.ndtr((-h - lu) / sig)
    with np.errstate(divide="ignore"):
        login = np.log1p(-np.minimum(q, 1.0)).sum(axis=1)
    outside = -np.expm1(login)
    dens = np.exp(-0.5 * u * u - _LOG_SQRT_2PI)
    return float(2.0 * np.dot(w, dens * outside))


def many_to_one_tail(c: float, lambdas: Sequence[float], df: float) -> float:
    """P(max_j |T_j| > c), T multivariate t with df df and correlations l_i l_j (two-sided).

    For Dunnett's comparisons of m treatments with a control of size n_0,
    ``l_i = sqrt(n_i / (n_i + n_0))``.
    """
    lam, sig = _check_lambdas(lambdas)
    d = _check_df(df)
    cv = float(c)
    if math.isnan(cv):
        raise InputError("sheetfuncs: the many-to-one statistic is not a number (NaN)")
    return _scale_mixture(lambda h: _many_to_one_tail_normal(h, lam, sig), abs(cv), d)


def many_to_one_critical(alpha: float, lambdas: Sequence[float], df: float) -> float:
    """The two-sided critical value c with P(max_j |T_j| > c) = alpha."""
    a = _check_alpha(alpha)
    lam, sig = _check_lambdas(lambdas)
    d = _check_df(df)
    m = lam.size
    t = stats.norm if math.isinf(d) else stats.t(d)
    lo = 0.999 * float(t.isf(a / 2.0))
    hi = 1.001 * float(t.isf(a / (2.0 * m)))
    return _solve(
        lambda c: _scale_mixture(lambda h: _many_to_one_tail_normal(h, lam, sig), c, d), a, lo, hi
    )
