"""Spreadsheet ranges into :class:`~sheetfuncs.input.groups.Groups`: the range rules.

:func:`groups_from_range` applies the range rules of the project guide: numbers count; blanks
are ignored; text and logical values are ignored and recorded; an error value anywhere makes the
whole call an :class:`InputError` that names the error and its position (with
``errors="missing"`` an error in a data position is a missing value instead: left out and
recorded); dates in a data position are errors. Layouts: ``wide`` (one group per column), ``rowwise`` (one group per row)
and ``long`` (a label column and a value column, also :func:`groups_from_long`).

A range whose data cells are all floats or blanks (what a spreadsheet hands over for typed
measurements) is read in one block (:func:`_plain_block`); any other range is read cell by cell,
which records or rejects each cell with its position. Both give the same result.
"""

from __future__ import annotations

import math
import operator
import struct
from collections import Counter
from collections.abc import Sequence
from itertools import chain
from typing import Any

import numpy as np

from ..errors import InputError
from .cells import cell_position, classify, error_text, is_error_text
from .groups import CellNote, Groups, bad_number_message, build_groups, first_duplicate, format_label
from .options import shown

__all__ = ["LAYOUTS", "groups_from_long", "groups_from_range", "parse_errors"]

LAYOUTS = ("wide", "long", "rowwise")


# --------------------------------------------------------------------------------------------
# rows and options


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


def parse_labels(labels: Any) -> str:
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


def parse_layout(layout: Any) -> str:
    """The ``layout`` argument as ``"wide"``, ``"long"`` or ``"rowwise"`` (an InputError otherwise)."""
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


# --------------------------------------------------------------------------------------------
# cells left out


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
            msg = bad_number_message(first.value, f"{first.position} of the range") + more
        else:
            msg = (
                f"unsupported cell value {first.value!r} at {first.position} of the "
                f"range{more}; clear the cell or enter a number"
            )
        raise InputError(msg, cells=tuple((e.row, e.col) for e in errs))


# --------------------------------------------------------------------------------------------
# reading line by line


def _line_values(
    line: Sequence[Any], lineno: int, start: int, col: _Collector, missing: bool = False
) -> np.ndarray:
    """Numbers of one column (or row) from index ``start`` on; records everything else (an
    error value as a missing value when ``missing``)."""
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
        elif kind == "error" and missing:
            col.add(lineno, i, kind, val, "missing")
        else:  # error, date, other
            col.add(lineno, i, kind, val, "rejected")
    return np.array(out, dtype=np.float64)


def _is_labelish_text(v: Any) -> bool:
    return isinstance(v, str) and v.strip() != "" and not is_error_text(v.strip())


# --------------------------------------------------------------------------------------------
# reading a range


def groups_from_range(
    cells: Any, layout: str = "wide", labels: Any = "auto", *, errors: str = "stop",
    unlabelled: str = "stop",
) -> Groups:
    """Clean a spreadsheet range into :class:`Groups`.

    ``cells`` is a 2-D sequence of rows as a spreadsheet hands it over (float, int, str, bool,
    None, datetime, Decimal, error texts such as ``"#N/A"``, or unconverted COM error codes).
    ``layout`` is ``"wide"`` (one group per column), ``"long"`` (label column, value column) or
    ``"rowwise"`` (one group per row). ``labels`` is ``"auto"``, ``True`` or ``False``; see the
    project guide for the exact rules.

    A range whose data cells are all floats or blanks (the usual case) is read in one block
    (:func:`_plain_block`); any other range is read cell by cell. Both give the same result.

    ``errors`` is ``"stop"`` (default: an error value stops the reading with its position, as
    the host's own functions do) or ``"missing"`` (error values in data positions are missing
    values: left out, recorded in ``cells`` as kind ``"error"`` with the action ``"missing"``,
    and counted per group in ``Groups.dropped``). An error in the label row (or column) stops
    the reading either way: a group cannot be reported without its label. In the long layout
    with ``"missing"``, an error in a label cell is a missing label: the cell is recorded as
    missing and the row's value as ``"unlabelled"``.

    ``unlabelled`` says what a number without a label in the long layout does: ``"stop"``
    (default: an error naming the cell, since a worksheet function has no log to show it in)
    or ``"log"`` (left out and recorded, for readers that show every cell left out); with
    ``errors="missing"`` it is always recorded.
    """
    err = parse_errors(errors)
    g = _read_range(cells, layout, labels, block=True, errors=err)
    if unlabelled != "log" and err != "missing":
        stop_unlabelled(g)
    return g


