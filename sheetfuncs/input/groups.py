"""Groups: cleaned groups of numbers with their labels, and the one way Python inputs become them.

Everything an analysis accepts goes through :func:`as_groups`:

* a :class:`Groups` object (returned as it is);
* a mapping ``label -> sequence of numbers``;
* a sequence of sequences, one per group, labelled ``Group 1``, ``Group 2``, ...

Spreadsheet ranges are cleaned by :func:`sheetfuncs.input.ranges.groups_from_range` into the
same :class:`Groups`, built by :func:`build_groups`.
"""

from __future__ import annotations

import datetime as _dt
import decimal
import math
import numbers
from collections.abc import Mapping, Sequence
from functools import cached_property
from dataclasses import dataclass
from typing import Any

import numpy as np

from ..errors import InputError
from .cells import cell_position, classify

__all__ = [
    "CellNote",
    "Groups",
    "as_groups",
    "bad_number_message",
    "build_groups",
    "first_duplicate",
    "format_label",
]


@dataclass(frozen=True)
class CellNote:
    """One input cell that was not used as a measurement.

    ``row`` and ``col`` are 0-based positions within the range as given (before any transpose).
    ``kind`` is ``"text"``, ``"logical"``, ``"error"`` or ``"date"``; ``action`` is
    ``"ignored"`` (skipped, as the host's own statistics functions skip it) or ``"rejected"``
    (it stopped the analysis).
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

    ``cells`` records every ignored cell (text, logical values) with its position in the range;
    ``notes`` holds plain-language remarks (for example labels that differ only in case).
    Arrays are read-only float64.
    """

    labels: tuple[str, ...]
    arrays: tuple[np.ndarray, ...]
    cells: tuple[CellNote, ...] = ()
    notes: tuple[str, ...] = ()
    layout: str = "python"
    label_source: str = "given"

    def __post_init__(self) -> None:
        if len(self.labels) != len(self.arrays):
            raise InputError(
                f"{len(self.labels)} labels for {len(self.arrays)} groups; "
                "give one label per group"
            )
        # a Groups built by hand gets the same guarantees as one built by the cleaning step
        checked = []
        for lab, a in zip(self.labels, self.arrays):
            if not (isinstance(a, np.ndarray) and a.dtype == np.float64 and a.ndim == 1):
                a = _numbers(a, str(lab))
            if a.size == 0:
                raise InputError(
                    f'group "{lab}" has no numbers; give it values or leave it out'
                )
            if not np.isfinite(a).all():
                i = int(np.flatnonzero(~np.isfinite(a))[0])
                raise InputError(bad_number_message(float(a[i]), f'position {i + 1} of group "{lab}"'))
            if a.flags.writeable:
                a = a.copy()
                a.setflags(write=False)
            checked.append(a)
        object.__setattr__(self, "labels", tuple(str(x) for x in self.labels))
        object.__setattr__(self, "arrays", tuple(checked))

    @property
    def k(self) -> int:
        return len(self.labels)

    @cached_property
    def counts(self) -> tuple[int, ...]:
        return tuple(int(a.size) for a in self.arrays)

    @cached_property
    def n_total(self) -> int:
        return int(sum(a.size for a in self.arrays))

    def __len__(self) -> int:
        return len(self.labels)

    def __iter__(self):
        return iter(zip(self.labels, self.arrays))

    def as_dict(self) -> dict[str, np.ndarray]:
        return dict(zip(self.labels, self.arrays))

    def ignored_count(self, kind: str | None = None) -> int:
        """How many cells were ignored (optionally of one kind: text, logical)."""
        return sum(1 for c in self.cells if c.action == "ignored" and (kind is None or c.kind == kind))

    def __repr__(self) -> str:
        inner = ", ".join(f"{lab!r}: n={a.size}" for lab, a in self)
        return f"Groups({inner})"


# --------------------------------------------------------------------------------------------
# labels


def format_label(value: Any) -> str:
    """A label as text: trimmed strings, shortest numbers (``3`` not ``3.0``), ISO dates."""
    if isinstance(value, str):
        return value.strip()
    if isinstance(value, bool):
        return "TRUE" if value else "FALSE"
    if isinstance(value, _dt.datetime):
        if value.time() == _dt.time(0, 0):
            return value.date().isoformat()
        return value.isoformat(sep=" ")
    if isinstance(value, (_dt.date, _dt.time)):
        return value.isoformat()
    if isinstance(value, decimal.Decimal):
        value = float(value)
    if isinstance(value, numbers.Integral):
        return str(int(value))
    if isinstance(value, numbers.Real):
        v = float(value)
        if math.isfinite(v) and v == int(v) and abs(v) < 1e16:
            return str(int(v))
        return repr(v)
    return str(value).strip()


