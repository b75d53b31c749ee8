"""Per-group summaries: n, mean, SD, standard error, t interval for the mean, min, median, max.

The interval is mean +/- t(1 - (1 - conf)/2, n - 1) * SD / sqrt(n) (Student 1908; e.g.
NIST/SEMATECH e-Handbook of Statistical Methods, section 7.2.2.1). Means and SDs come from the
same decimal-exact moments as the one-way analysis when that path applies. A group of one value
has no SD: its SD, SE and interval are NaN, which fronts show as "undefined".
"""

from __future__ import annotations

import decimal
import math
from collections.abc import Iterator, Mapping, Sequence
from fractions import Fraction
from dataclasses import dataclass
from typing import Any, ClassVar

import numpy as np
from scipy import stats

from ..errors import InputError
from ..input import as_groups, check_conf
from .group_moments import GroupMoments, group_moments
from .moments import TOO_SMALL, check_ss_range, compute_moments
from .interval import Interval

__all__ = ["GroupSummary", "DescribeResult", "describe", "describe_of", "middle_value"]

@dataclass(frozen=True)
class GroupSummary:
    """Summary of one group (``sd`` uses n - 1; ``ci`` the t interval for the mean)."""

    label: str
    n: int
    mean: float
    sd: float
    se: float
    ci: Interval
    min: float
    median: float
    max: float

    def row(self) -> list[Any]:
        return [self.label, self.n, self.mean, self.sd, self.se, *self.ci,
                self.min, self.median, self.max]


@dataclass(frozen=True)
class DescribeResult:
    """Per-group summaries in group order, at confidence level ``conf``; ``dropped`` the missing
    values left out of each group (``missing="drop"``, or error cells read as missing)."""

    groups: tuple[GroupSummary, ...]
    conf: float
    exact: bool
    dropped: tuple[int, ...] = ()

    #: The table's header row.
    HEADER: ClassVar[tuple[str, ...]] = (
        "Group", "n", "Mean", "SD", "SE", "CI low", "CI high", "Min", "Median", "Max",
    )

    def __getitem__(self, label: str) -> GroupSummary:
        for s in self.groups:
            if s.label == label:
                return s
        raise KeyError(label)

    def __iter__(self) -> Iterator[GroupSummary]:
        return iter(self.groups)

    def __len__(self) -> int:
        return len(self.groups)

    def table(self) -> list[list[Any]]:
        return [list(self.HEADER)] + [s.row() for s in self.groups]


def _median(a: np.ndarray, exact: bool) -> float:
    """The median; for an even count the midpoint of the two middle values (see
    :func:`middle_value`)."""
    n = a.size
    if n % 2:
        return float(np.partition(a, n // 2)[n // 2])
    part = np.partition(a, (n // 2 - 1, n // 2))
    return middle_value(float(part[n // 2 - 1]), float(part[n // 2]), exact)


def middle_value(lo: float, hi: float, exact: bool) -> float:
    """The midpoint of the two middle values of a group, taken exactly for their decimal values
    on the exact path (so 61.1 and 61.2 give 61.15, not 61.150000000000006)."""
    if exact:
        return float((Fraction(decimal.Decimal(repr(lo))) + Fraction(decimal.Decimal(repr(hi)))) / 2)
    return lo + (hi - lo) / 2


def describe(
    groups: Any, conf: float = 0.95, *, exact: bool | None = None,
    missing: str = "stop", relabel: Mapping[str, str] | None = None,
) -> DescribeResult:
    """Summaries of each group with a ``conf`` t interval for its mean.

    ``missing`` (``"stop"`` or ``"drop"``) and ``relabel`` are as in :func:`sheetfuncs.as_groups`.
    """
    g = as_groups(groups, missing=missing, relabel=relabel)
    c = check_conf(conf)
    mom = compute_moments(g, exact)
    extremes = [(float(a.min()), _median(a, mom.exact), float(a.max())) for a in g.arrays]
    return describe_of(group_moments(g, mom), c, extremes)


def describe_of(
    gm: GroupMoments, conf: float = 0.95,
    extremes: Sequence[tuple[float, float, float]] | None = None,
) -> DescribeResult:
    """:func:`describe` from the groups' labels, counts and moments. The smallest value, the
    median and the largest need the values: give them per group as ``extremes`` (computed
    elsewhere, e.g. by a database), or they are ``nan`` (not available from sums alone)."""
    c = check_conf(conf)
    mom = gm.moments
    out = []
    for i, label in enumerate(gm.labels):
        n = gm.counts[i]
        mean = float(mom.mean(i))
        if n > 1:
            ss = mom.ss_group(i)
            check_ss_range(ss)
            if i in gm.underflow_groups:
                raise InputError(TOO_SMALL)  # underflow, not a constant group
            var = ss / (n - 1)
            sd = math.sqrt(float(var))
            se = sd / math.sqrt(n)
            q = float(stats.t.isf((1.0 - c) / 2.0, n - 1))
            lo, hi = mean - q * se, mean + q * se
        else:
            sd = se = lo = hi = math.nan
        low, mid, high = extremes[i] if extremes is not None else (math.nan,) * 3
        out.append(GroupSummary(label, n, mean, sd, se, Interval(lo, hi), low, mid, high))
    return DescribeResult(tuple(out), c, mom.exact, dropped=gm.dropped)
