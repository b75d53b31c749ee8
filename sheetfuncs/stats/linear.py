"""The general linear test (full versus reduced model) and single-degree-of-freedom contrasts.

General linear test (e.g. Kutner, Nachtsheim, Neter & Li, *Applied Linear Statistical Models*,
section 2.8): the full model gives each group its own mean; the reduced model makes the groups
that share a pooling label share one mean. With SSE(R), df(R) and SSE(F), df(F) the residual sums
of squares and degrees of freedom,

    F* = [(SSE(R) - SSE(F)) / (df(R) - df(F))] / [SSE(F) / df(F)]  ~  F(df(R) - df(F), df(F)).

A contrast L = sum c_i mu_i with sum c_i = 0 is estimated by sum c_i ybar_i with standard error
sqrt(MSE * sum c_i^2 / n_i) and referred to t with N - k degrees of freedom.
"""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from fractions import Fraction
from typing import Any, ClassVar

from scipy import stats

from ..errors import InputError
from ..distributions import f_tail
from ..input import Groups, as_groups, as_real, check_conf, format_label, one_line, shown
from .moments import (
    ExactMoments, FloatMoments, check_float_zero_spread, check_ss_range, compute_moments, rounded,
)
from .oneway import require_two_groups
from .interval import Interval

__all__ = ["LinearTestResult", "ContrastResult", "linear_test", "contrast", "per_group_argument"]


def per_group_argument(values: Any, g: Groups, what: str) -> list[Any]:
    """A per-group argument (pooling labels, weights) as a flat list checked for length.

    2-D inputs (a spreadsheet row or column) are flattened; blank cells at the end are dropped,
    so a range drawn longer than needed still fits. A block of several rows and columns is an
    input error (it has no one order).
    """
    flat = one_line(values, what)
    while flat and (flat[-1] is None or flat[-1] == ""):
        flat.pop()
    if len(flat) != g.k:
        raise InputError(
            f"{len(flat)} {what} for {g.k} groups; give one per group, in the "
            f"order of the groups ({', '.join(g.labels[:6])}{', ...' if g.k > 6 else ''})"
        )
    return flat


@dataclass(frozen=True)
class LinearTestResult:
    """Full-versus-reduced model test.

    ``ss_reduced``/``df_reduced``: residual sum of squares and df of the reduced model;
    ``ss_full``/``df_full``: those of the full one-way model; ``f``, ``p``; ``pools`` lists the
    groups that share each mean in the reduced model.
    """

    ss_reduced: float
    df_reduced: int
    ss_full: float
    df_full: int
    f: float
    p: float
    pools: tuple[tuple[str, tuple[str, ...]], ...]
    exact: bool
    ss_difference: float = math.nan  # SSE(R) - SSE(F), rounded once (not the difference of the rounded parts)

    #: The table's header row.
    HEADER: ClassVar[tuple[str, ...]] = ("Model", "df", "SS", "MS", "F", "p")

    @property
    def df_difference(self) -> int:
        return self.df_reduced - self.df_full

    def table(self) -> list[list[Any]]:
        return [
            list(self.HEADER),
            ["Reduced residual", self.df_reduced, self.ss_reduced, self.ss_reduced / self.df_reduced, None, None],
            ["Full residual", self.df_full, self.ss_full, self.ss_full / self.df_full, None, None],
            ["Difference", self.df_difference, self.ss_difference,
             self.ss_difference / self.df_difference, self.f, self.p],
        ]


