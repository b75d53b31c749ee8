"""Per-group summaries: n, mean, SD, standard error, t interval for the mean, min, median, max.

The interval is mean +/- t(1 - (1 - conf)/2, n - 1) * SD / sqrt(n) (Student 1908; e.g.
NIST/SEMATECH e-Handbook of Statistical Methods, section 7.2.2.1). Means and SDs come from the
same decimal-exact moments as the one-way analysis when that path applies. A group of one value
has no SD: its SD, SE and interval are NaN, which fronts show as "undefined".
"""

from __future__ import annotations

import decimal
import math
from collections.abc import Iterator
from fractions import Fraction
from dataclasses import dataclass
from typing import Any, ClassVar

import numpy as np
from scipy import stats

from ..input import as_groups, check_conf
from .moments import check_float_zero_spread, check_ss_range, compute_moments
from .interval import Interval

__all__ = ["GroupSummary", "DescribeResult", "describe"]

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
    """Per-group summaries in group order, at confidence level ``conf``."""

    groups: tuple[GroupSummary, ...]
    conf: float
    exact: bool

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
    """The median; for an even count the midpoint of the two middle values, taken exactly for
    their decimal values on the exact path (so 61.1 and 61.2 give 61.15, not 61.150000000000006)."""
    n = a.size
    if n % 2:
        return float(np.partition(a, n // 2)[n // 2])
    part = np.partition(a, (n // 2 - 1, n // 2))
    lo, hi = float(part[n // 2 - 1]), float(part[n // 2])
    if exact:
        return float((Fraction(decimal.Decimal(repr(lo))) + Fraction(decimal.Decimal(repr(hi)))) / 2)
    return lo + (hi - lo) / 2


def describe(groups: Any, conf: float = 0.95, *, exact: bool | None = None) -> DescribeResult:
    """Summaries of each group with a ``conf`` t interval for its mean."""
    g = as_groups(groups)
    c = check_conf(conf)
    mom = compute_moments(g, exact)
    out = []
    for i, (label, a) in enumerate(g):
        n = int(a.size)
        mean = float(mom.mean(i))
        if n > 1:
            ss = mom.ss_group(i)
            check_ss_range(ss)
            if ss == 0 and float(a.min()) != float(a.max()):
                check_float_zero_spread(g, 0.0, within=True)  # underflow, not a constant group
            var = ss / (n - 1)
            sd = math.sqrt(float(var))
            se = sd / math.sqrt(n)
            q = float(stats.t.isf((1.0 - c) / 2.0, n - 1))
            lo, hi = mean - q * se, mean + q * se
        else:
            sd = se = lo = hi = math.nan
        out.append(
            GroupSummary(label, n, mean, sd, se, Interval(lo, hi), float(a.min()), _median(a, mom.exact), float(a.max()))
        )
    return DescribeResult(tuple(out), c, mom.exact)
