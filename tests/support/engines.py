"""Test helpers for the database engines: groups of values as DuckDB tables and files, seeded
random data, and the bit-for-bit comparison of an engine's analysis with the in-memory one."""

from __future__ import annotations

import csv
import dataclasses
from pathlib import Path
from typing import Any

import duckdb
import numpy as np
import pandas as pd

from sheetfuncs.engines import SqlAnalysis
from sheetfuncs.input import Groups
from sheetfuncs.stats import analyse


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


def datasets_parquet(path: Path, sets: list[dict[str, list[float]]]) -> Path:
    """Many datasets in one Parquet file: columns ``ds`` (the dataset's index), ``g``, ``x`` DOUBLE."""
    parts = []
    for i, groups in enumerate(sets):
        f = frame(groups)
        f["ds"] = i
        parts.append(f)
    every = pd.concat(parts)  # noqa: F841 (read by DuckDB's replacement scan)
    duckdb.connect().execute(f"COPY (SELECT ds, g, CAST(x AS DOUBLE) AS x FROM every) TO '{path}' (FORMAT parquet)")
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


#: The results derived from the sums (bit for bit on the exact path), and those of the second passes.
FROM_SUMS = ("oneway", "welch", "effects", "pairwise", "letters", "unequal_pairs", "describe", "dunnett")


def same(a: object, b: object) -> bool:
    """Equal to the last bit: ``repr`` writes every float in full (and NaN as nan)."""
    return repr(a) == repr(b)


def check_analysis_equal(got: SqlAnalysis, groups: dict, *, all_residuals: bool = True, **opts) -> None:
    """Every figure as the in-memory call gives it; with a sample of residuals (``all_residuals``
    false) the reading may differ, and only the sentences on the spreads are compared."""
    mem = analyse(groups if isinstance(groups, Groups) else sorted_groups(groups), **opts)
    an = got.analysis
    assert an.groups is None and an.labels == mem.labels and an.counts == mem.counts
    for f in FROM_SUMS:
        assert same(getattr(an, f), getattr(mem, f)), f
    chk, mchk = an.checks, mem.checks
    for f in ("levene", "bartlett", "welch", "kruskal", "sd_ratio", "variances_unequal"):
        assert same(getattr(chk, f), getattr(mchk, f)), f
    if all_residuals:
        assert (chk.read, chk.reasons) == (mchk.read, mchk.reasons)
    else:
        assert chk.reasons[:2] == mchk.reasons[:2]
    assert same(an.kruskal, mem.kruskal)


def random_decimal_groups(seed: int) -> dict[str, list[float]]:
    """Seeded random decimal data with ties and unequal groups (invented; ``+ 0.0`` turns a
    rounded -0.0 into 0.0: a database does not keep the sign of a zero median)."""
    rng = np.random.default_rng(seed)
    k = int(rng.integers(2, 7))
    dec = int(rng.integers(0, 3))
    centre = float(rng.choice([0.0, 12.5, -300.0, 1e5]))
    return {
        f"G{i}": [float(v) + 0.0 for v in np.round(rng.normal(centre + i * 0.2, 1 + i * 0.4, int(rng.integers(2, 60))), dec)]
        for i in range(k)
    }
