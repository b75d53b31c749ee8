"""The Data sheets: the cleaned data in long form, and the log of every input cell not used.

Columns A to D hold, per value, the group number, the group label, the value and its centred
value (the value minus the Audit's centring constant, as the exact decimal difference); columns
F to I log the input cells that were not used (:func:`input_log`: for a file, each entry of
its :class:`~sheetfuncs.input.Reading` with its sheet and address, reason, content and action;
for a range, each cell the range rules noted). Beyond a sheet's row limit both continue on ``Data 2``, ``Data 3``, ... as
:class:`~.data_layout.DataLayout` plans. The rows are streamed straight into write-only
worksheets, so a million values need little memory.
"""

from __future__ import annotations

from collections.abc import Callable, Iterator
from typing import Any

from openpyxl.cell import WriteOnlyCell

from ...input import CellNote, InputSource
from ...stats import centred_values
from ..context import ReportContext
from ..grid import Page, Style, apply_style, make_cell, safe_text, setup_print
from .data_layout import DataLayout
from .styles import TH

__all__ = ["Progress", "input_log", "write_data"]

#: ``progress(stage, done, total)``, called during long work.
Progress = Callable[[str, int, int], None]
#: A logged input cell: (address, kind, content, action).
LogEntry = tuple[str, str, str, str]

_LABEL = Style(halign="left")
_KIND_WORDS = {"text": "text", "logical": "logical value", "error": "error value", "date": "date",
               "nan": "not a number", "other": "other"}
_WIDTHS = (10, 18, 20, 30, 3, 26, 36, 20, 16)
#: Values between two progress reports.
_STEP = 50_000


_ACTIONS = {"missing": "read as missing"}


def input_log(an: ReportContext, source: InputSource | None) -> list[LogEntry]:
    """The log of input cells not used: one entry per left-out block of the reading (a cell the
    range rules noted shows its content), or per noted cell when there is no reading."""
    reading = an.reading
    if reading is None:
        return [(_address(c, source), _KIND_WORDS.get(c.kind, c.kind), _content(c.value), c.action)
                for c in an.groups.cells]
    return [
        (reading.address(x.ref), x.reason,
         x.content or ("1 cell" if len(x.cells) == 1 else f"{len(x.cells)} cells"),
         _ACTIONS.get(x.kind, "left out"))
        for x in reading.left_out
    ]


def write_data(sheets: list[Any], an: ReportContext, layout: DataLayout, log: list[LogEntry],
               progress: Progress | None, page: Page | None = None) -> None:
    """Stream the long-form data and the log of unused input cells (:func:`input_log`) over
    the Data sheets (printed as ``page`` says)."""
    header = _data_header(an)
    vfmt = an.precision.value_format()
    total = layout.n_values
    cap = layout.capacity
    values = _values(an)
    done = 0
    for s, ws in enumerate(sheets):
        _start_sheet(ws, header, page)
        rows_here = min(cap, max(total - s * cap, 0))
        done = _fill_sheet(ws, an, values, log[s * cap:(s + 1) * cap], rows_here, vfmt,
                           done, total, progress)
    if progress is not None:
        progress("data", done, total)


def _data_header(an: ReportContext) -> list[str]:
    unit = f" ({an.unit})" if an.unit else ""
    return [
        "Group no.", an.factor, f"{an.response}{unit}", f"Centred value (value − {an.centre:f})", "",
        "Input cells not used", "Why", "Content", "Action",
    ]


def _address(note: CellNote, source: InputSource | None) -> str:
    if source is not None:
        return source.full_address(note.row, note.col)
    return f"{note.position} of the range"


def _content(value: Any) -> str:
    if isinstance(value, bool):
        return "TRUE" if value else "FALSE"
    if hasattr(value, "isoformat"):  # a date or time, of whatever library the cell came from
        return value.isoformat()
    return value if isinstance(value, str) else repr(value)


def _values(an: ReportContext) -> Iterator[tuple[int, float, float]]:
    """(group index, value, centred value) of every value, in group order."""
    for gi, a in enumerate(an.groups.arrays):
        cen = centred_values(a, an.moments, an.centre)
        yield from ((gi, v, c) for v, c in zip(a.tolist(), cen.tolist()))


def _start_sheet(ws: Any, header: list[str], page: Page | None) -> None:
    """Column widths, frozen header, print set-up and the header row of one Data sheet."""
    for col, w in zip("ABCDEFGHI", _WIDTHS):
        ws.column_dimensions[col].width = w
    ws.freeze_panes = "A2"
    setup_print(ws, True, "1:1", page)
    ws.append([make_cell(ws, h, TH.but(wrap=False, halign="right" if j in (0, 2, 3) else None))
               if h else None for j, h in enumerate(header)])


def _number_cell(ws: Any, fmt: str) -> WriteOnlyCell:
    """A number cell to be reused for every row of a sheet (its value set before each row)."""
    cell = WriteOnlyCell(ws)
    apply_style(cell, Style(num=fmt))
    cell.data_type = "n"
    return cell


def _log_cells(ws: Any, entry: LogEntry) -> list[Any]:
    return [make_cell(ws, x) for x in entry]


def _fill_sheet(ws: Any, an: ReportContext, values: Iterator[tuple[int, float, float]], log: list[LogEntry],
                rows_here: int, vfmt: str, done: int, total: int, progress: Progress | None) -> int:
    """Stream ``rows_here`` values and this sheet's ``log`` entries side by side; returns the
    count of values written so far."""
    # Reused cells must carry a style: openpyxl's streaming writer keeps working on an
    # unstyled cell object after writing it, which would corrupt a reused one.
    # A label is handed over as plain text (the cheapest cell to stream) unless it begins
    # with "=", which openpyxl would take for a formula: that one goes as a styled text cell.
    label_cells = [make_cell(ws, lab, _LABEL) if safe_text(lab).startswith("=") else safe_text(lab)
                   for lab in an.groups.labels]
    vcell = _number_cell(ws, vfmt)
    ccell = _number_cell(ws, vfmt)
    logs_here = len(log)
    append = ws.append
    for i in range(rows_here):
        gi, v, c = next(values)
        vcell._value = repr(v)  # the shortest round-trip form (see grid.set_float)
        ccell._value = repr(c)
        if i < logs_here:
            append([gi + 1, label_cells[gi], vcell, ccell, None, *_log_cells(ws, log[i])])
        else:
            append([gi + 1, label_cells[gi], vcell, ccell])
        done += 1
        if progress is not None and done % _STEP == 0:
            progress("data", done, total)
    for i in range(rows_here, logs_here):
        append([None, None, None, None, None, *_log_cells(ws, log[i])])
    return done
