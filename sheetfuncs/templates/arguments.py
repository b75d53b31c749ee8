"""Reading an SF_ formula's call and its arguments from the workbook's cells.

A formula the filler computes with the core is one call, ``=SF_NAME(arg, arg, ...)``. Each
argument is a literal (a number, ``"text"``, ``TRUE``/``FALSE``, an inline array ``{1,2;3,4}``),
left out (``SF_P(A1:C9,,0.01)``), a reference (``B2``, ``$B$2:$G$40``, ``'Data entry'!B2:G40``)
or a workbook-scoped defined name that refers to one. References become what the host hands a
worksheet function: one cell its value, a range a list of rows (see
:mod:`sheetfuncs.worksheet.harness`). Anything else (a nested call, an operator, a structured
table reference) is not resolved here: :func:`parse_call` says so in one line naming the cell.
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from typing import Any, Callable, Mapping

from ..errors import InputError
from ..input import column_number
from ..worksheet.harness import MISSING

__all__ = ["Call", "is_sf_formula", "parse_call", "resolve", "Lookup"]

#: A cell's host value from (sheet, row, column), 1-based.
Lookup = Callable[[str, int, int], Any]

_SF = re.compile(r"(?<![\w.])(?:_xludf\.)?SF_\w+\s*\(", re.I)
_CALL = re.compile(r"^=?\s*(?:_xludf\.)?(SF_\w+)\s*\((.*)\)\s*$", re.I | re.S)
_NUMBER = re.compile(r"^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$")
_REF = re.compile(r"^(?:(?:'((?:[^']|'')+)'|([A-Za-z_][\w.]*))!)?"
                  r"\$?([A-Za-z]{1,3})\$?(\d+)(?::\$?([A-Za-z]{1,3})\$?(\d+))?$")


@dataclass(frozen=True)
class Call:
    """An SF_ call: the function's name (upper case) and its argument texts."""

    name: str
    args: tuple[str, ...]


def is_sf_formula(text: str) -> bool:
    """Does the formula call an SF_ function anywhere?"""
    return bool(_SF.search(_without_strings(text)))


def _without_strings(text: str) -> str:
    return re.sub(r'"(?:[^"]|"")*"', '""', text)


def _split(text: str) -> list[str] | None:
    """Top-level comma-separated pieces, or None when a piece nests a call or brackets."""
    pieces, depth, cur, i = [], 0, [], 0
    while i < len(text):
        ch = text[i]
        if ch in "\"'":
            j = i + 1
            while j < len(text) and not (text[j] == ch and text[j + 1:j + 2] != ch):
                j += 2 if text[j] == ch else 1
            cur.append(text[i:j + 1])
            i = j + 1
            continue
        if ch in "([":
            return None
        depth += ch == "{"
        depth -= ch == "}"
        if ch == "," and depth == 0:
            pieces.append("".join(cur).strip())
            cur = []
        else:
            cur.append(ch)
        i += 1
    pieces.append("".join(cur).strip())
    return pieces


def parse_call(formula: str, where: str) -> Call:
    """The one SF_ call a formula is; otherwise one line naming the cell ``where``."""
    m = _CALL.match(formula.strip())
    args = _split(m.group(2)) if m else None
    if m is None or args is None:
        raise InputError(f"the formula in {where} ({formula}) is not one SF_ call with plain "
                         "arguments, so it cannot be computed headless; put the SF_ call in a "
                         "cell of its own and refer to that cell (nothing was written)")
    return Call(m.group(1).upper(), tuple(args) if args != [""] else ())


def _literal(text: str) -> tuple[bool, Any]:
    if text == "":
        return True, MISSING
    if _NUMBER.match(text):
        return True, float(text)
    if text.upper() in ("TRUE", "FALSE"):
        return True, text.upper() == "TRUE"
    if len(text) >= 2 and text[0] == '"' and text[-1] == '"':
        return True, text[1:-1].replace('""', '"')
    return False, None


def _array(text: str, where: str) -> list[list[Any]]:
    rows = []
    for row in text[1:-1].split(";"):
        cells = []
        for piece in _split(row) or []:
            ok, v = _literal(piece)
            if not ok or v is MISSING:
                raise InputError(f"the array {text} in {where} holds {piece!r}, which is not a "
                                 "number, text or logical; write the values out")
            cells.append(v)
        rows.append(cells)
    return rows


def _range(m: re.Match[str], sheet: str, lookup: Lookup) -> Any:
    name = (m.group(1) or "").replace("''", "'") or m.group(2) or sheet
    r1, c1 = int(m.group(4)), column_number(m.group(3).upper())
    if m.group(5) is None:
        return lookup(name, r1, c1)
    r2, c2 = int(m.group(6)), column_number(m.group(5).upper())
    return [[lookup(name, r, c) for c in range(min(c1, c2), max(c1, c2) + 1)]
            for r in range(min(r1, r2), max(r1, r2) + 1)]


def resolve(arg: str, sheet: str, names: Mapping[str, str], lookup: Lookup, where: str) -> Any:
    """One argument's host value; ``sheet`` is the formula's sheet, ``names`` the defined names
    (upper case → reference text)."""
    ok, value = _literal(arg)
    if ok:
        return value
    if arg.startswith("{") and arg.endswith("}"):
        return _array(arg, where)
    text = names.get(arg.upper(), arg).lstrip("=")
    m = _REF.match(text)
    if m is None:
        raise InputError(f"the argument {arg} of the formula in {where} is not a value, a range "
                         "or a defined name of one range, so it cannot be computed headless "
                         "(nothing was written)")
    return _range(m, sheet, lookup)
