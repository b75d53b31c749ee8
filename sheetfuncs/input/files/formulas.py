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
import zipfile
from pathlib import Path
from posixpath import join, normpath
from xml.sax.saxutils import unescape

from ..cells import column_letters, column_number
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
#: A cell with a formula: the cell's attributes, the formula's attributes and its text (none for a
#: shared formula's followers). Inline text (``<is>``) or a value may come first.
_CELL_F = re.compile(
    rb"<(?:\w+:)?c(\s[^>]*?)?(?<!/)>"
    rb"(?:[^<]|<(?!(?:\w+:)?f[\s>/]|/?(?:\w+:)?c[\s>/]|/(?:\w+:)?row>))*"
    rb"<(?:\w+:)?f(\s[^>]*?)?(?:/>|>([^<]*)</(?:\w+:)?f>)"
)
_CELL_REF = re.compile(rb'\sr="([A-Z]{1,3})([0-9]{1,7})"')
_SHARED_INDEX = re.compile(rb'\ssi="([0-9]+)"')
_ENTITIES = {"&quot;": '"', "&apos;": "'"}
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
    sheet ``title``, by 1-based ``(row, col)``.

    The sheet's XML part is streamed once more and only its formula elements are parsed, at
    the speed of a byte search (a second pass of openpyxl over a large sheet would cost as much
    as reading its values). A shared formula's followers get the leader's formula translated to
    their cell (openpyxl's ``Translator``), as a spreadsheet program shows them.
    """
    found: dict[tuple[int, int], str] = {}
    leaders: dict[bytes, tuple[int, int, str]] = {}
    followers: list[tuple[int, int, bytes]] = []
    try:
        with zipfile.ZipFile(path) as zf:
            part = _sheet_part(zf, title)
            if part is None:
                return {}
            for data in _row_chunks(zf, part):
                _formula_cells(data, found, leaders, followers)
    except Exception:  # damaged parts were refused when the values were read
        return {}
    for r, c, si in followers:
        if si in leaders:
            lr, lc, text = leaders[si]
            found[(r, c)] = _translated(text, lr, lc, r, c)
    return {(r, c): f for (r, c), f in found.items() if top <= r <= bottom and left <= c <= right}


def _row_chunks(zf: zipfile.ZipFile, part: str):
    """The part's bytes in pieces that end between rows (so no cell is cut in two)."""
    tail = b""
    with zf.open(part) as fh:
        while chunk := fh.read(_CHUNK):
            data = tail + chunk
            cut = data.rfind(b"row>") + 4
            if cut < 4:
                tail = data
                continue
            tail = data[cut:]
            yield data[:cut]
    if tail:
        yield tail


def _formula_cells(data: bytes, found: dict[tuple[int, int], str],
                   leaders: dict[bytes, tuple[int, int, str]], followers: list[tuple[int, int, bytes]]) -> None:
    """Collect the formula cells of a piece of sheet XML (shared-formula followers apart)."""
    if not any(data.find(tag) >= 0 for tag in _FORMULA_TAGS):
        return
    for m in _CELL_F.finditer(data):
        ref = _CELL_REF.search(m.group(1) or b"")
        if ref is None:
            continue
        r, c = int(ref.group(2)), column_number(ref.group(1).decode())
        attrs, text = m.group(2) or b"", m.group(3)
        si = _SHARED_INDEX.search(attrs) if b"shared" in attrs else None
        if text:
            formula = unescape(text.decode("utf-8", "replace"), _ENTITIES)
            found[(r, c)] = formula
            if si is not None:
                leaders[si.group(1)] = (r, c, formula)
        elif si is not None:
            followers.append((r, c, si.group(1)))


def _translated(text: str, r0: int, c0: int, r: int, c: int) -> str:
    """A shared formula written at ``(r0, c0)`` as it reads in cell ``(r, c)``."""
    from openpyxl.formula.translate import Translator

    try:
        out = Translator("=" + text, origin=f"{column_letters(c0)}{r0}").translate_formula(
            f"{column_letters(c)}{r}")
    except Exception:  # a formula the translator cannot parse: the leader's text as it is
        return text
    return out[1:] if out.startswith("=") else out


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
