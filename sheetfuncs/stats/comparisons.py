"""Pairwise comparisons of group means after a one-way analysis, and many-to-one comparisons.

For groups ``a`` and ``b`` with means ``m_a``, ``m_b`` and sizes ``n_a``, ``n_b`` the
difference is ``d = m_a - m_b``. The pooled methods use the one-way model's mean square error
``MSE`` and its residual degrees of freedom ``df = N - k``, with ``SE = sqrt(MSE (1/n_a + 1/n_b))``.

Methods and their published sources:

``tukey``
    Tukey-Kramer (Tukey 1953; Kramer 1956, *Biometrics* 12, 307-310): ``q = |d| / (SE/sqrt 2)``
    is referred to the studentized range of ``k`` means with ``df`` degrees of freedom; the
    intervals ``d +/- q(alpha; k, df)/sqrt 2 * SE`` are simultaneous at ``1 - alpha`` (exactly
    for equal sizes, conservatively otherwise: Hayter 1984, *Ann. Statist.* 12, 61-75).
``games-howell``
    Games & Howell (1976, *J. Educ. Statist.* 1, 113-125): each pair uses its own variances,
    ``SE = sqrt(s_a^2/n_a + s_b^2/n_b)``, and Welch's degrees of freedom
    ``(v_a + v_b)^2 / (v_a^2/(n_a - 1) + v_b^2/(n_b - 1))`` with ``v = s^2/n``, in the
    studentized range of ``k`` means. Intervals are approximate.
``bonferroni``, ``holm``, ``sidak``
    Unadjusted two-sided t tests ``t = d/SE`` on ``df``, adjusted for ``m = k(k-1)/2`` pairs:
    Bonferroni ``min(1, m p)``; Holm (1979, *Scand. J. Statist.* 6, 65-70) step-down
    ``max_{j <= i} min(1, (m - j + 1) p_(j))``; Šidák (1967, *JASA* 62, 626-633)
    ``1 - (1 - p)^m``. Intervals: ``d +/- t(alpha/(2m); df) SE`` (Bonferroni; also shown on the
    Holm rows, since Holm's step-down has no matching intervals) and
    ``d +/- t((1 - (1 - alpha)^(1/m))/2; df) SE`` (Šidák).
``scheffe``
    Scheffé (1953, *Biometrika* 40, 87-104): ``F = t^2 / (k - 1)`` on ``(k - 1, df)``;
    intervals ``d +/- sqrt((k - 1) F(alpha; k - 1, df)) SE``, simultaneous over all contrasts.
``dunnett`` (function :func:`dunnett`)
    Dunnett (1955, *JASA* 50, 1096-1121): each treatment against one control, ``t = d/SE`` and
    the two-sided maximum of the ``m`` statistics, a multivariate t with correlations
    ``l_i l_j``, ``l_i = sqrt(n_i / (n_i + n_0))``, integrated by our own deterministic
    quadrature (:mod:`sheetfuncs.distributions.many_to_one`).

Adjusted p-values never exceed 1 and ``differs`` is ``p < alpha``. When the groups have no
within-group variation at all (``MSE = 0``) a pair with different means has an infinite
statistic and ``p = 0``, and a pair with equal means has statistic 0 and ``p = 1``.
"""

from __future__ import annotations

import math
import sys
from collections.abc import Callable, Mapping
from dataclasses import dataclass
from fractions import Fraction
from typing import Any, ClassVar

from scipy import stats

from ..errors import InputError
from ..distributions import (
    f_critical, f_tail, many_to_one_critical, many_to_one_tails, range_critical, range_criticals,
    range_tails,
)
from ..input import Groups, as_groups, check_alpha, check_range, format_label, shown
from .moments import TOO_LARGE, TOO_SMALL, ExactMoments, FloatMoments, compute_moments, rounded
from .group_moments import GroupMoments, group_moments, require_two
from .oneway import oneway_of, require_two_groups
from .interval import Interval

__all__ = [
    "METHODS", "METHOD_NAMES", "PairRow", "PairwiseResult", "pairwise", "pairwise_of", "dunnett",
    "dunnett_of", "parse_method",
]

#: The pairwise methods, in the order the documentation lists them.
METHODS = ("tukey", "games-howell", "bonferroni", "holm", "sidak", "scheffe")

