"""Alternatives to the one-way F test: Welch, Brown–Forsythe F* and Kruskal–Wallis.

Welch (1951), "On the comparison of several mean values: an alternative approach",
*Biometrika* 38, 330–336. With ``w_i = n_i / s_i^2``, ``W = sum w_i``, the weighted mean
``m_w = sum w_i ybar_i / W`` and ``L = sum (1 - w_i / W)^2 / (n_i - 1)``,

    F_W = [sum w_i (ybar_i - m_w)^2 / (k - 1)] / [1 + 2 (k - 2) L / (k^2 - 1)],

referred to F(k - 1, (k^2 - 1) / (3 L)).

Brown & Forsythe (1974), "The small sample behavior of some statistics which test the equality
of several means", *Technometrics* 16, 129–132. With ``N`` values in all and ``ybar`` the grand
mean,

    F* = sum n_i (ybar_i - ybar)^2 / sum (1 - n_i / N) s_i^2,

referred to F(k - 1, f) with Satterthwaite's (1946) degrees of freedom
``1 / f = sum c_i^2 / (n_i - 1)``, ``c_i = (1 - n_i/N) s_i^2 / sum_j (1 - n_j/N) s_j^2``.

Kruskal & Wallis (1952), "Use of ranks in one-criterion variance analysis", *JASA* 47, 583–621.
Ranks over all ``N`` values (ties share their average rank), ``R_i`` the rank sum of group i,

    H = [12 / (N (N + 1)) sum R_i^2 / n_i - 3 (N + 1)] / [1 - sum (t^3 - t) / (N^3 - N)],

the divisor being the tie correction over the tie blocks of size ``t``; H is referred to
chi-square with k - 1 df. The rank-based effect size (Tomczak & Tomczak 2014, *Trends in Sport
Sciences* 21, 19–25) is ``epsilon^2 = H (N + 1) / (N^2 - 1)``.

Means and variances come from the decimal-exact moments when that path applies
(:mod:`sheetfuncs.stats.moments`): Brown–Forsythe's F* and its df and Kruskal–Wallis' H are computed as
exact rationals and rounded once; Welch's statistic is formed in floating point from means
centred exactly on a common value and variances rounded once, so data with many constant leading
digits lose nothing.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass
from fractions import Fraction
from typing import Any, ClassVar

import numpy as np
from scipy import stats

from ..errors import InputError
from ..distributions import f_tail
from ..input import as_groups
from .moments import rounded
from .group_moments import GroupMoments, group_moments, require_two
from .group_variances import centred_stats, prepare_with_variances, require_variance_counts
from .oneway import require_two_groups

__all__ = [
    "WelchResult",
    "BrownForsytheResult",
    "KruskalResult",
    "welch",
    "welch_of",
    "brown_forsythe",
    "brown_forsythe_of",
    "kruskal",
    "kruskal_from_counts",
]


# --------------------------------------------------------------------------------------------
# shared pieces


def _zero_variance_error(label: str, method: str) -> InputError:
    return InputError(
        f'group "{label}" has zero variance (all its values are equal), and '
        f"{method} divides by each group's variance; check the measurement resolution, or use "
        "the Brown-Forsythe F* test or Kruskal-Wallis instead"
    )


# --------------------------------------------------------------------------------------------
# Welch


@dataclass(frozen=True)
class _HeteroscedasticF:
    """Fields shared by the F tests for means that allow unequal variances."""

    statistic: float
    df1: int
    df2: float
    p: float
    exact: bool = False

    name: ClassVar[str] = ""
    #: The table's header row.
    HEADER: ClassVar[tuple[str, ...]] = ("Test", "Statistic", "df1", "df2", "p")

    def table(self) -> list[list[Any]]:
        """Header row, then one row for the test."""
        return [list(self.HEADER), [self.name, self.statistic, self.df1, self.df2, self.p]]


@dataclass(frozen=True)
class WelchResult(_HeteroscedasticF):
    """Welch's (1951) test of equal means without assuming equal variances.

    Fields: ``statistic`` (Welch's F), ``df1 = k - 1``, ``df2`` (Welch's approximate
    denominator degrees of freedom, usually not a whole number), ``p`` (upper tail of
    F(df1, df2)); ``exact`` says whether the means and variances came from the decimal-exact
    moments.

    Source: Welch, B. L. (1951), *Biometrika* 38, 330–336.
    """

    name: ClassVar[str] = "Welch"


def welch(
    groups: Any, *, exact: bool | None = None,
    missing: str = "stop", relabel: Mapping[str, str] | None = None,
) -> WelchResult:
    """Welch's heteroscedastic one-way test of equal means.

    Every group needs two or more values and a non-zero variance (the test weights each group
    by ``n_i / s_i^2``). See the module docstring for the formula.

    ``missing`` (``"stop"`` or ``"drop"``) and ``relabel`` are as in :func:`sheetfuncs.as_groups`.
    """
    g = as_groups(groups, missing=missing, relabel=relabel)
    g, mom = prepare_with_variances(g, "Welch's test", exact)
    return welch_of(group_moments(g, mom))


def welch_of(gm: GroupMoments) -> WelchResult:
    """:func:`welch` from the groups' labels, counts and moments (no values needed)."""
    require_two(gm)
    require_variance_counts(gm.labels, gm.counts, "Welch's test")
    mom = gm.moments
    dev, var = centred_stats(mom)
    k = gm.k
    ns = gm.counts
    for i, label in enumerate(gm.labels):
        if mom.ss_group(i) == 0:
            raise _zero_variance_error(label, "Welch's test")
        if var[i] < 1e-300 * max(var):  # (the largest is near 1) its weight would overflow
            raise InputError(
                f'the variance of group "{label}" is more than 10^300 times smaller '
                "than the largest, so Welch's weights cannot be formed; check the data's units"
            )
    w = [n / float(v) for n, v in zip(ns, var)]
    big_w = math.fsum(w)
    m_w = math.fsum(wi * d for wi, d in zip(w, dev)) / big_w
    a = math.fsum(wi * (d - m_w) ** 2 for wi, d in zip(w, dev)) / (k - 1)
    lam = math.fsum((1.0 - wi / big_w) ** 2 / (n - 1) for wi, n in zip(w, ns))
    b = 1.0 + 2.0 * (k - 2) * lam / (k * k - 1)
    f = a / b
    df2 = (k * k - 1) / (3.0 * lam)
    p = f_tail(f, k - 1, df2) if f > 0 else 1.0
    return WelchResult(statistic=f, df1=k - 1, df2=df2, p=p, exact=mom.exact)


