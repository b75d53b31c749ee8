"""Groups: cleaned groups of numbers with their labels, and the one way Python inputs become them.

Everything an analysis accepts goes through :func:`as_groups`:

* a :class:`Groups` object (used as it is, its own dropped counts kept);
* a mapping ``label -> sequence of numbers``;
* a sequence of sequences, one per group, labelled ``Group 1``, ``Group 2``, ...

A group's values may be lists, tuples, numpy arrays or anything iterable (a pandas Series).
NaN and ``None`` are missing values: they stop the analysis with their position by default
(``missing="stop"``); ``missing="drop"`` leaves them out, counts them per group
(:attr:`Groups.dropped`) and says so in a note. ``relabel={"old": "new"}`` renames labels
(:func:`sheetfuncs.input.labels.relabel`; groups that end up with one label are merged).

Spreadsheet ranges are cleaned by :func:`sheetfuncs.input.ranges.groups_from_range` into the
same :class:`Groups`, built by :func:`build_groups`.
"""

from __future__ import annotations

import math
import numbers
from collections.abc import Mapping, Sequence
from functools import cached_property
from dataclasses import InitVar, dataclass
from typing import Any

import numpy as np

from ..errors import InputError
from .cells import cell_position, classify
from .labels import case_notes, format_label, relabel as relabel_groups
from .options import shown

__all__ = [
    "CellNote",
    "Groups",
    "as_groups",
    "bad_number_message",
    "build_groups",
    "dropped_note",
    "first_duplicate",
    "format_label",
    "parse_missing",
]


@dataclass(frozen=True)
class CellNote:
    """One input cell that was not used as a measurement.

    ``row`` and ``col`` are 0-based positions within the range as given (before any transpose).
    ``kind`` is ``"text"``, ``"logical"``, ``"error"``, ``"date"``, ``"nan"``, ``"other"`` or,
    in the long layout, ``"label-only"`` (a label without a value; ``value`` is the label) or
    ``"unlabelled"`` (a value without a label); ``action`` is ``"ignored"`` (skipped, as the
    host's own statistics functions skip it), ``"missing"`` (an error value read as a missing
    value, ``errors="missing"``) or ``"rejected"`` (it stopped the analysis).
    """

    row: int
    col: int
    kind: str
    value: Any
    action: str

    @property
    def position(self) -> str:
        """1-based, human-readable position, e.g. ``row 3, column 2``."""
        return cell_position(self.row, self.col)


