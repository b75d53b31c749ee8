"""Workbooks (``.xlsx``, ``.xlsm``): the saved values of a block of cells, and the document properties.

Read with openpyxl in read-only mode with ``data_only=True``: the values the spreadsheet
program saved, never the formulas; macros are neither run nor loaded (``keep_vba=False``). The
file first passes :func:`.safety.check_archive`, and workbooks are read only while openpyxl parses
through defusedxml. The sheet is the one named (matched case-insensitively) or the first
worksheet; the range is an A1 reference, a defined name, or the sheet's used range. A formula
cell that has no saved value (a file written by a program that does not calculate) is an error
naming its address, never a blank. The document properties part is found through the package
relationships (ECMA-376 Part 2) and parsed with defusedxml.
"""

from __future__ import annotations

import datetime as _dt
import io
import os
import warnings
import zipfile
import zlib
from collections.abc import Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from ...errors import InputError
from ..cells import RangeRef, a1_range, parse_range
from ..source import InputSource
from .block import PROGRESS_STEP, CellBlock, Progress
from .filetype import WORKBOOK_SUFFIXES
from .formulas import scan_sheet
from .sheetcells import Run, SheetCells, check_area, run_of
from .tables import table_range, workbook_tables
from .safety import (
    DEFAULT_SIZE_LIMIT, bomb_message, check_archive, damaged_error, defusedxml_refused,
    openpyxl_uses_defusedxml,
)

__all__ = ["WorkbookCells", "check_formulas", "range_bounds", "read_sheet", "read_workbook", "workbook_properties"]

_NONE = type(None)
_TEXT_TYPES = ("s", "str", "inlineStr")
_EXACT_INT = 2**53


# --------------------------------------------------------------------------------------------
# opening a workbook, choosing the sheet and the range


def _open_workbook(p: Path, data_only: bool):
    import openpyxl

    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        try:
            # openpyxl goes by the name: a workbook under another name is handed over in memory
            source = p if p.suffix.lower() in WORKBOOK_SUFFIXES else io.BytesIO(p.read_bytes())
            return openpyxl.load_workbook(
                source, read_only=True, data_only=data_only, keep_vba=False, keep_links=False
            )
        except InputError:
            raise
        except Exception as e:
            if defusedxml_refused(e):
                raise InputError(bomb_message(p.name, "a workbook part")) from None
            raise damaged_error(p.name, e) from None


def _sheet_list(names: Sequence[str]) -> str:
    shown = ", ".join(f'"{n}"' for n in names[:12])
    return shown + (f" and {len(names) - 12} more" if len(names) > 12 else "")


def _pick_sheet(wb, p: Path, sheet: str | None):
    worksheets = list(wb.worksheets)
    if sheet is None:
        if not worksheets:
            raise InputError(f"{p.name} has no worksheets (only chart sheets)")
        return worksheets[0]
    want = sheet.strip()
    if len(want) >= 2 and want[0] == want[-1] == "'":
        want = want[1:-1].replace("''", "'")
    by_name = {ws.title: ws for ws in worksheets}
    if want in by_name:
        return by_name[want]
    folded = [ws for ws in worksheets if ws.title.casefold() == want.casefold()]
    if len(folded) == 1:
        return folded[0]
    if want in wb.sheetnames:
        raise InputError(
            f'"{want}" in {p.name} is a chart sheet, not a worksheet; choose a '
            f"sheet with data: {_sheet_list([ws.title for ws in worksheets])}"
        )
    raise InputError(
        f'{p.name} has no sheet named "{want}"; its sheets are '
        f"{_sheet_list([ws.title for ws in worksheets])}"
    )


