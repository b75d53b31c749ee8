"""Input files: a block of cells from an ``.xlsx``/``.xlsm`` workbook or a ``.csv`` file.

The readers only fetch cells; every block then goes through
:func:`sheetfuncs.input.ranges.groups_from_range`, so a file read here is cleaned by exactly the
same rules as a range handed to a worksheet function.

This module holds the entry points: :func:`input_kind`, :func:`read_cells` and
:func:`read_groups`. The work is done by :mod:`.safety` (the checks before anything is parsed),
:mod:`.xlsx` (workbooks and their document properties), :mod:`.delimited` (CSV files and the
number grammar of their fields) and :mod:`.block` (the block of cells both readers return).
"""

from __future__ import annotations

import os
from dataclasses import dataclass, replace
from pathlib import Path
from typing import TYPE_CHECKING, Any, TypedDict

from ...errors import InputError
from ..cells import RangeRef, a1_range, cell_position, error_text, is_error_text, parse_range
from ..groups import Groups
from ..labels import relabel
from ..ranges import groups_from_range, parse_labels, parse_layout
from ..reading import LeftOut, Reading, cell_content, sheet_ref
from ..source import InputSource
from .block import CellBlock, Progress, is_blank
from .delimited import read_delimited
from .detect import detect
from .filetype import CSV_SUFFIXES, WORKBOOK_SUFFIXES, file_type
from .formulas import read_formulas
from .safety import DEFAULT_SIZE_LIMIT
from .sheetcells import SheetCells, check_area, runs_from_rows
from .xlsx import check_formulas, read_sheet, read_workbook

if TYPE_CHECKING:
    from typing_extensions import Unpack

__all__ = [
    "same_file",
    "WORKBOOK_SUFFIXES",
    "CSV_SUFFIXES",
    "DEFAULT_MAX_CELLS",
    "DEFAULT_MAX_FIELDS",
    "LoadedGroups",
    "ReadOptions",
    "input_kind",
    "read_cells",
    "read_groups",
]

#: Default limit on the cells read from one file (``--max-cells``).
DEFAULT_MAX_CELLS = 20_000_000
#: Default limit on the fields of one CSV line (``--max-fields``), as many as a sheet has columns.
DEFAULT_MAX_FIELDS = 16_384


@dataclass(frozen=True)
class LoadedGroups:
    """Groups cleaned from a file's block of cells, with the block they came from."""

    groups: Groups
    block: CellBlock
    reading: Reading

    @property
    def source(self) -> InputSource:
        return self.block.source


class ReadOptions(TypedDict, total=False):
    """The keyword arguments of :func:`read_cells`, which :func:`read_groups` passes on."""

    sheet: str | None
    cell_range: str | None
    decimal_comma: bool
    delimiter: str | None
    size_limit: int
    max_cells: int
    max_fields: int
    progress: Progress | None


def input_kind(path: str | os.PathLike[str]) -> str:
    """``"workbook"`` or ``"csv"``, judged by the file's first bytes (by its name when it does not
    exist); an InputError for anything else (see :mod:`.filetype`)."""
    return file_type(Path(path))[0]