_ALIASES = {
    "tukey": "tukey", "tukey-kramer": "tukey", "tukeykramer": "tukey", "hsd": "tukey",
    "tukey-hsd": "tukey",
    "games-howell": "games-howell", "gameshowell": "games-howell", "gh": "games-howell",
    "bonferroni": "bonferroni", "bonf": "bonferroni",
    "holm": "holm", "holm-bonferroni": "holm",
    "sidak": "sidak", "šidák": "sidak", "šidak": "sidak", "sidák": "sidak",
    "scheffe": "scheffe", "scheffé": "scheffe",
}

#: Each method and the name a reader knows it by.
METHOD_NAMES = {
    "tukey": "Tukey–Kramer", "games-howell": "Games–Howell", "bonferroni": "Bonferroni",
    "holm": "Holm", "sidak": "Šidák", "scheffe": "Scheffé", "dunnett": "Dunnett",
}

_STATISTIC = {
    "tukey": "q", "games-howell": "q", "bonferroni": "t", "holm": "t", "sidak": "t",
    "scheffe": "F", "dunnett": "t",
}

_SQRT2 = math.sqrt(2.0)

_NO_VARIATION = (
    "there is no variation within the groups, so every difference between different means is "
    "infinitely many standard errors; check that the data are measurements"
)


def parse_method(method: Any) -> str:
    """The canonical method name, or an :class:`InputError` that lists the methods."""
    if isinstance(method, str):
        key = method.strip().lower().replace("_", "-").replace(" ", "-").replace("–", "-")
        if key in _ALIASES:
            return _ALIASES[key]
        if key == "dunnett":
            raise InputError(
                "\"dunnett\" compares treatments with one control; use the dunnett "
                "function (SF_DUNNETT) with the control's label, or choose one of the pairwise "
                "methods: " + ", ".join(f'"{m}"' for m in METHODS)
            )
    raise InputError(
        f"unknown comparison method {shown(method)}; use one of "
        + ", ".join(f'"{m}"' for m in METHODS)
    )


def _percent(alpha: float) -> str:
    return f"{100.0 * (1.0 - alpha):.10g}%"


def _interval_label(method: str, alpha: float) -> str:
    pct = _percent(alpha)
    if method == "holm":
        return f"Bonferroni {pct} (Holm rows)"
    if method == "games-howell":
        return f"approximate {pct} (Games–Howell)"
    return f"simultaneous {pct}"


@dataclass(frozen=True)
class PairRow:
    """One comparison.

    ``difference = mean(group_a) - mean(group_b)``; ``se`` its standard error; ``ci`` the
    interval for it (see the result's ``interval``); ``statistic`` the method's
    test statistic (``q``, ``t`` or ``F``, see the result's ``statistic_name``); ``p`` the
    adjusted p-value (at most 1); ``differs`` is ``p < alpha``.
    """

    group_a: str
    group_b: str
    difference: float
    se: float
    ci: Interval
    statistic: float
    p: float
    differs: bool

    def cells(self) -> list[Any]:
        """The row as table cells."""
        return [
            self.group_a, self.group_b, self.difference, self.se, *self.ci,
            self.statistic, self.p, self.differs,
        ]


