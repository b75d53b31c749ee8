"""Writing cells into a worksheet part by editing its XML text, cell by cell.

A filled template must differ from its template only in the cells written, so a worksheet part is
never parsed and written back whole (that would rewrite namespaces, prefixes, attribute order and
white space). :func:`patch_sheet` finds each cell's ``<c>`` element in the text of
``<sheetData>`` and replaces that element alone; a cell that is not there yet is inserted in its
row in column order, and a row that is not there yet is inserted in row order. Everything else in
the part stays byte for byte.

What a written cell holds (:class:`CellValue`):

* a data cell: a number (``<v>``), text as an inline string (``t="inlineStr"``, so the shared
  strings part is untouched), a logical (``t="b"``), an error (``t="e"``) or nothing (the cell
  keeps its style ``s=`` and loses its content);
* a formula cell (``keep_formula``): its ``<f>`` element stays as written and its stored value is
  replaced, with ``t="str"`` for text, ``t="b"`` for a logical, ``t="e"`` for an error.

Other attributes of an existing cell (``s``, ``cm``, ``vm``, ``ph``) are kept.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass
from typing import Mapping, Union

from ..errors import InputError
from ..input import column_letters, column_number

__all__ = ["ErrorValue", "CellValue", "Value", "patch_sheet", "split_ref", "cell_xml"]


@dataclass(frozen=True)
class ErrorValue:
    """An error value as a cell stores it, e.g. ``ErrorValue("#N/A")``."""

    text: str


#: What a cell can hold once written.
Value = Union[float, str, bool, ErrorValue, None]


@dataclass(frozen=True)
class CellValue:
    """One cell to write: its value and whether its formula (if any) is kept."""

    value: Value
    keep_formula: bool = False


_SHEET_DATA = re.compile(r"<(?P<p>\w+:)?sheetData\b[^>]*?(?:/>|>(?P<body>.*?)</(?P=p)?sheetData>)",
                         re.S)
_ROW = re.compile(r"<(?P<p>\w+:)?row\b(?P<attrs>[^>]*?)(?:/>|>(?P<body>.*?)</(?P=p)?row>)", re.S)
_CELL = re.compile(r"<(?P<p>\w+:)?c\b(?P<attrs>[^>]*?)(?:/>|>(?P<body>.*?)</(?P=p)?c>)", re.S)
_ATTR = re.compile(r"""([\w:]+)\s*=\s*("[^"]*"|'[^']*')""")
_FORMULA = re.compile(r"<(?:\w+:)?f\b[^>]*?(?:/>|>.*?</(?:\w+:)?f>)", re.S)
_REF = re.compile(r"^([A-Z]{1,3})([0-9]+)$")


def split_ref(ref: str) -> tuple[int, int]:
    """``"C7"`` → ``(7, 3)`` (row, column; 1-based)."""
    m = _REF.match(ref.upper())
    if not m:
        raise InputError(f'"{ref}" is not a cell address like C7')
    return int(m.group(2)), column_number(m.group(1))


def _attrs(text: str) -> dict[str, str]:
    return {k: v[1:-1] for k, v in _ATTR.findall(text)}


def _escape(text: str) -> str:
    return text.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;")


def _number(v: float) -> str:
    if not math.isfinite(v):
        raise InputError(f"a cell cannot hold {v!r}; only finite numbers")
    return repr(float(v))


def _content(value: Value, formula: bool) -> tuple[str | None, str]:
    """The ``t`` attribute (None: none) and the inner XML after any ``<f>``."""
    if value is None:
        return (None, "") if not formula else ("str", "<v></v>")
    if isinstance(value, bool):
        return "b", f"<v>{int(value)}</v>"
    if isinstance(value, (int, float)):
        return None, f"<v>{_number(float(value))}</v>"
    if isinstance(value, ErrorValue):
        return "e", f"<v>{_escape(value.text)}</v>"
    text = _escape(str(value))
    if formula:
        return "str", f"<v>{text}</v>"
    space = ' xml:space="preserve"' if text != text.strip() else ""
    return "inlineStr", f"<is><t{space}>{text}</t></is>"