def stop_unlabelled(g: Groups) -> None:
    """An error for the first number without a label in ``g``'s cells, if there is one."""
    first = next((c for c in g.cells if c.kind == "unlabelled"), None)
    if first is not None:
        raise InputError(
            f"the value at {first.position} of the range has no group label; fill in its "
            "label (first column) or clear the value",
            cells=((first.row, 0),),
        )


def parse_errors(errors: Any) -> str:
    """The ``errors`` option: ``"stop"`` or ``"missing"``."""
    s = "stop" if errors is None else str(errors).strip().lower()
    if s not in ("stop", "missing"):
        raise InputError(
            f'errors must be "stop" (an error cell stops the reading) or "missing" (error '
            f"cells are missing values), not {shown(errors)}"
        )
    return s


def _read_range(cells: Any, layout: Any, labels: Any, *, block: bool, errors: str = "stop") -> Groups:
    """:func:`groups_from_range`; ``block=False`` reads every range cell by cell (for tests)."""
    lay = parse_layout(layout)
    lab = parse_labels(labels)
    rows = _as_rows(cells)
    if not rows or not rows[0]:
        raise InputError("the range is empty; select the cells that hold the data")
    missing = errors == "missing"
    if lay == "long":
        return _from_long_rows(rows, lab, missing)
    transpose = lay == "rowwise"
    col = _Collector(transpose)

    # label line: the first cell of every line
    heads = [r[0] for r in rows] if transpose else list(rows[0])
    has_labels = _has_label_line(heads, len(rows[0]) if transpose else len(rows), lab, col, missing)
    start = 1 if has_labels else 0

    values = _plain_block(rows, start, transpose) if block else None
    if values is not None:
        blank_lines = [a.size == 0 for a in values]  # only floats and blanks: no float, all blank
    else:
        lines = rows if transpose else list(zip(*rows))
        values = [_line_values(ln, i, start, col, missing) for i, ln in enumerate(lines)]
        blank_lines = [all(v is None or v == "" for v in ln[start:]) for ln in lines]

    raw_labels, arrays, positions = _kept_lines(values, blank_lines, heads if has_labels else None)
    col.raise_errors()
    if not arrays:
        raise InputError("the range holds no numbers; select the cells with the data")
    final = _group_labels(raw_labels, positions, transpose)
    per_line = Counter(n.row if transpose else n.col for n in col.notes if n.action == "missing")
    dropped = [per_line[p] for p in positions]
    _check_every_group_has_numbers(final, raw_labels, arrays, positions, transpose, dropped)
    return build_groups(
        final, arrays, col.notes, lay, "range" if has_labels else "default", dropped=dropped
    )