@dataclass(frozen=True)
class PairwiseResult:
    """Pairwise (or many-to-one) comparisons of group means.

    ``method``: ``tukey``, ``games-howell``, ``bonferroni``, ``holm``, ``sidak``, ``scheffe``
    or ``dunnett``; ``method_name`` the method's published name; ``alpha`` the significance
    level; ``rows`` one :class:`PairRow` per comparison (every unordered pair once, in group
    order; for Dunnett one row per treatment against the control); ``interval`` a short label
    of what the intervals are; ``statistic_name`` ``q`` (studentized range), ``t`` or ``F``;
    ``labels``, ``counts``, ``means`` of the groups; ``ms_within`` and ``df_within`` the pooled
    residual mean square and its degrees of freedom (``None`` for Games–Howell, which uses each pair's own
    variances); ``row_df`` the degrees of freedom behind each row; ``multipliers`` the factor
    that turns each row's SE into its interval half-width (for q-based methods ``q/sqrt 2``);
    ``control`` the control's label (Dunnett only); ``exact`` whether means and sums of squares
    came from the decimal-exact path; ``notes`` plain-words remarks; ``dropped`` the missing
    values left out of each group (``missing="drop"``, or error cells read as missing).
    """

    method: str
    alpha: float
    rows: tuple[PairRow, ...]
    interval: str
    statistic_name: str
    method_name: str
    labels: tuple[str, ...]
    counts: tuple[int, ...]
    means: tuple[float, ...]
    ms_within: float | None
    df_within: float | None
    row_df: tuple[float, ...]
    multipliers: tuple[float, ...]
    exact: bool
    control: str | None = None
    notes: tuple[str, ...] = ()
    dropped: tuple[int, ...] = ()

    #: The table's header row, with ``{interval}`` and ``{statistic}`` for the result's own
    #: interval label and statistic name (:meth:`header`).
    HEADER: ClassVar[tuple[str, ...]] = (
        "Group A", "Group B", "Difference", "SE", "CI low ({interval})", "CI high ({interval})",
        "{statistic}", "p", "Differs",
    )

    def header(self) -> list[str]:
        """The table's header row; the interval label is part of the CI column names."""
        return [h.format(interval=self.interval, statistic=self.statistic_name) for h in self.HEADER]

    def table(self) -> list[list[Any]]:
        """Header row, then one row per comparison (spill layout)."""
        return [self.header()] + [r.cells() for r in self.rows]

    def pair(self, a: str, b: str) -> PairRow:
        """The row comparing groups ``a`` and ``b`` (in either order as stored)."""
        for r in self.rows:
            if (r.group_a, r.group_b) in ((a, b), (b, a)):
                return r
        raise KeyError((a, b))

    def differing_pairs(self) -> tuple[tuple[str, str], ...]:
        """The pairs that the method separates (``p < alpha``)."""
        return tuple((r.group_a, r.group_b) for r in self.rows if r.differs)


# --------------------------------------------------------------------------------------------
# shared pieces


def _difference(mom: ExactMoments | FloatMoments, a: int, b: int) -> float:
    """``mean(a) - mean(b)``: exact then rounded once, or from the shifted float means."""
    if mom.exact:
        return float(mom.mean(a) - mom.mean(b))
    d = mom.deviations()
    return d[a] - d[b]


def _pooled(gm: GroupMoments) -> tuple[float, int, Fraction | None]:
    """``(MSE, df, exact MSE or None)`` of the one-way model (its checks included)."""
    ow = oneway_of(gm)
    if ow.exact and ow.ss_within_exact is not None:
        msw_x = ow.ss_within_exact / ow.df_within
        return float(msw_x), ow.df_within, msw_x
    return ow.ms_within, ow.df_within, None


def _se(msw: float, msw_x: Fraction | None, na: int, nb: int) -> float:
    if msw_x is not None:
        return math.sqrt(float(msw_x * Fraction(na + nb, na * nb)))
    return math.sqrt(msw * (1.0 / na + 1.0 / nb))


def _se_table(msw: float, msw_x: Fraction | None) -> Callable[[int, int], float]:
    """:func:`_se` for one family, each pair of group sizes computed once."""
    seen: dict[tuple[int, int], float] = {}

    def se(na: int, nb: int) -> float:
        key = (na, nb) if na <= nb else (nb, na)
        if key not in seen:
            seen[key] = _se(msw, msw_x, na, nb)
        return seen[key]

    return se


def _ratio(d: float, se: float) -> float:
    """``d / se`` with the degenerate cases of no variation answered (see module notes)."""
    if se > 0.0:
        return d / se
    if d == 0.0:
        return 0.0
    return math.copysign(math.inf, d)


def _t_two_sided(t: float, df: float) -> float:
    if math.isinf(t):
        return 0.0
    return min(1.0, float(2.0 * stats.t.sf(abs(t), df)))


def _holm(raw: list[float]) -> list[float]:
    """Holm's step-down adjusted p-values, in the order given."""
    m = len(raw)
    order = sorted(range(m), key=lambda i: raw[i])
    out = [0.0] * m
    running = 0.0
    for rank, i in enumerate(order):
        running = max(running, min(1.0, (m - rank) * raw[i]))
        out[i] = running
    return out


