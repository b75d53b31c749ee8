"""Groups: the one cleaning step between what a user has and what the statistics need.

Everything an analysis accepts goes through :func:`as_groups`:

* a :class:`Groups` object (returned as it is);
* a mapping ``label -> sequence of numbers``;
* a sequence of sequences, one per group, labelled ``Group 1``, ``Group 2``, ...

Spreadsheet ranges go through :func:`groups_from_range`, which applies the range rules of the
project guide: numbers count; blanks are ignored; text and logical values are ignored and
recorded; an error value anywhere makes the whole call an :class:`InputError` that names the
error and its position; dates in a data position are errors.
"""

from __future__ import annotations

import datetime as _dt
import decimal
import math
import numbers
import operator
import struct
from collections.abc import Mapping, Sequence
from functools import cached_property
from dataclasses import dataclass
from itertools import chain
from typing import Any

import numpy as np

from ..errors import InputError
from .cells import ERROR_TEXTS, cell_position, classify, error_text
from .options import shown

__all__ = [
    "CellNote",
    "Groups",
    "as_groups",
    "groups_from_range",
    "groups_from_long",
    "format_label",
    "first_duplicate",
]

LAYOUTS = ("wide", "long", "rowwise")


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
                raise InputError(_bad_number_message(float(a[i]), f'position {i + 1} of group "{lab}"'))
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


# --------------------------------------------------------------------------------------------
# cell classification


def _bad_number_message(v: float, where: str) -> str:
    what = "NaN (not a number)" if math.isnan(v) else "an infinite value"
    return (
        f"{what} at {where}; remove it or replace it with the measured value"
    )


# --------------------------------------------------------------------------------------------
# ranges


def _as_rows(cells: Any) -> list[Sequence[Any]]:
    """The range as a rectangular list of rows (ragged rows become tuples padded with blanks)."""
    if isinstance(cells, np.ndarray):
        if cells.ndim == 1:
            return [(v,) for v in cells.tolist()]
        if cells.ndim != 2:
            raise InputError("a range must be 2-D (rows of cells)")
        return [tuple(r) for r in cells.tolist()]
    if isinstance(cells, (str, bytes)) or not isinstance(cells, Sequence):
        if isinstance(cells, Sequence) or not hasattr(cells, "__iter__"):
            return [(cells,)]
        cells = list(cells)
    rows = list(cells)
    if not rows:
        return []
    first = type(rows[0])
    if (
        (first is list or first is tuple)
        and operator.countOf(map(type, rows), first) == len(rows)
        and operator.countOf(map(len, rows), len(rows[0])) == len(rows)
    ) or (set(map(type, rows)) <= {list, tuple} and len(set(map(len, rows))) == 1):
        return rows  # the usual case, a rectangle of rows: read as they are, never modified
    if all(not isinstance(r, (Sequence, np.ndarray)) or isinstance(r, str) for r in rows):
        # a flat list of cells: one column
        return [(v,) for v in rows]
    out = []
    for r in rows:
        if type(r) is tuple or type(r) is list:  # the usual case, without the slower ABC checks
            out.append(tuple(r))
        elif isinstance(r, str) or not isinstance(r, (Sequence, np.ndarray)):
            out.append((r,))
        else:
            out.append(tuple(r))
    width = max(len(r) for r in out)
    return [r if len(r) == width else r + (None,) * (width - len(r)) for r in out]


def _parse_labels_arg(labels: Any) -> str:
    """Normalise the ``labels`` argument to ``auto``, ``yes`` or ``no``."""
    if labels is None:
        return "auto"
    if isinstance(labels, (bool, np.bool_)):
        return "yes" if labels else "no"
    if isinstance(labels, (int, float)) and labels in (0, 1):
        return "yes" if labels else "no"
    if isinstance(labels, str):
        s = labels.strip().lower()
        if s in ("auto", ""):
            return "auto"
        if s in ("true", "yes", "y", "1"):
            return "yes"
        if s in ("false", "no", "n", "0"):
            return "no"
    raise InputError(
        f"labels must be \"auto\", TRUE or FALSE, not {shown(labels)}"
    )


def _parse_layout(layout: Any) -> str:
    if layout is None:
        return "wide"
    s = str(layout).strip().lower()
    if s == "":
        return "wide"
    if s not in LAYOUTS:
        raise InputError(
            f"unknown layout {shown(layout)}; use \"wide\" (one group per column), "
            "\"long\" (label and value columns) or \"rowwise\" (one group per row)"
        )
    return s


