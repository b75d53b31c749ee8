"""Where the rows come from: a DuckDB connection with a table or query, a Parquet or CSV file,
or Spark (a DataFrame, or a SparkSession with a table or query: :mod:`.spark`).

A :class:`Relation` holds the connection, the ``FROM`` text of the rows, the engine's
:class:`~.dialect.Dialect`, and the two columns checked against the relation's schema. Engine
errors become one :class:`InputError` line.
"""

from __future__ import annotations

import os
import re
from collections.abc import Callable, Iterator, Sequence
from contextlib import contextmanager
from dataclasses import dataclass
from typing import Any

from ..errors import InputError
from .dialect import DUCKDB, SPARK, Dialect
from .spark import is_spark, is_spark_source, spark_columns, spark_rows, spark_scope
from .watch import Watched

__all__ = ["Relation", "open_relation", "opened", "quote", "run", "engine"]

_QUERY_START = re.compile(r"^\s*\(?\s*(select|with|from|values|table|pivot|unpivot)\b", re.I)
_INTEGER_TYPES = frozenset({
    "TINYINT", "SMALLINT", "INTEGER", "BIGINT", "HUGEINT",
    "UTINYINT", "USMALLINT", "UINTEGER", "UBIGINT",
})
_FLOAT_TYPES = frozenset({"FLOAT", "DOUBLE"})


@dataclass(frozen=True)
class Relation:
    """The rows to analyse: ``con`` runs SQL, ``src`` is the text after ``FROM``; ``group`` and
    ``value`` are the columns as SQL identifiers, ``kind`` the value column's kind
    (``"double"``, ``"decimal"``, ``"integer"``), ``decimals`` a DECIMAL column's scale,
    ``where`` the filter (``TRUE`` when none), ``name`` what the messages call the source and
    ``dialect`` the engine's SQL spelling."""

    con: Any
    src: str
    group: str
    value: str
    kind: str
    decimals: int
    where: str
    name: str
    value_name: str
    dialect: Dialect = DUCKDB


def quote(name: str) -> str:
    """``name`` as a quoted SQL identifier (DuckDB's spelling)."""
    return DUCKDB.quote(name)


def _literal(text: str) -> str:
    return "'" + text.replace("'", "''") + "'"


def engine() -> Any:
    """The ``duckdb`` module, or one line saying how to install it (it is an optional extra)."""
    try:
        import duckdb
    except ImportError:
        raise InputError(
            "reading from a database engine needs DuckDB, which is not installed; install it "
            "with: pip install \"sheetfuncs[sql]\" (or pip install duckdb)"
        ) from None
    return duckdb


def run(con: Any, sql: str, params: Sequence[Any] = ()) -> list[tuple[Any, ...]]:
    """The rows of ``sql``; an engine error becomes one line that starts with the engine's own.
    ``con`` is a DuckDB connection or a SparkSession (then ``params`` must be empty)."""
    if is_spark(con):
        return spark_rows(con, sql)
    duckdb = engine()
    try:
        return con.execute(sql, list(params)).fetchall()
    except duckdb.Error as e:
        first = next((ln.strip() for ln in str(e).splitlines() if ln.strip()), type(e).__name__)
        raise InputError(
            f"the database engine rejected the query: {' '.join(first.split())}; check the "
            "table or query, the column names and the filter"
        ) from None


def _quiet(con: Any) -> Any:
    """``con`` without DuckDB's progress bar: a library call prints nothing."""
    con.execute("SET enable_progress_bar = false")
    return con


def _from_path(path: str) -> tuple[Any, str]:
    duckdb = engine()
    low = path.lower()
    if not os.path.isfile(path):
        raise InputError(f"no file {path!r}; give the path of a .parquet or .csv file")
    if low.endswith(".parquet"):
        return _quiet(duckdb.connect()), f"read_parquet({_literal(path)})"
    if low.endswith((".csv", ".csv.gz", ".tsv")):
        return _quiet(duckdb.connect()), f"read_csv({_literal(path)})"
    raise InputError(
        f"cannot tell how to read {path!r}; give a .parquet or .csv file, or a DuckDB "
        "connection with a table or query: (con, \"my_table\")"
    )


