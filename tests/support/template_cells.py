"""Reading a written template back in the tests: its formulas, their calls and arguments.

Formulas are split with openpyxl's formula tokenizer (a general-purpose library, not ours), so
the checks do not lean on the writer's own idea of what it wrote. :func:`argument_value` turns a
formula argument into what the host would hand the function: a defined name or an absolute
range becomes the rows of its cells, text and logical literals their values.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

from openpyxl.formula import Tokenizer
from openpyxl.worksheet.formula import ArrayFormula


@dataclass(frozen=True)
class Call:
    """One function call inside a formula: its name and its top-level argument tokens."""

    name: str
    args: tuple[tuple[Any, ...], ...]  # each argument: its tokens (value, type, subtype)


def formula_cells(wb: Any) -> list[tuple[str, str, str, str | None]]:
    """Every formula cell: (sheet, address, formula text with ``=``, array area or None)."""
    out = []
    for ws in wb.worksheets:
        for row in ws.iter_rows():
            for c in row:
                v = c.value
                if isinstance(v, ArrayFormula):
                    out.append((ws.title, c.coordinate, v.text, v.ref))
                elif isinstance(v, str) and v.startswith("="):
                    out.append((ws.title, c.coordinate, v, None))
    return out


def calls(formula: str) -> list[Call]:
    """Every function call in ``formula``, outermost first, with its top-level arguments."""
    stack: list[tuple[str, list[list[Any]]]] = []
    done: list[tuple[int, Call]] = []
    for tok in Tokenizer(formula).items:
        if tok.type == "FUNC" and tok.subtype == "OPEN":
            stack.append((tok.value[:-1].upper(), [[]]))
            continue
        if tok.type == "FUNC" and tok.subtype == "CLOSE":
            name, args = stack.pop()
            args = [a for a in args if a] if args == [[]] else args
            done.append((len(stack), Call(name, tuple(tuple(a) for a in args))))
            if stack:
                stack[-1][1][-1].append(("<call>", "FUNC", name))
            continue
        if stack and tok.type == "SEP" and tok.subtype == "ARG":
            stack[-1][1].append([])
            continue
        if stack and tok.type != "WHITE-SPACE":
            stack[-1][1][-1].append((tok.value, tok.type, tok.subtype))
    return [c for _, c in sorted(done, key=lambda d: d[0])]


def range_values(wb: Any, ref: str) -> list[list[Any]]:
    """The cells of ``'Sheet'!$B$9:$F$39`` (or one cell) as rows of values."""
    sheet, _, cells = ref.rpartition("!")
    ws = wb[sheet.strip("'")]
    got = ws[cells.replace("$", "")]
    if not isinstance(got, tuple):
        return [[got.value]]
    return [[c.value for c in row] for row in got]


def argument_value(wb: Any, arg: tuple[Any, ...]) -> Any:
    """What the host hands the function for one argument (one token: name, range or literal)."""
    assert len(arg) == 1, f"an argument of more than one token: {arg}"
    value, kind, sub = arg[0]
    if kind == "OPERAND" and sub == "TEXT":
        return value[1:-1].replace('""', '"')
    if kind == "OPERAND" and sub == "LOGICAL":
        return value.upper() == "TRUE"
    if kind == "OPERAND" and sub == "NUMBER":
        return float(value)
    assert kind == "OPERAND" and sub == "RANGE", f"not a name, range or literal: {arg}"
    if value in wb.defined_names:
        ref = wb.defined_names[value].attr_text
    else:
        ref = value
    rows = range_values(wb, ref)
    return rows[0][0] if len(rows) == 1 and len(rows[0]) == 1 else rows