class _Collector:
    """Gathers ignored and rejected cells while a range is read."""

    def __init__(self, transpose: bool) -> None:
        self.transpose = transpose
        self.notes: list[CellNote] = []
        self.errors: list[CellNote] = []

    def pos(self, line: int, idx: int) -> tuple[int, int]:
        """Position in the original range of cell ``idx`` of line ``line``."""
        return (line, idx) if self.transpose else (idx, line)

    def add(self, line: int, idx: int, kind: str, value: Any, action: str = "ignored") -> None:
        r, c = self.pos(line, idx)
        note = CellNote(r, c, kind, value, action)
        (self.errors if action == "rejected" else self.notes).append(note)

    def raise_errors(self) -> None:
        if not self.errors:
            return
        errs = sorted(self.errors, key=lambda n: (n.row, n.col))
        first = errs[0]
        more = f" (and {len(errs) - 1} more)" if len(errs) > 1 else ""
        if first.kind == "error":
            msg = (
                f"the data hold the error {first.value} at {first.position} of the "
                f"range{more}; fix or clear that cell"
            )
        elif first.kind == "date":
            msg = (
                f"a date at {first.position} of the range{more}: dates are not "
                "measurements; clear the cell, or format it as a number"
                + ("; if the first row (or column) holds dates as group labels, set labels to TRUE"
                   if first.row == 0 or first.col == 0 else "")
            )
        elif first.kind == "nan":
            msg = _bad_number_message(first.value, f"{first.position} of the range") + more
        else:
            msg = (
                f"unsupported cell value {first.value!r} at {first.position} of the "
                f"range{more}; clear the cell or enter a number"
            )
        raise InputError(msg, cells=tuple((e.row, e.col) for e in errs))


def _line_values(line: Sequence[Any], lineno: int, start: int, col: _Collector) -> np.ndarray:
    """Numbers of one column (or row) from index ``start`` on; records everything else."""
    cells = line[start:]
    types = set(map(type, cells))
    if types <= {float, type(None)}:
        arr = np.array(cells, dtype=np.float64)  # None becomes NaN
        n_none = cells.count(None) if type(None) in types else 0
        if n_none:
            good = ~np.isnan(arr)
            if arr.size - int(np.count_nonzero(good)) == n_none and np.isfinite(arr[good]).all():
                return arr[good]
        elif np.isfinite(arr).all():
            return arr
    # general path: cell by cell
    out: list[float] = []
    for i, v in enumerate(cells, start):
        kind, val = classify(v)
        if kind == "number":
            if not math.isfinite(val):
                col.add(lineno, i, "nan", val, "rejected")
            else:
                out.append(val)
        elif kind == "blank":
            continue
        elif kind in ("text", "logical"):
            col.add(lineno, i, kind, val)
        else:  # error, date, other
            col.add(lineno, i, kind, val, "rejected")
    return np.array(out, dtype=np.float64)


def _is_labelish_text(v: Any) -> bool:
    return isinstance(v, str) and v.strip() != "" and v.strip() not in ERROR_TEXTS


def _unique_default(pos: int, taken: set[str]) -> str:
    name = f"Group {pos}"
    while name in taken:
        name += "*"
    return name


def groups_from_range(cells: Any, layout: str = "wide", labels: Any = "auto") -> Groups:
    """Clean a spreadsheet range into :class:`Groups`.

    ``cells`` is a 2-D sequence of rows as a spreadsheet hands it over (float, int, str, bool,
    None, datetime, Decimal, error texts such as ``"#N/A"``, or unconverted COM error codes).
    ``layout`` is ``"wide"`` (one group per column), ``"long"`` (label column, value column) or
    ``"rowwise"`` (one group per row). ``labels`` is ``"auto"``, ``True`` or ``False``; see the
    project guide for the exact rules.

    A range whose data cells are all floats or blanks (the usual case) is read in one block
    (:func:`_plain_block`); any other range is read cell by cell. Both give the same result.
    """
    return _read_range(cells, layout, labels, block=True)


_NONE_TYPE = type(None)
#: A float's own value; a TypeError for anything that is not a float (bool and int included).
_FLOAT_ONLY = float.conjugate


#: Cells per block of rows in :func:`_plain_block`: small enough that a block's cells are still
#: in the processor's cache when the second pass over them (the conversion) runs.
_BLOCK_CELLS = 8192


