"""Result tables on a sheet: a header row, then body cells styled by the kind of their column.

A core result's ``table()`` is a header-first list of rows (the spill layout of the worksheet
functions). :func:`put_table` writes it with each column's number format read from its header
(``p``, ``df``, ``n``, ``Mean``, ``SS``, ``F`` ...), marks its p-values for conditional
formatting, and :func:`mark_differs` marks the pairs that differ.
"""

from __future__ import annotations

import math
from typing import Any

import numpy as np
from openpyxl.utils import get_column_letter

from ..formats import Precision, fixed, sig_decimals
from ..grid import Grid, Style
from .styles import INT_STYLE, P_STYLE, TEXT, TH, df_style, stat_style, yes_rule

__all__ = ["header_kind", "kind_style", "column_stat_format", "put_table", "mark_differs"]


def column_stat_format(values: list[Any]) -> str | None:
    """One format for a column of test statistics: four significant digits of its largest
    value, between two and four decimals (scientific when every value is tiny)."""
    finite = [abs(float(v)) for v in values
              if isinstance(v, (int, float, np.floating)) and not isinstance(v, bool) and math.isfinite(float(v))]
    if not finite:
        return None
    top = max(finite)
    if 0 < top < 1e-3:
        return "0.000E+00"
    return fixed(min(4, max(2, sig_decimals(top))))


def kind_style(kind: str, v: Any, prec: Precision) -> Style:
    """The style of one table cell by the kind of its column."""
    if kind == "p":
        return P_STYLE
    if kind == "df":
        return df_style(v)
    if kind == "n":
        return INT_STYLE
    if kind == "value":
        return Style(num=prec.value_format(v))
    if kind == "mean":
        return Style(num=prec.mean_format(v))
    if kind == "square":
        return Style(num=prec.square_format(v))
    if kind == "share":
        return Style(num="0.000")
    if kind == "stat":
        return stat_style(v)
    if kind == "text":
        return TEXT
    if kind == "flag":
        return Style(halign="center")
    if kind == "label":
        return Style(valign="top")
    return Style()


def header_kind(h: Any, overrides: dict[str, str] | None = None) -> str:
    """The kind of a column from its header (``overrides`` maps a header to a kind)."""
    s = str(h or "").strip()
    low = s.lower()
    if overrides and s in overrides:
        return overrides[s]
    if low in ("p", "p-value", "adjusted p", "p (adjusted)", "p adj", "p (adj.)") or low.startswith("p ("):
        return "p"
    if low in ("df", "df1", "df2") or low.startswith("df"):
        return "df"
    if low == "n":
        return "n"
    if low in ("differs", "letters"):
        return "flag"
    if low in ("ss", "ms"):
        return "square"
    if low in ("mean", "sd", "se", "difference", "median", "lower", "upper") or low.startswith(("ci low", "ci high")):
        return "mean"
    if low in ("min", "max"):
        return "value"
    if low in ("f", "statistic", "h", "w", "t", "q", "value"):
        return "stat"
    if low in ("reading", "note", "what it means", "interval"):
        return "text"
    return "label"


def _put_header(grid: Grid, top: int, header: list[Any], kinds: list[str], cols: list[int]) -> None:
    for j, h in enumerate(header):
        numeric = kinds[j] not in ("label", "text", "flag")
        align = "right" if numeric else ("center" if kinds[j] == "flag" else None)
        grid.put(top, cols[j], "" if h is None else str(h), TH.but(halign=align))


def _put_body(grid: Grid, top: int, table: list[list[Any]], kinds: list[str], cols: list[int],
              prec: Precision, left: int, bools: tuple[str, str]) -> int:
    """The body rows under the header at ``top``; returns the last row written (``top`` if none)."""
    stat_formats = {j: column_stat_format([row[j] for row in table[1:] if j < len(row)])
                    for j, kind in enumerate(kinds) if kind == "stat"}
    r = top
    for r, row in enumerate(table[1:], top + 1):
        for j, v in enumerate(row):
            kind = kinds[j] if j < len(kinds) else "label"
            col = cols[j] if j < len(cols) else left + j
            if isinstance(v, (bool, np.bool_)):
                grid.put(r, col, bools[0] if v else bools[1], Style(halign="center", valign="top"))
                continue
            st = kind_style(kind, v, prec)
            if j in stat_formats and stat_formats[j] and not isinstance(v, (int, np.integer)):
                st = Style(num=stat_formats[j])
            st = st.but(valign="top")
            if isinstance(v, str) and kind not in ("label", "text", "flag"):
                st = Style(halign="right")
            grid.put(r, col, v, st)
    return r


def put_table(
    grid: Grid,
    top: int,
    table: list[list[Any]],
    prec: Precision,
    overrides: dict[str, str] | None = None,
    left: int = 1,
    bools: tuple[str, str] = ("yes", "no"),
    text_col: int | None = None,
) -> tuple[int, int, list[str]]:
    """Write a header-first table; returns (first body row, last body row, kinds per column).

    With ``text_col``, a last column of plain-words text is placed in that column, so that the
    tables of one sheet share one wide text column."""
    header = table[0]
    kinds = [header_kind(h, overrides) for h in header]
    cols = [left + j for j in range(len(header))]
    if text_col is not None and kinds and kinds[-1] == "text" and cols[-1] < text_col:
        cols[-1] = text_col
    _put_header(grid, top, header, kinds, cols)
    r = _put_body(grid, top, table, kinds, cols, prec, left, bools)
    first = top + 1
    last = max(r, top)
    for j, kind in enumerate(kinds):
        if kind == "p" and last >= first:
            col = get_column_letter(cols[j])
            grid.conditional.append((f"{col}{first}:{col}{last}", None))
    return first, last, kinds


def mark_differs(g: Grid, header: list[Any], first: int, last: int) -> None:
    """Mark the ``yes`` cells of a table's Differs column (rows ``first..last``)."""
    for j, h in enumerate(header):
        if str(h).strip().lower() in ("differs", "differs?", "different"):
            col = get_column_letter(1 + j)
            g.conditional.append((f"{col}{first}:{col}{last}", yes_rule("yes")))