def _has_label_line(
    heads: list[Any], line_length: int, lab: str, col: _Collector, missing: bool = False
) -> bool:
    """Whether ``heads`` (the first cell of every line) are the groups' labels.

    ``lab`` is the ``labels`` argument as ``auto``, ``yes`` or ``no``; ``line_length`` the
    number of cells in a line. An error value among the heads stops the reading, except with
    ``missing`` when the heads are data (no labels): then it is a missing value, read with
    the data. With ``missing``, ``auto`` decides on the heads that are not errors.
    """
    errs = [(i, error_text(h)) for i, h in enumerate(heads) if error_text(h) is not None]
    if errs and not missing:
        for i, e in errs:
            col.add(i, 0, "error", e, "rejected")
        col.raise_errors()
    if lab == "auto":
        nonblank = [
            h for h in heads
            if not (h is None or (isinstance(h, str) and h.strip() == "")) and error_text(h) is None
        ]
        has_labels = bool(nonblank) and all(_is_labelish_text(h) for h in nonblank)
    else:
        has_labels = lab == "yes"
    if has_labels and line_length < 2 and lab == "auto":
        has_labels = False  # a single row of text is data (all ignored) rather than labels
    if has_labels and errs:
        i, e = errs[0]
        r, c = col.pos(i, 0)
        more = f" (and {len(errs) - 1} more)" if len(errs) > 1 else ""
        raise InputError(
            f"the group label at {cell_position(r, c)} of the range is the error {e}{more}; a "
            "group cannot be reported without its label: fix that cell, or leave its "
            f"{'row' if col.transpose else 'column'} out of the range",
            cells=tuple(col.pos(j, 0) for j, _ in errs),
        )
    return has_labels


def _kept_lines(
    values: list[np.ndarray], blank_lines: list[bool], heads: list[Any] | None
) -> tuple[list[str | None], list[np.ndarray], list[int]]:
    """``(labels, arrays, positions)`` of the lines that hold a label or a cell.

    A label is ``None`` for an unlabelled line; ``heads`` is ``None`` when the range has no
    label line. Entirely blank lines (a range drawn larger than the data) are left out.
    """
    raw_labels: list[str | None] = []
    arrays: list[np.ndarray] = []
    positions: list[int] = []
    for i, (arr, data_blank) in enumerate(zip(values, blank_lines)):
        label = None
        if heads is not None:
            h = heads[i]
            if not (h is None or (isinstance(h, str) and h.strip() == "")):
                label = format_label(h)
        if data_blank and label is None:
            continue  # an entirely blank column (or row): the range was drawn larger
        raw_labels.append(label)
        arrays.append(arr)
        positions.append(i)
    return raw_labels, arrays, positions


def _unique_default(pos: int, taken: set[str]) -> str:
    name = f"Group {pos}"
    while name in taken:
        name += "*"
    return name


def _group_labels(raw_labels: list[str | None], positions: list[int], transpose: bool) -> list[str]:
    """Every group's label: its own, or ``Group 2`` and so on; a label used twice is an error."""
    taken = {x for x in raw_labels if x is not None}
    final = [
        label if label is not None else _unique_default(j + 1, taken)
        for j, label in enumerate(raw_labels)
    ]
    dup = first_duplicate(final)
    if dup is not None:
        where = "rows" if transpose else "columns"
        idx = [positions[j] + 1 for j, x in enumerate(final) if x == dup]
        raise InputError(
            f'the label "{dup}" heads {where} {" and ".join(map(str, idx[:2]))}; '
            "give each group its own label"
        )
    return final


def _check_every_group_has_numbers(
    final: list[str],
    raw_labels: list[str | None],
    arrays: list[np.ndarray],
    positions: list[int],
    transpose: bool,
    dropped: list[int],
) -> None:
    """A labelled group, or an unlabelled line, without a number is an error."""
    line_word = "row" if transpose else "column"
    for j, arr in enumerate(arrays):
        if arr.size == 0:
            if raw_labels[j] is not None:
                raise InputError(_no_numbers_message(final[j], dropped[j]))
            what = "text, logical or missing values" if dropped[j] else "text or logical values"
            raise InputError(
                f"{line_word} {positions[j] + 1} of the range has no numbers, only "
                f"{what}; clear it or leave it out of the range"
            )


def _no_numbers_message(label: str, missing: int) -> str:
    """A labelled group without a number; ``missing`` error cells were read as missing."""
    why = (
        f" (its {missing} error cell{'s' if missing != 1 else ''} "
        f"{'were' if missing != 1 else 'was'} read as missing)" if missing else ""
    )
    return f'group "{label}" has no numbers{why}; enter its values or leave it out of the range'


