"""A template's structure as its zip parts state it: sheets, defined names, tables, the block.

Read only: the parts are parsed (with defusedxml) to learn where things are; nothing here writes.
:func:`find_block` picks the data block as the contract of the templates says: the defined name
given (or the table given), else the only workbook-scoped defined name that refers to one
rectangular range of more than one cell.
"""

from __future__ import annotations

import posixpath
import re
import zipfile
from dataclasses import dataclass
from pathlib import Path

from defusedxml import ElementTree

from ..errors import PREFIX, InputError
from ..input import column_letters, column_number

__all__ = ["Block", "Table", "Book", "read_book", "find_block", "CELLS_MARK"]

#: The defined name's comment that marks a block of cells copied as they are
#: (``sheetfuncs: cells``; built from the one spelling of the prefix, which lives in errors.py).
CELLS_MARK = PREFIX + "cells"

_MAIN = "{http://schemas.openxmlformats.org/spreadsheetml/2006/main}"
_REL = "{http://schemas.openxmlformats.org/package/2006/relationships}"
_RID = "{http://schemas.openxmlformats.org/officeDocument/2006/relationships}id"
_RANGE = re.compile(r"^(?:'((?:[^']|'')+)'|([^'!]+))!\$?([A-Z]{1,3})\$?(\d+)(?::\$?([A-Z]{1,3})\$?(\d+))?$")


@dataclass(frozen=True)
class Table:
    """A spreadsheet table (ListObject): its part, name and A1 range."""

    part: str
    name: str
    ref: str


@dataclass(frozen=True)
class Block:
    """The data block: its defined name, sheet, sheet part, corners (1-based) and kind."""

    name: str
    sheet: str
    part: str
    top: int
    left: int
    bottom: int
    right: int
    cells: bool
    table: Table | None

    @property
    def rows(self) -> int:
        return self.bottom - self.top + 1

    @property
    def cols(self) -> int:
        return self.right - self.left + 1

    @property
    def address(self) -> str:
        sheet = "'" + self.sheet.replace("'", "''") + "'"
        return (f"{sheet}!${column_letters(self.left)}${self.top}:"
                f"${column_letters(self.right)}${self.bottom}")


@dataclass(frozen=True)
class Book:
    """Sheets (name → part, in order), defined names (name → (text, comment)), tables, and
    the workbook part itself."""

    sheets: tuple[tuple[str, str], ...]
    names: tuple[tuple[str, str, str], ...]
    tables: tuple[tuple[str, Table], ...]
    part: str = "xl/workbook.xml"

    def part_of(self, sheet: str) -> str:
        for name, part in self.sheets:
            if name == sheet:
                return part
        raise InputError(f'the template has no sheet "{sheet}"')


def _xml(zf: zipfile.ZipFile, name: str) -> ElementTree.Element | None:
    try:
        return ElementTree.fromstring(zf.read(name))
    except KeyError:
        return None


def _rels(zf: zipfile.ZipFile, part: str) -> dict[str, str]:
    """Relationship id → target part of ``part``."""
    folder, base = posixpath.split(part)
    root = _xml(zf, posixpath.join(folder, "_rels", base + ".rels"))
    out: dict[str, str] = {}
    for rel in [] if root is None else root.iter(_REL + "Relationship"):
        target = rel.get("Target", "")
        if rel.get("TargetMode") == "External":
            continue
        out[rel.get("Id", "")] = (target.lstrip("/") if target.startswith("/")
                                  else posixpath.normpath(posixpath.join(folder, target)))
    return out


def _book_part(zf: zipfile.ZipFile) -> str:
    root = _xml(zf, "_rels/.rels")
    for rel in [] if root is None else root.iter(_REL + "Relationship"):
        if rel.get("Type", "").endswith("/officeDocument"):
            return rel.get("Target", "").lstrip("/")
    raise InputError("the template is not a workbook (no workbook part); check the file")


