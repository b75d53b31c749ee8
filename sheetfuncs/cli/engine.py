"""Inputs read by column through the embedded database engine, for ``report`` and ``table``.

A ``.parquet`` file, a ``.csv`` file with ``--group`` and ``--value``, or a DuckDB database file
(``--duckdb FILE.db``, opened read-only) with ``--query`` (a table name or a query). The rows
never come into Python: the exact per-group sums are computed inside the engine
(:mod:`sheetfuncs.engines`). The options of cell reading (``--sheet``, ``--range``, ...) do not
apply to such an input and are a usage error there, as are the column options for a workbook.
"""

from __future__ import annotations

import argparse
import os
from pathlib import Path
from typing import Any

from ..errors import InputError
from ..input import DEFAULT_MAX_CELLS, DEFAULT_MAX_FIELDS, DEFAULT_SIZE_LIMIT
from .parser import UsageError
from .progress import Progress

__all__ = ["by_column", "EngineInput", "engine_inputs", "open_engine_input"]

#: Cell-reading options and their defaults: set to anything else, they are a usage error for an
#: input read by column.
_CELL_OPTIONS = (
    ("sheet", "--sheet", None), ("cell_range", "--range", None), ("layout", "--layout", "wide"),
    ("labels", "--labels", "auto"), ("decimal_comma", "--decimal-comma", False),
    ("errors", "--errors", "stop"), ("merge_case", "--merge-case", False),
    ("rename", "--rename", None), ("size_limit", "--size-limit", DEFAULT_SIZE_LIMIT / 2**20),
    ("max_cells", "--max-cells", DEFAULT_MAX_CELLS), ("max_fields", "--max-fields", DEFAULT_MAX_FIELDS),
)
_COLUMN_OPTIONS = (("group", "--group"), ("value", "--value"), ("where", "--where"),
                   ("duckdb", "--duckdb"), ("query", "--query"))


class EngineInput:
    """One input read by column: ``name`` (for messages and the report's name), ``path`` (the
    file) and ``query`` (``None`` for a Parquet or CSV file)."""

    def __init__(self, path: Path, query: str | None) -> None:
        self.path = path
        self.query = query
        self.name = path.name

    @property
    def stem(self) -> str:
        return self.path.stem


def _inputs(args: argparse.Namespace) -> list[str]:
    if args.command == "report":
        return list(args.inputs)
    return [] if args.input is None else [args.input]


def by_column(args: argparse.Namespace) -> bool:
    """Whether the input is read by column (any column option, or a ``.parquet`` input);
    usage errors for a mixture the command cannot read."""
    asked = [flag for attr, flag in _COLUMN_OPTIONS if getattr(args, attr) is not None]
    parquet = [x for x in _inputs(args) if x.lower().endswith(".parquet")]
    if not asked and not parquet:
        if not _inputs(args):
            raise UsageError("give an input file (or --duckdb FILE.db --query SQL)")
        if args.missing != "stop":
            raise UsageError(
                "--missing applies to an input read by column (--group, --value); for cells, "
                "use --errors")
        return False
    cell = [flag for attr, flag, default in _CELL_OPTIONS if getattr(args, attr) != default]
    if cell:
        raise UsageError(
            f"{cell[0]} applies to cells of a workbook or CSV file read as a sheet; an input "
            "read by column (--group, --value) takes --where to choose rows"
        )
    if args.group is None or args.value is None:
        what = f"{parquet[0]} is read by column" if parquet else "reading by column"
        raise UsageError(f"{what}: give both --group COL and --value COL")
    return True


def engine_inputs(args: argparse.Namespace) -> list[EngineInput]:
    """The inputs read by column (after :func:`by_column` said yes), checked for their kind."""
    files = _inputs(args)
    if args.duckdb is not None:
        if files:
            raise UsageError(
                f"--duckdb names the input; leave out {files[0]} (or drop --duckdb)")
        if args.query is None:
            raise UsageError("--duckdb needs --query: a table name or a query (SELECT ...)")
        return [EngineInput(Path(args.duckdb), args.query)]
    if args.query is not None:
        raise UsageError("--query goes with --duckdb FILE.db (a Parquet or CSV file needs none)")
    out = []
    for f in files:
        if not f.lower().endswith((".parquet", ".csv", ".csv.gz", ".tsv")):
            raise UsageError(
                f"{f} cannot be read by column; give .parquet or .csv files, or "
                "--duckdb FILE.db --query SQL")
        out.append(EngineInput(Path(f), None))
    return out


def open_engine_input(inp: EngineInput) -> tuple[Any, Any]:
    """The ``source`` for :mod:`sheetfuncs.engines` and a function that closes what was opened."""
    if inp.query is None:
        return str(inp.path), lambda: None
    if not os.path.isfile(inp.path):
        raise InputError(f"no database file {str(inp.path)!r}; give the path of a DuckDB file")
    from ..engines import engine

    duckdb = engine()
    try:
        con = duckdb.connect(str(inp.path), read_only=True)
    except duckdb.Error as e:
        first = next((ln.strip() for ln in str(e).splitlines() if ln.strip()), type(e).__name__)
        raise InputError(
            f"cannot open {inp.path.name} as a DuckDB database: {' '.join(first.split())}"
        ) from None
    return (con, inp.query), con.close


def engine_analysis(args: argparse.Namespace, inp: EngineInput, prog: Progress,
                    **options: Any) -> Any:
    """Every analysis of one input read by column (:func:`sheetfuncs.engines.analyse_sql`);
    on a terminal, queries that run longer than a second show their progress."""
    from ..engines import analyse_sql

    source, close = open_engine_input(inp)
    prog.long_work()
    try:
        return analyse_sql(
            source, group=args.group, value=args.value, where=args.where, missing=args.missing,
            alpha=args.alpha, progress=prog if prog.active else None, **options,
        )
    finally:
        close()


def origin_lines(inp: EngineInput, res: Any) -> list[str]:
    """What was read, in words: the engine, the file or query, the filter, the rows."""
    o = res.origin
    rows = f"{o.rows_read:,} row{'s' if o.rows_read != 1 else ''}"
    an = res.analysis
    lines = [
        f"Read {inp.name} by column with {o.engine} {o.engine_version}: {rows}"
        + (f" with {o.where}" if o.where else "")
        + f", {an.n_total:,} values in {an.k} groups",
    ]
    if inp.query is not None:
        lines.append(f"  query: {' '.join(inp.query.split())}")
    lines += [f"  note: {n}" for n in o.notes]
    if res.sums is None:
        lines.append("  note: the values were fetched (more than 15 significant digits): "
                     "floating-point arithmetic")
    return lines


def origin_record(inp: EngineInput, res: Any, an: Any) -> dict[str, Any]:
    """What was read, for the JSON output."""
    o = res.origin
    s = res.sums
    return {
        "path": str(inp.path),
        "query": inp.query,
        "engine": o.engine,
        "engine_version": o.engine_version,
        "where": o.where,
        "rows_read": o.rows_read,
        "null_labels": o.null_labels,
        "labels": list(an.labels),
        "counts": list(an.counts),
        "missing": list(o.missing),
        "n_total": an.n_total,
        "notes": list(o.notes),
        "exact_sums": None if s is None else {
            "scale": s.scale, "offset": str(s.offset),
            "sum": [str(x) for x in s.s], "sum_of_squares": [str(x) for x in s.q],
            "meaning": "value = (offset + m) / 10**scale; per group n, sum of m and sum of m**2",
        },
    }