def _resolve(source: Any) -> tuple[Any, str, str]:
    """The connection, the ``FROM`` text and a name for messages."""
    if isinstance(source, (str, os.PathLike)):
        path = os.fspath(source)
        con, src = _from_path(path)
        return con, src, os.path.basename(path)
    if isinstance(source, tuple) and len(source) == 2 and isinstance(source[1], str):
        con, text = source
        if not hasattr(con, "execute"):
            raise InputError(
                f"the first item of source must be a DuckDB connection, not {type(con).__name__}"
            )
        if _QUERY_START.match(text):
            return con, f"({text}) AS sheetfuncs_rows", "the query"
        return con, text, text.strip()
    if hasattr(source, "execute"):
        raise InputError(
            "a connection alone does not say which rows to read; pass (con, \"table\") or "
            "(con, \"SELECT ...\")"
        )
    raise InputError(
        f"cannot read rows from {type(source).__name__}; give a .parquet or .csv path, or "
        "(DuckDB connection, table name or query)"
    )


def _column(cols: dict[str, str], name: Any, role: str, where: str) -> str:
    if not isinstance(name, str) or not name:
        raise InputError(f"{role} must be a column name, not {name!r}")
    if name in cols:
        return name
    folded = [c for c in cols if c.lower() == name.lower()]
    if len(folded) == 1:
        return folded[0]
    shown = ", ".join(list(cols)[:12]) + (", ..." if len(cols) > 12 else "")
    raise InputError(f'no column "{name}" in {where} (its columns: {shown}); check the {role} name')


def _kind(type_name: str, value: str) -> tuple[str, int]:
    t = type_name.upper()
    if t in _FLOAT_TYPES:
        return "double", 0
    if t in _INTEGER_TYPES:
        return "integer", 0
    m = re.fullmatch(r"DECIMAL\((\d+),\s*(\d+)\)", t)
    if m:
        return "decimal", int(m.group(2))
    raise InputError(
        f'the value column "{value}" holds {type_name}, not numbers; give a numeric column '
        f"(or cast it in a query: (con, \"SELECT ..., CAST({value} AS DOUBLE) AS {value} ...\"))"
    )


def open_relation(source: Any, group: Any, value: Any, where: str | None) -> Relation:
    """The :class:`Relation` for a DuckDB ``source`` or file, its two columns checked against
    its schema (Spark sources go through :func:`opened`)."""
    con, src, name = _resolve(source)
    return _relation(con, src, name, group, value, where, DUCKDB)


@contextmanager
def opened(source: Any, group: Any, value: Any, where: str | None,
           progress: Callable[[str, int, int], None] | None = None) -> Iterator[Relation]:
    """The :class:`Relation` for any ``source``; for Spark, with ANSI mode forced inside. With
    ``progress``, DuckDB queries report how far they are (:class:`~.watch.Watched`)."""
    if is_spark_source(source):
        with spark_scope(source) as (spark, src, name):
            yield _relation(spark, src, name, group, value, where, SPARK)
    else:
        con, src, name = _resolve(source)
        if progress is not None:
            con = Watched(con, progress)
        yield _relation(con, src, name, group, value, where, DUCKDB)


def _relation(
    con: Any, src: str, name: str, group: Any, value: Any, where: str | None, dialect: Dialect
) -> Relation:
    if where is not None and (not isinstance(where, str) or not where.strip()):
        raise InputError(f"where must be SQL text such as \"line = 'A'\", not {where!r}")
    if dialect is SPARK:
        cols = spark_columns(con, src)
    else:
        cols = {str(r[0]): str(r[1]) for r in run(con, f"DESCRIBE SELECT * FROM {src}")}
    g = _column(cols, group, "group", name)
    v = _column(cols, value, "value", name)
    if g == v:
        raise InputError(f'the group and the value are the same column "{g}"; give two columns')
    kind, decimals = _kind(cols[v], v)
    return Relation(
        con, src, dialect.quote(g), dialect.quote(v), kind, decimals,
        f"({where})" if where else "TRUE", name, v, dialect,
    )
