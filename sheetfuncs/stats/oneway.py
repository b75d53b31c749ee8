"""The one-way analysis of variance: y_ij = mu + tau_i + e_ij.

Sums of squares (e.g. Montgomery, *Design and Analysis of Experiments*, ch. 3):

* between groups  SSB = sum_i n_i (ybar_i - ybar)^2,   df = k - 1
* within groups   SSW = sum_i sum_j (y_ij - ybar_i)^2, df = N - k
* total           SST = SSB + SSW,                     df = N - 1

F = (SSB / (k - 1)) / (SSW / (N - k)) is referred to F(k - 1, N - k); its p-value is the upper
tail, computed from the survival function (:mod:`sheetfuncs.fdist`).
"""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence
from dataclasses import dataclass, replace
from fractions import Fraction
from typing import Any, ClassVar

import numpy as np

from ..errors import InputError
from ..input import Groups, as_groups, as_real, first_duplicate, format_label, one_line, shown
from ..distributions import f_tail
from .group_moments import (
    GroupMoments, check_zero_spread, group_moments, moments_only, require_two, require_two_labels,
)
from .moments import ExactMoments, FloatMoments, check_ss_range, compute_moments, decimal_parts, rounded

__all__ = [
    "OneWayResult", "oneway", "oneway_from_moments", "oneway_of", "oneway_from_sums", "oneway_from_summary",
    "require_two_groups",
]

@dataclass(frozen=True)
class OneWayResult:
    """Result of a one-way analysis of variance.

    Fields: ``labels``, ``counts``, ``means`` (per group); ``k`` groups, ``n_total``
    observations; ``df_between = k - 1``, ``df_within = N - k``, ``df_total = N - 1``;
    ``ss_between``, ``ss_within``, ``ss_total``; ``ms_between``, ``ms_within``; ``f`` (``inf``
    when there is no within-group variation), ``p``; ``r_squared = SSB / SST``;
    ``residual_sd = sqrt(MSW)``; ``exact`` tells whether the decimal-exact path was used, in
    which case ``ss_between_exact``, ``ss_within_exact`` and ``ss_total_exact`` hold the exact
    rationals (``None`` on the floating-point path); ``dropped`` the missing values left out of
    each group (``missing="drop"``, or error cells read as missing), zeros when none; ``notes``
    plain-language remarks on what was left out (set by sources that have no :class:`Groups`,
    such as a database query).
    """

    labels: tuple[str, ...]
    counts: tuple[int, ...]
    means: tuple[float, ...]
    k: int
    n_total: int
    df_between: int
    df_within: int
    df_total: int
    ss_between: float
    ss_within: float
    ss_total: float
    ms_between: float
    ms_within: float
    f: float
    p: float
    r_squared: float
    residual_sd: float
    exact: bool
    ss_between_exact: Fraction | None = None
    ss_within_exact: Fraction | None = None
    ss_total_exact: Fraction | None = None
    factor: str = "Factor"
    dropped: tuple[int, ...] = ()
    notes: tuple[str, ...] = ()

    #: The table's header row.
    HEADER: ClassVar[tuple[str, ...]] = ("Source", "df", "SS", "MS", "F", "p")

    def table(self, factor: str | None = None) -> list[list[Any]]:
        """Header row plus the ``Factor``, ``Residual`` and ``Total`` rows."""
        name = factor or self.factor
        return [
            list(self.HEADER),
            [name, self.df_between, self.ss_between, self.ms_between, self.f, self.p],
            ["Residual", self.df_within, self.ss_within, self.ms_within, None, None],
            ["Total", self.df_total, self.ss_total, None, None, None],
        ]


def require_two_groups(g: Groups) -> None:
    if g.k < 2:
        which = f' (only "{g.labels[0]}")' if g.k == 1 else ""
        raise InputError(
            f"at least two groups are needed to compare means, got {g.k}{which}; "
            "check the layout (one group per column, per row, or label and value columns)"
        )


