"""Per-group variances for the statistics that need each group's own variance.

Welch's and Brown & Forsythe's tests for means, and Levene's and Bartlett's tests for
variances, need two or more values in every group (:func:`require_variances`). Their
statistics do not depend on the unit of measurement, so their moments may be taken on data
rescaled by a power of two, which is exact (:func:`unit_free_moments`); and the group means and
variances they combine are formed in one common unit, centred on the first group's mean, from
the decimal-exact moments when that path applies (:func:`centred_group_stats`). See
:mod:`sheetfuncs.stats.moments` for the moments themselves.
"""

from __future__ import annotations

import math
from fractions import Fraction
from collections.abc import Sequence
from typing import Any

import numpy as np

from ..errors import InputError
from ..input import Groups, as_groups
from .moments import ExactMoments, FloatMoments, compute_moments
from .oneway import require_two_groups

__all__ = [
    "prepare_with_variances", "require_variances", "require_variance_counts", "unit_free_moments",
    "centred_group_stats", "centred_stats",
]


def prepare_with_variances(
    groups: Any, method: str, exact: bool | None
) -> tuple[Groups, ExactMoments | FloatMoments]:
    """The groups and their unit-free moments for a ``method`` that needs every group's
    variance: at least two groups, each of two or more values (else InputError)."""
    g = as_groups(groups)
    require_two_groups(g)
    require_variances(g, method)
    return unit_free_moments(g, exact)


def require_variances(g: Groups, method: str) -> None:
    """InputError unless every group has two or more values (``method`` needs each variance)."""
    require_variance_counts(g.labels, g.counts, method)


def require_variance_counts(labels: Sequence[str], counts: Sequence[int], method: str) -> None:
    """:func:`require_variances` from the labels and the counts alone."""
    for label, n in zip(labels, counts):
        if n < 2:
            raise InputError(
                f'group "{label}" has only one value, but {method} needs the '
                "variance of every group; add values to that group or leave it out"
            )


def unit_free_moments(g: Groups, exact: bool | None) -> tuple[Groups, ExactMoments | FloatMoments]:
    """Moments for statistics that do not depend on the unit of measurement.

    On the floating-point path, data of extreme size (largest magnitude above 2**300 or below
    2**-300) are first rescaled by a power of two, which is exact, so that squares neither
    overflow nor underflow. Returns the (possibly rescaled) groups with their moments. The
    decimal-exact path needs no rescaling: its sums are exact integers.
    """
    top = max(float(np.max(np.abs(a))) for a in g.arrays)
    if top == 0.0 or 2.0**-300 < top < 2.0**300:
        return g, compute_moments(g, exact)
    with np.errstate(over="ignore", under="ignore", invalid="ignore"):
        mom = compute_moments(g, exact)  # the float path's squares may overflow: not used then
    if mom.exact:
        return g, mom
    shift = -math.frexp(top)[1]
    scaled = Groups(
        labels=g.labels, arrays=tuple(np.ldexp(a, shift) for a in g.arrays), cells=g.cells,
        notes=g.notes, layout=g.layout, label_source=g.label_source, dropped=g.dropped,
    )
    return scaled, compute_moments(scaled, False)


def _pow2_exponent(x: Fraction | float) -> int:
    """An integer e with 2**e within a factor of 2 of x > 0."""
    if isinstance(x, Fraction):
        return x.numerator.bit_length() - x.denominator.bit_length()
    return math.frexp(x)[1]


def centred_group_stats(
    g: Groups, mom: ExactMoments | FloatMoments
) -> tuple[tuple[float, ...], tuple[float, ...]]:
    """:func:`centred_stats` of the groups' moments."""
    return centred_stats(mom)


def centred_stats(mom: ExactMoments | FloatMoments) -> tuple[tuple[float, ...], tuple[float, ...]]:
    """``(deviations, variances)`` per group, in a common unit ``2**h``.

    ``deviations[i] = (mean_i - mean_1) / 2**h`` and ``variances[i] = SS_i / (n_i - 1) / 4**h``
    (``nan`` for a group of one value), with ``h`` chosen so that the largest variance is near
    1: statistics that do not depend on the unit (Welch's F and df) are then free of overflow
    and underflow whatever the size of the data. On the exact path the differences of means and
    the variances are exact rationals rounded once, so they keep their full precision however
    many leading digits the data share.
    """
    k = len(mom.n)
    raw_var: list[Fraction | float | None] = []
    for i in range(k):
        n = mom.n[i]
        raw_var.append(mom.ss_group(i) / (n - 1) if n > 1 else None)
    positive = [v for v in raw_var if v is not None and v > 0]
    h = _pow2_exponent(max(positive)) // 2 if positive else 0
    try:
        if mom.exact:
            c = mom.mean(0)
            unit = Fraction(2) ** h
            dev = tuple(float((mom.mean(i) - c) / unit) for i in range(k))
            var = tuple(math.nan if v is None else float(v / (unit * unit)) for v in raw_var)
        else:
            dev = tuple(math.ldexp(d, -h) for d in mom.mean_differences(0))
            var = tuple(math.nan if v is None else math.ldexp(float(v), -2 * h) for v in raw_var)
    except OverflowError:  # means further apart than a double can count in standard deviations
        raise InputError(MEANS_TOO_FAR) from None
    return dev, var


MEANS_TOO_FAR = (
    "the group means differ by more than 10^300 times the groups' standard deviations, which "
    "double precision cannot carry; check the data's units"
)