def linear_test(
    groups: Any, pooling: Sequence[Any], *, exact: bool | None = None,
    missing: str = "stop", relabel: Mapping[str, str] | None = None,
) -> LinearTestResult:
    """General linear test of the reduced model given by ``pooling`` (one label per group).

    Groups with the same pooling label share one mean in the reduced model. Pooling every group
    into one label reproduces the one-way F test.

    ``missing`` (``"stop"`` or ``"drop"``) and ``relabel`` are as in :func:`sheetfuncs.as_groups`.
    """
    g = as_groups(groups, missing=missing, relabel=relabel)
    require_two_groups(g)
    pool = [format_label(v) if v is not None else "" for v in per_group_argument(pooling, g, "pooling labels")]
    if any(p == "" for p in pool):
        i = pool.index("")
        raise InputError(
            f'the pooling label for group "{g.labels[i]}" is blank; give every group a pooling label'
        )
    order: dict[str, list[int]] = {}
    for i, p in enumerate(pool):
        order.setdefault(p, []).append(i)
    parts = list(order.values())
    if len(parts) == g.k:
        raise InputError(
            "every group has its own pooling label, so the reduced model is the full "
            "model; give groups that should share a mean the same label"
        )
    mom = compute_moments(g, exact)
    n = g.n_total
    df_full = n - g.k
    df_red = n - len(parts)
    if df_full <= 0:
        raise InputError(
            f"no residual degrees of freedom ({n} values in {g.k} groups); at least "
            "one group needs two or more values"
        )
    ss_full_x = mom.ss_within_parts([[i] for i in range(g.k)])
    ss_red_x = mom.ss_within_parts(parts)
    check_ss_range(ss_red_x)
    if ss_full_x != 0:
        check_ss_range(ss_full_x)
    if not mom.exact:
        check_float_zero_spread(g, ss_full_x, within=True)
    num = (ss_red_x - ss_full_x) / (df_red - df_full)
    if ss_full_x == 0:
        if ss_red_x == 0:
            raise InputError(
                "all values within each pool are identical, so there is no variation to test"
            )
        f = math.inf
    else:
        f = rounded(num / (ss_full_x / df_full))
    p = 0.0 if math.isinf(f) else f_tail(max(f, 0.0), df_red - df_full, df_full)
    pools = tuple((lab, tuple(g.labels[i] for i in idx)) for lab, idx in order.items())
    return LinearTestResult(
        ss_reduced=float(ss_red_x), df_reduced=df_red, ss_full=float(ss_full_x), df_full=df_full,
        f=f, p=p, pools=pools, exact=mom.exact, ss_difference=float(ss_red_x - ss_full_x),
    )


@dataclass(frozen=True)
class ContrastResult:
    """A contrast sum w_i mu_i: ``estimate``, ``se``, ``t``, ``df``, two-sided ``p``, and the
    ``conf`` interval ``ci``."""

    weights: tuple[float, ...]
    estimate: float
    se: float
    t: float
    df: int
    p: float
    ci: Interval
    conf: float
    exact: bool = False

    #: The table's header row.
    HEADER: ClassVar[tuple[str, ...]] = ("Estimate", "SE", "t", "df", "p", "CI low", "CI high")

    def table(self) -> list[list[Any]]:
        return [
            list(self.HEADER),
            [self.estimate, self.se, self.t, self.df, self.p, *self.ci],
        ]


def _scale_back(v: float, e: int) -> float:
    """``v * 2**e`` exactly, or an infinity of v's sign beyond the largest double."""
    try:
        return math.ldexp(v, e)
    except OverflowError:
        return math.copysign(math.inf, v)