# --------------------------------------------------------------------------------------------
# the one-block read

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


# --------------------------------------------------------------------------------------------
# long layout


def _from_long_rows(rows: list[tuple], lab: str, missing: bool = False) -> Groups:
    """The long layout: a label column and a value column.

    A row with a label but no number (a blank, text, a logical value or, with ``missing``, an
    error) is recorded as ``"label-only"`` at its label cell, the one non-blank cell of it that
    is not used (its text or error cell is recorded as well); a number without a label is
    recorded as ``"unlabelled"``. A label without a number in any row is an error (a labelled
    group with no numbers). With ``missing``, an error in a label cell is a missing label: the
    label cell is recorded as missing and the row's value as unlabelled.
    """
    width = len(rows[0])
    if width != 2:
        raise InputError(
            f"the long layout needs exactly two columns (group label, value); "
            f"the range has {width}: give only the label and value columns (command line: "
            "--range, e.g. --range A1:B40)"
        )
    col = _Collector(transpose=True)  # line = row, idx = column
    start = 0
    first_label, first_value = rows[0]
    if lab == "yes" or (lab == "auto" and _is_labelish_text(first_value)):
        start = 1
    if not missing:
        for r in range(len(rows)):
            for c in (0, 1):
                e = error_text(rows[r][c])
                if e is not None:
                    col.add(r, c, "error", e, "rejected")
        col.raise_errors()
    order: dict[str, list[float]] = {}
    drops: Counter[str] = Counter()
    for r in range(start, len(rows)):
        label = _long_row(rows[r], r, col, order)
        if label is not None:
            drops[label] += 1
    col.raise_errors()
    if not order:
        raise InputError("the range holds no numbers; select the cells with the data")
    for label, vals in order.items():
        if not vals:
            raise InputError(_no_numbers_message(label, drops[label]))
    return build_groups(
        list(order), [np.array(v, dtype=np.float64) for v in order.values()], col.notes, "long",
        "range", dropped=[drops[label] for label in order],
    )


def _long_row(row: Sequence[Any], r: int, col: _Collector, order: dict[str, list[float]]) -> str | None:
    """Reads row ``r`` of the long layout into ``order`` (label -> values) and records what it
    leaves out; returns the row's label when its value is an error read as missing."""
    lv, vv = row
    kind, val = classify(vv)
    lerr = error_text(lv)
    if lerr is not None:  # only with errors="missing": a missing label
        col.add(r, 0, "error", lerr, "missing")
        label = None
    elif lv is None or (isinstance(lv, str) and lv.strip() == ""):
        label = None
    else:
        label = format_label(lv)
    if kind == "number":
        if not math.isfinite(val):
            col.add(r, 1, "nan", val, "rejected")
        elif label is None:
            col.add(r, 1, "unlabelled", val)
        else:
            order.setdefault(label, []).append(val)
        return None
    if kind in ("text", "logical"):
        col.add(r, 1, kind, val)
    elif kind == "error":
        col.add(r, 1, kind, val, "missing")
    elif kind != "blank":
        col.add(r, 1, kind, val, "rejected")
    if label is None or kind in ("date", "other"):
        return None
    col.add(r, 0, "label-only", label)
    order.setdefault(label, [])
    return label if kind == "error" else None


def groups_from_long(labels: Sequence[Any], values: Sequence[Any], *, errors: str = "stop") -> Groups:
    """Groups from two parallel columns: one label and one value per observation (``errors``
    as in :func:`groups_from_range`)."""
    if len(labels) != len(values):
        raise InputError(
            f"the label column has {len(labels)} entries but the value column has "
            f"{len(values)}; give one label per value"
        )
    missing = parse_errors(errors) == "missing"
    g = _from_long_rows(list(zip(labels, values)), "no", missing)
    if not missing:
        stop_unlabelled(g)
    return g