def _finish(
    labels: tuple[str, ...],
    counts: tuple[int, ...],
    means: tuple[float, ...],
    ssb: Fraction | float,
    ssw: Fraction | float,
    sst: Fraction | float,
    exact: bool,
    factor: str = "Factor",
    dropped: Sequence[int] = (),
    notes: Sequence[str] = (),
) -> OneWayResult:
    k = len(counts)
    n = int(sum(counts))
    dfb, dfw, dft = k - 1, n - k, n - 1
    if dfw <= 0:
        raise InputError(
            f"no residual degrees of freedom ({n} values in {k} groups); at least "
            "one group needs two or more values"
        )
    if sst == 0:
        raise InputError(
            "all values are identical, so there is no variation to analyse; check "
            "that the range holds the measurements"
        )
    check_ss_range(sst)
    if ssw != 0:
        check_ss_range(ssw)  # a within-group SS too small for a double is not shown as a subnormal
    if exact:
        msb_x = ssb / dfb
        msw_x = ssw / dfw
        f = math.inf if ssw == 0 else rounded(msb_x / msw_x)
        r2 = float(ssb / sst)
        msw = float(msw_x)
        fields = dict(
            ss_between=float(ssb), ss_within=float(ssw), ss_total=float(sst),
            ms_between=float(msb_x), ms_within=msw,
            ss_between_exact=ssb, ss_within_exact=ssw, ss_total_exact=sst,
        )
    else:
        ssb, ssw, sst = float(ssb), float(ssw), float(sst)
        msw = ssw / dfw
        msb = ssb / dfb
        f = math.inf if ssw == 0 else msb / msw
        r2 = ssb / sst
        fields = dict(ss_between=ssb, ss_within=ssw, ss_total=sst, ms_between=msb, ms_within=msw)
    p = 0.0 if math.isinf(f) else f_tail(f, dfb, dfw)
    return OneWayResult(
        labels=labels, counts=counts, means=means, k=k, n_total=n,
        df_between=dfb, df_within=dfw, df_total=dft,
        f=f, p=p, r_squared=r2, residual_sd=math.sqrt(msw), exact=exact, factor=factor,
        dropped=tuple(dropped) or (0,) * k, notes=tuple(notes), **fields,
    )


def oneway_of(gm: GroupMoments) -> OneWayResult:
    """The one-way result from the groups' labels, counts and moments (no values needed);
    shared by the in-memory analyses and by sums computed elsewhere."""
    require_two(gm)
    mom = gm.moments
    k = gm.k
    every = [list(range(k))]
    each = [[i] for i in range(k)]
    ssw = mom.ss_within_parts(each)
    sst = mom.ss_within_parts(every)
    if mom.exact:
        ssb = sst - ssw
        means = tuple(float(m) for m in mom.means())
    else:
        means = mom.means()
        check_ss_range(ssw)
        ssb = mom.ss_between()  # from the means minus a common shift, without cancellation
        sst = ssb + ssw
        check_ss_range(sst)
        check_zero_spread(gm, sst, within=False)
        check_zero_spread(gm, ssw, within=True)
    return _finish(gm.labels, gm.counts, means, ssb, ssw, sst, mom.exact, dropped=gm.dropped)


def oneway_from_moments(g: Groups, mom: ExactMoments | FloatMoments) -> OneWayResult:
    """The one-way result from already computed moments (shared with other analyses)."""
    require_two_groups(g)
    return oneway_of(group_moments(g, mom))


def oneway_from_sums(
    labels: Sequence[str],
    mom: ExactMoments,
    dropped: Sequence[int] = (),
    notes: Sequence[str] = (),
) -> OneWayResult:
    """The one-way result from exact per-group sums alone (no values at hand), e.g. sums
    computed inside a database. The same exact rationals, rounded once, as :func:`oneway` on
    the same values, whatever scale and offset the sums use."""
    k = len(labels)
    require_two_labels(labels)
    if len(mom.n) != k or (dropped and len(dropped) != k):
        raise InputError(f"{len(mom.n)} groups of sums for {k} labels; give one label per group")
    return replace(oneway_of(moments_only(labels, mom, dropped)), notes=tuple(notes))