def contrast(
    groups: Any, weights: Sequence[Any], conf: float = 0.95, *, exact: bool | None = None,
    missing: str = "stop", relabel: Mapping[str, str] | None = None,
) -> ContrastResult:
    """Estimate, test and interval for the contrast with the given weights (one per group,
    summing to 0).

    ``missing`` (``"stop"`` or ``"drop"``) and ``relabel`` are as in :func:`sheetfuncs.as_groups`.
    """
    g = as_groups(groups, missing=missing, relabel=relabel)
    require_two_groups(g)
    c = check_conf(conf)
    w = _contrast_weights(weights, g)
    # Work with the weights scaled by a power of two (exact) so that their largest is near 1:
    # t, p and the verdict do not depend on the scale; estimate, SE and interval scale back.
    ws, e = _scaled_weights(w)
    mom = compute_moments(g, exact)
    n = g.n_total
    df = n - g.k
    if df <= 0:
        raise InputError(
            f"no residual degrees of freedom ({n} values in {g.k} groups); at least "
            "one group needs two or more values"
        )
    ssw = mom.ss_within_parts([[i] for i in range(g.k)])
    check_ss_range(ssw)
    if not mom.exact:
        check_float_zero_spread(g, ssw, within=True)
    est, se = _estimate_and_se(mom, ssw, ws, g.counts, df)
    if se == 0:
        if est == 0:
            raise InputError(
                "the contrast and its standard error are both zero (no variation "
                "within or between the groups involved)"
            )
        t = math.copysign(math.inf, est)
        p = 0.0
    else:
        t = est / se
        p = float(2.0 * stats.t.sf(abs(t), df))
    q = float(stats.t.isf((1.0 - c) / 2.0, df))
    lo, hi = est - q * se, est + q * se
    est, se, lo, hi = (_scale_back(v, e) for v in (est, se, lo, hi))
    return ContrastResult(
        weights=tuple(w), estimate=est, se=se, t=t, df=df, p=min(p, 1.0),
        ci=Interval(lo, hi), conf=c, exact=mom.exact,
    )


def _contrast_weights(weights: Sequence[Any], g: Groups) -> list[float]:
    """One finite number per group, not all zero (else InputError)."""
    raw = per_group_argument(weights, g, "weights")
    w: list[float] = []
    for i, v in enumerate(raw):
        fv = as_real(v)
        if fv is None:
            raise InputError(f'the weight for group "{g.labels[i]}" is {shown(v)}, not a number')
        if not math.isfinite(fv):
            raise InputError(f'the weight for group "{g.labels[i]}" is not finite')
        w.append(fv)
    if all(x == 0 for x in w):
        raise InputError("all contrast weights are zero; give weights such as 1, -1, 0")
    return w


def _scaled_weights(w: list[float]) -> tuple[list[float], int]:
    """The weights times ``2**-e`` (exact) so that the largest is near 1, and ``e``; InputError
    unless they sum to zero (to a relative 1e-12)."""
    e = math.frexp(max(abs(x) for x in w))[1]
    ws = [math.ldexp(x, -e) for x in w]
    abs_sum = math.fsum(abs(x) for x in ws)
    total = math.fsum(ws)
    if abs_sum == 0:
        raise InputError("all contrast weights are zero; give weights such as 1, -1, 0")
    if abs(total) > 1e-12 * abs_sum:
        raise InputError(
            f"contrast weights must sum to zero, but they sum to {_scale_back(total, e):.6g}; "
            "adjust them (e.g. 1, -0.5, -0.5)"
        )
    return ws, e


def _estimate_and_se(mom: ExactMoments | FloatMoments, ssw: Fraction | float, ws: list[float],
                     counts: Sequence[int], df: int) -> tuple[float, float]:
    """The contrast's estimate and standard error in the scaled weights."""
    if mom.exact:
        # once the weights pass the tolerance they are a contrast: their rounding residue
        # (e.g. 1, -1/3, -1/3, -1/3 sum to 5.6e-17) must not multiply a mean near 1e12
        diffs_x = mom.mean_differences(0)
        est_x = sum(Fraction(wi) * diffs_x[i] for i, wi in enumerate(ws))
        var_x = ssw / df * sum(Fraction(wi) ** 2 / counts[i] for i, wi in enumerate(ws))
        return rounded(est_x), math.sqrt(rounded(var_x))
    diffs = mom.mean_differences(0)  # sum(w) is ~0, so the common part cancels exactly
    est = math.fsum(wi * diffs[i] for i, wi in enumerate(ws))
    se = math.sqrt(float(ssw) / df * math.fsum(wi * wi / counts[i] for i, wi in enumerate(ws)))
    return est, se
