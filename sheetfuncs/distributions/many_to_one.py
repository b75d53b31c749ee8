"""Dunnett's many-to-one t: upper tail and critical values for comparisons with a control.

Many-to-one multivariate t (Dunnett 1955, *JASA* 50, 1096-1121). When the correlations have the
product form ``rho_ij = l_i l_j`` the normals can be written ``Z_j = l_j U + sqrt(1 - l_j^2) E_j``
with ``U, E_1, ..., E_m`` independent standard normals, so the two-sided probability reduces to
one integral over ``U``:

    P(max_j |Z_j| > h) = integral phi(u) [1 - prod_j (1 - q_j(u))] du,
    q_j(u) = Phi((l_j u - h)/s_j) + Phi((-h - l_j u)/s_j),   s_j = sqrt(1 - l_j^2),

again evaluated as ``-expm1(sum log1p(-q_j))`` for relative accuracy in the tail.

The statistics divide by ``S = sqrt(chi2_df / df)``; their tail, a scale mixture of the one
above, is integrated and inverted by :mod:`.scale_mixture`.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from typing import Any

import numpy as np
from scipy import special, stats

from ..errors import InputError
from .scale_mixture import (
    GL_W, GL_X, LOG_SQRT_2PI, Family, check_scale_df, check_statistics, check_tail_alpha,
    gauss_legendre_panels, mixture_criticals, mixture_tails, panel_breaks,
)

__all__ = ["many_to_one_tail", "many_to_one_tails", "many_to_one_critical"]


def _check_lambdas(lambdas: Sequence[float]) -> tuple[np.ndarray, np.ndarray]:
    lam = np.asarray([float(v) for v in lambdas], dtype=np.float64)
    if lam.size < 1:
        raise InputError("the many-to-one distribution needs at least one comparison")
    if not np.all((lam >= 0.0) & (lam < 1.0)):
        raise InputError("correlation factors must lie in [0, 1)")
    return lam, np.sqrt((1.0 - lam) * (1.0 + lam))


def _many_to_one_nodes(h: float, lam: np.ndarray, sig: np.ndarray
                       ) -> tuple[np.ndarray, np.ndarray]:
    hi = math.sqrt(h * h + 80.0)
    feats = [(h / l, s / l) for l, s in zip(lam.tolist(), sig.tolist()) if l > 0.0]
    return gauss_legendre_panels(panel_breaks(0.0, hi, feats))


def _many_to_one_tail_normal(h: float, lam: np.ndarray, sig: np.ndarray) -> float:
    """P(max_j |Z_j| > h) for standard normals with correlations lam_i lam_j."""
    if h <= 0.0:
        return 1.0
    u, w = _many_to_one_nodes(h, lam, sig)
    lu = u[:, None] * lam[None, :]
    q = special.ndtr((lu - h) / sig) + special.ndtr((-h - lu) / sig)
    with np.errstate(divide="ignore"):
        login = np.log1p(-np.minimum(q, 1.0)).sum(axis=1)
    outside = -np.expm1(login)
    dens = np.exp(-0.5 * u * u - LOG_SQRT_2PI)
    return float(2.0 * np.dot(w, dens * outside))


def _many_to_one_tail_normal_many(h: np.ndarray, lam: np.ndarray, sig: np.ndarray,
                                  mult: np.ndarray) -> np.ndarray:
    """:func:`_many_to_one_tail_normal` at an array of ``h > 0``; ``lam`` distinct, each
    standing for ``mult`` equal comparisons. Each h keeps its own panels (zero-padded)."""
    if np.all((lam <= 0.0) | (sig / np.where(lam > 0.0, lam, 1.0) >= 0.5)):
        # no step of q_j narrower than a panel: the panels of panel_breaks(0, hi), for all h at once
        hi = np.sqrt(h * h + 80.0)
        count = np.maximum(1, np.ceil(hi / 0.5)).astype(np.int64)
        half = 0.5 * hi / count
        j = np.arange(int(count.max()))
        used = j[None, :] < count[:, None]
        mid = (2.0 * j[None, :] + 1.0) * half[:, None]
        uu = (mid[:, :, None] + half[:, None, None] * GL_X).reshape(h.size, -1)
        ww = (np.where(used, half[:, None], 0.0)[:, :, None] * GL_W).reshape(h.size, -1)
    else:
        nodes = [_many_to_one_nodes(float(x), lam, sig) for x in h]
        width = max(len(u) for u, _ in nodes)
        uu = np.zeros((h.size, width))
        ww = np.zeros((h.size, width))
        for row, (u, w) in enumerate(nodes):
            uu[row, :u.size] = u
            ww[row, :w.size] = w
    width = uu.shape[1]
    out = np.empty(h.size)
    step = max(1, int(2e6 // (width * lam.size)))
    for s in range(0, h.size, step):
        u = uu[s:s + step]
        hh = h[s:s + step, None, None]
        lu = u[:, :, None] * lam
        q = special.ndtr((lu - hh) / sig) + special.ndtr((-hh - lu) / sig)
        with np.errstate(divide="ignore"):
            login = np.log1p(-np.minimum(q, 1.0)) @ mult
        outside = -np.expm1(login)
        dens = np.exp(-0.5 * u * u - LOG_SQRT_2PI)
        out[s:s + step] = 2.0 * (ww[s:s + step] * dens * outside).sum(axis=1)
    return out


def _many_to_one_family(lambdas: Sequence[float]) -> Family:
    lam, sig = _check_lambdas(lambdas)
    dist, mult = np.unique(lam, return_counts=True)
    dsig = np.sqrt((1.0 - dist) * (1.0 + dist))
    mult = mult.astype(float)
    return Family(
        inner=lambda h: _many_to_one_tail_normal_many(h, dist, dsig, mult),
        scalar=lambda h: _many_to_one_tail_normal(h, lam, sig),
        rho=1.0, count=lam.size, kappa=2.0 + 0.25 * (lam.size + 1),
    )


def many_to_one_tails(c: Any, lambdas: Sequence[float], df: float) -> np.ndarray:
    """:func:`many_to_one_tail` at many values ``c`` (array-like) sharing lambdas and df."""
    fam = _many_to_one_family(lambdas)
    d = check_scale_df(df)
    cv = np.abs(check_statistics(c, "many-to-one statistic"))
    return mixture_tails(cv, np.full(cv.size, d), fam)


def many_to_one_tail(c: float, lambdas: Sequence[float], df: float) -> float:
    """P(max_j |T_j| > c), T multivariate t with df df and correlations l_i l_j (two-sided).

    For Dunnett's comparisons of m treatments with a control of size n_0,
    ``l_i = sqrt(n_i / (n_i + n_0))``.
    """
    fam = _many_to_one_family(lambdas)
    d = check_scale_df(df)
    cv = float(c)
    if math.isnan(cv):
        raise InputError("the many-to-one statistic is not a number (NaN)")
    return float(mixture_tails(np.array([abs(cv)]), np.array([d]), fam)[0])


def many_to_one_critical(alpha: float, lambdas: Sequence[float], df: float) -> float:
    """The two-sided critical value c with P(max_j |T_j| > c) = alpha."""
    a = check_tail_alpha(alpha)
    fam = _many_to_one_family(lambdas)
    d = check_scale_df(df)
    m = fam.count
    t = stats.norm if math.isinf(d) else stats.t(d)
    lo = 0.999 * float(t.isf(a / 2.0))
    hi = 1.001 * float(t.isf(a / (2.0 * m)))
    return float(mixture_criticals(a, np.array([d]), np.array([lo]), np.array([hi]), fam)[0])
