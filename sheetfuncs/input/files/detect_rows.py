"""The rows and columns of a block, sorted by what they hold, and the account of the cells left out.

A :class:`Block` is a candidate block of a sheet; :func:`read_rows` sorts its rows (data rows,
summary rows, sign-off lines, other rows; formulas that aggregate the block make summary rows
or columns, other formulas are noted); :func:`column_stats` says what each column of the data
rows holds; :func:`lot_row` tells lot numbers over the data from data; :class:`Account` gives
every non-blank cell of the block outside the rectangle read (or blanked inside it) an entry
with its address and reason.
"""

from __future__ import annotations

import decimal
import re
from dataclasses import dataclass, field
from typing import Any

import numpy as np

from ..cells import a1_range, column_letters, is_error_text
from ..groups import format_label
from ..reading import LeftOut, sheet_ref
from .block import is_blank
from .formulas import formula_refs, is_aggregate
from .sheetcells import Run, SheetCells
from .words import is_signoff, summary_word

__all__ = [
    "Account", "Block", "ColStat", "Rows", "Table", "column_stats", "is_label", "lot_row",
    "read_rows", "row_counts", "shape_of",
]

_NONE = type(None)


def row_counts(vals: tuple[Any, ...]) -> tuple[int, int]:
    """``(numbers, non-blank cells)`` of a row's values (a logical value is not a number)."""
    types = list(map(type, vals))
    n_float = types.count(float)
    n_none = types.count(_NONE)
    if n_float + n_none == len(vals):
        return n_float, n_float
    numbers = nonblank = 0
    for v, t in zip(vals, types):
        if v is None or (t is str and v == ""):
            continue
        nonblank += 1
        if _is_number(v):
            numbers += 1
    return numbers, nonblank


def _is_number(v: Any) -> bool:
    return isinstance(v, (float, int, decimal.Decimal, np.floating, np.integer)) and not isinstance(
        v, (bool, np.bool_)) and not (isinstance(v, int) and -2146826300 <= v <= -2146826200)


def is_label(v: Any) -> bool:
    """Whether a cell holds a text label (not blank, not an error text)."""
    return isinstance(v, str) and v.strip() != "" and not is_error_text(v.strip())


@dataclass
class Block:
    """A candidate block: rows ``top..bottom`` and columns ``left..right`` (1-based), its runs
    (clipped to its columns), and its counts of numbers and non-blank cells."""

    top: int
    left: int
    bottom: int
    right: int
    runs: list[Run] = field(default_factory=list)
    numbers: int = 0
    nonblank: int = 0
    counts: list[tuple[int, int]] = field(default_factory=list)

    @property
    def ref(self) -> str:
        return a1_range(self.top, self.left, self.bottom, self.right)

    def cells(self) -> list[tuple[int, int]]:
        """The 1-based ``(row, col)`` of every non-blank cell."""
        return [(r, c0 + j) for r, c0, vals in self.runs for j, v in enumerate(vals) if not is_blank(v)]

    def add(self, run: Run) -> None:
        self.runs.append(run)
        n, nb = row_counts(run[2])
        self.counts.append((n, nb))
        self.numbers += n
        self.nonblank += nb


# --------------------------------------------------------------------------------------------
# rows


@dataclass
class Rows:
    """A block's rows by number, each with its kind (``data``, ``summary``, ``signoff``,
    ``other``) and counts; the summary columns and computed cells its formulas show."""

    block: Block
    runs: dict[int, Run]
    order: list[int]
    kind: dict[int, str]
    counts: dict[int, tuple[int, int]]
    summary_cols: set[int] = field(default_factory=set)
    computed: list[tuple[int, int, str]] = field(default_factory=list)
    lead: dict[int, str] = field(default_factory=dict)

    def value(self, r: int | None, c: int) -> Any:
        run = self.runs.get(r) if r is not None else None
        if run is None or not run[1] <= c < run[1] + len(run[2]):
            return None
        return run[2][c - run[1]]

    def values(self, r: int) -> list[Any]:
        return list(self.runs[r][2])

    def data_rows(self) -> list[int]:
        return [r for r in self.order if self.kind[r] == "data"]