def _named_range(wb, p: Path, name: str, sheet: str | None) -> tuple[RangeRef, tuple[str, ...]]:
    """The cells a defined name or a spreadsheet table (``FillWeights``, ``FillWeights[#All]``,
    ``FillWeights[#Data]``, see :mod:`.tables`) refers to, with notes; the sheet they are on
    must agree with ``sheet`` when it is given."""
    names = _defined_names(wb)
    dn = None
    if "[" not in name:
        dn = names.get(name) or next(
            (v for k, v in names.items() if k.casefold() == name.casefold()), None)
    if dn is not None:
        ref, notes, what = _defined_range(p, name, dn), (), f'the name "{name}"'
    else:
        tables = workbook_tables(p)
        found = table_range(tables, name, p.name)
        if found is None:
            raise InputError(_unknown_name(p, name, list(names), [t.name for t in tables]))
        table, ref, notes = found
        what = f'the table "{table.name}"'
    if sheet is not None and sheet.strip().casefold() != (ref.sheet or "").casefold():
        raise InputError(
            f'{what} is on sheet "{ref.sheet}", not "{sheet.strip()}"; leave out the '
            "sheet (--sheet) or give an A1 range"
        )
    return ref, notes


def _defined_names(wb) -> dict:
    try:
        return dict(wb.defined_names.items())
    except Exception:  # unusual defined-name tables: treat as absent
        return {}


def _unknown_name(p: Path, name: str, names: list[str], tables: list[str]) -> str:
    """The message for a range that is neither A1 nor a name of the workbook."""
    known = [f'"{n}"' for n in names if not n.startswith("_xlnm.")][:8]
    known += [f'"{t}" (table)' for t in tables[:8]]
    has = f", which has {', '.join(known)}" if known else ", which has no names or tables"
    return (
        f'"{name}" is neither a range like A1:F40 nor a name or table in '
        f"{p.name}{has}; check the range"
    )


def _defined_range(p: Path, name: str, dn) -> RangeRef:
    try:
        dests = list(dn.destinations)
    except Exception:
        dests = []
    if len(dests) != 1:
        raise InputError(
            f'the name "{name}" in {p.name} does not refer to one block of cells; '
            "give the range as A1:F40"
        )
    sheet_name, cells = dests[0]
    ref = parse_range(cells)
    if ref is None:
        raise InputError(f'cannot read the cells "{cells}" that "{name}" refers to')
    return RangeRef(ref.min_row, ref.min_col, ref.max_row, ref.max_col,
                    sheet_name.replace("''", "'"))


def _sheet_prefix(title: str) -> str:
    """``'Lot data'!``: a sheet name as it precedes a reference (quoted, as in addresses)."""
    return "'" + title.replace("'", "''") + "'!"


def _addr(sheet: str | None, row: int, col: int) -> str:
    return InputSource(sheet=sheet).full_address(row - 1, col - 1)


# --------------------------------------------------------------------------------------------
# reading the block


def read_workbook(
    p: Path,
    sheet: str | None,
    ref: RangeRef | None,
    name: str | None,
    size_limit: int,
    progress: Progress | None,
    shown: str | None = None,
    max_cells: int | None = None,
) -> CellBlock:
    """The block of saved values of a workbook's sheet.

    ``ref`` is the range (``None``: the used range) or ``name`` a defined name; ``shown`` the
    range as the user gave it, for messages; ``max_cells`` limits the non-blank cells read and
    the block's area. See :func:`.reader.read_cells`.
    """
    cells, ref = read_sheet(p, sheet, ref, name, size_limit, progress, shown, max_cells)
    bounds = range_bounds(cells, ref)
    title = cells.source.sheet or ""
    if bounds is None:
        raise InputError(_empty_message(p, title, ref, name, shown, cells.n_sheets))
    top, left, bottom, right = bounds
    what = _what(p, title, ref, name, shown, top, left, bottom, right)
    check_area(what, bottom - top + 1, right - left + 1, max_cells or DEFAULT_MAX_AREA)
    block = cells.block(top, left, bottom, right)
    inside = [(r, c) for r, c in cells.suspects if top <= r <= bottom and left <= c <= right]
    if inside:
        check_formulas(p, title, inside, block.source)
    return block


#: The area limit when none is given (the reader's default ``max_cells``).
DEFAULT_MAX_AREA = 20_000_000


