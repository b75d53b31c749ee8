"""What was read from a file: the block, the groups' cells, and every cell left out with its reason.

A :class:`Reading` is the record every front shows first (the report's Findings, Data and About
sheets; ``table`` as text, JSON and CSV; the one-line summary on stderr). It keeps the account
of a file's non-blank cells: ``cells_read == cells_used + cells_left_out``, where the cells used
are the measurements and the group labels, and each cell left out belongs to one
:class:`LeftOut` entry with its address and reason.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

from .cells import a1_range, column_letters
from .options import shown

__all__ = ["LeftOut", "Reading", "cell_content", "group_sizes", "sheet_ref"]

#: Characters of a text cell that a log line shows before it cuts the rest.
CONTENT_SHOWN = 40

#: How many left-out entries the one-line summary names before it counts the rest.
SUMMARY_SHOWN = 4


def sheet_ref(sheet: str | None, ref: str) -> str:
    """``'Hardness'!B3:E15``: a reference with its sheet (quoted as in formulas), or bare."""
    if not sheet:
        return ref
    return "'" + sheet.replace("'", "''") + "'!" + ref


def group_sizes(labels: Sequence[str], counts: Sequence[int]) -> str:
    """Each group with its n, as every output names them: ``Line A 12, Line B 11``."""
    return ", ".join(f"{lab} {n}" for lab, n in zip(labels, counts))


def cell_content(value: Any) -> str:
    """A cell's content on one line as a spreadsheet user reads it: ``"retest"`` (white space
    runs as one space, inner quotes doubled as in a formula, cut after 40 characters), ``TRUE``,
    ``2024-03-05``, ``3``."""
    if isinstance(value, str):
        text = " ".join(value.split()) if value.strip() else value
        if len(text) > CONTENT_SHOWN:
            text = text[:CONTENT_SHOWN - 1] + "…"
        return '"' + text.replace('"', '""') + '"'
    if hasattr(value, "isoformat"):
        return value.isoformat()
    return shown(value)


def cells_ref(cells: Sequence[tuple[int, int]]) -> str:
    """The smallest A1 range that holds every 1-based sheet ``(row, col)`` of ``cells``."""
    rows = [r for r, _ in cells]
    cols = [c for _, c in cells]
    r1, r2, c1, c2 = min(rows), max(rows), min(cols), max(cols)
    if r1 == r2 and c1 == c2:
        return f"{column_letters(c1)}{r1}"
    return a1_range(r1, c1, r2, c2)


@dataclass(frozen=True)
class LeftOut:
    """Non-blank cells of the file that were read but not used, and why.

    ``ref`` is the A1 reference on the sheet (``A16:E17``, ``A4:A15``, ``C7``); ``reason`` is
    plain words for a QA reader (``summary rows (Mean, SD)``, ``identifier column (Sample)``,
    ``text in the data``); ``kind`` is a short key for programs (``title``, ``units``,
    ``identifier``, ``summary``, ``signoff``, ``other-block``, ``text``, ``logical``,
    ``missing``, ``label-only``, ``unlabelled``, ``comment``); ``cells`` the 1-based sheet
    ``(row, col)`` of every non-blank cell it covers; ``content`` what a single cell held, as
    a message shows it (``"n/a"``, ``TRUE``, ``#N/A``), or empty.
    """

    ref: str
    reason: str
    kind: str
    cells: tuple[tuple[int, int], ...]
    content: str = ""

    @classmethod
    def of(cls, cells: Sequence[tuple[int, int]], reason: str, kind: str,
           content: str = "") -> LeftOut:
        """An entry for ``cells`` (at least one), its reference the range that holds them."""
        cells = tuple(sorted(cells))
        return cls(ref=cells_ref(cells), reason=reason, kind=kind, cells=cells, content=content)

    @property
    def described(self) -> str:
        """The reason with the content, when there is one: ``text in the data ("n/a")``."""
        return f"{self.reason} ({self.content})" if self.content else self.reason


@dataclass(frozen=True)
class Reading:
    """The account of what was read from a file.

    ``block`` is the A1 reference of the cells the groups came from (``B3:E15``); ``detected``
    says whether it was found by block detection (no range given) or given as a range;
    ``cells_read`` counts the non-blank cells read from the file (its used range, or the range
    given); ``cells_used`` the measurements and labels used; ``left_out`` every other non-blank
    cell, grouped by reason; ``notes`` remarks that change no cell's fate (a hidden row that was
    read, a formula read as a measurement, lot numbers read as labels, labels merged).
    ``missing`` counts error cells read as missing values (``errors="missing"``).
    """

    path: str | None
    sheet: str | None
    block: str
    detected: bool
    cells_read: int
    cells_used: int
    left_out: tuple[LeftOut, ...] = ()
    notes: tuple[str, ...] = ()
    missing: int = 0

    @property
    def cells_left_out(self) -> int:
        return sum(len(x.cells) for x in self.left_out)

    @property
    def where(self) -> str:
        """The block with its sheet: ``'Hardness'!B3:E15``."""
        return sheet_ref(self.sheet, self.block)

    def address(self, ref: str) -> str:
        """Any reference on the sheet read, with the sheet's name."""
        return sheet_ref(self.sheet, ref)

    @property
    def balanced(self) -> bool:
        """Whether the account holds: cells read = cells used + cells left out."""
        return self.cells_read == self.cells_used + self.cells_left_out

    def summary(self, labels: Sequence[str], counts: Sequence[int]) -> str:
        """One line: the block, each group with its n, and what was left out.

        e.g. ``read 'Hardness'!B3:E15: 4 groups, 47 values (L1 12, L2 12, L3 12, L4 11); left
        out 29 cells: A1:A2 title and note rows, A4:A15 identifier column (Sample), ...``
        """
        groups = group_sizes(labels, counts)
        line = (
            f"read {self.where}: {len(labels)} group{'s' if len(labels) != 1 else ''}, "
            f"{sum(counts)} values ({groups})"
        )
        if self.left_out:
            named = "; ".join(f"{x.ref} {x.described}" for x in self.left_out[:SUMMARY_SHOWN])
            more = len(self.left_out) - SUMMARY_SHOWN
            line += (
                f"; left out {self.cells_left_out} cell{'s' if self.cells_left_out != 1 else ''}:"
                f" {named}" + (f"; and {more} more (see the log)" if more > 0 else "")
            )
        return line