def _value_at(run: Run, c: int) -> Any:
    """The value of column ``c`` in a row's run (``None`` outside it)."""
    _, c1, vals = run
    return vals[c - c1] if 0 <= c - c1 < len(vals) else None


def _formula_kinds(block: Block, fm: dict[tuple[int, int], str]) -> tuple[set[int], set[int], list]:
    """Rows and columns summarised by aggregate formulas over the block, and computed cells."""
    rows: set[int] = set()
    cols: set[int] = set()
    computed = []
    for (r, c), f in sorted(fm.items()):
        refs = [x for x in formula_refs(f) if x[0] <= block.bottom and x[2] >= block.top
                and x[1] <= block.right and x[3] >= block.left]
        if is_aggregate(f) and refs:
            if any(t != r or b != r for t, _, b, _ in refs):
                rows.add(r)
            else:
                cols.add(c)
        else:
            computed.append((r, c, f))
    return rows, cols, computed


def read_rows(block: Block, fm: dict[tuple[int, int], str] | None) -> Rows:
    """The rows of ``block`` sorted by kind (``fm``: its formulas, when the sheet has any)."""
    f_rows, f_cols, computed = _formula_kinds(block, fm) if fm else (set(), set(), [])
    runs = {run[0]: run for run in block.runs}
    kind: dict[int, str] = {}
    counts: dict[int, tuple[int, int]] = {}
    lead: dict[int, str] = {}
    for (r, _, vals), (n, nb) in zip(block.runs, block.counts):
        first = vals[0]
        counts[r] = n, nb
        if type(first) is str and summary_word(first):
            kind[r], lead[r] = "summary", first.strip()
        elif type(first) is str and is_signoff(first):
            kind[r] = "signoff"
        elif r in f_rows:
            kind[r] = "summary"
        else:
            kind[r] = "data" if n and 2 * n >= nb else "other"
    computed = [x for x in computed if kind.get(x[0]) == "data" and x[1] not in f_cols
                and _is_number(_value_at(runs[x[0]], x[1]))]  # an error or text is not a measurement
    return Rows(block, runs, sorted(runs), kind, counts, f_cols, computed, lead)


def shape_of(rows: Rows) -> Any:
    """``(columns of numbers, labels over them)`` of a block: what two blocks must share to be
    taken for the same table (the labels ``None`` when the row above is not all labels)."""
    data = rows.data_rows()
    if not data:
        return None
    cols = sorted({c0 + j for r in data for _, c0, vals in (rows.runs[r],)
                   for j, v in enumerate(vals) if _is_number(v)})
    above = data[0] - 1
    heads = tuple(rows.value(above, c) for c in cols)
    names = tuple(format_label(v) for v in heads) if all(is_label(v) for v in heads) else None
    return len(cols), names


# --------------------------------------------------------------------------------------------
# columns


@dataclass
class ColStat:
    """What a column holds in the data rows."""

    numbers: int = 0
    texts: int = 0
    dates: int = 0
    others: int = 0
    lo: float = 0.0
    hi: float = 0.0
    consecutive: bool = False
    repeats: bool = False
    numeric_texts: int = 0

    @property
    def numbers_only(self) -> bool:
        return not (self.texts or self.dates or self.others)


#: Text that reads as a number (a number stored as text: ``"49.8"``, ``"1,5"``, ``"-2e3"``).
_NUMBER_TEXT = re.compile(r"^[+-]?(?:\d+(?:[.,]\d*)?|[.,]\d+)(?:[eE][+-]?\d+)?$")