def _check_variances(gm: GroupMoments, method: str) -> list[float]:
    """Each group's variance (n - 1), with the messages for groups that have none."""
    mom = gm.moments
    out = []
    counts = gm.counts
    for i, lab in enumerate(gm.labels):
        n = counts[i]
        if n < 2:
            raise InputError(
                f'group "{lab}" has only one value; {method} uses each group\'s own '
                'variance, so every group needs at least two values (or use a pooled method '
                'such as "tukey")'
            )
        ss = mom.ss_group(i)
        if ss == 0:
            raise InputError(
                f'group "{lab}" has zero variance (all its values are equal); '
                f"{method} divides by each group's own variance, so it cannot be used here; "
                'use a pooled method such as "tukey", or check the measurement resolution'
            )
        var = rounded(Fraction(ss) / (n - 1)) if mom.exact else float(ss) / (n - 1)
        if var < sys.float_info.min:  # a variance that underflows cannot weigh its group
            raise InputError(TOO_SMALL)
        if not math.isfinite(var):
            raise InputError(TOO_LARGE)
        out.append(var)
    return out


#: The smallest alpha for comparisons: the studentized-range and many-to-one critical values
#: are solved (and checked) down to it; published tables stop at 0.001.
MIN_ALPHA = 1e-10


def check_comparison_alpha(alpha: Any) -> float:
    """The family-wise alpha of a comparison: a number from 1e-10 to 0.5."""
    check_alpha(alpha)  # not a number, or outside (0, 1): the general message
    return check_range(alpha, "alpha", MIN_ALPHA, 0.5, "0.05")


def _prepare(g: Groups, alpha: Any) -> tuple[Groups, float, ExactMoments | FloatMoments]:
    require_two_groups(g)
    a = check_comparison_alpha(alpha)
    return g, a, compute_moments(g, None)


def _means(gm: GroupMoments) -> tuple[float, ...]:
    return tuple(float(gm.moments.mean(i)) for i in range(gm.k))


# --------------------------------------------------------------------------------------------
# pairwise


def pairwise(
    groups: Any, method: str = "tukey", alpha: float = 0.05, *,
    missing: str = "stop", relabel: Mapping[str, str] | None = None,
) -> PairwiseResult:
    """Compare every pair of group means.

    ``groups`` is anything :func:`sheetfuncs.as_groups` accepts; ``method`` one of
    :data:`METHODS` (``tukey`` = Tukey–Kramer, ``games-howell``, ``bonferroni``, ``holm``,
    ``sidak``, ``scheffe``); ``alpha`` the familywise significance level. The formulas and their
    published sources are listed in the module documentation.

    ``missing`` (``"stop"`` or ``"drop"``) and ``relabel`` are as in :func:`sheetfuncs.as_groups`.
    """
    meth = parse_method(method)
    g, a, mom = _prepare(as_groups(groups, missing=missing, relabel=relabel), alpha)
    return pairwise_of(group_moments(g, mom), meth, a)


def pairwise_of(gm: GroupMoments, method: str = "tukey", alpha: float = 0.05) -> PairwiseResult:
    """:func:`pairwise` from the groups' labels, counts and moments (no values needed)."""
    meth = parse_method(method)
    require_two(gm)
    a = check_comparison_alpha(alpha)
    mom = gm.moments
    k = gm.k
    pairs = [(i, j) for i in range(k) for j in range(i + 1, k)]
    diffs = [_difference(mom, i, j) for i, j in pairs]
    if meth == "games-howell":
        return _games_howell(gm, a, pairs, diffs)
    return _pooled_pairs(gm, meth, a, pairs, diffs)


def _welch_df(vi: float, ni: int, vj: float, nj: int) -> float:
    """Welch's df of a pair, ``(a + b)^2 / (a^2/(ni-1) + b^2/(nj-1))`` with ``a = vi/ni`` and
    ``b = vj/nj``, from the shares ``a/(a+b)`` and ``b/(a+b)``: free of overflow and underflow
    for variances anywhere in the double range (both are positive)."""
    if vi >= vj:
        t = (vj / vi) * (ni / nj)  # b / a, at most ni / nj
        ra, rb = 1.0 / (1.0 + t), t / (1.0 + t)
    else:
        t = (vi / vj) * (nj / ni)  # a / b
        ra, rb = t / (1.0 + t), 1.0 / (1.0 + t)
    return 1.0 / (ra * ra / (ni - 1) + rb * rb / (nj - 1))


