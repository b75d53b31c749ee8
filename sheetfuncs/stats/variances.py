"""Tests of equal group variances: Levene's (and Brown–Forsythe's) and Bartlett's.

Levene (1960), "Robust tests for equality of variances", in Olkin (ed.), *Contributions to
Probability and Statistics*, 278–292: the one-way F test applied to the absolute deviations
``z_ij = |y_ij - c_i|`` with ``c_i`` the group mean. Brown & Forsythe (1974), "Robust tests
for the equality of variances", *JASA* 69, 364–367: the same with ``c_i`` the group median
(``center="median"``, the default, robust to skewed data).

Bartlett (1937), "Properties of sufficiency and statistical tests", *Proc. R. Soc. A* 160,
268–282: with ``s_p^2 = SSW / (N - k)``,
``T = [(N - k) ln s_p^2 - sum (n_i - 1) ln s_i^2] / C``,
``C = 1 + [sum 1/(n_i - 1) - 1/(N - k)] / (3 (k - 1))``, referred to chi-square(k - 1).
It is evaluated as ``sum (n_i - 1) [(r_i - 1) - ln r_i] / C`` with ``r_i = s_i^2 / s_p^2``
taken exactly, which is the same number without the cancellation of the textbook form: near
``r_i = 1`` as ``u_i - ln(1 + u_i)`` with ``u_i = r_i - 1`` rounded once, below ``r_i = 1/2``
from ``r_i`` itself, with ``ln r_i`` formed from the exact ratio scaled by a power of two
(so variances that differ by more than the double range still give a finite statistic).
"""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from fractions import Fraction
from typing import Any, ClassVar

import numpy as np
from scipy import stats

from ..errors import InputError
from ..distributions import f_tail
from ..input import as_groups, shown
from .moments import rounded
from .group_moments import GroupMoments, group_moments, require_two
from .group_variances import prepare_with_variances, require_variance_counts
from .oneway import oneway
from .residuals import Deviations

__all__ = ["LeveneResult", "BartlettResult", "levene", "bartlett", "bartlett_of", "levene_result"]


@dataclass(frozen=True)
class LeveneResult:
    """Levene's test of equal variances (``center="mean"``) or its Brown–Forsythe form
    (``center="median"``): the one-way F test on absolute deviations from each group's centre.

    Fields: ``statistic`` (F), ``df_between = k - 1``, ``df_within = N - k``, ``p`` (upper
    tail of F(df_between, df_within)), ``center`` (``"median"`` or ``"mean"``).

    Sources: Levene (1960); Brown & Forsythe (1974), *JASA* 69, 364–367.
    """

    statistic: float
    df_between: int
    df_within: int
    p: float
    center: str

    #: The table's header row.
    HEADER: ClassVar[tuple[str, ...]] = ("Test", "Statistic", "df1", "df2", "p")

    @property
    def name(self) -> str:
        return f"Levene ({self.center})"

    def table(self) -> list[list[Any]]:
        """Header row, then one row for the test."""
        return [
            list(self.HEADER),
            [self.name, self.statistic, self.df_between, self.df_within, self.p],
        ]


def _parse_center(center: Any) -> str:
    if center is None:
        return "median"
    s = center.strip().lower() if isinstance(center, str) else None
    if s == "":
        return "median"
    if s in ("median", "mean"):
        return s
    raise InputError(
        f'center must be "median" (Brown-Forsythe, the default) or "mean" '
        f"(Levene's original), not {shown(center)}"
    )