def read_cells(
    path: str | os.PathLike[str],
    *,
    sheet: str | None = None,
    cell_range: str | None = None,
    decimal_comma: bool = False,
    delimiter: str | None = None,
    size_limit: int = DEFAULT_SIZE_LIMIT,
    max_cells: int = DEFAULT_MAX_CELLS,
    max_fields: int = DEFAULT_MAX_FIELDS,
    progress: Progress | None = None,
) -> CellBlock:
    """Read a block of saved cell values from a workbook or a CSV file.

    ``sheet`` names the worksheet (default: the first worksheet; CSV files have none);
    ``cell_range`` is an A1 reference (``A1:F40``, ``B:E``, ``'Sheet 2'!B2:E30``) or, in a
    workbook, a defined name; without it the block is the sheet's used range (from its first
    to its last non-blank row and column). ``decimal_comma`` and ``delimiter`` apply to CSV
    files. ``size_limit`` is in bytes; ``max_cells`` limits the cells read (the cells present
    in a workbook, the block's area for a range), ``max_fields`` the fields of one CSV line. ``progress(stage, done, total)`` is called while cells
    are read (``done`` and ``total`` count cells; ``total`` is 0 when unknown).
    """
    p = Path(path)
    kind, notes = _file_kind(p)
    if size_limit is None or size_limit <= 0:
        raise InputError("the size limit must be a positive number of bytes")
    ref, name, shown = _range_argument(cell_range)
    sheet = _sheet_argument(sheet, ref)
    try:
        if kind == "workbook":
            block = read_workbook(p, sheet, ref, name, size_limit, progress, shown, max_cells)
            return replace(block, notes=notes + block.notes) if notes else block
        if sheet is not None:
            raise InputError(
                f"{p.name} is a CSV file, which has no sheets; leave out the sheet"
            )
        if name is not None:
            raise InputError(
                f'"{name}" is not a range like A1:F40, and a CSV file has no '
                "defined names"
            )
        return read_delimited(
            p, ref, decimal_comma, delimiter, size_limit, progress, shown, max_fields, max_cells
        )
    except PermissionError:
        raise InputError(
            f"no permission to read {p}; check the file's access rights"
        ) from None
    except IsADirectoryError:
        raise InputError(f"{p} is a folder, not a file") from None


def _file_kind(p: Path) -> tuple[str, tuple[str, ...]]:
    """The kind of an existing file, judged by its content, and notes on it (a workbook under
    another name); a folder or a missing file is an InputError."""
    if p.is_dir():
        raise InputError(f"{p} is a folder, not a file; give the file to read")
    kind, notes = file_type(p)
    if not p.exists():
        raise InputError(f"{p} does not exist; check the file name and folder")
    return kind, notes


def _range_argument(cell_range: str | None) -> tuple[RangeRef | None, str | None, str | None]:
    """``(reference, defined name, text as given)`` of the ``cell_range`` argument."""
    text = cell_range.strip() if cell_range is not None else ""
    if not text:
        return None, None, None
    ref = parse_range(text)
    return ref, (text if ref is None else None), text


def _sheet_argument(sheet: str | None, ref: RangeRef | None) -> str | None:
    """The sheet to read: the one the range names, which must agree with ``sheet`` if given."""
    if ref is None or ref.sheet is None:
        return sheet
    if sheet is not None and sheet.strip().casefold() != ref.sheet.casefold():
        raise InputError(
            f'the range names sheet "{ref.sheet}" but the sheet option says '
            f'"{sheet}"; give the sheet once'
        )
    return ref.sheet


def read_groups(
    path: str | os.PathLike[str],
    *,
    layout: str = "wide",
    labels: Any = "auto",
    errors: str = "stop",
    merge_case: bool = False,
    rename: Any = None,
    **options: Unpack[ReadOptions],
) -> LoadedGroups:
    """Read a file's data and clean it with ``groups_from_range``.

    With a range (``cell_range``), the range is read (see :func:`read_cells`, whose keyword
    arguments ``options`` are) and only the range rules apply. Without one, the data block is
    found as an analyst finds it (:mod:`.detect`): title and note rows, a units row,
    identifier columns, summary rows and columns, sign-off lines and other blocks are left out,
    each with its address and reason in the :class:`Reading`; when the reading is not certain,
    an InputError says what was seen and which ``--range`` or ``--labels`` to give.

    ``errors`` (``"stop"`` or ``"missing"``) is passed to ``groups_from_range``;
    ``merge_case`` and ``rename`` (a mapping or ``OLD=NEW`` texts) fix labels afterwards
    (:func:`sheetfuncs.input.labels.relabel`). A cleaning error that points at cells gets the
    first cell's sheet address and the file name added, e.g. ``... (cell 'Lot data'!C7 of
    lots.xlsx)``.
    """
    given = options.get("cell_range")
    if given is not None and str(given).strip():
        block = read_cells(path, **options)
        groups = _clean(path, block, layout, labels, errors)
        reading = range_reading(block, groups)
        reading = replace(reading, notes=block.notes + reading.notes)
    else:
        block, groups, reading = _read_detected(path, layout, labels, errors, options)
    fixed = relabel(groups, merge_case=merge_case, rename=rename)
    if fixed is not groups:  # the reading's notes on labels follow the fixed labels
        old = set(groups.notes)
        reading = replace(reading, notes=tuple(n for n in reading.notes if n not in old) + fixed.notes)
    return LoadedGroups(groups=fixed, block=block, reading=reading)