# --------------------------------------------------------------------------------------------
# Brown–Forsythe F* for means


@dataclass(frozen=True)
class BrownForsytheResult(_HeteroscedasticF):
    """Brown & Forsythe's (1974) F* test of equal means for unequal variances.

    Fields: ``statistic`` (F*), ``df1 = k - 1`` (the 1974 numerator df), ``df2``
    (Satterthwaite's denominator df), ``p`` (upper tail of F(df1, df2)); ``exact`` says whether
    F* and df2 were computed as exact rationals from the decimal-exact moments.

    Source: Brown, M. B. & Forsythe, A. B. (1974), *Technometrics* 16, 129–132;
    Satterthwaite, F. E. (1946), *Biometrics Bulletin* 2, 110–114.
    """

    name: ClassVar[str] = "Brown-Forsythe F*"


def brown_forsythe(
    groups: Any, *, exact: bool | None = None,
    missing: str = "stop", relabel: Mapping[str, str] | None = None,
) -> BrownForsytheResult:
    """Brown–Forsythe F* for equal means (not the Brown–Forsythe test for variances, which is
    :func:`sheetfuncs.stats.variances.levene` with ``center="median"``).

    Every group needs two or more values; single groups may have zero variance, but not all.

    ``missing`` (``"stop"`` or ``"drop"``) and ``relabel`` are as in :func:`sheetfuncs.as_groups`.
    """
    g = as_groups(groups, missing=missing, relabel=relabel)
    g, mom = prepare_with_variances(g, "the Brown-Forsythe F* test", exact)
    return brown_forsythe_of(group_moments(g, mom))