def _games_howell(gm: GroupMoments, a: float,
                  pairs: list[tuple[int, int]], diffs: list[float]) -> PairwiseResult:
    """Every pair by Games & Howell's method: each pair's own variances and Welch df."""
    k = gm.k
    counts = gm.counts
    var = _check_variances(gm, "Games–Howell")
    ses, row_df, stat = [], [], []
    for (i, j), d in zip(pairs, diffs):
        ses.append(math.hypot(math.sqrt(var[i] / counts[i]), math.sqrt(var[j] / counts[j])))
        row_df.append(_welch_df(var[i], counts[i], var[j], counts[j]))
        stat.append(abs(_ratio(d, ses[-1])) * _SQRT2)
    # one call each: the tails of all pairs, and one critical value per distinct Welch df
    ps = range_tails(stat, k, row_df).tolist()
    distinct = sorted(set(row_df))
    crit = dict(zip(distinct, (range_criticals(a, k, distinct) / _SQRT2).tolist()))
    mults = [crit[v] for v in row_df]
    rows = [
        _row(gm, i, j, d, se, mult, q, p, a)
        for (i, j), d, se, mult, q, p in zip(pairs, diffs, ses, mults, stat, ps)
    ]
    return _result(gm, "games-howell", a, rows, None, None, row_df, mults, [])


def _pooled_pairs(gm: GroupMoments, meth: str, a: float,
                  pairs: list[tuple[int, int]], diffs: list[float]) -> PairwiseResult:
    """Every pair by a method that pools the groups' variances (all but Games–Howell)."""
    k = gm.k
    counts = gm.counts
    m = len(pairs)
    notes: list[str] = []
    msw, df, msw_x = _pooled(gm)
    if msw == 0.0:
        notes.append(_NO_VARIATION)
    se_of = _se_table(msw, msw_x)
    ses = [se_of(counts[i], counts[j]) for i, j in pairs]
    ts = [_ratio(d, se) for d, se in zip(diffs, ses)]

    if meth == "tukey":
        stat = [abs(t) * _SQRT2 for t in ts]
        ps = range_tails(stat, k, df).tolist()  # one call shares the work between the pairs
        mult = range_critical(a, k, df) / _SQRT2  # one value for the whole family
        if len(set(counts)) > 1:
            notes.append(
                "group sizes differ: the Tukey–Kramer intervals are conservative (their joint "
                "coverage is at least the stated level)"
            )
    elif meth == "scheffe":
        stat = [t * t / (k - 1) for t in ts]
        ps = [0.0 if math.isinf(f) else f_tail(f, k - 1, df) for f in stat]
        mult = math.sqrt((k - 1) * f_critical(a, k - 1, df))
    else:
        stat = ts
        ps, mult = _adjusted_t(meth, ts, df, a, m)
    rows = [
        _row(gm, i, j, d, se, mult, s, p, a)
        for (i, j), d, se, s, p in zip(pairs, diffs, ses, stat, ps)
    ]
    return _result(gm, meth, a, rows, msw, float(df), [float(df)] * m, [mult] * m, notes)


def _adjusted_t(meth: str, ts: list[float], df: int, a: float, m: int) -> tuple[list[float], float]:
    """Two-sided t tests adjusted for ``m`` pairs by Bonferroni, Holm or Šidák: the adjusted
    p-values and the interval multiplier."""
    raw = [_t_two_sided(t, df) for t in ts]
    if meth == "bonferroni":
        ps = [min(1.0, m * p) for p in raw]
    elif meth == "holm":
        ps = _holm(raw)
    else:  # sidak
        ps = [min(1.0, -math.expm1(m * math.log1p(-p))) if p < 1.0 else 1.0 for p in raw]
    if meth == "sidak":
        per = -math.expm1(math.log1p(-a) / m)
    else:
        per = a / m
    return ps, float(stats.t.isf(per / 2.0, df))


def _row(gm: GroupMoments, i: int, j: int, d: float, se: float, mult: float, stat: float, p: float,
         alpha: float) -> PairRow:
    half = mult * se
    p = min(1.0, max(0.0, float(p)))
    return PairRow(
        group_a=gm.labels[i], group_b=gm.labels[j], difference=d, se=se,
        ci=Interval(d - half, d + half), statistic=float(stat), p=p, differs=bool(p < alpha),
    )


