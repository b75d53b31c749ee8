"""Computing worksheet functions in a real Calc and comparing them with the Python call.

:func:`example_job` lays out each chosen function's documented example (docs/functions.md) on a
sheet of its own, types its formula (a table as an array formula of the result's size), and
reads what Calc shows; :func:`compare` sets each shown result beside the Python call through
:mod:`sheetfuncs.worksheet.harness` (what xlwings shows in Excel): numbers equal to a relative
1e-15, text equal, a blank table cell blank in both, a logical as Calc holds it (1 or 0). ``sheetfuncs calc check`` runs this for
``SF_P`` and ``SF_TABLE``; the tests run it for every function.
"""

from __future__ import annotations

import math
from collections.abc import Iterable, Sequence
from dataclasses import dataclass
from typing import Any

from .. import harness
from ..docs import resolve
from ..functions import EXAMPLE_SHEET, REGISTRY
from ..registry import Ref
from .names import calc_formula

__all__ = ["RELATIVE", "Example", "examples", "example_job", "compare", "check_names"]

#: The largest relative difference between Calc's number and the Python call's (issue 11).
RELATIVE = 1e-15
#: The first cell of each example's result, clear of every example's own cells.
_RESULT_COLUMN = "AA"


@dataclass(frozen=True)
class Example:
    """One function's documented example: its cells, Calc's formula and the Python result."""

    name: str
    cells: tuple[tuple[Any, ...], ...]
    formula: str
    expected: Any

    @property
    def shape(self) -> tuple[int, int]:
        if isinstance(self.expected, list):
            return len(self.expected), len(self.expected[0])
        return 1, 1

    @property
    def target(self) -> str:
        rows, cols = self.shape
        last = _column(_column_number(_RESULT_COLUMN) + cols - 1)
        return f"{_RESULT_COLUMN}1" if (rows, cols) == (1, 1) else f"{_RESULT_COLUMN}1:{last}{rows}"


def _column_number(letters: str) -> int:
    n = 0
    for ch in letters:
        n = n * 26 + ord(ch) - 64
    return n


def _column(n: int) -> str:
    out = ""
    while n:
        n, r = divmod(n - 1, 26)
        out = chr(65 + r) + out
    return out


def examples(names: Iterable[str] | None = None) -> list[Example]:
    """The documented examples of ``names`` (every function when ``None``), with the Python
    result computed through the harness."""
    out = []
    for name in names or REGISTRY:
        ex = REGISTRY[name].example
        cells = EXAMPLE_SHEET if ex.cells is None else ex.cells
        values = [resolve(a, cells) if isinstance(a, Ref) else a for a in ex.args]
        out.append(Example(name, cells, calc_formula(name, ex.args), harness.call(name, *values)))
    return out


def _sheet_rows(cells: tuple[tuple[Any, ...], ...]) -> list[list[Any]]:
    width = max(len(r) for r in cells)
    return [[float(v) if isinstance(v, int) and not isinstance(v, bool) else v for v in r]
            + [None] * (width - len(r)) for r in cells]


def example_job(chosen: Sequence[Example]) -> list[dict[str, Any]]:
    """Driver steps: one sheet per example, its cells from A1, its formula, then a read."""
    steps: list[dict[str, Any]] = [{"op": "new"}]
    for i, ex in enumerate(chosen):
        steps.append({"op": "sheet", "name": ex.name, "index": i})
        steps.append({"op": "cells", "at": "A1", "rows": _sheet_rows(ex.cells)})
        op = "formula" if ex.shape == (1, 1) else "array"
        steps.append({"op": op, "at": ex.target, "formula": ex.formula})
    steps.append({"op": "recalc"})
    steps += [{"op": "read", "sheet": ex.name, "at": ex.target, "key": ex.name} for ex in chosen]
    return steps


def _same(expected: Any, shown: Any, error: int) -> bool:
    if error:
        return False
    if isinstance(expected, float) and isinstance(shown, float):
        return expected == shown or math.isclose(expected, shown, rel_tol=RELATIVE, abs_tol=0.0)
    if isinstance(expected, bool):  # Calc holds a logical as the number 1 or 0
        return isinstance(shown, float) and shown == float(expected)
    if expected == harness.BLANK:
        return shown in ("", None)
    return type(expected) is type(shown) and expected == shown


def compare(ex: Example, read: dict[str, Any]) -> list[str]:
    """What differs between Calc's cells and the Python call (empty when they agree)."""
    expected = ex.expected if isinstance(ex.expected, list) else [[ex.expected]]
    problems = []
    for r, (want_row, got_row, err_row) in enumerate(zip(expected, read["values"], read["errors"])):
        for c, (want, got, err) in enumerate(zip(want_row, got_row, err_row)):
            if not _same(want, got, err):
                shown = f"Err:{err}" if err else repr(got)
                problems.append(f"{ex.name} row {r + 1} column {c + 1}: Calc shows {shown}, "
                                f"Python {want!r}")
    return problems


def check_names() -> tuple[str, ...]:
    """What ``sheetfuncs calc check`` computes: a scalar and a table on the example sheet."""
    return ("SF_P", "SF_TABLE")
