"""The look of the templates and the pieces every template is built from.

A template is two sheets: the record (header fields, settings, the decision, instructions, the
result areas, the cautions and a sign-off line) and the data sheet (the data block: a defined
name and a spreadsheet table over the same range, with invented example data). A :class:`Page`
writes one sheet from the top down and remembers what it wrote (array areas, decision cells,
named cells), so that the writer can report it and the tests can check it.

Result tables are legacy array formulas over the exact size of their result on the example data
(Calc 7.4 does not spill; array formulas work in every Excel). Every decision cell is guarded by
``ISNUMBER()``: the host compares any text as greater than any number, so an unguarded test on a
message cell would read as a confident answer.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

from openpyxl.styles import Alignment, Border, Font, PatternFill, Side
from openpyxl.utils import get_column_letter
from openpyxl.workbook.defined_name import DefinedName
from openpyxl.worksheet.datavalidation import DataValidation
from openpyxl.worksheet.formula import ArrayFormula
from openpyxl.worksheet.properties import PageSetupProperties
from openpyxl.worksheet.table import Table, TableStyleInfo

from .book import CELLS_MARK  # the mark the filler reads: one spelling

__all__ = [
    "HEADER_FIELDS", "CAUTIONS", "CELLS_MARK", "NUMBER_FORMAT", "SPARE_ROWS_NOTE", "ArrayArea", "Block", "Page",
    "absolute", "write_block", "setup_print",
]

#: The header fields of every template, in the order they are shown.
HEADER_FIELDS = ("Product", "Study", "Date", "Analyst", "Reviewer")

#: The cautions every template shows (see the project guide, Cautions).
CAUTIONS = (
    "Statistics support but do not replace engineering judgement.",
    "Check the assumptions the checks list: independent values, similar spreads, roughly "
    "normal residuals.",
    "Follow your organisation's quality procedures, applicable standards and regulations; "
    "they decide what a result means for the product.",
    "Validate this template and the functions under your organisation's software-validation "
    "procedure before using them for regulated decisions.",
)


SPARE_ROWS_NOTE = ("With fewer groups than the data block has columns, the spare rows of a "
                   "result area show #N/A; that is expected.")

NAVY = "203864"
_THIN = Side(style="thin", color="8EA0BF")
_BOX = Border(left=_THIN, right=_THIN, top=_THIN, bottom=_THIN)
_TITLE = Font(bold=True, size=15, color=NAVY)
_SUB = Font(italic=True, color="5A5A5A")
_SECTION = Font(bold=True, size=12, color=NAVY)
_LABEL = Font(bold=True)
_INPUT_FILL = PatternFill("solid", start_color="FFF6D5", end_color="FFF6D5")
_RESULT_FILL = PatternFill("solid", start_color="EEF2F8", end_color="EEF2F8")
_DECISION_FILL = PatternFill("solid", start_color="E3EFDA", end_color="E3EFDA")
_SECTION_RULE = Border(bottom=Side(style="medium", color=NAVY))
_HEAD_ALIGN = Alignment(wrap_text=True, vertical="bottom")
#: Four decimals, and scientific notation for numbers closer to zero (small p-values).
NUMBER_FORMAT = "[>=0.001]0.0000;[<=-0.001]-0.0000;0.00E+00"


def absolute(sheet: str, first: tuple[int, int], last: tuple[int, int]) -> str:
    """``'Sheet'!$B$8:$F$38`` for the cells from ``first`` to ``last`` (row, column)."""
    a = f"${get_column_letter(first[1])}${first[0]}"
    b = f"${get_column_letter(last[1])}${last[0]}"
    return f"'{sheet}'!{a}:{b}"


def local(first: tuple[int, int], last: tuple[int, int]) -> str:
    """``B8:F38`` for the cells from ``first`` to ``last`` (row, column)."""
    return (f"{get_column_letter(first[1])}{first[0]}:"
            f"{get_column_letter(last[1])}{last[0]}")


@dataclass(frozen=True)
class ArrayArea:
    """One legacy array formula: its sheet, its area (``E5:J8``) and its formula text."""

    sheet: str
    ref: str
    formula: str


@dataclass(frozen=True)
class Block:
    """The data-entry block: defined ``name`` and table ``table`` over the same range.

    ``header`` is its first row (group labels, or the column names of a cells block),
    ``rows`` the number of value rows below it, ``example`` the invented example values (rows,
    at most ``rows`` of them, each at most as wide as the header). ``cells`` marks a block
    whose cells are copied as they are (``comment="sheetfuncs: cells"`` on the name).
    """

    name: str
    table: str
    header: tuple[str, ...]
    rows: int
    example: tuple[tuple[Any, ...], ...]
    cells: bool = False

    def grid(self) -> list[list[Any]]:
        """The block as the host hands it to a function: header row, then every value row
        (blank cells as ``None``), the spare rows included."""
        width = len(self.header)
        body = [list(r) + [None] * (width - len(r)) for r in self.example]
        body += [[None] * width for _ in range(self.rows - len(body))]
        return [list(self.header)] + body


@dataclass
class Page:
    """Writes one sheet from the top down, starting at column B; records what it wrote."""

    ws: Any
    row: int = 1
    arrays: list[ArrayArea] = field(default_factory=list)
    decisions: list[str] = field(default_factory=list)
    names: dict[str, str] = field(default_factory=dict)

    def title(self, text: str, subtitle: str) -> None:
        self.ws.cell(self.row, 2, text).font = _TITLE
        self.ws.cell(self.row + 1, 2, subtitle).font = _SUB
        self.row += 3

    def section(self, text: str, width: int = 8) -> None:
        """A section heading with a rule under it, one blank row above."""
        self.row += 1
        for col in range(2, 2 + width):
            self.ws.cell(self.row, col).border = _SECTION_RULE
        self.ws.cell(self.row, 2, text).font = _SECTION
        self.row += 1

    def lines(self, texts: tuple[str, ...] | list[str], font: Font | None = None) -> None:
        """One text per row from column B (long texts run over the empty cells beside)."""
        for text in texts:
            c = self.ws.cell(self.row, 2, text)
            if font is not None:
                c.font = font
            self.row += 1

    def fields(self, labels: tuple[str, ...]) -> None:
        """Label in column B, an empty input cell over C:E, one row each (the header fields)."""
        for label in labels:
            self.ws.cell(self.row, 2, label).font = _LABEL
            for col in (3, 4, 5):
                cell = self.ws.cell(self.row, col)
                cell.fill, cell.border = _INPUT_FILL, _BOX
            self.ws.merge_cells(start_row=self.row, start_column=3, end_row=self.row, end_column=5)
            self.row += 1

    def setting(self, name: str, label: str, value: Any, hint: str,
                choices: tuple[str, ...] | None = None) -> str:
        """A named input cell (label, value, hint), workbook-scoped name ``name``."""
        self.ws.cell(self.row, 2, label).font = _LABEL
        cell = self.ws.cell(self.row, 3, value)
        cell.fill, cell.border = _INPUT_FILL, _BOX
        self.ws.cell(self.row, 5, hint).font = _SUB
        if choices:
            dv = DataValidation(type="list", formula1='"' + ",".join(choices) + '"',
                                allow_blank=False, showErrorMessage=True)
            dv.error = "Choose one of the listed values."
            self.ws.add_data_validation(dv)
            dv.add(cell.coordinate)
        self.names[name] = f"'{self.ws.title}'!$C${self.row}"
        self.row += 1
        return name

    def skip(self, rows: int) -> int:
        """Leaves ``rows`` rows for later (see :meth:`goto`); returns the first of them."""
        self.row += rows
        return self.row - rows

    def goto(self, row: int) -> int:
        """Moves to ``row`` (a row left by :meth:`skip`); returns the row it left."""
        self.row, left = row, self.row
        return left

    def value(self, label: str, formula: str, hint: str = "", decision: bool = False) -> str:
        """A labelled result cell with a formula (written without ``=``), its hint in column F;
        returns its address (``C12``)."""
        self.ws.cell(self.row, 2, label).font = _LABEL
        cell = self.ws.cell(self.row, 3, "=" + formula)
        cell.fill = _DECISION_FILL if decision else _RESULT_FILL
        cell.border, cell.number_format = _BOX, NUMBER_FORMAT
        if decision:
            cell.font = Font(bold=True, size=12)
            self.decisions.append(cell.coordinate)
        if hint:
            self.ws.cell(self.row, 6, hint).font = _SUB
        self.row += 1
        return cell.coordinate

    def array(self, formula: str, shape: tuple[int, int], col: int = 2) -> tuple[int, int]:
        """A legacy array formula over ``shape`` (rows, columns) from the current row; returns
        the (row, column) of its top-left cell. ``formula`` is written without ``=``."""
        top = (self.row, col)
        bottom = (self.row + shape[0] - 1, col + shape[1] - 1)
        ref = local(top, bottom)
        self.ws.cell(*top).value = ArrayFormula(ref, "=" + formula)
        for r in range(top[0], bottom[0] + 1):
            for c in range(top[1], bottom[1] + 1):
                cell = self.ws.cell(r, c)
                cell.border, cell.fill = _BOX, _RESULT_FILL
                if r == top[0]:
                    cell.font, cell.alignment = _LABEL, _HEAD_ALIGN
                else:
                    cell.number_format = NUMBER_FORMAT
        self.ws.row_dimensions[top[0]].height = 30
        self.arrays.append(ArrayArea(self.ws.title, ref, formula))
        self.row = bottom[0] + 1
        return top


def write_block(page: Page, block: Block, label_note: str) -> str:
    """Writes the block from column B at the page's row: header, example values, spare rows;
    defines its name and its table over exactly the same range. Returns the absolute range."""
    ws = page.ws
    page.lines([label_note], _SUB)
    top = page.row
    for j, text in enumerate(block.header):
        cell = ws.cell(top, 2 + j, text)
        cell.font, cell.border = _LABEL, _BOX
    for i, values in enumerate(block.grid()[1:], start=1):
        for j, v in enumerate(values):
            cell = ws.cell(top + i, 2 + j, v)
            cell.fill, cell.border = _INPUT_FILL, _BOX
    last = (top + block.rows, 1 + len(block.header))
    ref = absolute(ws.title, (top, 2), last)
    dn = DefinedName(block.name, attr_text=ref)
    if block.cells:
        dn.comment = CELLS_MARK
    ws.parent.defined_names[block.name] = dn
    table = Table(displayName=block.table, ref=local((top, 2), last))
    table.tableStyleInfo = TableStyleInfo(name="TableStyleLight9", showRowStripes=True)
    ws.add_table(table)
    page.row = last[0] + 1
    return ref


def setup_print(ws: Any, title: str, last_col: int, landscape: bool) -> None:
    """A4, fit to one page wide, print area, header with the title and footer with page
    numbers; narrow column A, wider label column B."""
    ws.sheet_properties.pageSetUpPr = PageSetupProperties(fitToPage=True)
    ws.page_setup.paperSize = ws.PAPERSIZE_A4
    ws.page_setup.orientation = "landscape" if landscape else "portrait"
    ws.page_setup.fitToWidth = 1
    ws.page_setup.fitToHeight = 0
    ws.print_area = local((1, 1), (max(ws.max_row, 1), last_col))
    ws.oddHeader.left.text = title
    ws.oddHeader.right.text = "&A"
    ws.oddFooter.left.text = "&F"
    ws.oddFooter.right.text = "Page &P of &N"
    ws.column_dimensions["A"].width = 2
    ws.column_dimensions["B"].width = 26
    for col in range(3, last_col + 1):
        ws.column_dimensions[get_column_letter(col)].width = 20 if col == 3 else 14
    ws.sheet_view.showGridLines = False
