"""``docs/functions.md``, generated from the registry of worksheet functions.

``python -m sheetfuncs.worksheet.docs --markdown`` prints the page; ``--check [PATH]`` exits 1
when the file (default ``docs/functions.md``) is out of date. The page lists every registered
function in the registry's order, with its arguments, what it returns and a worked example on
invented data, whose output is computed through :mod:`sheetfuncs.worksheet.harness`, exactly as
a cell would show it. Nothing in the package imports this module.
"""

from __future__ import annotations

import argparse
import sys
from pathlib import Path
from typing import Any

from ..input import parse_range
from . import harness
from .functions import EXAMPLE_NOTE, EXAMPLE_SHEET, REGISTRY
from .registry import Example, Function, Ref

__all__ = ["DOCS_PATH", "resolve", "markdown", "main"]

#: Where the page lives in a source checkout.
DOCS_PATH = Path(__file__).resolve().parents[2] / "docs" / "functions.md"


def resolve(ref: Ref, cells: tuple[tuple[Any, ...], ...]) -> list[list[Any]]:
    """The block of ``cells`` (laid out from A1) that ``ref`` points at, as rows."""
    bounds = parse_range(ref.address)
    if bounds is None or bounds.max_row is None or bounds.max_col is None or bounds.sheet is not None:
        raise ValueError(f"not an A1 reference into the example cells: {ref.address}")
    width = max(len(r) for r in cells)
    grid = [list(r) + [None] * (width - len(r)) for r in cells]
    out: list[list[Any]] = []
    for r in range(bounds.min_row - 1, bounds.max_row):
        row = grid[r] if r < len(grid) else [None] * width
        out.append([row[c] if c < width else None for c in range(bounds.min_col - 1, bounds.max_col)])
    return out


def _shown(v: Any) -> str:
    """A cell value as the docs print it (6 significant digits)."""
    if v is None or v == "":
        return ""
    if isinstance(v, bool):
        return "TRUE" if v else "FALSE"
    if isinstance(v, float):
        if v == int(v) and abs(v) < 1e15:
            return str(int(v))
        return f"{v:.6g}".replace("e", "E")
    if isinstance(v, int):
        return str(v)
    return str(v).replace("|", "\\|")


def _md_table(header: list[str], rows: list[list[Any]]) -> list[str]:
    out = ["| " + " | ".join(header) + " |", "| " + " | ".join("---" for _ in header) + " |"]
    out += ["| " + " | ".join(_shown(v) for v in r) + " |" for r in rows]
    return out


def _sheet_table(cells: tuple[tuple[Any, ...], ...]) -> list[str]:
    width = max(len(r) for r in cells)
    header = [" "] + [chr(65 + i) for i in range(width)]
    rows = [[str(i + 1)] + list(r) + [None] * (width - len(r)) for i, r in enumerate(cells)]
    return _md_table(header, rows)


_INTRO = """\
# Worksheet functions

Generated from the registry of worksheet functions (`sheetfuncs/worksheet/functions/`, which
`sheetfuncs.udfs` hands to xlwings) by `python -m sheetfuncs.worksheet.docs --markdown`; do not
edit by hand (`python -m sheetfuncs.worksheet.docs --check` tells whether this page is current).
Setting the functions up in a spreadsheet is described in the README ("Using it in a
spreadsheet").

## How every function behaves

* **Data first, options after.** Every option is optional; leave it out or leave it empty
  (`=SF_TABLE(A1:C7,,FALSE)`) to get its default. Some locales separate arguments with `;`.
* **Ranges** follow the host's own statistics functions: numbers count; blank cells, text and
  logical values are ignored; a column (or row) that is entirely blank is ignored. `layout` is
  `"wide"` (one group per column, the default), `"long"` (two columns: group label, value) or
  `"rowwise"` (one group per row). `labels` is `"auto"` (the first row, or first column when
  rowwise, holds labels when all its non-blank cells are text), TRUE or FALSE. Point at the
  block that holds the data (or at a table column): a whole-column reference such as `A:C` works
  but makes every recalculation read a million rows per column.
* **Tables spill** with one header row, so a chart or `INDEX()` can point at them. Spilling needs
  a host with dynamic arrays; in older hosts select the output block first and enter the formula
  as an array formula (Ctrl+Shift+Enter).
* **One figure out of a table.** `INDEX()` picks one cell of a spilled result, so a QA sheet can
  hold a single figure: `=INDEX(SF_WELCH(A1:C7),2,5)` is Welch's p-value. When the function
  returns a message instead, `INDEX()` gives an error value (a message has no second row), which
  the `ISNUMBER()` guard below catches in the same way.
* **Blank** cells in a result mean "not defined here" (for example the SD of a one-value group).
  An **infinite** F, when there is no variation within the groups, shows as the largest double,
  1.7976931348623157E+308, so comparisons still work.
* **Input problems** put one line of text in the cell, starting `sheetfuncs: `, saying what is
  wrong and how to fix it, for example `sheetfuncs: the data hold the error #N/A at row 4,
  column 2 of the range; fix or clear that cell`.
* **Guard decisions with `ISNUMBER()`.** The host compares any text as greater than any number,
  so `=SF_P(A1:C7)<0.05` is FALSE when the cell holds a message instead of a p-value, and a
  broken input would read as "no difference". Write instead
  `=IF(ISNUMBER(SF_P(A1:C7)), SF_P(A1:C7)<0.05, "check the data")`.
* **Methods.** The assumption checks and the alternatives to the F test (with the rule
  `SF_CHECKS` uses to say which test to read) are described in `docs/checks.md`, the
  comparisons and letters in `docs/comparisons.md`, effect sizes, planning and variance
  components in `docs/effects.md`, each with its published sources.
* **Cautions.** Statistics support but do not replace engineering judgement. Check the
  assumptions (independent observations, similar spreads, roughly normal residuals), follow your
  organisation's quality procedures, applicable standards and regulations, and validate the tool
  under your organisation's software-validation procedure before using it for regulated decisions.
"""