def levene(
    groups: Any, center: str = "median", *, exact: bool | None = None,
    missing: str = "stop", relabel: Mapping[str, str] | None = None,
) -> LeveneResult:
    """Test whether the groups' variances are equal, by Levene's method.

    ``center="median"`` (default) measures each value's distance from its group median
    (Brown & Forsythe 1974), ``"mean"`` from its group mean (Levene 1960). Every group needs two
    or more values.

    ``missing`` (``"stop"`` or ``"drop"``) and ``relabel`` are as in :func:`sheetfuncs.as_groups`.
    """
    c = _parse_center(center)
    g = as_groups(groups, missing=missing, relabel=relabel)
    g, mom = prepare_with_variances(g, "Levene's test", exact)
    dev = Deviations(g, mom)
    # F is unchanged by a common unit, so the deviations stay in the exact integer unit
    z = [dev.abs_from_median(i) if c == "median" else dev.abs_from_mean(i) for i in range(g.k)]
    allz = np.concatenate(z)
    if float(allz.max()) == float(allz.min()):
        what = "zero" if float(allz.max()) == 0.0 else "the same"
        raise InputError(
            f"every value's distance from its group {c} is {what}, so Levene's test "
            "has no differences in spread to compare; check that the range holds the "
            "measurements"
        )
    top = float(allz.max())
    if not (2.0**-400 < top < 2.0**400):  # F is free of the unit: keep the sums of squares finite
        shift = -math.frexp(top)[1]
        z = [np.ldexp(a, shift) for a in z]
    ow = oneway(dict(zip(g.labels, z)))
    return LeveneResult(statistic=ow.f, df_between=ow.df_between, df_within=ow.df_within, p=ow.p, center=c)


# --------------------------------------------------------------------------------------------
# Bartlett


@dataclass(frozen=True)
class BartlettResult:
    """Bartlett's test of equal variances (sensitive to non-normal data).

    Fields: ``statistic`` (the corrected chi-square statistic T), ``df = k - 1``, ``p`` (upper
    tail of chi-square(df)); ``exact`` says whether the variance ratios came from the
    decimal-exact moments.

    Source: Bartlett, M. S. (1937), *Proc. R. Soc. A* 160, 268–282.
    """

    statistic: float
    df: int
    p: float
    exact: bool = False

    #: The table's header row.
    HEADER: ClassVar[tuple[str, ...]] = ("Test", "Statistic", "df", "p")

    def table(self) -> list[list[Any]]:
        """Header row, then one row for the test."""
        return [list(self.HEADER), ["Bartlett", self.statistic, self.df, self.p]]


def _u_minus_log1p(u: float) -> float:
    """``u - ln(1 + u)`` without cancellation for small ``u`` (series below |u| = 0.1)."""
    if abs(u) >= 0.1:
        return u - math.log1p(u)
    # u^2/2 - u^3/3 + u^4/4 - ...; |u| < 0.1, so 17 terms reach double precision
    total = 0.0
    power = u * u
    for j in range(2, 20):
        total += power / j if j % 2 == 0 else -power / j
        power *= u
    return total


def _log_fraction(r: Fraction) -> float:
    """``ln r`` of a positive rational, accurate however large or small its terms: ``r`` is
    scaled by a power of two to lie near 1, converted once, and the power added back."""
    e = r.numerator.bit_length() - r.denominator.bit_length()
    m = r / (Fraction(2) ** e) if e >= 0 else r * (Fraction(2) ** -e)  # in (1/2, 2)
    return math.log(float(m)) + e * math.log(2.0)


def _bartlett_term_exact(r: Fraction) -> float:
    """``(r - 1) - ln r`` for the exact variance ratio ``r = s_i^2 / s_p^2 > 0``.

    Near ``r = 1`` it is ``u - ln(1 + u)`` with ``u = r - 1`` rounded once; below ``r = 1/2``
    (``u < -1/2``, where rounding ``u`` would lose the digits of ``1 + u``, or round it to 0
    when the variances differ by more than about 2^53) it is formed from ``r`` itself.
    """
    u = r - 1
    if u >= Fraction(-1, 2):
        return _u_minus_log1p(float(u))
    return float(u) - _log_fraction(r)


def _bartlett_term_float(ss: float, df: int, sp2: float) -> float:
    """``(r - 1) - ln r`` for ``r = (ss / df) / sp2`` on the floating-point path (as above)."""
    v = ss / df
    u = (v - sp2) / sp2
    if u >= -0.5:
        return _u_minus_log1p(u)
    # ln r from the logarithms of its parts, so that a ratio below the double range stays finite
    return (v / sp2 - 1.0) - (math.log(ss) - math.log(df) - math.log(sp2))