def _plain_block(rows: Sequence[Sequence[Any]], start: int, transpose: bool) -> list[np.ndarray] | None:
    """The numbers of every line (column, or row when ``transpose``) in one pass, or ``None``.

    Used only when every data cell (from ``start`` on in each line) is a ``float`` (numpy's
    float64, a float subclass, counts in a block without blanks) or ``None`` and no float is NaN
    or infinite; then the range rules reduce to "drop the blanks", and the result is the same as
    reading cell by cell. Anything else (text, logical values, errors, dates, ints, Decimals, NaN
    or infinity) returns ``None`` and the caller reads cell by cell, which records or rejects
    each such cell with its position.

    The rows are taken in blocks of about :data:`_BLOCK_CELLS` cells. A block of floats is
    packed as doubles in one C-speed pass through ``float.conjugate``, which returns a float's
    stored double and refuses anything that is not a float (``None``, bool, int, text ...). A
    block it refuses has its cell types counted; when they are floats and blanks only, it is
    converted with blanks as NaN. Each block goes straight into one array holding a line per
    row (no intermediate copy of the whole range), whose rows become the groups.
    """
    if transpose:
        data = rows if start == 0 else [r[start:] for r in rows]
        width = len(rows[0]) - start
    else:
        data = rows[start:]
        width = len(rows[0])
    n = len(data)
    if not n or width <= 0:
        return None
    step = max(1, _BLOCK_CELLS // width)
    # one line per row of ``lines``: the range's rows (rowwise) or its columns (wide)
    lines = np.empty((n, width) if transpose else (width, n), dtype=np.float64)
    n_blank = 0
    for i in range(0, n, step):
        part = data[i:i + step]
        m = len(part) * width
        try:  # all floats: their stored doubles, unchanged
            block = np.frombuffer(struct.pack(f"{m}d", *map(_FLOAT_ONLY, chain.from_iterable(part))))
        except (TypeError, struct.error):
            kinds = list(map(type, chain.from_iterable(part)))
            if len(kinds) != m:
                return None
            nb = kinds.count(_NONE_TYPE)
            if kinds.count(float) + nb != m:  # cheap: the identity test settles every float
                return None
            n_blank += nb
            block = np.fromiter(chain.from_iterable(part), dtype=np.float64, count=m)  # None: NaN
        if transpose:
            lines[i:i + len(part)] = block.reshape(len(part), width)
        else:
            lines[:, i:i + len(part)] = block.reshape(len(part), width).T
    if not n_blank:
        if not np.isfinite(lines).all():
            return None  # NaN or infinity: rejected with its position cell by cell
        lines.setflags(write=False)  # the groups are read-only views of it, not copies
        return list(lines)
    blank = np.isnan(lines)
    if int(np.count_nonzero(blank)) != n_blank or np.isinf(lines).any():
        return None  # a genuine NaN (more NaNs than blanks) or an infinity
    keep = ~blank
    return [ln[k] for ln, k in zip(lines, keep)]


def _read_range(cells: Any, layout: Any, labels: Any, *, block: bool) -> Groups:
    """:func:`groups_from_range`; ``block=False`` reads every range cell by cell (for tests)."""
    lay = _parse_layout(layout)
    lab = _parse_labels_arg(labels)
    rows = _as_rows(cells)
    if not rows or not rows[0]:
        raise InputError("the range is empty; select the cells that hold the data")
    if lay == "long":
        return _from_long_rows(rows, lab)
    transpose = lay == "rowwise"
    col = _Collector(transpose)

    # label line: the first cell of every line
    heads = [r[0] for r in rows] if transpose else list(rows[0])
    line_length = len(rows[0]) if transpose else len(rows)
    for i, h in enumerate(heads):
        if error_text(h) is not None:
            col.add(i, 0, "error", error_text(h), "rejected")
    col.raise_errors()
    if lab == "auto":
        nonblank = [h for h in heads if not (h is None or (isinstance(h, str) and h.strip() == ""))]
        has_labels = bool(nonblank) and all(_is_labelish_text(h) for h in nonblank)
    else:
        has_labels = lab == "yes"
    if has_labels and line_length < 2 and lab == "auto":
        has_labels = False  # a single row of text is data (all ignored) rather than labels
    start = 1 if has_labels else 0

    values = _plain_block(rows, start, transpose) if block else None
    if values is not None:
        blank_lines = [a.size == 0 for a in values]  # only floats and blanks: no float, all blank
    else:
        lines = rows if transpose else list(zip(*rows))
        values = [_line_values(ln, i, start, col) for i, ln in enumerate(lines)]
        blank_lines = [all(v is None or v == "" for v in ln[start:]) for ln in lines]

    raw_labels: list[str | None] = []
    arrays: list[np.ndarray] = []
    positions: list[int] = []
    for i, (arr, data_blank) in enumerate(zip(values, blank_lines)):
        label = None
        if has_labels:
            h = heads[i]
            if not (h is None or (isinstance(h, str) and h.strip() == "")):
                label = format_label(h)
        if data_blank and label is None:
            continue  # an entirely blank column (or row): the range was drawn larger
        raw_labels.append(label)
        arrays.append(arr)
        positions.append(i)
    col.raise_errors()
    if not arrays:
        raise InputError("the range holds no numbers; select the cells with the data")

    taken = {x for x in raw_labels if x is not None}
    final: list[str] = []
    for j, (label, i) in enumerate(zip(raw_labels, positions)):
        final.append(label if label is not None else _unique_default(j + 1, taken))
    dup = first_duplicate(final)
    if dup is not None:
        where = "rows" if transpose else "columns"
        idx = [positions[j] + 1 for j, x in enumerate(final) if x == dup]
        raise InputError(
            f'the label "{dup}" heads {where} {" and ".join(map(str, idx[:2]))}; '
            "give each group its own label"
        )
    line_word = "row" if transpose else "column"
    for j, arr in enumerate(arrays):
        if arr.size == 0:
            if raw_labels[j] is not None:
                raise InputError(
                    f'group "{final[j]}" has no numbers; enter its values or '
                    "leave it out of the range"
                )
            raise InputError(
                f"{line_word} {positions[j] + 1} of the range has no numbers, only "
                f"text or logical values; clear it or leave it out of the range"
            )
    return _make_groups(final, arrays, col.notes, lay, "range" if has_labels else "default")


def first_duplicate(items: Sequence[str]) -> str | None:
    """The first item that occurs a second time, or ``None`` when all differ."""
    seen: set[str] = set()
    for x in items:
        if x in seen:
            return x
        seen.add(x)
    return None


def _make_groups(labels, arrays, cells, layout, source) -> Groups:
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


def _from_long_rows(rows: list[tuple], lab: str) -> Groups:
    width = len(rows[0])
    if width != 2:
        raise InputError(
            f"the long layout needs exactly two columns (group label, value); "
            f"the range has {width}"
        )
    col = _Collector(transpose=True)  # line = row, idx = column
    start = 0
    first_label, first_value = rows[0]
    if lab == "yes" or (lab == "auto" and _is_labelish_text(first_value)):
        start = 1
    for r in range(len(rows)):
        for c in (0, 1):
            e = error_text(rows[r][c])
            if e is not None and not (r < start and c == 0 and False):
                col.add(r, c, "error", e, "rejected")
    col.raise_errors()
    order: dict[str, list[float]] = {}
    for r in range(start, len(rows)):
        lv, vv = rows[r]
        kind, val = classify(vv)
        label_blank = lv is None or (isinstance(lv, str) and lv.strip() == "")
        if kind == "blank":
            continue
        if kind == "number":
            if not math.isfinite(val):
                col.add(r, 1, "nan", val, "rejected")
                continue
            if label_blank:
                raise InputError(
                    f"the value at {cell_position(r, 1)} of the range has no group "
                    "label; fill in its label (first column) or clear the value",
                    cells=((r, 0),),
                )
            label = format_label(lv)
            order.setdefault(label, []).append(val)
        elif kind in ("text", "logical"):
            col.add(r, 1, kind, val)
            if not label_blank:
                order.setdefault(format_label(lv), [])
        else:
            col.add(r, 1, kind, val, "rejected")
    col.raise_errors()
    if not order:
        raise InputError("the range holds no numbers; select the cells with the data")
    for label, vals in order.items():
        if not vals:
            raise InputError(
                f'group "{label}" has no numbers; enter its values or leave it out '
                "of the range"
            )
    return _make_groups(
        list(order), [np.array(v, dtype=np.float64) for v in order.values()], col.notes, "long", "range"
    )


def groups_from_long(labels: Sequence[Any], values: Sequence[Any]) -> Groups:
    """Groups from two parallel columns: one label and one value per observation."""
    if len(labels) != len(values):
        raise InputError(
            f"the label column has {len(labels)} entries but the value column has "
            f"{len(values)}; give one label per value"
        )
    return _from_long_rows(list(zip(labels, values)), "no")


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
        raise InputError(_bad_number_message(float(arr[i]), f'position {i + 1} of group "{label}"'))
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
    return _make_groups(labels, arrays, (), "python", source)
