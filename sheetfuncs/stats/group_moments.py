"""The groups without their values: labels, counts and moments, all that many analyses need.

Welch's and Bartlett's tests, the pairwise and many-to-one comparisons, the compact letters, the
effect sizes, the variance components and the group means, SDs and intervals need only each
group's size, mean and variance. :class:`GroupMoments` holds exactly that, so the same
functions serve groups held in memory (:func:`group_moments` builds it from
:class:`~sheetfuncs.input.Groups` and their moments) and exact per-group sums computed
elsewhere, e.g. inside a database (:func:`moments_only`), with no values at hand.

What needs the values themselves is not available from a :class:`GroupMoments`: the smallest,
median and largest values, ranks (Kruskal–Wallis), absolute deviations from a centre (Levene,
Brown–Forsythe for variances) and the residuals (their normality test).
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

from ..errors import InputError
from ..input import Groups
from .moments import TOO_SMALL, ExactMoments, FloatMoments

__all__ = ["GroupMoments", "group_moments", "moments_only", "require_two", "require_two_labels", "check_zero_spread"]


@dataclass(frozen=True)
class GroupMoments:
    """Labels, counts and moments of the groups, without their values.

    Fields: ``labels`` (one per group, in order); ``moments`` (exact or floating-point, their
    ``n`` the group sizes); ``dropped`` the missing values left out of each group (zeros when
    none); ``underflow_groups`` the indices of groups whose floating-point sum of squares is
    zero although their values differ, and ``underflow_total`` whether the total sum of squares
    is zero although the values differ (floating-point path only: the sums of squares were too
    small for a double; always empty and ``False`` on the exact path, whose zeros are exact).
    """

    labels: tuple[str, ...]
    moments: ExactMoments | FloatMoments
    dropped: tuple[int, ...] = ()
    underflow_groups: tuple[int, ...] = ()
    underflow_total: bool = False

    def __post_init__(self) -> None:
        k = len(self.labels)
        if len(self.moments.n) != k:
            raise InputError(f"{len(self.moments.n)} groups of sums for {k} labels; give one label per group")
        if self.dropped and len(self.dropped) != k:
            raise InputError(f"{len(self.dropped)} dropped counts for {k} groups; give one count per group")
        for lab, n in zip(self.labels, self.moments.n):
            if n < 1:
                raise InputError(f'group "{lab}" has no numbers; give it values or leave it out')
        object.__setattr__(self, "labels", tuple(str(x) for x in self.labels))
        object.__setattr__(self, "dropped", tuple(int(x) for x in self.dropped) or (0,) * k)

    @property
    def k(self) -> int:
        """The number of groups."""
        return len(self.labels)

    @property
    def counts(self) -> tuple[int, ...]:
        """The group sizes."""
        return tuple(int(n) for n in self.moments.n)

    @property
    def n_total(self) -> int:
        """The number of values in all groups."""
        return int(sum(self.moments.n))

    @property
    def exact(self) -> bool:
        """Whether the moments are decimal-exact."""
        return bool(self.moments.exact)


def group_moments(g: Groups, mom: ExactMoments | FloatMoments) -> GroupMoments:
    """The :class:`GroupMoments` of groups held in memory and their moments. On the
    floating-point path, a zero sum of squares is checked against the values (only then are
    the values read again)."""
    under: list[int] = []
    total = False
    if not mom.exact:
        for i, a in enumerate(g.arrays):
            if mom.ss_group(i) == 0 and float(a.min()) != float(a.max()):
                under.append(i)
        ssw = mom.ss_within_parts([[i] for i in range(g.k)])
        if g.k and mom.ss_between() + ssw == 0:  # the one-way analysis's total
            first = float(g.arrays[0][0])
            total = not all(float(a.min()) == first == float(a.max()) for a in g.arrays)
    return GroupMoments(g.labels, mom, g.dropped, tuple(under), total)


def moments_only(
    labels: Sequence[str], mom: ExactMoments, dropped: Sequence[int] = ()
) -> GroupMoments:
    """The :class:`GroupMoments` of exact per-group sums computed elsewhere (no values)."""
    return GroupMoments(tuple(labels), mom, tuple(dropped))


def require_two(gm: GroupMoments) -> None:
    """InputError unless there are at least two groups."""
    require_two_labels(gm.labels)


def require_two_labels(labels: Sequence[str]) -> None:
    """InputError unless there are at least two groups (the message for sums without values)."""
    k = len(labels)
    if k < 2:
        which = f' (only "{labels[0]}")' if k == 1 else ""
        raise InputError(
            f"at least two groups are needed to compare means, got {k}{which}; "
            "check the group column and the filter"
        )


def check_zero_spread(gm: GroupMoments, ss: float, within: bool) -> None:
    """On the floating-point path, a zero sum of squares must be a real zero, not underflow
    (``within=True``: the within-group sum; ``False``: the total)."""
    if ss != 0:
        return
    if (within and gm.underflow_groups) or (not within and gm.underflow_total):
        raise InputError(TOO_SMALL)
