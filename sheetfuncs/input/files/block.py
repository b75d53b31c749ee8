"""A block of cells as read from a file, and the trimming of its blank margins.

Both readers (:mod:`.xlsx` for workbooks, :mod:`.delimited` for CSV files) hand their rows to
:func:`trim_rows` and build their result with :func:`cell_block`, so that a block read from
either kind of file has the same shape and the same A1 reference.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass
from typing import Any

from ..cells import RangeRef, a1_range
from ..source import InputSource

__all__ = ["PROGRESS_STEP", "CellBlock", "Progress", "cell_block", "is_blank", "row_span", "trim_rows"]

#: A progress callback: ``progress(stage, done, total)``; ``total`` 0 when unknown.
Progress = Callable[[str, int, int], None]

#: Cells read between two progress calls.
PROGRESS_STEP = 20_000


@dataclass(frozen=True)
class CellBlock:
    """A rectangular block of cells as read from a file.

    ``rows`` holds the saved cell values row by row (``None`` for blanks; numbers, text,
    logical values, error texts such as ``"#N/A"``, dates); ``source`` says where the block's
    top-left cell is, so that a 0-based ``(row, col)`` of the block has an address
    (``source.full_address(row, col)``). ``kind`` is ``"workbook"`` or ``"csv"``; ``ref`` the
    block's A1 reference (e.g. ``"A1:D9"``); ``delimiter`` the CSV field separator; ``notes``
    what the reader wants the user told about how the file was read (one line each, e.g. a
    workbook named ``.xls``, or the totals row of a spreadsheet table left out).
    """

    rows: tuple[tuple[Any, ...], ...]
    source: InputSource
    kind: str
    ref: str
    delimiter: str | None = None
    notes: tuple[str, ...] = ()

    @property
    def n_rows(self) -> int:
        return len(self.rows)

    @property
    def n_cols(self) -> int:
        return max((len(r) for r in self.rows), default=0)

    @property
    def n_cells(self) -> int:
        return self.n_rows * self.n_cols


def cell_block(
    rows: list[tuple[Any, ...]], source: InputSource, kind: str, delimiter: str | None = None,
    notes: tuple[str, ...] = (),
) -> CellBlock:
    """The block of the trimmed, non-empty ``rows`` whose top-left cell ``source`` names."""
    width = max(len(r) for r in rows)
    first_row, first_col = source.first_row, source.first_col
    ref = a1_range(first_row, first_col, first_row + len(rows) - 1, first_col + width - 1)
    return CellBlock(
        rows=tuple(rows), source=source, kind=kind, ref=ref, delimiter=delimiter, notes=notes
    )


def is_blank(v: Any) -> bool:
    """A blank cell as a reader hands it over: ``None`` or the empty string."""
    return v is None or (isinstance(v, str) and v == "")


def row_span(row: tuple[Any, ...]) -> tuple[int, int] | None:
    """First and last non-blank positions of a row, ``None`` when it is all blank."""
    n = len(row)
    if n == 0:
        return None
    if not is_blank(row[0]) and not is_blank(row[-1]):
        return 0, n - 1
    first = next((j for j, v in enumerate(row) if not is_blank(v)), None)
    if first is None:
        return None
    last = next(j for j in range(n - 1, -1, -1) if not is_blank(row[j]))
    return first, last


def trim_rows(
    rows: list[tuple[Any, ...]],
    r1: int,
    c1: int,
    ref: RangeRef | None,
    suspects: list[tuple[int, int]],
) -> tuple[list[tuple[Any, ...]], list[tuple[int, int]], int, int]:
    """Drop blank margins (all four sides for the used range; trailing only for a range).

    ``rows`` start at sheet row ``r1``, column ``c1``; ``suspects`` are sheet ``(row, col)``
    cells that count as non-blank (cells that may hold formulas without saved values).
    Returns ``(rows, suspects inside, first row, first column)`` (sheet numbers, 1-based).
    """
    width = max((len(r) for r in rows), default=0)
    if ref is not None and ref.max_col is not None:
        width = max(width, ref.max_col - ref.min_col + 1)
    spans = {i: sp for i, row in enumerate(rows) if (sp := row_span(row)) is not None}
    for r, c in suspects:
        i, j = r - r1, c - c1
        lo, hi = spans.get(i, (j, j))
        spans[i] = (min(lo, j), max(hi, j))
    if not spans:
        return [], [], r1, c1
    if ref is None:
        top, bottom = min(spans), max(spans)
        left = min(sp[0] for sp in spans.values())
        right = max(sp[1] for sp in spans.values())
    else:
        top, left = 0, 0
        bottom = max(spans)
        right = width - 1 if ref.max_col is not None else max(sp[1] for sp in spans.values())
    out = []
    full = right - left + 1
    for row in rows[top:bottom + 1]:
        if left or len(row) != full:
            row = row[left:right + 1]
            if len(row) < full:
                row = row + (None,) * (full - len(row))
        out.append(row)
    inside = [
        (r, c) for r, c in suspects
        if r1 + top <= r <= r1 + bottom and c1 + left <= c <= c1 + right
    ]
    return out, inside, r1 + top, c1 + left