def bartlett(
    groups: Any, *, exact: bool | None = None,
    missing: str = "stop", relabel: Mapping[str, str] | None = None,
) -> BartlettResult:
    """Bartlett's chi-square test that the group variances are equal.

    Every group needs two or more values and a non-zero variance (the test takes logarithms of
    the variances).

    ``missing`` (``"stop"`` or ``"drop"``) and ``relabel`` are as in :func:`sheetfuncs.as_groups`.
    """
    g = as_groups(groups, missing=missing, relabel=relabel)
    g, mom = prepare_with_variances(g, "Bartlett's test", exact)
    return bartlett_of(group_moments(g, mom))


def bartlett_of(gm: GroupMoments) -> BartlettResult:
    """:func:`bartlett` from the groups' labels, counts and moments (no values needed)."""
    require_two(gm)
    require_variance_counts(gm.labels, gm.counts, "Bartlett's test")
    mom = gm.moments
    k = gm.k
    ns = gm.counts
    dfw = gm.n_total - k
    ss = [mom.ss_group(i) for i in range(k)]
    for label, s in zip(gm.labels, ss):
        if s == 0:
            raise InputError(
                f'group "{label}" has zero variance (all its values are equal), and '
                "Bartlett's test takes the logarithm of each group's variance; check the "
                "measurement resolution, or use Levene's test instead"
            )
    if mom.exact:
        ssw = sum(ss, Fraction(0))
        terms = [_bartlett_term_exact(s * dfw / (ssw * (n - 1))) for s, n in zip(ss, ns)]
    else:
        sp2 = math.fsum(float(s) for s in ss) / dfw
        terms = [_bartlett_term_float(float(s), n - 1, sp2) for s, n in zip(ss, ns)]
    num = math.fsum((n - 1) * t for t, n in zip(terms, ns))
    corr = 1.0 + (math.fsum(1.0 / (n - 1) for n in ns) - 1.0 / dfw) / (3.0 * (k - 1))
    t = max(num / corr, 0.0)
    p = float(stats.chi2.sf(t, k - 1)) if t > 0 else 1.0
    return BartlettResult(statistic=t, df=k - 1, p=p, exact=mom.exact)


def levene_result(
    center: str, n: Sequence[int], sum_z: Sequence[Fraction], sum_z2: Sequence[Fraction],
    spread: tuple[Fraction, Fraction],
) -> LeveneResult:
    """Levene's test from per-group sums of the absolute deviations ``z`` computed elsewhere
    (e.g. inside a database): ``n``, ``sum z`` and ``sum z**2`` per group as exact rationals in
    any one unit, and ``spread`` the smallest and largest ``z`` over all values. The one-way F
    on ``z`` is formed from them exactly and rounded once, as :func:`levene` does on the exact
    path (bit-identical to it when its deviations are exact)."""
    c = _parse_center(center)
    if spread[0] == spread[1]:
        what = "zero" if spread[1] == 0 else "the same"
        raise InputError(
            f"every value's distance from its group {c} is {what}, so Levene's test "
            "has no differences in spread to compare; check that the range holds the "
            "measurements"
        )
    k, total = len(n), sum(n)
    ssw = sum((q - s * s / m for m, s, q in zip(n, sum_z, sum_z2)), Fraction(0))
    sz = sum(sum_z, Fraction(0))
    sst = sum(sum_z2, Fraction(0)) - sz * sz / total
    dfb, dfw = k - 1, total - k
    f = math.inf if ssw == 0 else rounded((sst - ssw) / dfb / (ssw / dfw))
    p = 0.0 if math.isinf(f) else f_tail(f, dfb, dfw)
    return LeveneResult(statistic=f, df_between=dfb, df_within=dfw, p=p, center=c)
