"""Test helpers for the database engines: groups of values as DuckDB tables and files."""

from __future__ import annotations

import csv
import dataclasses
from pathlib import Path
from typing import Any

import duckdb
import pandas as pd


def frame(groups: dict[str, list[Any]]) -> pd.DataFrame:
    """Long layout: one row per value, columns ``g`` (label) and ``x`` (value)."""
    return pd.DataFrame(
        {"g": [g for g, vs in groups.items() for _ in vs], "x": [v for vs in groups.values() for v in vs]}
    )


def double_table(con: Any, name: str, groups: dict[str, list[float]]) -> None:
    df = frame(groups)  # noqa: F841 (read by DuckDB's replacement scan)
    con.execute(f"CREATE OR REPLACE TABLE {name} AS SELECT g, CAST(x AS DOUBLE) AS x FROM df")


def decimal_table(con: Any, name: str, texts: dict[str, list[str]]) -> None:
    """The values as DECIMAL(38, s), cast from their text (exact: no text has more than s decimals)."""
    s = max(len(t.split(".")[1]) if "." in t else 0 for vs in texts.values() for t in vs)
    df = frame(texts)  # noqa: F841
    con.execute(f"CREATE OR REPLACE TABLE {name} AS SELECT g, CAST(x AS DECIMAL(38, {s})) AS x FROM df")


def parquet_file(path: Path, groups: dict[str, list[float]]) -> Path:
    con = duckdb.connect()
    double_table(con, "t", groups)
    con.execute(f"COPY t TO '{path}' (FORMAT parquet)")
    return path


def csv_file(path: Path, texts: dict[str, list[str]]) -> Path:
    """The values exactly as given in text, under a header ``g,x``."""
    with open(path, "w", newline="") as f:
        w = csv.writer(f)
        w.writerow(["g", "x"])
        for g, vs in texts.items():
            for t in vs:
                w.writerow([g, t])
    return path


def fields(res: Any) -> tuple[Any, ...]:
    """Every field of a result but its notes, floats as their bits (so NaN equals NaN)."""
    out = []
    for f in dataclasses.fields(res):
        if f.name == "notes":
            continue
        v = getattr(res, f.name)
        out.append(v.hex() if isinstance(v, float) else (v, f.name))
    return tuple(out)


def sorted_groups(groups: dict[str, Any]) -> dict[str, Any]:
    """The groups in the engines' order: labels sorted as text."""
    return {k: groups[k] for k in sorted(groups)}



def assert_integer_sums(sums: Any, rows: list[tuple[Any, int]]) -> None:
    """``sums`` (a GroupSums) are the Python integers' n, sum m and sum m**2 of ``rows``
    (label, integer value) per group (common practice: exact integer arithmetic)."""
    for i, lab in enumerate(sums.labels):
        vals = [x for g, x in rows if str(g) == lab]
        assert sums.n[i] == len(vals), lab
        assert sums.s[i] == sum(v - sums.offset for v in vals), lab
        assert sums.q[i] == sum((v - sums.offset) ** 2 for v in vals), lab