def range_bounds(cells: WorkbookCells, ref: RangeRef | None) -> tuple[int, int, int, int] | None:
    """``(top, left, bottom, right)`` of the block a range (or the used range) reads.

    The used range loses its blank margins on all four sides; a range keeps its top-left
    corner (and its right edge when it has one) and loses trailing blank rows, as the host
    hands a range over.
    """
    b = cells.bounds()
    if b is None:
        return None
    if ref is None:
        return b
    right = ref.max_col if ref.max_col is not None else b[3]
    return ref.min_row, ref.min_col, b[2], right


def _what(p: Path, title: str, ref: RangeRef | None, name: str | None, shown: str | None,
          top: int, left: int, bottom: int, right: int) -> str:
    """How the area message names the block read."""
    a1 = a1_range(top, left, bottom, right)
    if ref is None:
        return f'the used range {a1} of sheet "{title}" in {p.name}'
    if name is not None:
        return f'the name "{name}" ({_sheet_prefix(title)}{a1})'
    return f'the range {shown if shown and ref.sheet else (shown or a1)} of sheet "{title}"'


@dataclass(frozen=True)
class WorkbookCells(SheetCells):
    """A workbook sheet's cells, with the number of sheets of its workbook (for messages)."""

    n_sheets: int = 1


def read_sheet(
    p: Path,
    sheet: str | None,
    ref: RangeRef | None,
    name: str | None,
    size_limit: int,
    progress: Progress | None,
    shown: str | None = None,
    max_cells: int | None = None,
) -> tuple[WorkbookCells, RangeRef | None]:
    """The non-blank cells of a workbook's sheet (inside ``ref`` or the defined ``name`` when
    given), and the range read. Without a range, the sheet part is also scanned for formulas
    and hidden rows (for block detection)."""
    if not openpyxl_uses_defusedxml():
        raise InputError(
            "openpyxl is not parsing through defusedxml (is the environment "
            "variable OPENPYXL_DEFUSEDXML set to False?); unset it so that workbooks are read "
            "safely"
        )
    check_archive(p, size_limit)
    wb = _open_workbook(p, data_only=True)
    try:
        notes: tuple[str, ...] = ()
        if name is not None:
            ref, notes = _named_range(wb, p, name, sheet)
            sheet = ref.sheet
        ws = _pick_sheet(wb, p, sheet)
        runs, suspects, count = _read_sheet(ws, ref, progress, p.name, max_cells)
        title = ws.title
        n_sheets = len(wb.sheetnames)
    finally:
        wb.close()
    has_formulas, hidden = (False, frozenset())
    if ref is None and name is None and runs:
        has_formulas, hidden = scan_sheet(p, title)
    source = InputSource(path=str(p), sheet=title)
    return WorkbookCells(
        runs=tuple(runs), source=source, kind="workbook", n_cells=count, suspects=tuple(suspects),
        hidden=hidden, has_formulas=has_formulas, n_sheets=n_sheets, notes=notes,
    ), ref


def _empty_message(
    p: Path, title: str, ref: RangeRef | None, name: str | None, shown: str | None, n_sheets: int
) -> str:
    """What to say when the sheet, or the range or name given, holds no cells."""
    if ref is None:
        return (
            f'sheet "{title}" of {p.name} is empty; choose the sheet that holds '
            "the data"
            + (" (--sheet)" if n_sheets > 1 else "")
        )
    if name is not None:
        what = f'the name "{name}" ({_sheet_prefix(title)}{ref.a1()})'
    elif shown is not None and ref.sheet is not None:
        what = f"the range {shown}"
    else:
        what = f'the range {shown or ref.a1()} of sheet "{title}"'
    return f"{what} in {p.name} is empty; check the range"


def _read_sheet(ws, ref: RangeRef | None, progress: Progress | None, file_name: str,
                max_cells: int | None):
    """:func:`_sheet_rows`, with a parser's failure turned into one line."""
    known = ws.max_row, ws.max_column
    try:
        return _sheet_rows(ws, ref, known, progress, file_name, max_cells)
    except InputError:
        raise
    except Exception as e:
        if defusedxml_refused(e):
            raise InputError(bomb_message(file_name, f'sheet "{ws.title}"')) from None
        raise damaged_error(file_name, e) from None