def markdown() -> str:
    """``docs/functions.md``: the intro, the example sheet, then every registered function."""
    lines = _INTRO.splitlines()
    lines += ["", "## The example sheet", "", EXAMPLE_NOTE, ""]
    lines += _sheet_table(EXAMPLE_SHEET)
    lines += ["", "## Functions", ""]
    lines += [f"* [`{f.signature}`](#{f.name.lower()}): {f.description}" for f in REGISTRY.values()]
    for f in REGISTRY.values():
        lines += _function_section(f)
    return "\n".join(lines) + "\n"


def _function_section(f: Function) -> list[str]:
    """One function's section: signature, description, arguments, what it returns, example."""
    lines = ["", f"## {f.name}", "", f"`={f.signature}`", "", f.description, ""]
    lines += ["| argument | kind | default | what it is |", "| --- | --- | --- | --- |"]
    for a in f.args:
        lines.append(f"| `{a.name}` | {a.kind} | {a.default_text} | {a.help} |")
    result = "one value" if f.result == "scalar" else "a table that spills"
    lines += ["", f"**Returns** {result}. {f.returns}"]
    if f.columns:
        lines[-1] += " Columns: " + ", ".join(f"`{c}`" for c in f.columns) + "."
    return lines + _example_lines(f)


def _example_lines(f: Function) -> list[str]:
    """The worked example: its note, its own cells when it has them, the formula and what the
    cell shows, computed through the harness."""
    ex = f.example
    values = [resolve(a, _cells(ex)) if isinstance(a, Ref) else a for a in ex.args]
    out = harness.call(f.name, *values)
    lines = ["", f"**Example.** {ex.note}" + ("" if ex.note.endswith(("?", ".", ":")) else ":")]
    if not ex.shared:
        lines += [""] + _sheet_table(_cells(ex))
    if isinstance(out, list):
        lines += ["", f"`{f.example_formula}` spills", ""]
        lines += _md_table([_shown(v) for v in out[0]], out[1:])
    else:
        lines += ["", f"`{f.example_formula}` returns `{_shown(out)}`."]
    return lines


def _cells(ex: Example) -> tuple[tuple[Any, ...], ...]:
    """The cells an example's references point into."""
    return EXAMPLE_SHEET if ex.cells is None else ex.cells


def main(argv: list[str] | None = None) -> int:
    """``--markdown`` prints the page; ``--check [PATH]`` compares it with the file."""
    parser = argparse.ArgumentParser(prog="python -m sheetfuncs.worksheet.docs", description=__doc__.splitlines()[0])
    group = parser.add_mutually_exclusive_group(required=True)
    group.add_argument("--markdown", action="store_true", help="print docs/functions.md")
    group.add_argument("--check", nargs="?", const=str(DOCS_PATH), metavar="PATH",
                       help="exit 1 when PATH (default docs/functions.md) is out of date")
    opts = parser.parse_args(argv)
    text = markdown()
    if opts.markdown:
        sys.stdout.write(text)
        return 0
    path = Path(opts.check)
    current = path.read_text(encoding="utf-8") if path.exists() else None
    if current != text:
        print(f"{path} is out of date; run: python -m sheetfuncs.worksheet.docs --markdown > {path}", file=sys.stderr)
        return 1
    print(f"{path} is up to date")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