def cell_xml(ref: str, new: CellValue, old: str | None, prefix: str = "") -> str:
    """The ``<c>`` element for cell ``ref`` holding ``new``; ``old`` is the element it replaces."""
    attrs: dict[str, str] = {"r": ref}
    formula = ""
    if old is not None:
        m = _CELL.match(old)
        assert m is not None
        attrs.update(_attrs(m.group("attrs")))
        attrs["r"] = ref
        if new.keep_formula:
            f = _FORMULA.search(m.group("body") or "")
            formula = f.group(0) if f else ""
    attrs.pop("t", None)
    kind, inner = _content(new.value, bool(formula) or new.keep_formula)
    if kind is not None:
        attrs["t"] = kind
    text = " ".join(f'{k}="{v}"' for k, v in attrs.items())
    body = formula + (re.sub(r"<(/?)(is|t|v)\b", rf"<\1{prefix}\2", inner) if prefix else inner)
    if not body:
        return f"<{prefix}c {text}/>"
    return f"<{prefix}c {text}>{body}</{prefix}c>"


def _patch_row(body: str, row: int, cells: Mapping[int, CellValue], prefix: str) -> str:
    """The row's inner XML with ``cells`` (by column) written."""
    out: list[str] = []
    pos = 0
    pending = sorted(cells)
    for m in _CELL.finditer(body):
        ref = _attrs(m.group("attrs")).get("r")
        if ref is None:
            raise InputError(f"row {row} of the sheet has a cell without an address; "
                             "save the template again in a spreadsheet program and retry")
        col = split_ref(ref)[1]
        while pending and pending[0] < col:
            c = pending.pop(0)
            out.append(body[pos:m.start()])
            pos = m.start()
            out.append(cell_xml(f"{column_letters(c)}{row}", cells[c], None, prefix))
        if pending and pending[0] == col:
            c = pending.pop(0)
            out.append(body[pos:m.start()])
            out.append(cell_xml(ref, cells[c], m.group(0), prefix))
            pos = m.end()
    out.append(body[pos:])
    out.extend(cell_xml(f"{column_letters(c)}{row}", cells[c], None, prefix) for c in pending)
    return "".join(out)


def _by_row(writes: Mapping[str, CellValue]) -> dict[int, dict[int, CellValue]]:
    rows: dict[int, dict[int, CellValue]] = {}
    for ref, v in writes.items():
        r, c = split_ref(ref)
        rows.setdefault(r, {})[c] = v
    return rows


def _new_row(row: int, cells: Mapping[int, CellValue], prefix: str) -> str:
    return f'<{prefix}row r="{row}">{_patch_row("", row, cells, prefix)}</{prefix}row>'


def _patched_row(m: re.Match[str], row: int, cells: Mapping[int, CellValue], prefix: str) -> str:
    body = _patch_row(m.group("body") or "", row, cells, prefix)
    attrs = m.group("attrs").rstrip()
    if attrs.endswith("/"):
        attrs = attrs[:-1].rstrip()
    return f"<{prefix}row{attrs}>{body}</{prefix}row>"


def patch_sheet(xml: str, writes: Mapping[str, CellValue]) -> str:
    """The worksheet part's text with the cells ``writes`` (A1 address → value) written.

    Only the ``<c>`` elements of those cells change (and a ``<row>`` that has to be opened or
    created for them); every other character of the part is kept.
    """
    if not writes:
        return xml
    sd = _SHEET_DATA.search(xml)
    if sd is None:
        raise InputError("the worksheet has no cell data part; save the template again in a "
                         "spreadsheet program and retry")
    prefix = sd.group("p") or ""
    pending = _by_row(writes)
    order = sorted(pending)
    body = sd.group("body") or ""
    out: list[str] = []
    pos = 0
    for m in _ROW.finditer(body):
        r_text = _attrs(m.group("attrs")).get("r")
        if r_text is None:
            raise InputError("the worksheet has a row without a number; save the template again "
                             "in a spreadsheet program and retry")
        row = int(r_text)
        while order and order[0] < row:
            out.append(body[pos:m.start()] + _new_row(order[0], pending[order[0]], prefix))
            pos = m.start()
            order.pop(0)
        if order and order[0] == row:
            out.append(body[pos:m.start()] + _patched_row(m, row, pending[row], prefix))
            pos = m.end()
            order.pop(0)
    out.append(body[pos:])
    out.extend(_new_row(r, pending[r], prefix) for r in order)
    new_body = "".join(out)
    if sd.group("body") is None:
        open_tag = sd.group(0)[:-2].rstrip()
        element = f"{open_tag}>{new_body}</{prefix}sheetData>"
    else:
        start = sd.start("body") - sd.start()
        end = sd.end("body") - sd.start()
        element = sd.group(0)[:start] + new_body + sd.group(0)[end:]
    return xml[:sd.start()] + element + xml[sd.end():]
