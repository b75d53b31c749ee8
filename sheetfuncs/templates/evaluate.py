"""Values of the formulas around the SF_ cells, from a formula-evaluation library.

The filler computes SF_ cells with the core itself; the formulas that read them (a decision
``=IF(ISNUMBER(E8), IF(E8<Alpha, ...), "check the data")``, ``=ROUND(E8, 4)``, ``INDEX`` into a
table result, ``&`` joins) and the formulas over the data block (``=COUNT(Measurements)``) need
their values too, so that the filled workbook shows them in any program. They come from the
``formulas`` package (1.3.4, MIT licence, actively maintained): it reads the workbook with
openpyxl, builds the dependency graph of every formula, and takes given values for chosen cells
(the SF_ results) before it calculates.

Why ``formulas`` and not ``pycel`` (1.0b30), measured on a decision-cell workbook (an SF_P
cell, IF/ISNUMBER, ROUND, AND, ``&`` with TEXT, INDEX into an SF_TABLE array area, COUNT over a
defined name): ``formulas`` gave every value right, took defined names and array areas as given
inputs, and loaded a 6 x 50 block workbook in about 1.2 s with 0.08 s per calculation. ``pycel``
failed on the same workbook with openpyxl 3.1 (``'DefinedNameDict' object has no attribute
'definedName'`` while reading defined names; an SF_ function it cannot evaluate stops the
evaluation), and it pins networkx below 2.7. LibreOffice was not chosen because the filler must
work where no office program is installed.

The library does not know every function a spreadsheet has; a value it cannot give
(``#NAME?``) is not stored, and the caller is told which cells kept their old value. It
misreads sheet names that hold an apostrophe (a reference to ``'It''s'!A1`` becomes ``#REF!``,
measured with 1.3.4), so such a template is refused with one line rather than filled wrongly. A logical joined
with ``&`` reads ``True`` where Excel and Calc show ``TRUE`` (1.3.4): join the texts of an IF
instead (``IF(cond, "TRUE", "FALSE") & ...``) in a template to be filled.
"""

from __future__ import annotations

import contextlib
import io
import re
from dataclasses import dataclass
from pathlib import Path
from typing import Any, Mapping

import numpy as np

from ..errors import InputError
from ..input import column_letters, column_number
from .cells import ErrorValue, Value

__all__ = ["Evaluated", "evaluate_workbook", "UNKNOWN"]

#: What the library returns for a function it does not implement.
UNKNOWN = "#NAME?"

_KEY = re.compile(r"^'?\[[^\]]*\](?P<sheet>.*?)'?!(?P<c1>[A-Z]+)(?P<r1>\d+)(?::(?P<c2>[A-Z]+)(?P<r2>\d+))?$")


@dataclass(frozen=True)
class Evaluated:
    """Values by (sheet as written, A1 address) for every formula cell the library computed."""

    values: tuple[tuple[tuple[str, str], Value], ...]

    def as_dict(self) -> dict[tuple[str, str], Value]:
        return dict(self.values)


def _plain(v: Any) -> Value:
    """A library value as a cell value."""
    if isinstance(v, np.generic):
        v = v.item()
    if isinstance(v, bool) or v is None:
        return v
    if isinstance(v, (int, float)):
        return float(v)
    text = str(v)
    if type(v) is str:
        return v
    if isinstance(v, str) and text.startswith("#"):  # the library's errors are str subclasses
        return ErrorValue(text)
    if text.startswith("#"):
        return ErrorValue(text)
    if text in ("", "empty"):
        return None
    return text


def _cells(key: str, sheets: Mapping[str, str]) -> list[tuple[str, str, int, int]] | None:
    """The cells a library key covers: (sheet, address, row offset, column offset)."""
    m = _KEY.match(key)
    if m is None:
        return None
    sheet = sheets.get(m.group("sheet").replace("''", "'").upper())
    if sheet is None:
        return None
    r1, c1 = int(m.group("r1")), column_number(m.group("c1"))
    r2 = int(m.group("r2") or r1)
    c2 = column_number(m.group("c2") or m.group("c1"))
    return [(sheet, f"{column_letters(c)}{r}", r - r1, c - c1)
            for r in range(r1, r2 + 1) for c in range(c1, c2 + 1)]


def _key_for(book: str, sheet: str, ref: str) -> str:
    return f"'[{book}]{sheet.upper()}'!{ref}"


def evaluate_workbook(path: Path, sheets: tuple[str, ...],
                      given: Mapping[tuple[str, str], Any]) -> Evaluated:
    """Calculate every formula of the workbook at ``path`` with the SF_ results ``given``.

    ``given`` maps (sheet, A1 address or area such as ``E5:J8``) to a value or, for an area, a
    list of rows. Returns the value of every formula cell the library computed.
    """
    quoted = [s for s in sheets if "'" in s]
    if quoted:
        raise InputError(f'the sheet name "{quoted[0]}" holds an apostrophe, which the formula '
                         "library misreads (its formulas would get wrong values); rename the sheet "
                         "in the template and retry (nothing was written)")
    import formulas  # imported here: it takes a second to load and only filling needs it

    with contextlib.redirect_stderr(io.StringIO()):
        model = formulas.ExcelModel().loads(str(path)).finish()
        nodes = set(model.dsp.data_nodes)
        inputs = {}
        for (sheet, ref), value in given.items():
            key = _key_for(path.name, sheet, ref)
            if key in nodes:
                inputs[key] = np.array(value, dtype=object) if isinstance(value, list) else value
        solution = model.calculate(inputs=inputs)
    names = {s.upper(): s for s in sheets}
    out: dict[tuple[str, str], Value] = {}
    for key, result in solution.items():
        cells = _cells(key, names)
        value = getattr(result, "value", None)
        if cells is None or value is None:
            continue
        grid = np.asarray(value, dtype=object)
        if grid.ndim != 2:
            continue
        for sheet, ref, dr, dc in cells:
            if dr < grid.shape[0] and dc < grid.shape[1]:
                out[(sheet, ref)] = _plain(grid[dr, dc])
    return Evaluated(tuple(out.items()))