def _stat(col: tuple[Any, ...]) -> ColStat:
    types = set(map(type, col))
    st = ColStat()
    if types <= {float, _NONE}:
        nums = np.array(col, dtype=np.float64)
        nums = nums[~np.isnan(nums)]
    else:
        values = []
        texts = []
        for v in col:
            if is_blank(v):
                continue
            if _is_number(v):
                values.append(float(v))
            elif is_label(v):
                texts.append(v.strip())
            elif hasattr(v, "year") or hasattr(v, "hour"):
                st.dates += 1
            else:
                st.others += 1
        nums = np.array(values, dtype=np.float64)
        st.texts = len(texts)
        st.repeats = len(set(texts)) < len(texts)
        st.numeric_texts = sum(1 for t in texts if _NUMBER_TEXT.match(t))
    st.numbers = int(nums.size)
    if nums.size and np.isfinite(nums).all():
        st.lo, st.hi = float(nums.min()), float(nums.max())
        st.consecutive = nums.size >= 3 and bool(np.all(nums == np.floor(nums))) and bool(
            np.all(np.diff(nums) == 1))
    return st


def column_stats(rows: Rows, data: list[int], extra: int | None = None) -> dict[int, ColStat]:
    """Each column's :class:`ColStat` over the ``data`` rows; a column with no cell there but
    a cell in row ``extra`` (the header) gets an empty one."""
    left, right = rows.block.left, rows.block.right
    width = right - left + 1
    grid = [rows.runs[r][2] for r in data]
    if not all(rows.runs[r][1] == left for r in data) or any(len(v) != width for v in grid):
        grid = [(None,) * (c0 - left) + vals + (None,) * (right - c0 - len(vals) + 1)
                for _, c0, vals in (rows.runs[r] for r in data)]
    out = {}
    for j, col in enumerate(zip(*grid)):
        if col.count(None) != len(col):
            out[left + j] = _stat(col)
    if extra is not None and extra in rows.runs:
        for j, v in enumerate(rows.runs[extra][2]):
            c = rows.runs[extra][1] + j
            if not is_blank(v) and c not in out:
                out[c] = ColStat()
    return out


def lot_row(rows: Rows, r0: int, data: list[int]) -> str | None:
    """``"labels"`` when the first data row holds whole numbers all far outside the values
    below them (lot numbers 1001, 1002 over values near 5: outside each column's range by more
    than 10 times its width), ``"ambiguous"`` when some are far and some not, else ``None``."""
    if len(data) < 2:
        return None
    _, c0, vals = rows.runs[r0]
    cells = [(c0 + j, v) for j, v in enumerate(vals) if not is_blank(v)]
    nums = [(c, v) for c, v in cells if _is_number(v)]
    texts = [(c, v) for c, v in cells if not _is_number(v)]
    if not nums or any(float(v) != int(v) for _, v in nums) or len(texts) > 1 or (
        texts and texts[0][0] != c0
    ):
        return None
    below = column_stats(rows, data[1:])
    far = near = 0
    for c, v in nums:
        st = below.get(c)
        if st is None or not st.numbers:
            continue
        if st.consecutive and float(v) == st.lo - 1:
            continue  # the first sample number of an identifier column
        width = st.hi - st.lo
        margin = 10 * width if width > 0 else max(abs(st.lo), 1.0)
        if float(v) < st.lo - margin or float(v) > st.hi + margin:
            far += 1
        else:
            near += 1
    if far and not near:
        return "labels"
    return "ambiguous" if far else None


# --------------------------------------------------------------------------------------------
# the account of the cells left out


@dataclass(frozen=True)
class Table:
    """The rectangle read from the table block, as :class:`.detect.Found` describes it."""

    top: int
    left: int
    bottom: int
    right: int
    labels: Any
    blanked: frozenset[tuple[int, int]]
    left_out: tuple[LeftOut, ...]
    notes: tuple[str, ...]