def read_book(path: Path) -> Book:
    """The template's sheets, workbook-scoped defined names and tables."""
    with zipfile.ZipFile(path) as zf:
        part = _book_part(zf)
        root = _xml(zf, part)
        if root is None:
            raise InputError(f"{path.name} has no workbook part; check the file")
        rels = _rels(zf, part)
        sheets = tuple((s.get("name", ""), rels.get(s.get(_RID, ""), ""))
                       for s in root.iter(_MAIN + "sheet"))
        names = tuple((d.get("name", ""), (d.text or "").strip(), d.get("comment", ""))
                      for d in root.iter(_MAIN + "definedName")
                      if d.get("localSheetId") is None and not d.get("name", "").startswith("_xlnm."))
        tables: list[tuple[str, Table]] = []
        for _, sheet_part in sheets:
            for target in _rels(zf, sheet_part).values():
                t = _xml(zf, target) if target.endswith(".xml") else None
                if t is not None and t.tag == _MAIN + "table":
                    tables.append((sheet_part, Table(target, t.get("displayName") or
                                                     t.get("name", ""), t.get("ref", ""))))
    return Book(sheets, names, tuple(tables), part)


def _corners(text: str) -> tuple[str, int, int, int, int] | None:
    m = _RANGE.match(text.lstrip("="))
    if not m:
        return None
    sheet = (m.group(1) or "").replace("''", "'") or m.group(2)
    r1, c1 = int(m.group(4)), column_number(m.group(3))
    r2 = int(m.group(6)) if m.group(6) else r1
    c2 = column_number(m.group(5)) if m.group(5) else c1
    return sheet, min(r1, r2), min(c1, c2), max(r1, r2), max(c1, c2)


def _table_over(book: Book, part: str, top: int, left: int, bottom: int, right: int) -> Table | None:
    ref = f"{column_letters(left)}{top}:{column_letters(right)}{bottom}"
    for sheet_part, t in book.tables:
        if sheet_part == part and t.ref.upper() == ref:
            return t
    return None


def _block(book: Book, name: str, text: str, comment: str) -> Block | None:
    c = _corners(text)
    if c is None:
        return None
    sheet, top, left, bottom, right = c
    part = book.part_of(sheet)
    table = _table_over(book, part, top, left, bottom, right)
    return Block(name, sheet, part, top, left, bottom, right, comment.strip() == CELLS_MARK, table)


def _by_table(book: Book, into: str) -> Block | None:
    for sheet_part, t in book.tables:
        if t.name.lower() == into.lower():
            sheet = next(n for n, p in book.sheets if p == sheet_part)
            for name, text, comment in book.names:
                b = _block(book, name, text, comment)
                if b is not None and b.table == t:
                    return b
            return _block(book, t.name, f"'{sheet}'!{t.ref}", "")
    return None


def find_block(book: Book, into: str | None, template: str) -> Block:
    """The data block: ``into`` (a defined name or a table name) or the only candidate."""
    if into is not None:
        for name, text, comment in book.names:
            if name.lower() == into.lower():
                b = _block(book, name, text, comment)
                if b is None or b.rows * b.cols < 2:
                    raise InputError(f'the name "{name}" in {template} does not refer to one '
                                     f"range of cells ({text}); give a name that does")
                return b
        b = _by_table(book, into)
        if b is None:
            known = ", ".join(n for n, _, _ in book.names) or "none"
            raise InputError(f'{template} has no defined name or table "{into}" (names: {known}); '
                             "give one of them with --into")
        return b
    found = [b for n, t, c in book.names
             if (b := _block(book, n, t, c)) is not None and b.rows * b.cols > 1]
    if not found:
        raise InputError(f"{template} has no data block (no defined name that refers to a range "
                         "of cells); name the data-entry range and retry, or give --into")
    if len(found) > 1:
        listed = ", ".join(f"{b.name} ({b.address})" for b in found)
        raise InputError(f"{template} has {len(found)} possible data blocks: {listed}; "
                         "say which with --into NAME")
    return found[0]