@dataclass(frozen=True)
class Groups:
    """Cleaned groups: labels in order of first appearance and one float array per group.

    ``cells`` records every cell left out (text, logical values, missing values) with its
    position in the range; ``notes`` holds plain-language remarks (labels that differ only in
    case, labels renamed or merged, missing values dropped); ``dropped`` counts, per group, the
    missing values left out (NaN or None with ``missing="drop"``, error cells read with
    ``errors="missing"``): zeros when nothing was left out. Arrays are read-only float64.

    Arrays given as contiguous float64 are used as read-only views, not copied: the groups share
    their memory with the caller's arrays (change those arrays and the groups change too). A
    writable array is never made read-only itself; the view is. ``checked`` (not stored) says
    the arrays were already checked for finite values by the cleaning step, which then is not
    done twice.
    """

    labels: tuple[str, ...]
    arrays: tuple[np.ndarray, ...]
    cells: tuple[CellNote, ...] = ()
    notes: tuple[str, ...] = ()
    layout: str = "python"
    label_source: str = "given"
    dropped: tuple[int, ...] = ()
    checked: InitVar[bool] = False

    def __post_init__(self, finite: bool) -> None:
        if len(self.labels) != len(self.arrays):
            raise InputError(
                f"{len(self.labels)} labels for {len(self.arrays)} groups; "
                "give one label per group"
            )
        # a Groups built by hand gets the same guarantees as one built by the cleaning step
        checked = []
        for lab, a in zip(self.labels, self.arrays):
            if not (isinstance(a, np.ndarray) and a.dtype == np.float64 and a.ndim == 1):
                a = _numbers(a, str(lab), hint=False)[0]
            if a.size == 0:
                raise InputError(
                    f'group "{lab}" has no numbers; give it values or leave it out'
                )
            if not finite and not _all_finite(a):
                i = int(np.flatnonzero(~np.isfinite(a))[0])
                raise InputError(bad_number_message(float(a[i]), f'position {i + 1} of group "{lab}"'))
            if a.flags.writeable:
                a = a.view()  # read-only for the groups, the caller's array left as it was
                a.setflags(write=False)
            checked.append(a)
        dropped = tuple(int(x) for x in self.dropped) if self.dropped else (0,) * len(checked)
        if len(dropped) != len(checked) or min(dropped, default=0) < 0:
            raise InputError(
                f"{len(dropped)} dropped counts for {len(checked)} groups; give one count "
                "(0 or more) per group"
            )
        object.__setattr__(self, "labels", tuple(str(x) for x in self.labels))
        object.__setattr__(self, "arrays", tuple(checked))
        object.__setattr__(self, "dropped", dropped)

    @property
    def k(self) -> int:
        return len(self.labels)

    @cached_property
    def counts(self) -> tuple[int, ...]:
        return tuple(int(a.size) for a in self.arrays)

    @cached_property
    def n_total(self) -> int:
        return int(sum(a.size for a in self.arrays))

    @property
    def n_dropped(self) -> int:
        """How many missing values were left out, over all groups."""
        return sum(self.dropped)

    @property
    def case_notes(self) -> tuple[str, ...]:
        """The notes on labels that differ only in case (possible typos), part of ``notes``."""
        return case_notes(self.labels)

    def __len__(self) -> int:
        return len(self.labels)

    def __iter__(self):
        return iter(zip(self.labels, self.arrays))

    def as_dict(self) -> dict[str, np.ndarray]:
        return dict(zip(self.labels, self.arrays))

    def ignored_count(self, kind: str | None = None) -> int:
        """How many cells were ignored (optionally of one kind: text, logical)."""
        return sum(1 for c in self.cells if c.action == "ignored" and (kind is None or c.kind == kind))

    def regrouped(self, labels: Sequence[str], notes: Sequence[str] = ()) -> Groups:
        """These groups under new ``labels`` (one per group, see
        :func:`sheetfuncs.input.labels.relabel`): groups that share a label become one, their
        values joined in group order and their dropped counts added. ``notes`` are added after
        the remarks kept; the notes on case and on dropped values are made anew for the new
        labels. The cells log is kept as it is."""
        if len(labels) != self.k:
            raise InputError(f"{len(labels)} new labels for {self.k} groups; give one per group")
        parts: dict[str, list[int]] = {}
        for i, lab in enumerate(labels):
            parts.setdefault(str(lab), []).append(i)
        arrays = [
            self.arrays[ix[0]] if len(ix) == 1 else np.concatenate([self.arrays[i] for i in ix])
            for ix in parts.values()
        ]
        dropped = tuple(sum(self.dropped[i] for i in ix) for ix in parts.values())
        made = set(self.case_notes)
        old_drop = dropped_note(self.labels, self.dropped)
        if old_drop:
            made.add(old_drop)
        new_drop = dropped_note(list(parts), dropped) if old_drop in self.notes else ""
        return build_groups(
            list(parts), arrays, self.cells, self.layout, self.label_source, dropped=dropped,
            notes=[n for n in self.notes if n not in made] + list(notes), after=[new_drop],
            checked=True,
        )

    def __repr__(self) -> str:
        inner = ", ".join(f"{lab!r}: n={a.size}" for lab, a in self)
        return f"Groups({inner})"


# --------------------------------------------------------------------------------------------
# labels (written by :func:`sheetfuncs.input.labels.format_label`)


def first_duplicate(items: Sequence[str]) -> str | None:
    """The first item that occurs a second time, or ``None`` when all differ."""
    seen: set[str] = set()
    for x in items:
        if x in seen:
            return x
        seen.add(x)
    return None


# --------------------------------------------------------------------------------------------
# building groups


def bad_number_message(v: float, where: str) -> str:
    """What to say about a NaN or an infinite value at ``where``."""
    what = "NaN (not a number)" if math.isnan(v) else "an infinite value"
    return (
        f"{what} at {where}; remove it or replace it with the measured value"
    )