def _progress_total(known: tuple[Any, Any], ref: RangeRef | None) -> int:
    """The cells the sheet's dimension record claims (for progress only; never trusted)."""
    known_rows, known_cols = known
    if not (known_rows and known_cols):
        return 0
    r1 = ref.min_row if ref else 1
    c1 = ref.min_col if ref else 1
    r2 = ref.max_row if ref else None
    c2 = ref.max_col if ref else None
    total = (min(known_rows, r2 or known_rows) - r1 + 1) * (min(known_cols, c2 or known_cols) - c1 + 1)
    return max(min(total, 10**9), 0)


def _sheet_rows(ws, ref: RangeRef | None, known, progress: Progress | None, file_name: str,
                max_cells: int | None):
    """Runs of saved values (see :mod:`.sheetcells`), cells that exist but hold nothing
    (possible formulas), and the count of non-blank cells.

    Length: one pass over openpyxl's rows, kept in one loop for speed (every cell of a large
    sheet passes through it)."""
    from openpyxl.cell.read_only import EmptyCell

    ws.reset_dimensions()  # dimension records are often wrong: read what is there
    r1 = ref.min_row if ref else 1
    c1 = ref.min_col if ref else 1
    r2 = ref.max_row if ref else None
    c2 = ref.max_col if ref else None
    limit = max_cells or DEFAULT_MAX_AREA
    total = _progress_total(known, ref)
    runs: list[Run] = []
    suspects: list[tuple[int, int]] = []  # 1-based sheet (row, col)
    done = next_report = count = 0
    if progress is not None:
        progress("reading", 0, total)
    r = r1 - 1
    gap = None  # openpyxl hands every missing row as one shared tuple of empty cells
    for cells in ws.iter_rows(min_row=r1, max_row=None, min_col=c1, max_col=c2):
        r += 1
        if r2 is not None and r > r2:
            break
        if not cells or cells is gap:
            continue
        if type(cells[0]) is EmptyCell and type(cells[-1]) is EmptyCell and all(
            type(c) is EmptyCell for c in cells
        ):
            gap = cells
            continue
        vals = [cell.value for cell in cells]
        types = set(map(type, vals))
        if _NONE in types:  # cells that exist but hold nothing may be unsaved formulas
            for j, v in enumerate(vals):
                if v is None:
                    cell = cells[j]
                    if not isinstance(cell, EmptyCell) and cell.data_type not in _TEXT_TYPES:
                        suspects.append((r, c1 + j))
        if _dt.timedelta in types:
            j = next(j for j, v in enumerate(vals) if isinstance(v, _dt.timedelta))
            raise InputError(
                f"a duration (time) value at {_addr(ws.title, r, c1 + j)} of "
                f"{file_name}; durations are not read as measurements: convert them to "
                "numbers (e.g. minutes) in the sheet"
            )
        if int in types:  # whole numbers saved without a decimal point: the same doubles
            vals = [float(v) if type(v) is int and abs(v) <= _EXACT_INT else v for v in vals]
        run = run_of(r, c1, vals)
        if run is not None:
            runs.append(run)
            count += len(run[2]) - run[2].count(None) - run[2].count("")
            if count > limit:
                raise InputError(
                    f'sheet "{ws.title}" of {file_name} holds more than {limit:,} non-blank cells '
                    "(the limit); give a --range or raise --max-cells"
                )
        done += len(vals)
        if progress is not None and done >= next_report:
            progress("reading", done, total)
            next_report = done + PROGRESS_STEP
    if progress is not None:
        progress("reading", done, max(total, done))
    return runs, suspects, count


# --------------------------------------------------------------------------------------------
# formula cells without saved values