def _read_detected(
    path: str | os.PathLike[str], layout: Any, labels: Any, errors: str, options: dict[str, Any]
) -> tuple[CellBlock, Groups, Reading]:
    """A file read without a range: its cells, the block found, the groups and the reading."""
    lay, lab = parse_layout(layout), parse_labels(labels)
    cells = _sheet_cells(path, options)
    p = Path(path)
    formulas = None
    if cells.kind == "workbook":
        title = cells.source.sheet or ""
        formulas = lambda t, l, b, r: read_formulas(p, title, t, l, b, r)  # noqa: E731
    found = detect(cells, lay, lab, formulas)
    limit = options.get("max_cells") or DEFAULT_MAX_CELLS
    if found is None:  # no numbers anywhere: the used range, whose rules say what is wrong
        bounds = cells.bounds()
        assert bounds is not None
        top, left, bottom, right = bounds
        check_area(f"the used range {_named(cells, a1_range(*bounds[:2], *bounds[2:]))}",
                   bottom - top + 1, right - left + 1, limit)
        block = cells.block(top, left, bottom, right)
        groups = _clean(path, block, layout, labels, errors)
        reading = range_reading(block, groups)
        return block, groups, replace(reading, notes=cells.notes + reading.notes)
    where = _named(cells, a1_range(found.top, found.left, found.bottom, found.right))
    check_area(f"the table {where}", found.bottom - found.top + 1, found.right - found.left + 1, limit)
    block = cells.block(found.top, found.left, found.bottom, found.right, found.blanked)
    inside = [(r, c) for r, c in cells.suspects if found.top <= r <= found.bottom
              and found.left <= c <= found.right and (r, c) not in found.blanked]
    if inside:
        check_formulas(p, cells.source.sheet or "", inside, block.source)
    groups = _clean(path, block, lay, found.labels, errors, found=True)
    base = range_reading(block, groups)
    left_out = found.left_out + base.left_out
    n_out = sum(len(x.cells) for x in left_out)
    reading = Reading(
        path=base.path, sheet=base.sheet, block=block.ref, detected=True, cells_read=cells.n_cells,
        cells_used=cells.n_cells - n_out, left_out=left_out,
        notes=cells.notes + found.notes + base.notes, missing=base.missing,
    )
    return block, groups, reading


def _named(cells: SheetCells, ref: str) -> str:
    """A reference with its sheet (a CSV file's name when it has none)."""
    if cells.source.sheet:
        return sheet_ref(cells.source.sheet, ref)
    return f"{ref} of {Path(cells.source.path or '').name}"


def _sheet_cells(path: str | os.PathLike[str], options: dict[str, Any]) -> SheetCells:
    """The cells of the sheet (or CSV file) read without a range."""
    p = Path(path)
    kind, notes = _file_kind(p)
    if kind != "workbook":
        block = read_cells(path, **options)
        runs, count = runs_from_rows(block.rows, block.source.first_row, block.source.first_col)
        source = InputSource(path=block.source.path, sheet=block.source.sheet)
        return SheetCells(runs=tuple(runs), source=source, kind=block.kind, n_cells=count,
                          delimiter=block.delimiter, notes=tuple(getattr(block, "notes", ())))
    size_limit = options.get("size_limit", DEFAULT_SIZE_LIMIT)
    if size_limit is None or size_limit <= 0:
        raise InputError("the size limit must be a positive number of bytes")
    try:
        cells, _ = read_sheet(p, options.get("sheet"), None, None, size_limit, options.get("progress"),
                              None, options.get("max_cells") or DEFAULT_MAX_CELLS)
    except PermissionError:
        raise InputError(f"no permission to read {p}; check the file's access rights") from None
    if not cells.runs and not cells.suspects:
        title = cells.source.sheet
        raise InputError(
            f'sheet "{title}" of {p.name} is empty; choose the sheet that holds the data'
            + (" (--sheet)" if cells.n_sheets > 1 else "")
        )
    return replace(cells, notes=notes + cells.notes) if notes else cells