def brown_forsythe_of(gm: GroupMoments) -> BrownForsytheResult:
    """:func:`brown_forsythe` from the groups' labels, counts and moments (no values needed)."""
    require_two(gm)
    require_variance_counts(gm.labels, gm.counts, "the Brown-Forsythe F* test")
    mom = gm.moments
    n_tot = gm.n_total
    ns = gm.counts
    every, each = [list(range(gm.k))], [[i] for i in range(gm.k)]
    if mom.exact:
        ssb = mom.ss_within_parts(every) - mom.ss_within_parts(each)
        parts = [Fraction(n_tot - n, n_tot) * (mom.ss_group(i) / (n - 1)) for i, n in enumerate(ns)]
        denom = sum(parts, Fraction(0))
        if denom == 0:
            raise _all_zero_error()
        f_x = ssb / denom
        df2_x = denom * denom / sum((c * c / (n - 1) for c, n in zip(parts, ns)), Fraction(0))
        f, df2 = rounded(f_x), rounded(df2_x)  # F* beyond the largest double is infinite
    else:
        # centred means and variances in a common unit (F* and df2 do not depend on it)
        dev, var = centred_stats(mom)
        parts_f = [(n_tot - n) / n_tot * v for n, v in zip(ns, var)]
        denom_f = math.fsum(parts_f)
        if denom_f == 0:
            raise _all_zero_error()
        grand = math.fsum(n * d for n, d in zip(ns, dev)) / n_tot
        ssb_f = math.fsum(n * (d - grand) ** 2 for n, d in zip(ns, dev))
        f = ssb_f / denom_f
        df2 = denom_f * denom_f / math.fsum(c * c / (n - 1) for c, n in zip(parts_f, ns))
    p = f_tail(f, gm.k - 1, df2) if f > 0 else 1.0
    return BrownForsytheResult(statistic=f, df1=gm.k - 1, df2=df2, p=p, exact=mom.exact)


def _all_zero_error() -> InputError:
    return InputError(
        "every group has zero variance (within each group all values are equal), so "
        "the Brown-Forsythe F* has no within-group spread to divide by; the one-way F is "
        "infinite here: check the measurement resolution"
    )


# --------------------------------------------------------------------------------------------
# Kruskal–Wallis


@dataclass(frozen=True)
class KruskalResult:
    """Kruskal–Wallis rank test of equal distributions (location shift), tie-corrected.

    Fields: ``statistic`` (H, divided by the tie correction), ``df = k - 1``, ``p`` (upper tail
    of chi-square(df), the large-sample approximation), ``rank_epsilon_squared``
    (``H (N + 1) / (N^2 - 1)``, between 0 and 1), ``tie_correction`` (the divisor
    ``1 - sum (t^3 - t) / (N^3 - N)``; 1 when there are no ties), ``mean_ranks`` per group.

    Sources: Kruskal, W. H. & Wallis, W. A. (1952), *JASA* 47, 583–621; effect size: Tomczak, M.
    & Tomczak, E. (2014), *Trends in Sport Sciences* 21, 19–25.
    """

    statistic: float
    df: int
    p: float
    rank_epsilon_squared: float
    tie_correction: float = 1.0
    mean_ranks: tuple[float, ...] = ()

    #: The table's header row.
    HEADER: ClassVar[tuple[str, ...]] = ("Test", "Statistic", "df", "p", "Rank epsilon squared")

    def table(self) -> list[list[Any]]:
        """Header row, then one row for the test."""
        return [
            list(self.HEADER),
            ["Kruskal-Wallis", self.statistic, self.df, self.p, self.rank_epsilon_squared],
        ]


def _twice_ranks(values: np.ndarray) -> tuple[np.ndarray, int]:
    """Twice the average ranks (whole numbers) and ``sum (t^3 - t)`` over tie blocks."""
    n = values.size
    order = np.argsort(values, kind="mergesort")
    sv = values[order]
    new_block = np.empty(n, dtype=bool)
    new_block[0] = True
    np.not_equal(sv[1:], sv[:-1], out=new_block[1:])
    starts = np.flatnonzero(new_block)
    sizes = np.diff(np.append(starts, n))
    # a block of t values starting at 0-based position s shares rank s + (t + 1) / 2
    twice_block = 2 * starts.astype(np.int64) + sizes.astype(np.int64) + 1
    twice_sorted = np.repeat(twice_block, sizes)
    out = np.empty(n, dtype=np.int64)
    out[order] = twice_sorted
    t = [int(x) for x in sizes[sizes > 1].tolist()]
    return out, sum(x * x * x - x for x in t)


