"""Build spreadsheet ranges (rows of cells, None for blanks) from a mapping label -> values,
in the three layouts of GUIDE.md. Shared by the worksheet-function tests."""

from __future__ import annotations

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