def _case_notes(labels: Sequence[str]) -> tuple[str, ...]:
    seen: dict[str, list[str]] = {}
    for lab in labels:
        seen.setdefault(lab.casefold(), []).append(lab)
    notes = []
    for same in seen.values():
        if len(same) > 1:
            shown = ", ".join(f'"{s}"' for s in same)
            notes.append(
                f"labels {shown} differ only in case and are kept as separate groups; "
                "check for a typo"
            )
    return tuple(notes)


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
) -> Groups:
    """:class:`Groups` from checked labels and arrays: read-only float64 arrays, ``cells``
    sorted by position, notes on labels that differ only in case; ``source`` says where the
    labels came from (``given``, ``range``, ``default``)."""
    frozen = []
    for a in arrays:
        a = np.ascontiguousarray(a, dtype=np.float64)
        a.setflags(write=False)
        frozen.append(a)
    return Groups(
        labels=tuple(labels),
        arrays=tuple(frozen),
        cells=tuple(sorted(cells, key=lambda n: (n.row, n.col))),
        notes=_case_notes(labels),
        layout=layout,
        label_source=source,
    )


# --------------------------------------------------------------------------------------------
# Python inputs


_PLAIN_NUMBER_TYPES = frozenset({float, int, np.float64, np.float32, np.int64, np.int32})


def _numbers(values: Any, label: str) -> np.ndarray:
    """One group's values as a float64 array; anything but finite numbers is an InputError."""
    if isinstance(values, (str, bytes)):
        raise InputError(f'group "{label}" is text, not a sequence of numbers')
    flat_msg = f'group "{label}" must be a flat sequence of numbers'
    if isinstance(values, np.ndarray):
        if values.ndim > 1:
            raise InputError(flat_msg)
        seq = values.reshape(-1) if values.dtype.kind in "iuf" else values.reshape(-1).tolist()
    else:
        try:
            seq = list(values)
        except TypeError:
            seq = [values]  # a single number
    if isinstance(seq, np.ndarray):
        arr = seq.astype(np.float64)
    elif set(map(type, seq)) <= _PLAIN_NUMBER_TYPES:
        # plain numbers only (numpy would turn [1.0, "x"] into text and [1.0, True] into 1.0)
        try:
            arr = np.asarray(seq, dtype=np.float64)
        except OverflowError:
            arr = np.array([classify(v)[1] for v in seq], dtype=np.float64)
    else:
        out = []
        for i, v in enumerate(seq):
            if isinstance(v, (list, tuple, np.ndarray)):
                raise InputError(flat_msg)
            kind, val = classify(v)
            if kind != "number":
                raise InputError(
                    f'group "{label}" holds {v!r} at position {i + 1}; '
                    "only numbers are allowed (use groups_from_range for spreadsheet ranges)"
                )
            out.append(val)
        arr = np.array(out, dtype=np.float64)
    if not np.isfinite(arr).all():
        i = int(np.flatnonzero(~np.isfinite(arr))[0])
        raise InputError(bad_number_message(float(arr[i]), f'position {i + 1} of group "{label}"'))
    return arr


def as_groups(data: Any) -> Groups:
    """Any accepted input as :class:`Groups` (see the module docstring)."""
    if isinstance(data, Groups):
        return data
    if isinstance(data, Mapping):
        labels = [format_label(k) for k in data.keys()]
        arrays = [_numbers(v, lab) for lab, v in zip(labels, data.values())]
        source = "given"
    elif isinstance(data, np.ndarray) and data.ndim == 2 and data.dtype.kind in "iuf":
        raise InputError(
            "a 2-D array is ambiguous; pass a list of 1-D arrays (one per group) or "
            "use groups_from_range with a layout"
        )
    elif isinstance(data, (Sequence, np.ndarray)) and not isinstance(data, (str, bytes)):
        seq = list(data)
        if seq and all(isinstance(v, numbers.Real) for v in seq):
            raise InputError(
                "got one flat sequence of numbers; pass one sequence per group, "
                "e.g. [[...], [...]], or a mapping label -> values"
            )
        labels = [f"Group {i + 1}" for i in range(len(seq))]
        arrays = [_numbers(v, lab) for lab, v in zip(labels, seq)]
        source = "default"
    else:
        raise InputError(
            f"cannot read groups from {type(data).__name__}; pass a mapping "
            "label -> values, a list of sequences, or a Groups object"
        )
    dup = first_duplicate(labels)
    if dup is not None:
        raise InputError(f'the label "{dup}" is used twice; give each group its own label')
    for lab, a in zip(labels, arrays):
        if a.size == 0:
            raise InputError(f'group "{lab}" has no numbers; give it values or leave it out')
    return build_groups(labels, arrays, (), "python", source)