def build_groups(
    labels: Sequence[str],
    arrays: Sequence[np.ndarray],
    cells: Sequence[CellNote],
    layout: str,
    source: str,
    *,
    dropped: Sequence[int] = (),
    notes: Sequence[str] = (),
    after: Sequence[str] = (),
    checked: bool = False,
) -> Groups:
    """:class:`Groups` from checked labels and arrays: read-only float64 arrays, ``cells``
    sorted by position; the notes are ``notes``, then those on labels that differ only in case,
    then ``after`` (empty ones left out); ``source`` says where the labels came from
    (``given``, ``range``, ``default``); ``dropped`` the missing values left out per group;
    ``checked`` that every array was already checked for finite values."""
    frozen = []
    for a in arrays:
        a = np.ascontiguousarray(a, dtype=np.float64).view()  # no copy of a float64 array
        a.setflags(write=False)
        frozen.append(a)
    return Groups(
        labels=tuple(labels),
        arrays=tuple(frozen),
        cells=tuple(sorted(cells, key=lambda n: (n.row, n.col))),
        notes=tuple(n for n in (*notes, *case_notes(labels), *after) if n),
        layout=layout,
        label_source=source,
        dropped=tuple(dropped),
        checked=checked,
    )


# --------------------------------------------------------------------------------------------
# Python inputs


_PLAIN_NUMBER_TYPES = frozenset({float, int, np.float64, np.float32, np.int64, np.int32})
#: Plain numbers and None (a missing value, NaN in a float array).
_NUMBER_OR_NONE = _PLAIN_NUMBER_TYPES | {type(None)}
_MISSING_HINT = 'remove it, or pass missing="drop" to leave missing values out'


def parse_missing(missing: Any) -> bool:
    """The ``missing`` option: ``"stop"`` (False) or ``"drop"`` (True)."""
    s = "stop" if missing is None else str(missing).strip().lower()
    if s not in ("stop", "drop"):
        raise InputError(
            'missing must be "stop" (a NaN or None stops the analysis) or "drop" (NaN and None '
            f"are left out and counted), not {shown(missing)}"
        )
    return s == "drop"


def _is_missing(v: Any) -> bool:
    """None, or pandas' own missing-value marker (``pd.NA``), found without importing pandas."""
    return v is None or (type(v).__name__ == "NAType" and type(v).__module__.startswith("pandas"))


def _sequence(values: Any, label: str) -> np.ndarray | list[Any]:
    """One group's values as a 1-D numeric array or a list of cells."""
    if isinstance(values, (str, bytes)):
        raise InputError(f'group "{label}" is text, not a sequence of numbers')
    if not isinstance(values, (np.ndarray, list, tuple)) and hasattr(values, "__array__"):
        values = np.asarray(values)  # a pandas Series, say: its numbers in one step
    if isinstance(values, np.ndarray):
        if values.ndim > 1:
            raise InputError(f'group "{label}" must be a flat sequence of numbers')
        return values.reshape(-1) if values.dtype.kind in "iuf" else values.reshape(-1).tolist()
    try:
        return list(values)
    except TypeError:
        return [values]  # a single number


def _numbers(values: Any, label: str, *, drop: bool = False, hint: bool = True) -> tuple[np.ndarray, int]:
    """One group's values as a float64 array, and how many missing values were dropped.

    NaN and None (and pandas' ``NA``) are missing values: left out and counted when ``drop``,
    else an InputError naming the first, which says how to drop them when ``hint``. Anything
    else that is not a finite number is an InputError.
    """
    seq = _sequence(values, label)
    if isinstance(seq, np.ndarray):
        arr = seq.astype(np.float64, copy=False)  # a float64 array is used as it is
    elif set(map(type, seq)) <= _NUMBER_OR_NONE:
        # plain numbers and None only (numpy would turn [1.0, "x"] into text and [1.0, True]
        # into 1.0); None becomes NaN
        try:
            arr = np.asarray(seq, dtype=np.float64)
        except OverflowError:
            arr = np.array([classify(v)[1] for v in seq], dtype=np.float64)
    else:
        out = []
        for i, v in enumerate(seq):
            if isinstance(v, (list, tuple, np.ndarray)):
                raise InputError(f'group "{label}" must be a flat sequence of numbers')
            kind, val = classify(v)
            if kind != "number" and not _is_missing(v):
                raise InputError(
                    f'group "{label}" holds {v!r} at position {i + 1}; '
                    "only numbers are allowed (use groups_from_range for spreadsheet ranges)"
                )
            out.append(math.nan if kind != "number" else val)
        arr = np.array(out, dtype=np.float64)
    if _all_finite(arr):
        return arr, 0
    nan = np.isnan(arr)
    bad = np.flatnonzero(~nan & ~np.isfinite(arr) if drop else ~np.isfinite(arr))
    if bad.size:
        i = int(bad[0])
        if not nan[i]:
            raise InputError(bad_number_message(float(arr[i]), f'position {i + 1} of group "{label}"'))
        v = seq[i]
        what = f"a missing value ({v})" if _is_missing(v) else "NaN (not a number)"
        how = _MISSING_HINT if hint else "remove it or replace it with the measured value"
        raise InputError(f'{what} at position {i + 1} of group "{label}"; {how}')
    return arr[~nan], int(np.count_nonzero(nan))


