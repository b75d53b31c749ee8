"""A small in-memory model of one report sheet, written out row by row in write-only mode.

The report workbook is written with openpyxl's write-only (streaming) mode so that the Data
sheets of a million observations stay cheap in memory. Streaming sheets must be written in row
order, so the small sheets are first laid out on a :class:`Grid` (cells, styles, column widths,
frozen rows, conditional formats, charts) and then emitted in one pass.

Text safety: every string is written with the cell data type forced to text, so input text that
begins with ``=``, ``+``, ``-`` or ``@`` can never become a formula; formulas are only written
through :class:`Formula`. Characters the file format cannot hold are made visible (see
:func:`safe_text`).
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass, field
from decimal import Decimal
from fractions import Fraction
from functools import lru_cache
from typing import Any

import numpy as np
from openpyxl.cell import WriteOnlyCell
from openpyxl.comments import Comment
from openpyxl.styles import Alignment, Border, Font, PatternFill, Side
from openpyxl.utils import get_column_letter
from openpyxl.worksheet.properties import PageSetupProperties

__all__ = [
    "Formula", "Style", "Grid", "PLAIN", "FONT", "MAX_TEXT", "INFINITE_NOTE", "UNDEFINED_NOTE",
    "safe_text", "quote_sheet", "cell_ref", "is_number", "apply_style", "make_cell", "shown_width",
    "set_float", "setup_print", "Page",
]

#: The longest text a cell holds (the host's limit).
MAX_TEXT = 32767

_ILLEGAL = re.compile(r"[\x00-\x08\x0b\x0c\x0e-\x1f]")
_ESCAPE_LOOKALIKE = re.compile(r"_(x[0-9A-Fa-f]{4}_)")

INFINITE_NOTE = "infinite: the value has no finite size (for example F when no group varies)"
UNDEFINED_NOTE = "undefined: the value cannot be computed from these data"


@dataclass(frozen=True)
class Formula:
    """A cell formula, written as given (it must start with ``=``)."""

    text: str

    def __post_init__(self) -> None:
        if not self.text.startswith("="):
            raise ValueError("a formula starts with '='")


@dataclass(frozen=True)
class Style:
    """The look of one cell (hashable, so that equal styles share one openpyxl style)."""

    bold: bool = False
    italic: bool = False
    size: float | None = None
    color: str | None = None
    fill: str | None = None
    wrap: bool = False
    halign: str | None = None
    valign: str | None = None
    num: str | None = None
    rule_below: bool = False
    indent: int = 0

    def but(self, **changes: Any) -> "Style":
        fields = {k: getattr(self, k) for k in self.__dataclass_fields__}
        fields.update(changes)
        return Style(**fields)


PLAIN = Style()
#: The report's font (spreadsheet programs substitute a metric-compatible one where it is absent).
FONT = "Calibri"


@lru_cache(maxsize=None)
def _font(bold: bool, italic: bool, size: float | None, color: str | None) -> Font:
    return Font(name=FONT, bold=bold, italic=italic, size=size or 11, color=color)


@lru_cache(maxsize=None)
def _fill(color: str) -> PatternFill:
    return PatternFill("solid", start_color=color, end_color=color)


@lru_cache(maxsize=None)
def _align(wrap: bool, halign: str | None, valign: str | None, indent: int) -> Alignment:
    return Alignment(wrap_text=wrap, horizontal=halign, vertical=valign, indent=indent)


_BELOW = Border(bottom=Side(style="thin", color="808080"))


def _wrapped_lines(text: str, per_line: float) -> int:
    """Lines that ``text`` takes when wrapped at word boundaries, ``per_line`` characters wide."""
    lines, used = 1, 0
    for word in text.split():
        n = len(word)
        if used and used + 1 + n > per_line:
            lines += 1
            used = 0
        if n > per_line:
            lines += int(n // per_line)
            n = int(n % per_line)
        used += n + (1 if used else 0)
    return lines


def apply_style(cell: Any, st: Style) -> None:
    """Set the openpyxl style attributes of ``cell`` from ``st``."""
    if st.bold or st.italic or st.size or st.color:
        cell.font = _font(st.bold, st.italic, st.size, st.color)
    if st.fill:
        cell.fill = _fill(st.fill)
    if st.wrap or st.halign or st.valign or st.indent:
        cell.alignment = _align(st.wrap, st.halign, st.valign, st.indent)
    if st.num:
        cell.number_format = st.num
    if st.rule_below:
        cell.border = _BELOW


def safe_text(value: str) -> str:
    """Text as a cell can hold it, with nothing silently lost.

    * Control characters that the file format cannot store are shown as their visible
      Unicode "control picture" (U+2400 block), e.g. ``\\x01`` becomes ``␁``.
    * A carriage return is stored as the format's escape ``_x000D_`` (ECMA-376 Part 1,
      ST_Xstring), because XML readers turn a literal CR into a line feed; a literal text that
      looks like such an escape has its underscore escaped (``_x005F_``) so that spreadsheet
      programs show it unchanged.
    * Text longer than the host's 32,767 characters is cut, saying how long it was.
    """
    s = _ESCAPE_LOOKALIKE.sub(r"_x005F_\1", value)
    s = _ILLEGAL.sub(lambda m: chr(0x2400 + ord(m.group())), s)
    s = s.replace("\r", "_x000D_")
    if len(s) > MAX_TEXT:
        tail = f" … (cut: the text has {len(value):,} characters)"
        s = s[: MAX_TEXT - len(tail)] + tail
    return s


def quote_sheet(name: str) -> str:
    """A sheet name as it appears in a reference: quoted when it is not a plain word."""
    if re.fullmatch(r"[A-Za-z_][A-Za-z0-9_]*", name) and not re.fullmatch(r"[A-Za-z]{1,3}[0-9]+", name):
        return name
    return "'" + name.replace("'", "''") + "'"


def cell_ref(sheet: str, row: int, col: int, absolute: bool = True) -> str:
    """``Sheet!$C$5`` (1-based row and column)."""
    d = "$" if absolute else ""
    return f"{quote_sheet(sheet)}!{d}{get_column_letter(col)}{d}{row}"


def is_number(v: Any) -> bool:
    return isinstance(v, (int, float, np.integer, np.floating, Fraction, Decimal)) and not isinstance(
        v, (bool, np.bool_)
    )


@dataclass
class _Cell:
    value: Any
    style: Style
    comment: str | None


@dataclass
class Grid:
    """One sheet laid out in memory: ``put`` cells, then :meth:`emit` them in row order."""

    name: str
    cells: dict[tuple[int, int], _Cell] = field(default_factory=dict)
    widths: dict[int, float] = field(default_factory=dict)
    freeze: str | None = None
    conditional: list[tuple[str, Any]] = field(default_factory=list)
    charts: list[tuple[Any, str]] = field(default_factory=list)
    landscape: bool = False
    print_rows: str | None = None
    print_area: str | None = None
    merges: list[tuple[int, int, int, int]] = field(default_factory=list)

    @property
    def max_row(self) -> int:
        return max((r for r, _ in self.cells), default=0)

    def put(self, row: int, col: int, value: Any, style: Style = PLAIN, comment: str | None = None) -> None:
        """Place a value. Numbers stay numbers; inf and NaN become the texts ``infinite`` and
        ``undefined`` with a cell note; ``None`` leaves the cell empty."""
        if is_number(value):
            v = float(value)
            if math.isnan(v):
                value, comment = "undefined", comment or UNDEFINED_NOTE
            elif math.isinf(v):
                value = "infinite" if v > 0 else "minus infinite"
                comment = comment or INFINITE_NOTE
            elif isinstance(value, (np.integer, int)):
                value = int(value)
            else:
                value = v
            if isinstance(value, str):
                style = style.but(halign="right", num=None)
        elif isinstance(value, (bool, np.bool_)):
            value = bool(value)
        elif value is not None and not isinstance(value, (str, Formula)):
            value = str(value)
        self.cells[(row, col)] = _Cell(value, style, comment)

    def put_row(self, row: int, col: int, values: list[Any], styles: list[Style] | Style = PLAIN) -> None:
        for j, v in enumerate(values):
            st = styles[j] if isinstance(styles, list) else styles
            self.put(row, col + j, v, st)

    def merge(self, row: int, col: int, row2: int, col2: int) -> None:
        """Merge a block (its text sits in the top-left cell and wraps across the block)."""
        if (row, col) != (row2, col2):
            self.merges.append((row, col, row2, col2))

    def row_heights(self) -> dict[int, float]:
        """Heights for rows with wrapped text, from the text length and the column widths
        (spreadsheet programs do not size rows of merged cells themselves)."""
        spans = {(r, c): (c2 - c + 1, r2 - r + 1) for r, c, r2, c2 in self.merges}
        heights: dict[int, float] = {}
        for (r, c), cell in self.cells.items():
            st = cell.style
            if not isinstance(cell.value, str):
                continue
            size = st.size or 11.0
            ncols, nrows = spans.get((r, c), (1, 1))
            width = sum(self.widths.get(c + j, 9.0) for j in range(ncols))
            per_line = max(4.0, width * 1.2 * 11.0 / size * (0.9 if st.bold else 1.0))
            if st.wrap:
                lines = sum(_wrapped_lines(part, per_line) for part in cell.value.split("\n"))
            else:
                lines = 1
            h = lines * size * 1.32 + 3.0
            if lines > 1 or size > 11:
                heights[r] = max(heights.get(r, 15.0), h / nrows)
        return heights

    def ref(self, row: int, col: int, absolute: bool = True) -> str:
        return cell_ref(self.name, row, col, absolute)

    def auto_widths(self, minimum: float = 6.0, maximum: float = 60.0, skip: set[int] | None = None) -> None:
        """Size columns from their contents (text length, about 12 characters for numbers)."""
        need: dict[int, float] = {}
        for (r, c), cell in self.cells.items():
            if (skip and c in skip) or r <= 2:  # rows 1-2 hold the sheet's title
                continue
            v = cell.value
            if v is None:
                continue
            if cell.style.wrap:
                if isinstance(v, str) and cell.style.fill:  # a wrapped header: allow two lines
                    words = max((len(w) for w in v.split()), default=0)
                    need[c] = max(need.get(c, 0.0), float(max(words, math.ceil(len(v) / 2))) * 1.1)
                continue
            if isinstance(v, str):
                n = max((len(x) for x in v.split("\n")), default=0)
                if cell.style.bold:
                    n *= 1.1
                if cell.style.size and cell.style.size > 11:
                    n *= cell.style.size / 11.0
                    # a title may run over empty neighbours: do not widen its column for it
                    continue
            elif isinstance(v, Formula):
                n = 12
            elif isinstance(v, bool):
                n = 5
            else:
                n = shown_width(v, cell.style.num)
            need[c] = max(need.get(c, 0.0), n)
        for c, n in need.items():
            if c not in self.widths:
                self.widths[c] = min(max(n + 2, minimum), maximum)

    def fit_numbers(self) -> None:
        """Widen any column too narrow for its numbers as displayed (never show ``###``)."""
        for (r, c), cell in self.cells.items():
            v = cell.value
            if isinstance(v, (int, float)) and not isinstance(v, bool):
                n = shown_width(v, cell.style.num) * (1.1 if cell.style.bold else 1.0) + 2
                spans = [m for m in self.merges if m[0] <= r <= m[2] and m[1] == c]
                if spans:
                    continue
                if self.widths.get(c, 9.0) < n:
                    self.widths[c] = n

    def emit(self, ws: Any, page: Page | None = None) -> None:
        """Write the grid into an empty write-only worksheet (printed as ``page`` says)."""
        self.fit_numbers()
        for c, w in sorted(self.widths.items()):
            ws.column_dimensions[get_column_letter(c)].width = w
        if self.freeze:
            ws.freeze_panes = self.freeze
        setup_print(ws, self.landscape, self.print_rows, page)
        if self.print_area:
            ws.print_area = self.print_area
        for r, h in self.row_heights().items():
            ws.row_dimensions[r].height = round(h, 1)
        for r, c, r2, c2 in self.merges:
            ws.merged_cells.add(f"{get_column_letter(c)}{r}:{get_column_letter(c2)}{r2}")
        by_row: dict[int, list[tuple[int, _Cell]]] = {}
        for (r, c), cell in self.cells.items():
            by_row.setdefault(r, []).append((c, cell))
        for r in range(1, self.max_row + 1):
            entries = sorted(by_row.get(r, []), key=lambda t: t[0])
            row: list[Any] = [None] * (entries[-1][0] if entries else 0)
            for c, cell in entries:
                row[c - 1] = make_cell(ws, cell.value, cell.style, cell.comment)
            ws.append(row)
        for rng, rule in self.conditional:
            ws.conditional_formatting.add(rng, rule)
        for chart, anchor in self.charts:
            ws.add_chart(chart, anchor)


def make_cell(ws: Any, value: Any, style: Style = PLAIN, comment: str | None = None) -> Any:
    """A write-only cell; strings are always text, never formulas."""
    if value is None and style == PLAIN and comment is None:
        return None
    if isinstance(value, Formula):
        cell = WriteOnlyCell(ws, value=value.text)
    elif isinstance(value, str):
        cell = WriteOnlyCell(ws, value=None)
        cell.value = safe_text(value)
        cell.data_type = "s"
    elif isinstance(value, float):
        cell = WriteOnlyCell(ws)
        set_float(cell, value)
    else:
        cell = WriteOnlyCell(ws, value=value)
    if style != PLAIN:
        apply_style(cell, style)
    if comment:
        note = Comment(safe_text(comment), "sheetfuncs")
        note.width, note.height = 260, 90
        cell.comment = note
    return cell


def shown_width(v: float, num: str | None) -> int:
    """Characters a number takes when shown with the number format ``num``."""
    if num is None or num == "General":
        return min(len(repr(v)), 12)
    m = re.fullmatch(r"0(?:\.(0+))?", num)
    if m:
        return len(f"{v:.{len(m.group(1) or '')}f}")
    if "E+" in num:
        return len(num)
    if num.startswith("[<"):  # the p-value format
        return 7
    if num.endswith("%"):
        return len(f"{v * 100:.2f}") + 1
    m = re.fullmatch(r"0\.(#+)", num)
    if m:
        return len(f"{v:.{len(m.group(1))}f}")
    return min(len(repr(v)), 16)


def set_float(cell: Any, value: float) -> None:
    """Store a finite float so that it reads back as the same double.

    openpyxl writes numbers with 16 significant digits, which does not always round-trip;
    the shortest round-trip form (``repr``) always does, and it is a valid number in the file.
    """
    cell._value = repr(value)
    cell.data_type = "n"


@dataclass(frozen=True)
class Page:
    """What every printed page of a report carries: the paper (its code in the file format:
    9 A4, 1 letter), the header's left and right texts and the footer's centre text (header
    and footer codes such as ``&P`` already in place)."""

    paper: int
    left: str
    right: str
    footer: str


def setup_print(ws: Any, landscape: bool, print_rows: str | None, page: Page | None = None) -> None:
    """Printable: fit to one page wide, as many pages tall as needed; with ``page``, its paper,
    header and footer."""
    ws.sheet_properties.pageSetUpPr = PageSetupProperties(fitToPage=True)
    if page is not None:
        ws.page_setup.paperSize = page.paper
        ws.oddHeader.left.text = page.left
        ws.oddHeader.right.text = page.right
        ws.oddFooter.center.text = page.footer
    ws.page_setup.fitToWidth = 1
    ws.page_setup.fitToHeight = 0
    ws.page_setup.orientation = "landscape" if landscape else "portrait"
    ws.print_options.horizontalCentered = False
    if print_rows:
        ws.print_title_rows = print_rows
