"""Formulas on a sheet, for block detection: whether a sheet has any, and what each one covers.

A workbook is read for its saved values; the formulas are read only when the sheet holds any.
:func:`scan_sheet` streams the sheet's XML part once (found through ``xl/workbook.xml`` and its
relationships, ECMA-376 Part 1, parsed with defusedxml) looking for formula elements and hidden
rows; :func:`read_formulas` reads the formulas of a few rows; :func:`formula_refs` and
:func:`is_aggregate` say what a formula covers and whether it aggregates (``AVERAGE``,
``STDEV`` ...), so that a Mean row computed over the data is told from a measurement computed
from another cell (a unit conversion).
"""

from __future__ import annotations

import re
import warnings
import zipfile
from pathlib import Path
from posixpath import join, normpath

from ..cells import column_number
from .words import AGGREGATES

__all__ = ["formula_refs", "is_aggregate", "read_formulas", "scan_sheet"]

_NS_MAIN = "{http://schemas.openxmlformats.org/spreadsheetml/2006/main}"
_NS_REL = "{http://schemas.openxmlformats.org/officeDocument/2006/relationships}"
_FORMULA = re.compile(rb"<(?:\w+:)?f[\s>/]")
_FORMULA_TAGS = (b"<f>", b"<f ", b":f>", b":f ")
_ROW_TAG = re.compile(rb"<(?:\w+:)?row\s[^>]*>")
_HIDDEN = re.compile(rb'\shidden="(?:1|true)"')
_ROW_NUM = re.compile(rb'\sr="(\d+)"')
_CHUNK = 1 << 20
_PART_MAX = 16 << 20  # workbook.xml and its relationships are small parts
_REF = re.compile(
    r"(?<![A-Za-z0-9_$!.])((?:'[^']+'|[A-Za-z_][A-Za-z0-9_.]*)!)?\$?([A-Z]{1,3})\$?([0-9]{1,7})"
    r"(?::\$?([A-Z]{1,3})\$?([0-9]{1,7}))?(?![A-Za-z0-9_(])"
)
_FUNC = re.compile(r"([A-Z_][A-Z0-9._]*)\s*\(")


def _sheet_part(zf: zipfile.ZipFile, title: str) -> str | None:
    """The zip member of the worksheet called ``title``, from the workbook's relationships."""
    from defusedxml import ElementTree as SafeET

    names = set(zf.namelist())
    if "xl/workbook.xml" not in names or "xl/_rels/workbook.xml.rels" not in names:
        return None
    if max(zf.getinfo(n).file_size for n in ("xl/workbook.xml", "xl/_rels/workbook.xml.rels")) > _PART_MAX:
        return None
    book = SafeET.fromstring(zf.read("xl/workbook.xml"))
    rid = None
    for sh in book.iter(f"{_NS_MAIN}sheet"):
        if sh.get("name") == title:
            rid = sh.get(f"{_NS_REL}id")
            break
    rels = SafeET.fromstring(zf.read("xl/_rels/workbook.xml.rels"))
    for rel in rels:
        if rel.get("Id") == rid and rel.get("Target"):
            target = rel.get("Target", "")
            part = target.lstrip("/") if target.startswith("/") else normpath(join("xl", target))
            return part if part in names else None
    return None


def scan_sheet(path: Path, title: str) -> tuple[bool, frozenset[int]]:
    """``(has formulas, hidden rows)`` of the sheet ``title``, streaming its XML part once.

    The file has passed the archive checks already; a part that cannot be found or read is
    taken to hold no formulas and no hidden rows (the values were read; this only adds notes).
    """
    hidden: set[int] = set()
    found = False
    try:
        with zipfile.ZipFile(path) as zf:
            part = _sheet_part(zf, title)
            if part is None:
                return False, frozenset()
            tail = b""
            with zf.open(part) as fh:
                while chunk := fh.read(_CHUNK):
                    data = tail + chunk
                    if not found and any(data.find(tag) >= 0 for tag in _FORMULA_TAGS):
                        found = _FORMULA.search(data) is not None
                    if b"hidden" in data:
                        for m in _ROW_TAG.finditer(data):
                            tag = m.group(0)
                            if _HIDDEN.search(tag) and (num := _ROW_NUM.search(tag)):
                                hidden.add(int(num.group(1)))
                    tail = data[-512:]
    except Exception:  # damaged parts were refused when the values were read
        return found, frozenset(hidden)
    return found, frozenset(hidden)


def read_formulas(path: Path, title: str, top: int, left: int, bottom: int, right: int) -> dict[tuple[int, int], str]:
    """The formulas (text after ``=``) in rows ``top..bottom``, columns ``left..right`` of the
    sheet ``title``, by 1-based ``(row, col)``."""
    import openpyxl
    from openpyxl.worksheet.formula import ArrayFormula

    out: dict[tuple[int, int], str] = {}
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        wb = openpyxl.load_workbook(path, read_only=True, data_only=False, keep_vba=False,
                                    keep_links=False)
    try:
        ws = wb[title]
        ws.reset_dimensions()
        r = top - 1
        for cells in ws.iter_rows(min_row=top, max_row=None, min_col=left, max_col=right):
            r += 1
            if r > bottom:
                break
            for j, cell in enumerate(cells):
                v = getattr(cell, "value", None)
                if isinstance(v, ArrayFormula):
                    v = v.text
                if isinstance(v, str) and v.startswith("="):
                    out[(r, left + j)] = v[1:]
    finally:
        wb.close()
    return out


def formula_refs(formula: str) -> list[tuple[int, int, int, int]]:
    """The cells a formula refers to on its own sheet, as ``(top, left, bottom, right)``.

    References to other sheets (``'Lot 2'!B3``) are left out; text in quotes is skipped.
    """
    text = re.sub(r'"[^"]*"', '""', formula)
    out = []
    for m in _REF.finditer(text):
        if m.group(1):  # a reference on another sheet
            continue
        c1, r1 = column_number(m.group(2)), int(m.group(3))
        if m.group(4):
            c2, r2 = column_number(m.group(4)), int(m.group(5))
        else:
            c2, r2 = c1, r1
        out.append((min(r1, r2), min(c1, c2), max(r1, r2), max(c1, c2)))
    return out


def is_aggregate(formula: str) -> bool:
    """Whether a formula calls a function that aggregates a range (``AVERAGE``, ``SUM`` ...)."""
    text = re.sub(r'"[^"]*"', '""', formula.upper())
    return any(name.removeprefix("_XLFN.") in AGGREGATES for name in _FUNC.findall(text))
