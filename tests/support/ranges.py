"""Build spreadsheet ranges (rows of cells, None for blanks) from a mapping label -> values,
in the three layouts of GUIDE.md. Shared by the worksheet-function tests."""

from __future__ import annotations

import decimal
from typing import Any


def wide(groups: dict[str, list[float]], header: bool = True) -> list[list[Any]]:
    """One group per column, labels in the first row when ``header``."""
    labels = list(groups)
    n = max(len(v) for v in groups.values())
    rows = [labels] if header else []
    for i in range(n):
        rows.append([groups[k][i] if i < len(groups[k]) else None for k in labels])
    return rows


def long(groups: dict[str, list[float]], header: bool = True, names: tuple[str, str] = ("Group", "Value")) -> list[list[Any]]:
    """Two columns, group label and value, under a header row ``names`` when ``header``."""
    rows = [list(names)] if header else []
    for k, vals in groups.items():
        rows += [[k, v] for v in vals]
    return rows


def rowwise(groups: dict[str, list[float]], header: bool = True) -> list[list[Any]]:
    """One group per row, labels in the first column when ``header``."""
    n = max(len(v) for v in groups.values())
    return [([k] if header else []) + v + [None] * (n - len(v)) for k, v in groups.items()]


def with_blank_columns(rows: list[list[Any]]) -> list[list[Any]]:
    """The rows with an all-blank column in the middle (second) and one at the right edge, as a
    range drawn wider than the data; the rows are changed in place and returned."""
    for r in rows:
        r.insert(1, None)
        r.append(None)
    return rows


def as_decimals(rows: list[list[Any]]) -> list[list[Any]]:
    """The rows with every float as a ``decimal.Decimal`` of its shortest form, as currency-
    formatted cells arrive from the host."""
    return [[decimal.Decimal(repr(v)) if isinstance(v, float) else v for v in r] for r in rows]
