"""Block detection: which cells of a sheet read without a range are the data.

A sheet is read the way an analyst reads it. Its non-blank cells fall into *blocks*: a blank row
or a blank column ends a block (bands of consecutive non-blank rows, split at columns blank
throughout the band). The block with the most numbers is the table; another block of the same
shape with at least half as many numbers makes the reading ambiguous, and it stops. Text-only
blocks (titles, notes, sign-off lines) and other blocks are left out with their reasons. Inside
the table, :mod:`.detect_table` finds the header, units row, identifier and summary columns and
rows.

The result, :class:`Found`, is a rectangle on the sheet with the cells inside it that were left
out (set to blank before the range rules read it), the ``labels`` decision, every cell left out
with its reason, and notes.
"""

from __future__ import annotations

from bisect import bisect_right
from collections.abc import Callable
from dataclasses import replace

from ...errors import InputError
from ..cells import a1_range
from ..reading import LeftOut, sheet_ref
from .block import is_blank
from .detect_rows import Block, Table, read_rows, row_counts, shape_of
from .detect_table import read_table
from .sheetcells import Run, SheetCells
from .words import is_signoff, summary_word

__all__ = ["Found", "blocks_of", "detect"]

#: What detection decided: the rectangle ``top..bottom`` x ``left..right`` handed to the range
#: rules, the cells inside it ``blanked`` (left out), the ``labels`` to pass (``"yes"``, ``"no"``
#: or, for the rowwise layout, ``"auto"``), every cell left out (``left_out``) and the ``notes``.
Found = Table


# --------------------------------------------------------------------------------------------
# blocks


def _pieces(run: Run, nonblank: int) -> list[tuple[int, int]]:
    """The column intervals of a run's ``nonblank`` cells."""
    r, c0, vals = run
    if nonblank == len(vals):
        return [(c0, c0 + len(vals) - 1)]
    out = []
    start = None
    for j, v in enumerate(vals):
        if is_blank(v):
            if start is not None:
                out.append((c0 + start, c0 + j - 1))
                start = None
        elif start is None:
            start = j
    if start is not None:
        out.append((c0 + start, c0 + len(vals) - 1))
    return out


def _bands(runs: tuple[Run, ...]) -> list[list[Run]]:
    """Maximal groups of runs on consecutive rows."""
    bands: list[list[Run]] = []
    prev = None
    for run in runs:
        if prev is None or run[0] != prev + 1:
            bands.append([])
        bands[-1].append(run)
        prev = run[0]
    return bands


def _segments(band: list[Run], counts: list[tuple[int, int]]) -> list[tuple[int, int]]:
    """The column intervals of a band, split at columns blank throughout it."""
    intervals = sorted({p for run, (_, nb) in zip(band, counts) for p in _pieces(run, nb)})
    out: list[list[int]] = []
    for lo, hi in intervals:
        if out and lo <= out[-1][1] + 1:
            out[-1][1] = max(out[-1][1], hi)
        else:
            out.append([lo, hi])
    return [(lo, hi) for lo, hi in out]


def _clip(run: Run, lo: int, hi: int) -> Run | None:
    r, c0, vals = run
    end = c0 + len(vals) - 1
    if c0 >= lo and end <= hi:
        return run
    a, b = max(c0, lo), min(end, hi)
    part = vals[a - c0:b - c0 + 1]
    while part and is_blank(part[0]):
        part, a = part[1:], a + 1
    while part and is_blank(part[-1]):
        part = part[:-1]
    return (r, a, tuple(part)) if part else None


def blocks_of(runs: tuple[Run, ...]) -> list[Block]:
    """The candidate blocks of a sheet's runs, top to bottom, left to right."""
    out: list[Block] = []
    for band in _bands(runs):
        counts = [row_counts(run[2]) for run in band]
        segs = _segments(band, counts)
        starts = [lo for lo, _ in segs]
        blocks = [Block(band[0][0], lo, band[-1][0], hi) for lo, hi in segs]
        if len(segs) == 1:
            blocks[0].runs, blocks[0].counts = band, counts
            blocks[0].numbers = sum(n for n, _ in counts)
            blocks[0].nonblank = sum(nb for _, nb in counts)
            band = []
        for run in band:
            i = bisect_right(starts, run[1]) - 1
            lo, hi = segs[i]
            if run[1] + len(run[2]) - 1 <= hi:
                blocks[i].add(run)
                continue
            for k, (lo, hi) in enumerate(segs):
                if (part := _clip(run, lo, hi)) is not None:
                    blocks[k].add(part)
        for b in blocks:
            if b.runs:
                b.top, b.bottom = b.runs[0][0], b.runs[-1][0]
                out.append(b)
    return out


# --------------------------------------------------------------------------------------------
# the whole sheet