def check_formulas(p: Path, title: str, suspects: list[tuple[int, int]], source: InputSource) -> None:
    """Cells that exist but have no saved value: are they formulas? Then stop with an error."""
    from openpyxl.worksheet.formula import ArrayFormula, DataTableFormula

    want = set(suspects)
    lo = min(r for r, _ in suspects)
    hi = max(r for r, _ in suspects)
    c_lo = min(c for _, c in suspects)
    c_hi = max(c for _, c in suspects)
    wb = _open_workbook(p, data_only=False)
    found: list[tuple[int, int]] = []
    try:
        ws = wb[title]
        ws.reset_dimensions()
        r = lo - 1
        for cells in ws.iter_rows(min_row=lo, max_row=None, min_col=c_lo, max_col=c_hi):
            r += 1
            if r > hi:
                break
            for j, cell in enumerate(cells):
                if (r, c_lo + j) not in want:
                    continue
                v = getattr(cell, "value", None)
                if isinstance(v, (ArrayFormula, DataTableFormula)) or (
                    isinstance(v, str) and v.startswith("=")
                ):
                    found.append((r, c_lo + j))
    except InputError:
        raise
    except Exception as e:
        raise damaged_error(p.name, e) from None
    finally:
        wb.close()
    if found:
        first = found[0]
        more = f" (and {len(found) - 1} more)" if len(found) > 1 else ""
        where = _addr(title, *first)
        raise InputError(
            f"the formula in {where} of {p.name} has no saved value{more}; the file "
            "was saved by a program that does not calculate: open it in a spreadsheet program "
            "and save it, or paste the values, then try again",
            cells=tuple((r - source.first_row, c - source.first_col) for r, c in found),
        )


# --------------------------------------------------------------------------------------------
# document properties

_CORE_REL = "http://schemas.openxmlformats.org/package/2006/relationships/metadata/core-properties"
_CORE_FIELDS = {
    "{http://purl.org/dc/elements/1.1/}creator": "creator",
    "{http://purl.org/dc/elements/1.1/}title": "title",
    "{http://purl.org/dc/elements/1.1/}subject": "subject",
    "{http://purl.org/dc/elements/1.1/}description": "description",
    "{http://schemas.openxmlformats.org/package/2006/metadata/core-properties}keywords": "keywords",
    "{http://schemas.openxmlformats.org/package/2006/metadata/core-properties}category": "category",
}
_CORE_MAX = 1024 * 1024  # a core-properties part is a few hundred bytes


def workbook_properties(
    path: str | os.PathLike[str], size_limit: int = DEFAULT_SIZE_LIMIT
) -> dict[str, str]:
    """The core document properties of a workbook (``creator``, ``title``, ``subject``,
    ``description``, ``keywords``, ``category``; only those present).

    The file passes :func:`check_archive` first (size limit, no document type declaration), and
    the properties part (found through the package relationships, ECMA-376 Part 2, with
    ``docProps/core.xml`` as the usual name) is parsed with defusedxml. Raises
    :class:`InputError` when the file is not a readable workbook; a workbook without a
    properties part gives an empty dict.
    """
    from defusedxml import ElementTree as SafeET
    from defusedxml import DefusedXmlException

    p = Path(path)
    if p.is_dir():
        raise InputError(f"{p} is a folder, not a workbook")
    check_archive(p, size_limit)
    try:
        with zipfile.ZipFile(p) as zf:
            names = set(zf.namelist())
            part = "docProps/core.xml"
            if "_rels/.rels" in names and zf.getinfo("_rels/.rels").file_size <= _CORE_MAX:
                rels = SafeET.fromstring(zf.read("_rels/.rels"))
                for rel in rels:
                    if rel.get("Type") == _CORE_REL and rel.get("Target"):
                        part = rel.get("Target", "").lstrip("/")
                        break
            if part not in names or zf.getinfo(part).file_size > _CORE_MAX:
                return {}
            root = SafeET.fromstring(zf.read(part))
    except (DefusedXmlException, SafeET.ParseError, zipfile.BadZipFile, KeyError, OSError,
            zlib.error, EOFError) as e:
        if isinstance(e, PermissionError):
            raise InputError(
                f"no permission to read {p}; check the file's access rights"
            ) from None
        raise damaged_error(p.name, e) from None
    out: dict[str, str] = {}
    for child in root:
        key = _CORE_FIELDS.get(child.tag)
        if key is not None:
            out[key] = (child.text or "").strip()
    return out
