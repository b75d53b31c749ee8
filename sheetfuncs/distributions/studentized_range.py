"""The studentized range: upper tail and critical values for the range of k means.

Studentized range (Tukey 1953; the double-integral form used, e.g., by Copenhaver & Holland
1988, *J. Statist. Comput. Simul.* 30, 1-15). For ``k`` independent standard normals with range
``R``,

    P(R > r) = k integral phi(z) [Phi(z)^(k-1) - (Phi(z) - Phi(z - r))^(k-1)] dz,

written as ``Phi(z)^(k-1) * (1 - (1 - Phi(z - r)/Phi(z))^(k-1))`` and evaluated with ``expm1``
and ``log1p`` so that the tail keeps its relative accuracy far below 1e-15 (never as one minus
the distribution function).

The studentized statistic divides the range by ``S = sqrt(chi2_df / df)``; its tail, a scale
mixture of the one above, is integrated and inverted by :mod:`.scale_mixture`.
"""

from __future__ import annotations

import math
from typing import Any

import numpy as np
from scipy import special, stats

from ..errors import InputError
from .scale_mixture import (
    LOG_SQRT_2PI, Family, check_scale_df, check_scale_dfs, check_statistics, check_tail_alpha,
    gauss_legendre_panels, mixture_criticals, mixture_tails, panel_breaks,
)

__all__ = ["range_tail", "range_tails", "range_critical", "range_criticals"]


def _check_k(k: int) -> int:
    kk = int(k)
    if kk != k or kk < 2:
        raise InputError(f"the studentized range needs k >= 2 means, not {k!r}")
    return kk


def _fixed_panels(lo: float, hi: float) -> tuple[np.ndarray, np.ndarray]:
    return gauss_legendre_panels(panel_breaks(lo, hi))


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
    return float(_range_tail_normal_many(np.array([r]), k)[0])


def _range_tail_normal_many(r: np.ndarray, k: int) -> np.ndarray:
    """:func:`_range_tail_normal` at an array of ``r > 0``, in blocks of rows."""
    out = np.empty(r.size)
    step = 1024
    for s in range(0, r.size, step):
        rr = r[s:s + step, None]
        z = _RANGE_Y[None, :] + 0.5 * rr
        la = special.log_ndtr(z)
        lb = special.log_ndtr(z - rr)
        ratio = np.exp(np.minimum(lb - la, 0.0))
        with np.errstate(divide="ignore"):
            term = -np.expm1((k - 1) * np.log1p(-ratio))
        logf = math.log(k) - 0.5 * z * z - LOG_SQRT_2PI + (k - 1) * la
        out[s:s + step] = (np.exp(logf) * term) @ _RANGE_W
    return out


def _range_family(k: int) -> Family:
    return Family(
        inner=lambda r: _range_tail_normal_many(r, k),
        scalar=lambda r: _range_tail_normal(r, k),
        rho=math.sqrt(2.0), count=k * (k - 1) // 2, kappa=2.0 + 0.25 * k,
    )


def range_tails(q: Any, k: int, df: Any) -> np.ndarray:
    """P(Q > q) at many values ``q`` (array-like) for the studentized range of k means.

    ``df`` is one value for all, or one per ``q`` (``inf`` = known variance). One call shares
    the inner integrals between all arguments, so a whole family of comparisons costs little
    more than one.
    """
    kk = _check_k(k)
    qv = check_statistics(q, "studentized range value")
    return mixture_tails(qv, check_scale_dfs(df, qv.size), _range_family(kk))


def range_tail(q: float, k: int, df: float) -> float:
    """P(Q > q) for the studentized range Q of k means with df degrees of freedom.

    ``df`` may be ``inf`` (known variance). Accurate in relative terms far into the tail.
    """
    kk = _check_k(k)
    d = check_scale_df(df)
    qv = float(q)
    if math.isnan(qv):
        raise InputError("the studentized range value is not a number (NaN)")
    return float(mixture_tails(np.array([qv]), np.array([d]), _range_family(kk))[0])


def range_criticals(alpha: float, k: int, df: Any) -> np.ndarray:
    """The q with P(Q > q) = alpha for each of many degrees of freedom (array-like)."""
    a = check_tail_alpha(alpha)
    kk = _check_k(k)
    dfs = np.array([check_scale_df(v) for v in np.ravel(np.asarray(df, dtype=object))], dtype=float)
    tq = np.where(np.isinf(dfs), 1.0, dfs)
    lo = np.where(np.isinf(dfs), stats.norm.isf(a / 2.0), stats.t.isf(a / 2.0, tq))
    hi = np.where(np.isinf(dfs), stats.norm.isf(a / (kk * (kk - 1))),
                  stats.t.isf(a / (kk * (kk - 1)), tq))
    s2 = math.sqrt(2.0)
    return mixture_criticals(a, dfs, 0.999 * s2 * lo, 1.001 * s2 * hi, _range_family(kk))


def range_critical(alpha: float, k: int, df: float) -> float:
    """The q with P(Q > q) = alpha for the studentized range of k means with df df."""
    a = check_tail_alpha(alpha)
    kk = _check_k(k)
    d = check_scale_df(df)
    return float(range_criticals(a, kk, [d])[0])
