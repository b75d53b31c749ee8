"""A test that the one-way residuals come from a normal distribution.

Shapiro & Wilk (1965), *Biometrika* 52, 591–611, with the coefficients and p-value
approximation of Royston (1992), "Approximating the Shapiro-Wilk W-test for non-normality",
*Statistics and Computing* 2, 117–119 (Royston 1995, *Applied Statistics* 44, 547–551,
algorithm AS R94), for 3 to 5,000 residuals. Above 5,000 residuals the approximation is not
validated, and the D'Agostino–Pearson omnibus test is used instead: D'Agostino & Pearson
(1973), *Biometrika* 60, 613–622, from D'Agostino's (1970) skewness test and Anscombe &
Glynn's (1983) kurtosis test, as set out in D'Agostino, Belanger & D'Agostino (1990), *The
American Statistician* 44, 316–321.

The residuals are those of :mod:`sheetfuncs.stats.residuals` (formed around a value of each
group, exactly on the decimal-exact path). A group of one value has a residual of exactly zero
that carries no information; such groups are left out (and named in the result). The
statistics and their p-values are those of :mod:`sheetfuncs.distributions.normality`.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass
from typing import Any, ClassVar

import numpy as np

from ..distributions import SHAPIRO_WILK_MAX_N, dagostino_pearson, shapiro_wilk
from ..errors import InputError
from ..input import as_groups
from .group_variances import unit_free_moments
from .oneway import require_two_groups
from .residuals import Deviations

__all__ = ["NormalityResult", "shapiro_residuals", "SHAPIRO_WILK_MAX_N"]

SHAPIRO_WILK = "Shapiro-Wilk"
DAGOSTINO_PEARSON = "D'Agostino-Pearson"


@dataclass(frozen=True)
class NormalityResult:
    """A test that the one-way residuals come from a normal distribution.

    Fields: ``statistic`` (Shapiro–Wilk W, or the D'Agostino–Pearson K^2), ``p``, ``n`` (number
    of residuals tested), ``method`` (``"Shapiro-Wilk"`` for up to 5,000 residuals, else
    ``"D'Agostino-Pearson"``), ``left_out`` (labels of groups of one value, whose residual is
    zero by construction and is not tested); ``of_total`` and ``seed`` are set when the test ran
    on a seeded random sample of ``n`` of ``of_total`` residuals (``0`` and ``None`` when it ran
    on them all).

    Sources: Shapiro & Wilk (1965); Royston (1992, 1995); D'Agostino & Pearson (1973).
    """

    statistic: float
    p: float
    n: int
    method: str
    left_out: tuple[str, ...] = ()
    of_total: int = 0
    seed: int | None = None

    @property
    def residuals_text(self) -> str:
        """What was tested, in words: ``"40 residuals"``, or for a random sample (``of_total``
        residuals in all, ``seed`` the sample's seed) ``"a random sample of 5000 of the
        1000000 residuals, seed 7"``."""
        if not self.of_total:
            return f"{self.n} residuals"
        return f"a random sample of {self.n} of the {self.of_total} residuals, seed {self.seed}"

    #: The table's header row.
    HEADER: ClassVar[tuple[str, ...]] = ("Test", "Statistic", "n", "p")

    def table(self) -> list[list[Any]]:
        """Header row, then one row for the test."""
        return [
            list(self.HEADER),
            [f"{self.method} (residuals)", self.statistic, self.n, self.p],
        ]


def shapiro_residuals(
    groups: Any, *, exact: bool | None = None,
    missing: str = "stop", relabel: Mapping[str, str] | None = None,
) -> NormalityResult:
    """Test the normality of the one-way residuals ``y_ij - ybar_i``.

    Shapiro–Wilk for 3 to 5,000 residuals; above that the D'Agostino–Pearson omnibus test (the
    result's ``method`` says which). Groups of one value are left out.

    ``missing`` (``"stop"`` or ``"drop"``) and ``relabel`` are as in :func:`sheetfuncs.as_groups`.
    """
    g = as_groups(groups, missing=missing, relabel=relabel)
    require_two_groups(g)
    g, mom = unit_free_moments(g, exact)
    kept = [i for i, n in enumerate(g.counts) if n >= 2]
    left_out = tuple(g.labels[i] for i, n in enumerate(g.counts) if n < 2)
    dev = Deviations(g, mom)
    # W and K^2 are unchanged by a common unit: test the residuals in the exact integer unit
    res = np.concatenate([dev.residuals(i) for i in kept]) if kept else np.empty(0)
    n = int(res.size)
    if n < 3:
        raise InputError(
            f"only {n} residuals from groups of two or more values; the normality "
            "test needs at least 3: add values to the groups"
        )
    if not np.any(res):
        raise InputError(
            "all residuals are zero (within each group every value is the same), so "
            "their normality cannot be tested; check the measurement resolution"
        )
    res = res / float(np.max(np.abs(res)))  # both statistics are free of the unit
    if n <= SHAPIRO_WILK_MAX_N:
        stat, p = shapiro_wilk(res)
        method = SHAPIRO_WILK
    else:
        stat, p = dagostino_pearson(res)
        method = DAGOSTINO_PEARSON
    return NormalityResult(statistic=stat, p=p, n=n, method=method, left_out=left_out)