def oneway(
    groups: Any, *, exact: bool | None = None,
    missing: str = "stop", relabel: Mapping[str, str] | None = None,
) -> OneWayResult:
    """One-way analysis of variance of the groups.

    ``groups`` is anything :func:`sheetfuncs.as_groups` accepts. ``exact=None`` uses the
    decimal-exact path whenever every value has at most 15 significant digits and the accurate
    floating-point path otherwise; ``True`` demands the exact path; ``False`` forces floats.

    ``missing`` (``"stop"`` or ``"drop"``) and ``relabel`` are as in :func:`sheetfuncs.as_groups`.
    """
    g = as_groups(groups, missing=missing, relabel=relabel)
    require_two_groups(g)
    return oneway_from_moments(g, compute_moments(g, exact))


# --------------------------------------------------------------------------------------------


def _summary_column(values: Any, name: str) -> list[Any]:
    if isinstance(values, (str, bytes)) or not hasattr(values, "__len__"):
        values = [values]
    return np.asarray(one_line(values, name), dtype=object).tolist()


def _to_fraction(v: Any, what: str, i: int) -> Fraction:
    f = as_real(v)
    if f is None:
        raise InputError(f"{what} {i + 1} is {shown(v)}, not a number")
    if not math.isfinite(f):
        raise InputError(f"{what} {i + 1} is {shown(v)}, not a finite number")
    mant, exp, _ = decimal_parts(f)
    return Fraction(mant) * (Fraction(10) ** exp)


def oneway_from_summary(
    counts: Sequence[Any],
    means: Sequence[Any],
    sds: Sequence[Any],
    labels: Sequence[Any] | None = None,
) -> OneWayResult:
    """One-way analysis from a table of group sizes, means and standard deviations (n - 1).

    SSW = sum (n_i - 1) s_i^2 and SSB = sum n_i (m_i - m)^2 with m the weighted grand mean;
    both are computed exactly from the decimal values given and rounded once, so the result is
    marked ``exact``.
    """
    cs, ms, sd = (_summary_column(v, nm) for v, nm in ((counts, "counts"), (means, "means"), (sds, "sds")))
    if not (len(cs) == len(ms) == len(sd)):
        raise InputError(
            f"{len(cs)} counts, {len(ms)} means and {len(sd)} SDs; give one of "
            "each per group"
        )
    if labels is None:
        labs = tuple(f"Group {i + 1}" for i in range(len(cs)))
    else:
        labs = tuple(format_label(x) for x in _summary_column(labels, "labels"))
        if len(labs) != len(cs):
            raise InputError(
                f"{len(labs)} names for {len(cs)} groups; give one name per group"
            )
        dup = first_duplicate(labs)
        if dup is not None:
            idx = [i + 1 for i, x in enumerate(labs) if x == dup]
            raise InputError(
                f'the name "{dup}" is given to groups {idx[0]} and {idx[1]}; give each '
                "group its own name"
            )
    if len(cs) < 2:
        raise InputError(f"at least two groups are needed to compare means, got {len(cs)}")
    n_list: list[int] = []
    for i, c in enumerate(cs):
        fc = _to_fraction(c, "count", i)
        if fc.denominator != 1 or fc < 1:
            raise InputError(f"count {i + 1} is {shown(c)}; counts must be whole numbers of at least 1")
        n_list.append(int(fc))
    m_list = [_to_fraction(m, "mean", i) for i, m in enumerate(ms)]
    s_list = [_to_fraction(s, "SD", i) for i, s in enumerate(sd)]
    for i, s in enumerate(s_list):
        if s < 0:
            raise InputError(f"SD {i + 1} is negative; standard deviations are at least 0")
        if s and n_list[i] == 1:  # contradictory: the columns are out of line or the count wrong
            raise InputError(
                f"SD {i + 1} is {shown(sd[i])} but count {i + 1} is 1, and a single "
                "value has no standard deviation; check the rows line up, or give 0 for its SD"
            )
    n = sum(n_list)
    grand = sum(c * m for c, m in zip(n_list, m_list)) / n
    ssb = sum(c * (m - grand) ** 2 for c, m in zip(n_list, m_list))
    ssw = sum((c - 1) * s * s for c, s in zip(n_list, s_list))
    return _finish(
        labs, tuple(n_list), tuple(float(m) for m in m_list), Fraction(ssb), Fraction(ssw),
        Fraction(ssb + ssw), True,
    )
