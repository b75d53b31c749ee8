"""Compact letter display: groups that share a letter are not separated by the comparisons.

Algorithm: insert-and-absorb, then sweep (Piepho 2004, "An algorithm for a letter-based
representation of all-pairwise comparisons", *J. Comput. Graph. Statist.* 13, 456-466).

1. Start with one letter shared by every group.
2. Insert: for each pair (i, j) that the comparisons separate, every letter held by both i and
   j is split in two: one copy without i, one without j.
3. Absorb: after each insertion, drop every letter whose groups are a subset of another
   letter's groups.
4. Sweep: drop a group from a letter when every other group of that letter shares another
   letter with it (and it keeps at least one letter); absorb again. No letter is then redundant.

Letters are then named so that ``a`` goes to the letter of the group with the highest mean,
``b`` to the next, and so on (``a``-``z``, then ``A``-``Z``, then two-character names), and each
group lists its letters alphabetically. Two groups share a letter exactly when the chosen
pairwise method does not separate them.
"""

from __future__ import annotations

import string
from collections.abc import Iterator, Mapping, Sequence
from dataclasses import dataclass
from typing import Any, ClassVar

from ..errors import InputError
from .comparisons import PairwiseResult, pairwise, pairwise_of, parse_method
from .group_moments import GroupMoments

__all__ = ["LettersResult", "letters", "letters_of", "letter_sets"]

_SYMBOLS = string.ascii_lowercase + string.ascii_uppercase


def _absorb(cols: list[frozenset[int]]) -> list[frozenset[int]]:
    """Drop duplicate letters and letters whose groups lie within another letter's groups."""
    uniq = list(dict.fromkeys(cols))
    return [c for c in uniq if not any(c < d for d in uniq)]


def letter_sets(k: int, separated: Sequence[tuple[int, int]]) -> list[frozenset[int]]:
    """The letters as sets of group indices (0..k-1), unnamed and unordered.

    ``separated`` lists the pairs of group indices that the comparisons separate.
    """
    cols: list[frozenset[int]] = [frozenset(range(k))]
    for i, j in separated:
        if i == j:
            continue
        new: list[frozenset[int]] = []
        split = False
        for c in cols:
            if i in c and j in c:
                new.append(c - {i})
                new.append(c - {j})
                split = True
            else:
                new.append(c)
        if split:
            cols = _absorb(new)
    return _sweep(k, cols)


def _sweep(k: int, cols: list[frozenset[int]]) -> list[frozenset[int]]:
    """Remove redundant memberships (Piepho 2004, the sweeping step)."""
    cols = [set(c) for c in cols]
    changed = True
    while changed:
        changed = False
        for ci, c in enumerate(cols):
            for g in sorted(c):
                held = [cj for cj, d in enumerate(cols) if g in d]
                if len(held) < 2:
                    continue  # the group's only letter stays
                others = [d for cj, d in enumerate(cols) if cj != ci and g in d]
                if all(any(h in d for d in others) for h in c if h != g):
                    c.discard(g)
                    changed = True
        kept = [frozenset(c) for c in cols if c]
        absorbed = _absorb(kept)
        changed = changed or len(absorbed) < len(cols)
        cols = [set(c) for c in absorbed]
    return [frozenset(c) for c in cols]


def _symbol(n: int) -> str:
    if n < len(_SYMBOLS):
        return _SYMBOLS[n]
    n -= len(_SYMBOLS)
    return _SYMBOLS[n // len(_SYMBOLS) % len(_SYMBOLS)] + _SYMBOLS[n % len(_SYMBOLS)]


def name_letters(cols: list[frozenset[int]], means: Sequence[float]) -> list[str]:
    """Each group's letters, ``a`` for the letter of the highest mean, as strings in group order."""
    k = len(means)
    rank_of = {g: r for r, g in enumerate(sorted(range(k), key=lambda g: (-means[g], g)))}
    ordered = sorted(cols, key=lambda c: sorted(rank_of[g] for g in c))
    names = [_symbol(n) for n in range(len(ordered))]
    wide = any(len(s) > 1 for s in names)
    per: list[list[str]] = [[] for _ in range(k)]
    for name, c in zip(names, ordered):
        for g in c:
            per[g].append(name)
    sep = " " if wide else ""
    return [sep.join(p) for p in per]


@dataclass(frozen=True)
class LettersResult(Mapping):
    """Compact letter display; also a read-only mapping ``label -> letters`` in group order.

    ``labels`` the groups; ``letters`` each group's letters (same order); ``means`` the group
    means; ``method`` and ``alpha`` of the pairwise comparisons behind the letters;
    ``comparisons`` those comparisons (:class:`sheetfuncs.stats.comparisons.PairwiseResult`).
    """

    labels: tuple[str, ...]
    letters: tuple[str, ...]
    means: tuple[float, ...]
    method: str
    alpha: float
    comparisons: PairwiseResult

    #: The table's header row.
    HEADER: ClassVar[tuple[str, ...]] = ("Group", "Mean", "Letters")

    def __getitem__(self, label: str) -> str:
        try:
            return self.letters[self.labels.index(label)]
        except ValueError:
            raise KeyError(label) from None

    def __iter__(self) -> Iterator[str]:
        return iter(self.labels)

    def __len__(self) -> int:
        return len(self.labels)

    def __contains__(self, label: object) -> bool:
        return label in self.labels

    def table(self) -> list[list[Any]]:
        """Header (Group, Mean, Letters), then groups by mean, highest first (spill layout)."""
        order = sorted(range(len(self.labels)), key=lambda g: (-self.means[g], g))
        return [list(self.HEADER)] + [
            [self.labels[g], self.means[g], self.letters[g]] for g in order
        ]


def letters(
    groups: Any, method: str = "tukey", alpha: float = 0.05, *,
    missing: str = "stop", relabel: Mapping[str, str] | None = None,
) -> LettersResult:
    """Compact letter display of the pairwise comparisons (insert-and-absorb, Piepho 2004).

    ``method`` is any pairwise method of :func:`sheetfuncs.stats.comparisons.pairwise`; Dunnett's
    many-to-one comparisons do not compare every pair and cannot be shown as letters.

    ``missing`` (``"stop"`` or ``"drop"``) and ``relabel`` are as in :func:`sheetfuncs.as_groups`.
    """
    meth = _letters_method(method)
    return _drawn(pairwise(groups, meth, alpha, missing=missing, relabel=relabel))


def letters_of(gm: GroupMoments, method: str = "tukey", alpha: float = 0.05) -> LettersResult:
    """:func:`letters` from the groups' labels, counts and moments (no values needed)."""
    return _drawn(pairwise_of(gm, _letters_method(method), alpha))


def _letters_method(method: Any) -> str:
    if isinstance(method, str) and method.strip().lower() == "dunnett":
        raise InputError(
            "letters need every pair compared, and Dunnett compares each group with "
            "the control only; choose a pairwise method such as \"tukey\""
        )
    return parse_method(method)


def _drawn(res: PairwiseResult) -> LettersResult:
    """The letters drawn from the comparisons ``res``."""
    index = {lab: i for i, lab in enumerate(res.labels)}
    sep = [(index[r.group_a], index[r.group_b]) for r in res.rows if r.differs]
    cols = letter_sets(len(res.labels), sep)
    return LettersResult(
        labels=res.labels, letters=tuple(name_letters(cols, res.means)), means=res.means,
        method=res.method, alpha=res.alpha, comparisons=res,
    )