class Account:
    """Collects the columns left out of a table block, then gives every non-blank cell outside
    the rectangle (or blanked inside it) an entry."""

    def __init__(self, rows: Rows, cells: SheetCells) -> None:
        self.rows = rows
        self.cells = cells
        self.cols: dict[int, tuple[str, str]] = {}
        self.notes: list[str] = []
        self.box = (0, 0, 0, 0)
        self.header: int | None = None
        self.units: int | None = None
        self.heading = "title or note above the table"

    def column(self, c: int, reason: str, kind: str) -> None:
        self.cols[c] = (reason, kind)

    def rect(self, top: int, left: int, bottom: int, right: int, header: int | None,
             units: int | None, heading: str = "title or note above the table") -> None:
        self.box, self.header, self.units, self.heading = (top, left, bottom, right), header, units, heading

    def _row_reason(self, r: int) -> tuple[str, str] | None:
        top, _, bottom, _ = self.box
        kind = self.rows.kind[r]
        if r == self.units:
            return "units row", "units"
        if r < top:
            return self.heading, "title"
        if kind == "summary" and r != self.header:
            return "summary rows", "summary"
        if kind == "signoff" and r != self.header:
            return "sign-off line", "signoff"
        if r > bottom:
            return "note under the table", "note"
        return None

    def table(self, labels: Any) -> Table:
        """The :class:`Table`: rectangle, blanked cells, entries and notes."""
        top, left, bottom, right = self.box
        groups: dict[tuple[str, str], list[tuple[int, int]]] = {}
        special = sorted(self.cols)
        kind = self.rows.kind
        for r, c0, vals in self.rows.block.runs:
            end = c0 + len(vals) - 1
            inside = c0 >= left and end <= right and not any(c0 <= c <= end for c in special)
            if inside and top <= r <= bottom and kind[r] in ("data", "other") and r != self.units:
                continue
            why = self._row_reason(r)
            if why is None and inside:
                continue
            for j, v in enumerate(vals):
                c = c0 + j
                if is_blank(v):
                    continue
                reason = why or self.cols.get(c)
                if reason is None and left <= c <= right:
                    continue
                groups.setdefault(reason or ("note beside the table", "note"), []).append((r, c))
        blanked = frozenset((r, c) for cells in groups.values() for r, c in cells
                            if top <= r <= bottom and left <= c <= right)
        return Table(top, left, bottom, right, labels, blanked, self._entries(groups), tuple(self._notes()))

    def _entries(self, groups: dict[tuple[str, str], list[tuple[int, int]]]) -> tuple[LeftOut, ...]:
        out = []
        for (reason, kind), cells in groups.items():
            if reason == "summary rows":
                words = list(dict.fromkeys(self.rows.lead[r] for r in sorted({r for r, _ in cells})
                                           if r in self.rows.lead))
                reason = f"summary rows ({', '.join(words)})" if words else "summary rows (formulas over the data)"
            out.append(LeftOut.of(cells, reason, kind))
        return tuple(out)

    def _notes(self) -> list[str]:
        top, left, bottom, right = self.box
        notes = list(self.notes)
        sheet = self.cells.source.sheet
        hidden = sorted(r for r in self.cells.hidden if top <= r <= bottom)
        if hidden:
            rows = ", ".join(map(str, hidden[:6])) + (" ..." if len(hidden) > 6 else "")
            notes.append(
                f"{'rows' if len(hidden) > 1 else 'row'} {rows} of {sheet_ref(sheet, '')[:-1] or 'the sheet'} "
                f"{'are' if len(hidden) > 1 else 'is'} hidden and read as data, as the spreadsheet's "
                "own functions read hidden cells"
            )
        computed = [(r, c, f) for r, c, f in self.rows.computed
                    if top <= r <= bottom and left <= c <= right and c not in self.cols]
        if computed:
            cols = sorted({c for _, c, _ in computed})
            rs = [r for r, _, _ in computed]
            where = sheet_ref(sheet, a1_range(min(rs), cols[0], max(rs), cols[-1]))
            first = computed[0]
            notes.append(
                f"{len(computed)} value{'s' if len(computed) > 1 else ''} in {where} "
                f"{'are' if len(computed) > 1 else 'is'} computed by formulas (e.g. "
                f"{column_letters(first[1])}{first[0]} ={first[2]}) and read as measurements"
            )
        return notes
