"""Computing a workbook's SF_ formula cells with the core, as the host would show them.

Each SF_ cell's call is read (:mod:`.arguments`), its arguments are taken from the workbook's
cells after the data are in, and the function is called through the registry exactly as the
harness calls it (:func:`sheetfuncs.worksheet.harness.call`: what the cell shows in Excel). An
array formula gets its whole area: the result's rows from the top-left corner, ``#N/A`` where the
area is larger than the result (as both Excel and Calc show it); a result larger than its area is
cut to the area, and the caller is told.
"""

from __future__ import annotations

import datetime as dt
from dataclasses import dataclass
from pathlib import Path
from typing import Any, Callable

import openpyxl
from openpyxl.worksheet.formula import ArrayFormula

from ..errors import InputError
from ..input import column_letters
from ..worksheet.functions import REGISTRY
from ..worksheet.harness import ErrorCell, call
from .arguments import is_sf_formula, parse_call, resolve
from .cells import ErrorValue, Value, split_ref

__all__ = ["FormulaCell", "Computed", "scan_formulas", "compute_sf_cells"]


@dataclass(frozen=True)
class FormulaCell:
    """A formula cell: sheet, A1 address, formula text, array area (or None), SF_ call or not."""

    sheet: str
    ref: str
    text: str
    area: str | None
    sf: bool


@dataclass(frozen=True)
class Computed:
    """SF_ results: every cell's value (sheet, A1) and, per formula, its value or rows."""

    cells: tuple[tuple[tuple[str, str], Value], ...]
    given: tuple[tuple[tuple[str, str], Any], ...]
    notes: tuple[str, ...]


def _where(sheet: str, ref: str) -> str:
    return "'" + sheet.replace("'", "''") + "'!" + ref


def scan_formulas(wb: Any) -> tuple[FormulaCell, ...]:
    """Every formula cell of an openpyxl workbook loaded with formulas (not values)."""
    out = []
    for ws in wb.worksheets:
        for row in ws.iter_rows():
            for c in row:
                v = c.value
                if isinstance(v, ArrayFormula):
                    text, area = v.text or "", v.ref
                elif c.data_type == "f" and isinstance(v, str):
                    text, area = v, None
                else:
                    continue
                out.append(FormulaCell(ws.title, c.coordinate, text, area, is_sf_formula(text)))
    return tuple(out)


def _host(c: Any) -> Any:
    """What the host hands a worksheet function for an openpyxl cell holding a constant."""
    v = c.value
    if c.data_type == "e":
        return ErrorCell(v) if v in ("#N/A", "#DIV/0!", "#VALUE!", "#REF!", "#NAME?", "#NUM!",
                                      "#NULL!") else ErrorCell("#N/A")
    if isinstance(v, bool) or v is None or isinstance(v, (str, dt.datetime)):
        return v
    if isinstance(v, (int, float)):
        return float(v)
    if isinstance(v, dt.date):
        return dt.datetime(v.year, v.month, v.day)
    return v


def _shown(v: Any) -> Value:
    if isinstance(v, ErrorCell):
        return ErrorValue(v.name)
    if isinstance(v, (dt.datetime, dt.date)):
        return v.isoformat()
    return v


def _place(cell: FormulaCell, result: Any) -> tuple[dict[tuple[str, str], Value], Any, str]:
    """The area's cells, the value given to the evaluator and a note (or "")."""
    rows = result if isinstance(result, list) else [[result]]
    if cell.area is None:
        note = "" if len(rows) == 1 and len(rows[0]) == 1 else (
            f"{_where(cell.sheet, cell.ref)} returns {len(rows)} x {len(rows[0])} cells but is not an "
            "array formula; its first cell was stored")
        return {(cell.sheet, cell.ref): _shown(rows[0][0])}, _shown(rows[0][0]), note
    first, _, last = cell.area.partition(":")
    (r1, c1), (r2, c2) = split_ref(first), split_ref(last or first)
    out: dict[tuple[str, str], Value] = {}
    grid = []
    for i in range(r2 - r1 + 1):
        line = []
        for j in range(c2 - c1 + 1):
            v = _shown(rows[i][j]) if i < len(rows) and j < len(rows[i]) else ErrorValue("#N/A")
            out[(cell.sheet, f"{column_letters(c1 + j)}{r1 + i}")] = v
            line.append(v)
        grid.append(line)
    cut = len(rows) > len(grid) or len(rows[0]) > len(grid[0])
    note = (f"{_where(cell.sheet, cell.area)} is smaller than its result ({len(rows)} x "
            f"{len(rows[0])}); only the area was stored" if cut else "")
    return out, grid, note


def _evaluate(cell: FormulaCell, names: dict[str, str], lookup: Callable[[str, int, int], Any]) -> Any:
    where = _where(cell.sheet, cell.ref)
    parsed = parse_call(cell.text, where)
    if parsed.name not in REGISTRY:
        raise InputError(f"{where} calls {parsed.name}, which is not a function of this sheetfuncs "
                         "version; correct the formula (nothing was written)")
    args = [resolve(a, cell.sheet, names, lookup, where) for a in parsed.args]
    return call(parsed.name, *args)


def compute_sf_cells(path: Path, names: dict[str, str]) -> tuple[Computed, tuple[FormulaCell, ...]]:
    """Compute every SF_ cell of the workbook at ``path``; ``names`` are its defined names
    (upper case → reference). Returns the results and all formula cells found."""
    wb = openpyxl.load_workbook(path, data_only=False)
    formulas = scan_formulas(wb)
    by_cell = {(f.sheet, f.ref): f for f in formulas}
    done: dict[tuple[str, str], Value] = {}
    given: dict[tuple[str, str], Any] = {}
    notes: list[str] = []
    running: set[tuple[str, str]] = set()

    def lookup(sheet: str, r: int, c: int) -> Any:
        if sheet not in wb.sheetnames:
            raise InputError(f'a formula refers to a sheet "{sheet}" the template does not have; '
                             "correct the formula (nothing was written)")
        key = (sheet, f"{column_letters(c)}{r}")
        f = by_cell.get(key)
        if f is not None and f.sf and key not in done:
            if key in running:
                raise InputError(f"{_where(*key)} refers to itself through its arguments; "
                                 "correct the formula (nothing was written)")
            run(f)
        if key in done:
            v = done[key]
            return ErrorCell(v.text) if isinstance(v, ErrorValue) else v
        if f is not None:
            raise InputError(f"an SF_ formula refers to {_where(*key)}, which holds another formula "
                             f"({f.text}); give the SF_ function the cells it reads (nothing was written)")
        return _host(wb[sheet].cell(r, c))

    def run(f: FormulaCell) -> None:
        running.add((f.sheet, f.ref))
        cells, value, note = _place(f, _evaluate(f, names, lookup))
        done.update(cells)
        given[(f.sheet, f.area or f.ref)] = value
        notes.extend([note] if note else [])

    for f in formulas:
        if f.sf and (f.sheet, f.ref) not in done:
            run(f)
    return Computed(tuple(done.items()), tuple(given.items()), tuple(notes)), formulas
