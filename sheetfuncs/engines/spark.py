"""Spark as an engine: a Spark DataFrame, or ``(spark, "table")`` / ``(spark, "SELECT ...")``.

pyspark is imported only when a Spark source is given. For the duration of a call,
``spark.sql.ansi.enabled`` is forced to ``true`` (without it Spark wraps a long overflow into a
wrong number, or turns a DECIMAL overflow into NULL) and the user's setting is restored
afterwards; a DataFrame is read through a temporary view that is dropped afterwards.
"""

from __future__ import annotations

import re
import uuid
from collections.abc import Iterator
from contextlib import contextmanager
from typing import Any

from ..errors import InputError
from .dialect import EngineOverflow

__all__ = ["ANSI", "is_spark", "is_spark_source", "spark_scope", "spark_columns", "spark_rows"]

ANSI = "spark.sql.ansi.enabled"
_QUERY_START = re.compile(r"^\s*\(?\s*(select|with|from|values|table)\b", re.I)
_TYPES = {"INT": "INTEGER", "LONG": "BIGINT", "SHORT": "SMALLINT", "BYTE": "TINYINT"}


def is_spark(obj: Any) -> bool:
    """Whether ``obj`` is a pyspark object (told by its module, without importing pyspark)."""
    return type(obj).__module__.split(".")[0] == "pyspark"


def is_spark_source(source: Any) -> bool:
    """A Spark DataFrame, a SparkSession, or a pair whose first item is a SparkSession."""
    if isinstance(source, tuple) and len(source) == 2:
        return is_spark(source[0])
    return is_spark(source)


def _errors() -> tuple[type[BaseException], ...]:
    """The exceptions a Spark query raises, or one line saying how to install pyspark."""
    try:
        from py4j.protocol import Py4JError
        from pyspark.errors import PySparkException
    except ImportError:
        raise InputError(
            "reading from Spark needs pyspark, which is not installed; install it with: "
            "pip install \"sheetfuncs[spark]\" (or pip install pyspark)"
        ) from None
    return (PySparkException, Py4JError)


def _first_sentence(e: BaseException) -> str:
    first = next((ln.strip() for ln in str(e).splitlines() if ln.strip()), type(e).__name__)
    first = " ".join(first.split())
    cut = first.find(". ")
    return first[:cut] if cut > 0 else first.rstrip(".")


def spark_rows(spark: Any, sql: str) -> list[tuple[Any, ...]]:
    """The rows of ``sql``; an engine error becomes one line that starts with Spark's own."""
    errors = _errors()
    try:
        return [tuple(r) for r in spark.sql(sql).collect()]
    except errors as e:
        first = _first_sentence(e)
        kind = EngineOverflow if first.startswith("[ARITHMETIC_OVERFLOW]") else InputError
        raise kind(
            f"the database engine (Spark) rejected the query: {first}; check the "
            "table or query, the column names and the filter"
        ) from None


def spark_columns(spark: Any, src: str) -> dict[str, str]:
    """The columns of the rows ``src`` and their types, spelled as DuckDB spells them
    (``DOUBLE``, ``BIGINT``, ``DECIMAL(38,3)``, ...)."""
    errors = _errors()
    try:
        schema = spark.sql(f"SELECT * FROM {src}").schema
    except errors as e:
        raise InputError(
            f"the database engine (Spark) rejected the query: {_first_sentence(e)}; check the "
            "table or query, the column names and the filter"
        ) from None
    out = {}
    for f in schema.fields:
        t = f.dataType.simpleString().upper()
        out[f.name] = _TYPES.get(t, t)
    return out


def _resolve(source: Any) -> tuple[Any, str, str, str | None]:
    """The session, the ``FROM`` text, a name for messages and a temporary view to drop."""
    if isinstance(source, tuple):
        spark, text = source
        if not hasattr(spark, "sql") or not hasattr(spark, "conf"):
            raise InputError(
                f"the first item of source must be a SparkSession, not {type(spark).__name__}"
            )
        if not isinstance(text, str) or not text.strip():
            raise InputError(f'the second item of source must be a table name or a query, not {text!r}')
        if _QUERY_START.match(text):
            return spark, f"({text}) AS sheetfuncs_rows", "the query", None
        return spark, text, text.strip(), None
    if hasattr(source, "sparkSession") and hasattr(source, "createOrReplaceTempView"):
        view = "sheetfuncs_rows_" + uuid.uuid4().hex
        source.createOrReplaceTempView(view)
        return source.sparkSession, view, "the DataFrame", view
    raise InputError(
        f"a Spark {type(source).__name__} alone does not say which rows to read; pass a "
        "DataFrame, (spark, \"table\") or (spark, \"SELECT ...\")"
    )


@contextmanager
def spark_scope(source: Any) -> Iterator[tuple[Any, str, str]]:
    """``(session, FROM text, name)`` with ANSI mode forced; the user's setting and catalog are
    restored on the way out."""
    _errors()
    spark, src, name, view = _resolve(source)
    before = spark.conf.get(ANSI, None)
    spark.conf.set(ANSI, "true")
    try:
        yield spark, src, name
    finally:
        if before is None:
            spark.conf.unset(ANSI)
        else:
            spark.conf.set(ANSI, before)
        if view is not None:
            spark.catalog.dropTempView(view)