def _result(gm: GroupMoments, meth: str, a: float, rows: list[PairRow],
            ms_within: float | None, df_within: float | None, row_df: list[float],
            mults: list[float], notes: list[str], control: str | None = None) -> PairwiseResult:
    """The result of a family of comparisons, with the groups' labels, sizes and means."""
    return PairwiseResult(
        method=meth, alpha=a, rows=tuple(rows), interval=_interval_label(meth, a),
        statistic_name=_STATISTIC[meth], method_name=METHOD_NAMES[meth], labels=gm.labels,
        counts=gm.counts, means=_means(gm), ms_within=ms_within, df_within=df_within,
        row_df=tuple(row_df),
        multipliers=tuple(mults), exact=gm.exact, control=control, notes=tuple(notes),
        dropped=gm.dropped,
    )


# --------------------------------------------------------------------------------------------
# many-to-one


def dunnett(
    groups: Any, control: Any, alpha: float = 0.05, *,
    missing: str = "stop", relabel: Mapping[str, str] | None = None,
) -> PairwiseResult:
    """Compare every treatment group with one control group (Dunnett 1955, two-sided).

    ``control`` is the control group's label (numbers are matched by their shortest form, so
    ``3`` finds the group labelled ``3``). Rows follow the group order, without the control:
    ``group_a`` is the treatment, ``group_b`` the control, ``difference`` = treatment mean minus
    control mean. p-values and the simultaneous critical value come from the many-to-one
    multivariate t distribution, computed by deterministic quadrature of Dunnett's
    one-dimensional reduction (see :mod:`sheetfuncs.distributions.many_to_one`), not by
    random sampling.

    ``missing`` (``"stop"`` or ``"drop"``) and ``relabel`` are as in :func:`sheetfuncs.as_groups`.
    """
    g = as_groups(groups, missing=missing, relabel=relabel)
    require_two_groups(g)
    _control_index(g.labels, control)  # the control's messages before alpha's, as always
    a = check_comparison_alpha(alpha)
    return dunnett_of(group_moments(g, compute_moments(g, None)), control, a)


def _control_index(labels: tuple[str, ...], control: Any) -> tuple[int, str]:
    """The control's position and label, or the message that names the groups."""
    lab = format_label(control) if control is not None else ""
    if lab == "":
        raise InputError(
            "no control group given; give the label of the group the others are "
            "compared with"
        )
    if lab not in labels:
        shown = ", ".join(f'"{x}"' for x in labels[:12]) + (", ..." if len(labels) > 12 else "")
        raise InputError(
            f'the control "{lab}" is not one of the groups ({shown}); give the '
            "control's label exactly as it appears"
        )
    return labels.index(lab), lab


def dunnett_of(gm: GroupMoments, control: Any, alpha: float = 0.05) -> PairwiseResult:
    """:func:`dunnett` from the groups' labels, counts and moments (no values needed)."""
    require_two(gm)
    c, lab = _control_index(gm.labels, control)
    a = check_comparison_alpha(alpha)
    mom = gm.moments
    msw, df, msw_x = _pooled(gm)
    notes: list[str] = []
    if msw == 0.0:
        notes.append(_NO_VARIATION)
    treat = [i for i in range(gm.k) if i != c]
    counts = gm.counts
    n0 = counts[c]
    lam = [math.sqrt(counts[i] / (counts[i] + n0)) for i in treat]
    crit = many_to_one_critical(a, lam, df)
    ds = [_difference(mom, i, c) for i in treat]
    se_of = _se_table(msw, msw_x)
    ses = [se_of(counts[i], n0) for i in treat]
    ts = [_ratio(d, se) for d, se in zip(ds, ses)]
    ps = many_to_one_tails([abs(t) for t in ts], lam, df).tolist()  # inf gives 0
    rows = [_row(gm, i, c, d, se, crit, t, p, a) for i, d, se, t, p in zip(treat, ds, ses, ts, ps)]
    m = len(treat)
    return _result(gm, "dunnett", a, rows, msw, float(df), [float(df)] * m, [crit] * m,
                   notes, control=lab)
