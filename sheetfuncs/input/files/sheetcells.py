"""The cells present on a sheet, kept sparse: what a file holds, not what its dimensions claim.

A sheet is kept as *runs*: for every row that holds a non-blank cell, the row number, the
column of its first non-blank cell and the values from there to its last non-blank cell. A
block of cells is made dense (a rectangle of rows) only for the part that is used, and only
after its area has been checked against the ``max_cells`` limit, so that a far cell such as
``XFD1048576`` costs one short run and nothing more.
"""

from __future__ import annotations

from collections.abc import Iterable
from dataclasses import dataclass
from typing import Any

from ...errors import InputError
from ..cells import a1_range
from ..source import InputSource
from .block import CellBlock, is_blank

__all__ = ["Run", "SheetCells", "area_message", "check_area", "dense_rows", "run_of", "runs_from_rows"]

#: ``(row, first column, values)``: 1-based sheet numbers; values from the row's first to its
#: last non-blank cell (blanks between them as ``None`` or ``""``).
Run = tuple[int, int, tuple[Any, ...]]


@dataclass(frozen=True)
class SheetCells:
    """The non-blank cells of one sheet (or CSV file), as runs sorted by row.

    ``source`` names the file and sheet (its first row and column are 1); ``kind`` is
    ``"workbook"`` or ``"csv"``; ``suspects`` are cells that exist but hold no saved value
    (possible formulas without values, checked when they fall in the block used);
    ``n_cells`` counts the non-blank cells; ``hidden`` the hidden rows; ``has_formulas``
    whether the sheet holds any formula; ``notes`` remarks of the reader (e.g. on the file
    type) carried into the reading.
    """

    runs: tuple[Run, ...]
    source: InputSource
    kind: str
    n_cells: int
    suspects: tuple[tuple[int, int], ...] = ()
    delimiter: str | None = None
    hidden: frozenset[int] = frozenset()
    has_formulas: bool = False
    notes: tuple[str, ...] = ()

    @property
    def name(self) -> str:
        """How messages name the sheet: ``sheet "Data"`` or the file's name."""
        from pathlib import Path

        if self.source.sheet:
            return f'sheet "{self.source.sheet}"'
        return Path(self.source.path or "").name

    def cells(self) -> Iterable[tuple[int, int, Any]]:
        """Every non-blank cell as ``(row, col, value)``."""
        for r, c0, vals in self.runs:
            for j, v in enumerate(vals):
                if not is_blank(v):
                    yield r, c0 + j, v

    def bounds(self) -> tuple[int, int, int, int] | None:
        """``(top, left, bottom, right)`` of the non-blank cells and the suspects."""
        if not self.runs and not self.suspects:
            return None
        rows = [r for r, _, _ in self.runs] + [r for r, _ in self.suspects]
        lefts = [c for _, c, _ in self.runs] + [c for _, c in self.suspects]
        rights = [c + len(v) - 1 for _, c, v in self.runs] + [c for _, c in self.suspects]
        return min(rows), min(lefts), max(rows), max(rights)

    def block(
        self, top: int, left: int, bottom: int, right: int, blanked: frozenset[tuple[int, int]] = frozenset()
    ) -> CellBlock:
        """The dense block ``top..bottom`` x ``left..right`` (1-based), cells in ``blanked``
        set to blank. The caller checks the area first."""
        rows = dense_rows(self.runs, top, left, bottom, right, blanked)
        source = InputSource(path=self.source.path, sheet=self.source.sheet, first_row=top,
                             first_col=left)
        ref = a1_range(top, left, bottom, right)
        return CellBlock(rows=tuple(rows), source=source, kind=self.kind, ref=ref,
                         delimiter=self.delimiter, notes=self.notes)


def run_of(r: int, c1: int, vals: list[Any] | tuple[Any, ...]) -> Run | None:
    """The run of a row whose first value is in column ``c1``; ``None`` when it is all blank."""
    n = len(vals)
    if not n:
        return None
    if not is_blank(vals[0]) and not is_blank(vals[-1]):
        return r, c1, vals if type(vals) is tuple else tuple(vals)
    first = next((j for j, v in enumerate(vals) if not is_blank(v)), None)
    if first is None:
        return None
    last = next(j for j in range(n - 1, first - 1, -1) if not is_blank(vals[j]))
    return r, c1 + first, tuple(vals[first:last + 1])


def runs_from_rows(rows: Iterable[tuple[Any, ...]], r1: int, c1: int) -> tuple[list[Run], int]:
    """Runs of dense ``rows`` whose top-left cell is sheet ``(r1, c1)``, and their non-blank
    count."""
    out: list[Run] = []
    count = 0
    for i, row in enumerate(rows):
        run = run_of(r1 + i, c1, row)
        if run is not None:
            vals = run[2]
            count += len(vals) - vals.count(None) - vals.count("")
            out.append(run)
    return out, count


def dense_rows(
    runs: Iterable[Run], top: int, left: int, bottom: int, right: int,
    blanked: frozenset[tuple[int, int]] = frozenset(),
) -> list[tuple[Any, ...]]:
    """The rectangle ``top..bottom`` x ``left..right`` of ``runs`` as dense rows."""
    width = right - left + 1
    empty = (None,) * width
    out = [empty] * (bottom - top + 1)
    for r, c0, vals in runs:
        if r < top or r > bottom:
            continue
        end = c0 + len(vals) - 1
        if end < left or c0 > right:
            continue
        if c0 == left and end == right:
            row = vals
        else:
            lo, hi = max(c0, left), min(end, right)
            row = (None,) * (lo - left) + tuple(vals[lo - c0:hi - c0 + 1]) + (None,) * (right - hi)
        out[r - top] = row
    by_row: dict[int, list[int]] = {}
    for r, c in blanked:
        if top <= r <= bottom and left <= c <= right:
            by_row.setdefault(r, []).append(c)
    for r, cols in by_row.items():
        row = list(out[r - top])
        for c in cols:
            row[c - left] = None
        out[r - top] = tuple(row)
    return out


def area_message(what: str, area: int, max_cells: int) -> str:
    """The one line for a block larger than the ``max_cells`` limit."""
    return (
        f"{what} spans {area:,} cells, more than the limit of {max_cells:,}; give a smaller "
        "--range or raise --max-cells"
    )


def check_area(what: str, rows: int, cols: int, max_cells: int) -> None:
    """Stop when a block of ``rows`` x ``cols`` is larger than ``max_cells``."""
    if rows * cols > max_cells:
        raise InputError(area_message(what, rows * cols, max_cells))
