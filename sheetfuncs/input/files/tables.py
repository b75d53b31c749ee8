"""Spreadsheet tables (the named tables of a worksheet) as ranges: ``FillWeights``,
``FillWeights[#All]``, ``FillWeights[#Data]``.

openpyxl's read-only mode does not load tables, so they are read here from the package
(ECMA-376 Part 1, 18.5 Tables; Part 2, relationships): the workbook part (found through
``_rels/.rels``) lists the sheets with their relationship ids, each sheet's relationships name
its table parts, and each table part gives its name, its reference and how many header and
totals rows it has. Every part is parsed with defusedxml and read only when it is small (a
table part is a few kilobytes); the caller has already passed the file through
:func:`.safety.check_archive`.

A table is read with its header row (its column names become the group labels); ``[#Data]``
reads the same cells, the header giving the labels, with a note; a totals row is never read
as data (it holds sums and averages), and a note says it was left out.
"""

from __future__ import annotations

import posixpath
import re
import zipfile
import zlib
from dataclasses import dataclass
from pathlib import Path

from ...errors import InputError
from ..cells import RangeRef, a1_range, parse_range
from .safety import damaged_error

__all__ = ["SheetTable", "table_range", "workbook_tables"]

_PART_MAX = 4 * 1024 * 1024  # a workbook part or a table part: far smaller in practice
_OFFICE_DOC = "/officeDocument"
_SPECIFIER = re.compile(r"^\s*([^\[\]]+?)\s*(?:\[\s*(#?[^\[\]]*?)\s*\])?\s*$")


@dataclass(frozen=True)
class SheetTable:
    """A spreadsheet table: its name, its sheet, its whole reference (header and totals rows
    included) and how many header and totals rows it has."""

    name: str
    sheet: str
    ref: RangeRef
    header_rows: int = 1
    totals_rows: int = 0


def _local(tag: str) -> str:
    return tag.rsplit("}", 1)[-1]


def _attr(el, name: str) -> str | None:
    """An attribute by its local name (``r:id`` whatever the namespace prefix)."""
    for key, val in el.attrib.items():
        if _local(key) == name:
            return val
    return None


def _read_xml(zf: zipfile.ZipFile, part: str):
    """The parsed part, or ``None`` when it is absent or larger than any real one."""
    from defusedxml import ElementTree as SafeET

    try:
        info = zf.getinfo(part)
    except KeyError:
        return None
    if info.file_size > _PART_MAX:
        return None
    return SafeET.fromstring(zf.read(info))


def _rels(zf: zipfile.ZipFile, part: str) -> dict[str, tuple[str, str]]:
    """The relationships of ``part``: id -> (type, target part name)."""
    folder, name = posixpath.split(part)
    root = _read_xml(zf, posixpath.join(folder, "_rels", name + ".rels"))
    out: dict[str, tuple[str, str]] = {}
    for rel in root if root is not None else ():
        target = rel.get("Target") or ""
        if rel.get("TargetMode") == "External" or not target:
            continue
        path = target.lstrip("/") if target.startswith("/") else posixpath.normpath(
            posixpath.join(folder, target))
        out[rel.get("Id") or ""] = (rel.get("Type") or "", path)
    return out


def workbook_tables(p: Path) -> tuple[SheetTable, ...]:
    """The spreadsheet tables of a workbook, in sheet order."""
    from defusedxml import DefusedXmlException
    from defusedxml import ElementTree as SafeET

    try:
        with zipfile.ZipFile(p) as zf:
            return _tables(zf)
    except (DefusedXmlException, SafeET.ParseError, zipfile.BadZipFile, KeyError, OSError,
            zlib.error, EOFError) as e:
        if isinstance(e, PermissionError):
            raise
        raise damaged_error(p.name, e) from None


def _tables(zf: zipfile.ZipFile) -> tuple[SheetTable, ...]:
    top = _rels(zf, "")  # the package relationships, _rels/.rels
    book = next((t for typ, t in top.values() if typ.endswith(_OFFICE_DOC)), "xl/workbook.xml")
    root = _read_xml(zf, book)
    if root is None:
        return ()
    book_rels = _rels(zf, book)
    out: list[SheetTable] = []
    for el in root.iter():
        if _local(el.tag) != "sheet":
            continue
        typ, part = book_rels.get(_attr(el, "id") or "", ("", ""))
        if not typ.endswith("/worksheet"):
            continue
        for ttyp, tpart in _rels(zf, part).values():
            if ttyp.endswith("/table"):
                table = _table(zf, tpart, el.get("name") or "")
                if table is not None:
                    out.append(table)
    return tuple(out)


def _table(zf: zipfile.ZipFile, part: str, sheet: str) -> SheetTable | None:
    root = _read_xml(zf, part)
    if root is None or _local(root.tag) != "table":
        return None
    name = root.get("displayName") or root.get("name") or ""
    ref = parse_range(root.get("ref") or "")
    if not name or ref is None or ref.max_row is None or ref.max_col is None:
        return None
    try:
        header = int(root.get("headerRowCount", "1"))
        totals = int(root.get("totalsRowCount", "0"))
    except ValueError:
        return None
    return SheetTable(name, sheet, RangeRef(ref.min_row, ref.min_col, ref.max_row, ref.max_col,
                                            sheet), max(header, 0), max(totals, 0))


def _address(t: SheetTable, r1: int, r2: int) -> str:
    name = "'" + t.sheet.replace("'", "''") + "'!"
    return name + a1_range(r1, t.ref.min_col, r2, t.ref.max_col or t.ref.min_col)


def table_range(
    tables: tuple[SheetTable, ...], text: str, file_name: str
) -> tuple[SheetTable, RangeRef, tuple[str, ...]] | None:
    """The cells ``FillWeights``, ``FillWeights[#All]`` or ``FillWeights[#Data]`` name, with
    notes; ``None`` when no table has the name (matched case-insensitively). Any other part
    of a table (``[#Headers]``, ``[#Totals]``, a column) is an error that says what to give."""
    m = _SPECIFIER.match(text)
    if m is None:
        return None
    name, part = m.group(1), m.group(2)
    table = next((t for t in tables if t.name.casefold() == name.casefold()), None)
    if table is None:
        return None
    spec = (part or "#all").casefold()
    if spec not in ("#all", "#data"):
        raise InputError(
            f'{text.strip()} names a part of the table "{table.name}" in {file_name} that '
            f"is not read alone; give {table.name} (the whole table) or an A1 range"
        )
    last = table.ref.max_row or table.ref.min_row
    notes: list[str] = []
    if table.totals_rows:
        cut = last - table.totals_rows
        notes.append(f'the totals row {_address(table, cut + 1, last)} of the table '
                     f'"{table.name}" is not read (it holds totals, not measurements)')
        last = cut
    if spec == "#data" and table.header_rows:
        head = table.ref.min_row + table.header_rows - 1
        notes.append(f'{text.strip()}: the group labels come from the table\'s header row '
                     f"{_address(table, table.ref.min_row, head)}")
    ref = RangeRef(table.ref.min_row, table.ref.min_col, max(last, table.ref.min_row),
                   table.ref.max_col, table.sheet)
    return table, ref, tuple(notes)
