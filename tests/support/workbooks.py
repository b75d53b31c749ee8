"""Building test workbooks: sheets of values, and zip parts replaced or dropped (for damaged files)."""

from __future__ import annotations

import zipfile
from pathlib import Path

import openpyxl

__all__ = ["lots_book", "make_book", "patch_zip", "sheet_xml"]


def make_book(path: Path, sheets: dict[str, list[list[object]]], *, at: str = "A1") -> Path:
    """A workbook with the given sheets; each sheet's rows start at cell ``at``."""
    wb = openpyxl.Workbook()
    wb.remove(wb.active)
    r0, c0 = openpyxl.utils.cell.coordinate_to_tuple(at)
    for name, rows in sheets.items():
        ws = wb.create_sheet(name)
        for i, row in enumerate(rows):
            for j, v in enumerate(row):
                if v is not None:
                    ws.cell(row=r0 + i, column=c0 + j, value=v)
    wb.save(path)
    return path


def lots_book(folder: Path) -> Path:
    """``lots.xlsx`` in ``folder``: a sheet "Notes" with one note, then a sheet "Lot data" whose
    block (labels Lot A to Lot C, invented readings, one "n/a") starts at C3."""
    rows = [["Lot A", "Lot B", "Lot C"], [1.2, 2.2, 3.1], [1.4, 2.1, "n/a"], [1.1, 2.6, 3.3]]
    return make_book(folder / "lots.xlsx", {"Notes": [["see other sheet"]], "Lot data": rows},
                     at="C3")


def patch_zip(src: Path, dst: Path, changes: dict[str, bytes | None]) -> Path:
    """Copy a zip, replacing (or with ``None`` dropping) the named members; new names are added."""
    with zipfile.ZipFile(src) as zin, zipfile.ZipFile(dst, "w", zipfile.ZIP_DEFLATED) as zout:
        done = set()
        for info in zin.infolist():
            if info.filename in changes:
                done.add(info.filename)
                if changes[info.filename] is not None:
                    zout.writestr(info.filename, changes[info.filename])
            else:
                zout.writestr(info, zin.read(info.filename))
        for name, data in changes.items():
            if name not in done and data is not None:
                zout.writestr(name, data)
    return dst


def sheet_xml(path: Path, member: str = "xl/worksheets/sheet1.xml") -> str:
    with zipfile.ZipFile(path) as z:
        return z.read(member).decode("utf-8")