#: Values per dot product in :func:`_all_finite`: OpenBLAS runs longer ones on several threads.
_ROW = 8192


def _all_finite(a: np.ndarray) -> bool:
    """Whether every value of a float64 array is finite, in one fast pass.

    A sum of squares is finite exactly when every value is finite and nothing overflows (NaN
    and infinity propagate through it); row-wise dot products give it faster than
    ``np.isfinite`` can. Only when it is not finite (a NaN or an infinity, or values beyond
    about 1e150) are the values checked one by one.
    """
    vecdot = getattr(np, "vecdot", None)  # numpy 2
    k = a.size - a.size % _ROW if vecdot is not None else 0
    with np.errstate(over="ignore", invalid="ignore"):
        total = float(np.dot(a[k:], a[k:])) if a.size - k <= _ROW else math.inf
        if k:
            rows = a[:k].reshape(-1, _ROW)
            total += float(vecdot(rows, rows).sum())
    return math.isfinite(total) or bool(np.isfinite(a).all())


def dropped_note(labels: Sequence[str], dropped: Sequence[int]) -> str:
    """``2 missing values (NaN or None) dropped: "Line 2" 1, "Line 3" 1``, or "" for none."""
    total = sum(dropped)
    if not total:
        return ""
    each = ", ".join(f'"{lab}" {n}' for lab, n in zip(labels, dropped) if n)
    return f"{total} missing value{'s' if total != 1 else ''} (NaN or None) dropped: {each}"


def _python_groups(data: Any, drop: bool) -> Groups:
    """A mapping or a sequence of groups as :class:`Groups` (see :func:`as_groups`)."""
    if isinstance(data, Mapping):
        labels = [format_label(k) for k in data.keys()]
        values = list(data.values())
        source = "given"
    elif isinstance(data, np.ndarray) and data.ndim == 2 and data.dtype.kind in "iuf":
        raise InputError(
            "a 2-D array is ambiguous; pass a list of 1-D arrays (one per group) or "
            "use groups_from_range with a layout"
        )
    elif isinstance(data, (Sequence, np.ndarray)) and not isinstance(data, (str, bytes)):
        values = list(data)
        if values and all(isinstance(v, numbers.Real) for v in values):
            raise InputError(
                "got one flat sequence of numbers; pass one sequence per group, "
                "e.g. [[...], [...]], or a mapping label -> values"
            )
        labels = [f"Group {i + 1}" for i in range(len(values))]
        source = "default"
    else:
        raise InputError(
            f"cannot read groups from {type(data).__name__}; pass a mapping "
            "label -> values, a list of sequences, or a Groups object"
        )
    dup = first_duplicate(labels)
    if dup is not None:
        raise InputError(f'the label "{dup}" is used twice; give each group its own label')
    parts = [_numbers(v, lab, drop=drop) for lab, v in zip(labels, values)]
    for lab, (a, n) in zip(labels, parts):
        if a.size == 0 and n:
            raise InputError(
                f'group "{lab}" has no numbers left after dropping its {n} missing value'
                f"{'s' if n != 1 else ''} (NaN or None); give it values or leave it out"
            )
        if a.size == 0:
            raise InputError(f'group "{lab}" has no numbers; give it values or leave it out')
    dropped = [n for _, n in parts]
    return build_groups(
        labels, [a for a, _ in parts], (), "python", source, dropped=dropped,
        after=[dropped_note(labels, dropped)], checked=True,
    )


def as_groups(data: Any, *, missing: str = "stop", relabel: Any = None) -> Groups:
    """Any accepted input as :class:`Groups` (see the module docstring).

    ``missing`` is ``"stop"`` (default: a NaN or None is an error naming its position) or
    ``"drop"`` (NaN and None are left out, counted per group in :attr:`Groups.dropped` and
    noted); a group with no values left is an error. ``relabel`` maps old labels to new ones,
    e.g. ``{"supplier B": "Supplier B"}``; groups that end up with one label are merged (see
    :func:`sheetfuncs.input.labels.relabel`). A :class:`Groups` object is used as it is (only
    ``relabel`` applies to it).
    """
    drop = parse_missing(missing)
    g = data if isinstance(data, Groups) else _python_groups(data, drop)
    return relabel_groups(g, rename=relabel) if relabel is not None else g