def kruskal(
    groups: Any, *,
    missing: str = "stop", relabel: Mapping[str, str] | None = None,
) -> KruskalResult:
    """Kruskal–Wallis H test with the tie correction; see the module docstring.

    Groups of one value are allowed. All values tied (one value throughout) is an error: the
    ranks then carry no information.

    ``missing`` (``"stop"`` or ``"drop"``) and ``relabel`` are as in :func:`sheetfuncs.as_groups`.
    """
    g = as_groups(groups, missing=missing, relabel=relabel)
    require_two_groups(g)
    allv = np.concatenate(g.arrays)
    twice, tie_sum = _twice_ranks(allv)
    sums: list[int] = []
    start = 0
    for a in g.arrays:
        sums.append(int(twice[start : start + a.size].sum(dtype=np.int64)))
        start += a.size
    return _kruskal_finish(g.counts, sums, tie_sum)


def kruskal_from_counts(
    k: int, values: np.ndarray, group: np.ndarray, count: np.ndarray
) -> KruskalResult:
    """:func:`kruskal` from how many times each value occurs in each group (e.g. counted by a
    database): one row per (group, distinct value) with the value, the group's index (0 to
    ``k - 1``) and the count. The mid-ranks and the tie correction are formed from this table
    as :func:`kruskal` forms them from the values, so the result is the same to the last bit.
    """
    if k < 2:
        raise InputError(f"at least two groups are needed to compare means, got {k}")
    v = np.asarray(values, dtype=np.float64)
    gi = np.asarray(group, dtype=np.int64)
    c = np.asarray(count, dtype=np.int64)
    order = np.lexsort((gi, v))
    v, gi, c = v[order], gi[order], c[order]
    new_block = np.empty(v.size, dtype=bool)
    new_block[:1] = True
    np.not_equal(v[1:], v[:-1], out=new_block[1:])
    block = np.cumsum(new_block) - 1
    starts = np.flatnonzero(new_block)
    sizes = np.add.reduceat(c, starts) if v.size else np.zeros(0, dtype=np.int64)
    first = np.cumsum(sizes) - sizes  # 0-based position of each block's first value
    twice_block = 2 * first + sizes + 1  # twice the block's average rank
    weighted = c * twice_block[block]
    sums = [int(weighted[gi == i].sum(dtype=np.int64)) for i in range(k)]
    counts = [int(c[gi == i].sum(dtype=np.int64)) for i in range(k)]
    tie_sum = sum(t * t * t - t for t in (int(x) for x in sizes[sizes > 1].tolist()))
    if min(counts) < 1:
        raise InputError(f"group {counts.index(min(counts)) + 1} has no values in the table of counts")
    return _kruskal_finish(tuple(counts), sums, tie_sum)


def _kruskal_finish(counts: tuple[int, ...], sums: list[int], tie_sum: int) -> KruskalResult:
    """H, its p-value and effect size from each group's size and twice its rank sum."""
    n_tot = sum(counts)
    n3 = n_tot**3 - n_tot
    if tie_sum == n3:
        raise InputError(
            "every value is the same, so the Kruskal-Wallis test has no ranks to "
            "compare; check that the range holds the measurements"
        )
    # sum R_i^2 / n_i with R_i = sums_i / 2
    sr2 = sum((Fraction(s * s, 4 * n) for s, n in zip(sums, counts)), Fraction(0))
    h0 = Fraction(12, n_tot * (n_tot + 1)) * sr2 - 3 * (n_tot + 1)
    corr = 1 - Fraction(tie_sum, n3)
    h_x = h0 / corr
    if h_x < 0:  # cannot happen in exact arithmetic; a guard against misuse
        h_x = Fraction(0)
    h = float(h_x)
    df = len(counts) - 1
    p = float(stats.chi2.sf(h, df)) if h > 0 else 1.0
    eps = float(h_x * (n_tot + 1) / (n_tot * n_tot - 1))
    mean_ranks = tuple(s / (2.0 * n) for s, n in zip(sums, counts))
    return KruskalResult(
        statistic=h, df=df, p=p, rank_epsilon_squared=eps, tie_correction=float(corr),
        mean_ranks=mean_ranks,
    )
