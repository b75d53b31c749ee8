"""One local Spark session for the whole test run (Spark takes seconds to start), and helpers
that turn groups of values into Spark DataFrames."""

from __future__ import annotations

import uuid
from collections.abc import Iterator
from pathlib import Path
from typing import Any

import duckdb
import pytest

from tests.support.engines import decimal_table, parquet_file


@pytest.fixture(scope="session")
def spark_session() -> Iterator[Any]:
    """Spark in local mode on two cores: two shuffle partitions, no web UI, quiet logs."""
    from pyspark.sql import SparkSession

    spark = (
        SparkSession.builder.master("local[2]")
        .appName("sheetfuncs-tests")
        .config("spark.ui.enabled", "false")
        .config("spark.sql.shuffle.partitions", "2")
        .config("spark.default.parallelism", "2")
        .config("spark.driver.memory", "1g")
        .config("spark.ui.showConsoleProgress", "false")
        .getOrCreate()
    )
    spark.sparkContext.setLogLevel("ERROR")
    yield spark
    spark.stop()


def double_frame(spark: Any, groups: dict[str, list[float]], tmp: Path) -> Any:
    """Long layout ``g STRING, x DOUBLE``, read by Spark from a Parquet file DuckDB wrote (no
    Python worker: fast, and every double exact)."""
    path = tmp / f"double-{uuid.uuid4().hex}.parquet"
    return spark.read.parquet(str(parquet_file(path, groups)))


def decimal_frame(spark: Any, texts: dict[str, list[str]], tmp: Path) -> Any:
    """The values as DECIMAL(38, s) from their text (exact: no text has more than s decimals)."""
    con = duckdb.connect()
    decimal_table(con, "t", texts)
    path = tmp / f"decimal-{uuid.uuid4().hex}.parquet"
    con.execute(f"COPY t TO '{path}' (FORMAT parquet)")
    return spark.read.parquet(str(path))