def _clean(path: str | os.PathLike[str], block: CellBlock, layout: Any, labels: Any, errors: str,
           found: bool = False) -> Groups:
    """``groups_from_range`` on a block, its messages given the sheet address and file name
    (for a block ``found`` on the sheet, in place of a position in a range nobody gave)."""
    if layout in ("wide", "long") and block.n_rows == 1 and all(
        isinstance(v, str) and not is_error_text(v) for v in block.rows[0] if not is_blank(v)
    ):
        raise InputError(
            f"{_where(block)} holds only a row of labels and no values; check that "
            "it is the right file (or range) and that the data were saved"
        )
    try:
        return groups_from_range(block.rows, layout=layout, labels=labels, errors=errors,
                                 unlabelled="log")
    except InputError as e:
        if e.cells:
            r, c = e.cells[0]
            where = block.source.full_address(r, c)
            hint = ""
            if errors == "stop" and r < block.n_rows and c < len(block.rows[r]) and \
                    error_text(block.rows[r][c]) is not None and "label" not in e.reason:
                hint = ("; or, to read error cells as missing values, give --errors missing "
                        '(Python: errors="missing")')
            at = f"{cell_position(r, c)} of the range"
            if found and at in e.reason:
                reason = e.reason.replace(at, f"{where} of {Path(path).name}", 1)
                raise InputError(reason + hint, cells=e.cells) from None
            raise InputError(
                f"{e.reason} (cell {where} of {Path(path).name}){hint}", cells=e.cells
            ) from None
        msg = e.reason
        if Path(path).name not in msg:
            msg = f"{msg} (in {_where(block)})"
        raise InputError(msg, cells=e.cells) from None


#: What a cell noted by the range rules is, as a reason to leave it out.
NOTE_REASONS = {
    "text": "text in the data",
    "logical": "logical value in the data",
    "error": "error value, read as a missing value",
    "label-only": "label without a value",
    "unlabelled": "value without a label",
}


def range_reading(block: CellBlock, groups: Groups) -> Reading:
    """The account of a block read as a whole (a range given, or a block found): every
    non-blank cell is a value, a label, or a cell the range rules noted."""
    src = block.source
    read = sum(len(row) - row.count(None) - row.count("") for row in block.rows)
    left = tuple(
        LeftOut.of(
            [(src.first_row + note.row, src.first_col + note.col)],
            NOTE_REASONS.get(note.kind, NOTE_REASONS["text"]),
            "missing" if note.action == "missing" else note.kind,
            str(note.value) if note.kind == "error" else cell_content(note.value),
        )
        for note in groups.cells if note.action != "rejected"
    )
    out = sum(len(x.cells) for x in left)
    missing = sum(1 for n in groups.cells if n.action == "missing")
    return Reading(
        path=src.path, sheet=src.sheet, block=block.ref, detected=False, cells_read=read,
        cells_used=read - out, left_out=left, notes=groups.notes, missing=missing,
    )


def _where(block: CellBlock) -> str:
    name = Path(block.source.path or "").name
    if block.source.sheet:
        return f"{block.ref} of sheet \"{block.source.sheet}\" in {name}"
    return f"{block.ref} of {name}" if block.ref else name


def same_file(a: Path, b: Path) -> bool:
    """Whether two paths name the same file: one file on disk, or the same full path (so that a
    file not written yet still counts). Used to keep an output from overwriting an input."""
    try:
        if a.exists() and b.exists():
            return os.path.samefile(a, b)
    except OSError:
        pass
    return os.path.normcase(str(a.resolve())) == os.path.normcase(str(b.resolve()))