def detect(
    cells: SheetCells,
    layout: str,
    labels: str,
    formulas: Callable[[int, int, int, int], dict[tuple[int, int], str]] | None = None,
) -> Found | None:
    """The data block of a sheet read without a range; ``None`` when no block holds a number
    (the caller then reads the used range, whose rules say what is wrong).

    ``labels`` is ``"auto"``, ``"yes"`` or ``"no"``; ``formulas(top, left, bottom, right)``
    gives the formulas of a part of the sheet (workbooks with formulas only). Raises
    :class:`InputError` with one line when the reading is ambiguous.
    """
    blocks = blocks_of(cells.runs)
    numeric = [b for b in blocks if b.numbers]
    if not numeric:
        return None
    main = max(numeric, key=lambda b: b.numbers)
    others = [b for b in blocks if b is not main]
    _check_twins(main, others, cells)
    _check_split(main, others, cells)
    table = read_table(main, cells, layout, labels, formulas)
    left_out = list(table.left_out)
    notes = list(table.notes)
    for b in others:
        entry, note = _other_block(b, main, cells)
        left_out.append(entry)
        if note:
            notes.append(note)
    left_out.sort(key=lambda x: x.cells[0])
    return replace(table, left_out=tuple(left_out), notes=tuple(notes))


def _check_twins(main: Block, others: list[Block], cells: SheetCells) -> None:
    """Stop when another block looks like the table: the same shape (the same number of
    columns of numbers and the same labels over them, or the same size), and at least half as
    many numbers."""
    shape = None
    for b in others:
        if not b.numbers or 2 * b.numbers < main.numbers:
            continue
        if shape is None:
            shape = shape_of(read_rows(main, None))
        if shape_of(read_rows(b, None)) == shape or (
            (b.bottom - b.top, b.right - b.left) == (main.bottom - main.top, main.right - main.left)
        ):
            first, second = sorted((main, b), key=lambda x: (x.top, x.left))
            a, z = (sheet_ref(cells.source.sheet, x.ref) for x in (first, second))
            raise InputError(
                f"{cells.name} holds two tables of the same shape, {a} and {z}, and it is not "
                f"clear which to read; give --range {a} or --range {z}"
            )


def _check_split(main: Block, others: list[Block], cells: SheetCells) -> None:
    """Stop when a blank row may have split the table: numbers without a header of their own in
    the table's columns just below it (a skipped sample?), or a lone row of labels over its
    columns just above it. Either way the whole table is one ``--range`` away."""
    for b in others:
        overlap = b.left <= main.right and b.right >= main.left
        if not overlap or not b.runs:
            continue
        n, nb = b.counts[0]
        firsts = [vals[0] for _, _, vals in b.runs]
        words = any(isinstance(v, str) and (summary_word(v) or is_signoff(v)) for v in firsts)
        below = b.top > main.bottom and n and 2 * n >= nb and not words
        above = (b.bottom < main.top and b.top == b.bottom and not b.numbers and main.top - b.bottom <= 2
                 and nb >= max(2, (main.right - main.left + 1) // 2) and b.left >= main.left)
        if not (below or above):
            continue
        whole = sheet_ref(cells.source.sheet, a1_range(
            min(main.top, b.top), min(main.left, b.left), max(main.bottom, b.bottom),
            max(main.right, b.right)))
        part = sheet_ref(cells.source.sheet, b.ref)
        table = sheet_ref(cells.source.sheet, main.ref)
        if below:
            raise InputError(
                f"{part} under the table {table} holds numbers in the same columns after a blank "
                f"row; if they belong to the table give --range {whole}, if not give --range {table}"
            )
        raise InputError(
            f"the labels in {part} are separated from the numbers in {table} by a blank row; give "
            f"--range {whole} to read them together (blank rows are skipped)"
        )


def _other_block(b: Block, main: Block, cells: SheetCells) -> tuple[LeftOut, str | None]:
    """The entry for a block that is not the table, and a note for a block of numbers."""
    firsts = [vals[0] for _, _, vals in b.runs]
    where = sheet_ref(cells.source.sheet, b.ref)
    if b.numbers and all(summary_word(v) for v in firsts if isinstance(v, str)) and any(
        isinstance(v, str) for v in firsts
    ) and b.top > main.bottom:
        names = ", ".join(dict.fromkeys(v.strip() for v in firsts if isinstance(v, str)))
        return LeftOut.of(b.cells(), f"summary rows ({names})", "summary"), None
    if any(is_signoff(v) for v in firsts) and b.top > main.bottom:  # names, dates: not data
        return LeftOut.of(b.cells(), "sign-off line", "signoff"), None
    if b.numbers:
        note = f"another block at {where} was not read; give --range {where} to read it instead"
        return LeftOut.of(b.cells(), "another block, not read", "other-block"), note
    if b.bottom < main.top:
        return LeftOut.of(b.cells(), "title or note above the table", "title"), None
    return LeftOut.of(b.cells(), "note outside the table", "note"), None
