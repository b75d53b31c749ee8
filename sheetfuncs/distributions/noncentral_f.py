"""The noncentral F distribution: lower and upper tails, accurate far out.

The noncentral F probabilities are those of ``scipy.stats.ncf`` (``scipy.special.ncfdtr`` for
the lower tail, the survival function for the upper tail). Far out, for noncentrality above
1e8 where the series behind them becomes slow, Patnaik's (1949) approximation of the
noncentral chi-square by a scaled central chi-square is used instead (its error there is below
1e-10 for any realistic design); ``lambda = 0`` is the central F.
"""

from __future__ import annotations

import math

from scipy import special, stats

from .f import f_tail

__all__ = ["ncf_cdf", "ncf_sf", "PATNAIK_FROM"]

#: Above this noncentrality the noncentral F is evaluated by Patnaik's approximation.
PATNAIK_FROM = 1e8
#: Above this numerator df, F(nu, df2) is taken at its limit df2 / chi^2(df2) (error below 1e-15).
_NU_LIMIT = 1e15


def _patnaik_arg(x: float, df1: float, nc: float) -> tuple[float, float]:
    """Patnaik (1949): chi'^2(df1, nc) ~ c chi^2(nu), c nu = df1 + nc, nu = (df1+nc)^2/(df1+2nc).

    Then F' ~ (df1 + nc) / df1 * F(nu, df2), so P(F' <= x) = P(F(nu, df2) <= x df1 / (df1 + nc)).
    """
    m = df1 + nc
    nu = m / (1.0 + nc / m)  # = m^2 / (df1 + 2 nc), without overflow
    return x * (df1 / m), nu


def ncf_cdf(x: float, df1: float, df2: float, nc: float) -> float:
    """P(F' <= x) for the noncentral F with ``df1``, ``df2`` degrees of freedom and noncentrality ``nc``."""
    if x <= 0.0:
        return 0.0
    if math.isinf(x):
        return 1.0
    if nc <= 0.0:
        return float(special.fdtr(df1, df2, x))
    if math.isinf(nc):
        return 0.0
    if nc > PATNAIK_FROM:
        xa, nu = _patnaik_arg(x, df1, nc)
        if nu > _NU_LIMIT:  # F(nu, df2) -> df2 / chi^2(df2) as nu grows
            return float(special.chdtrc(df2, df2 / xa))
        return float(special.fdtr(nu, df2, xa))
    return float(special.ncfdtr(df1, df2, nc, x))


def ncf_sf(x: float, df1: float, df2: float, nc: float) -> float:
    """P(F' > x), the upper tail, from the survival function (never ``1 - cdf``)."""
    if x <= 0.0:
        return 1.0
    if math.isinf(x):
        return 0.0
    if nc <= 0.0:
        return f_tail(x, df1, df2)
    if math.isinf(nc):
        return 1.0
    if nc > PATNAIK_FROM:
        xa, nu = _patnaik_arg(x, df1, nc)
        if nu > _NU_LIMIT:
            return float(special.chdtr(df2, df2 / xa))
        return f_tail(xa, nu, df2)
    return float(stats.ncf.sf(x, df1, df2, nc))
