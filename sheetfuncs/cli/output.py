"""Values shaped for the terminal and for pipelines: JSON, CSV and aligned text.

:func:`json_ready` makes a value fit for strict JSON (infinities as ``"inf"``, undefined as
``null``); :func:`csv_safe` writes a CSV cell that a spreadsheet cannot take for a formula;
:func:`aligned` lays a table out as columns of text; :func:`cell_log` lists the cells the range
rules noted, as records.
"""

from __future__ import annotations

import math
from fractions import Fraction
from typing import Any

from ..input import LoadedGroups

__all__ = [
    "FORMULA_LEAD", "aligned", "cell_log", "csv_safe", "json_ready", "records", "text_cell",
]

#: The first characters that make a spreadsheet read text as a formula.
FORMULA_LEAD = ("=", "+", "-", "@", "\t", "\r")


def json_ready(value: Any) -> Any:
    """A value for ``json.dumps(..., allow_nan=False)``: infinities as ``"inf"``/``"-inf"``,
    NaN (undefined) as ``None``, numpy scalars and tuples converted, fractions as floats."""
    if isinstance(value, dict):
        return {str(k): json_ready(v) for k, v in value.items()}
    if isinstance(value, (list, tuple)):
        return [json_ready(v) for v in value]
    if isinstance(value, bool) or value is None or isinstance(value, str):
        return value
    if hasattr(value, "item") and not isinstance(value, (list, tuple)):
        try:
            value = value.item()
        except Exception:
            pass
        if isinstance(value, bool):
            return value
    if isinstance(value, int):
        return value
    if isinstance(value, (float, Fraction)):
        v = float(value)
        if math.isnan(v):
            return None
        if math.isinf(v):
            return "inf" if v > 0 else "-inf"
        return v
    if hasattr(value, "isoformat"):
        return value.isoformat()
    return str(value)


def csv_safe(value: Any) -> str:
    """A cell for CSV output: text that a spreadsheet could take for a formula (starting with
    ``= + - @``, tab or carriage return) gets a leading single quote; numbers in shortest
    round-trip form, ``inf``/``nan`` for infinite/undefined, blank for ``None``."""
    if value is None:
        return ""
    if isinstance(value, bool):
        return "TRUE" if value else "FALSE"
    if isinstance(value, str):
        return "'" + value if value.startswith(FORMULA_LEAD) else value
    if isinstance(value, int):
        return str(value)
    if isinstance(value, (float, Fraction)) or hasattr(value, "item"):
        try:
            v = float(value)
        except (TypeError, ValueError):
            return csv_safe(str(value))
        if math.isnan(v):
            return "nan"
        if math.isinf(v):
            return "inf" if v > 0 else "-inf"
        if v.is_integer() and abs(v) < 1e16:
            return str(int(v))
        return repr(v)
    return csv_safe(str(value))


def records(table: list[list[Any]]) -> list[dict[str, Any]]:
    """A table with one header row as one record per row, keyed by the headers."""
    header = [str(h) for h in table[0]]
    return [dict(zip(header, row)) for row in table[1:]]


def text_cell(v: Any) -> str:
    """A value as the text output shows it: six significant digits, ``infinite`` and
    ``undefined`` in words, logical values as ``TRUE``/``FALSE``, blank for ``None``."""
    if v is None:
        return ""
    if isinstance(v, bool):
        return "TRUE" if v else "FALSE"
    if isinstance(v, int):
        return str(v)
    if isinstance(v, float):
        if math.isnan(v):
            return "undefined"
        if math.isinf(v):
            return "infinite" if v > 0 else "-infinite"
        return f"{v:.6g}"
    return str(v)


def aligned(table: list[list[Any]]) -> list[str]:
    """A table as lines of text: the first and last columns left-aligned, the others
    right-aligned, two spaces apart."""
    cells = [[text_cell(v) for v in row] for row in table]
    widths = [max(len(r[j]) for r in cells if j < len(r)) for j in range(len(cells[0]))]
    lines = []
    for row in cells:
        parts = []
        for j, c in enumerate(row):
            parts.append(c.ljust(widths[j]) if j == 0 or j == len(row) - 1 else c.rjust(widths[j]))
        lines.append("  ".join(parts).rstrip())
    return lines


def cell_log(loaded: LoadedGroups) -> list[dict[str, Any]]:
    """Every cell the cleaning step noted, as records: its full address (with the sheet), what
    it held, its value and what was done with it."""
    src = loaded.source
    return [
        {"address": src.full_address(c.row, c.col), "kind": c.kind, "value": c.value,
         "action": c.action}
        for c in loaded.groups.cells
    ]
