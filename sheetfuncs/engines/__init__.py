"""Exact analyses pushed down to database engines: per-group exact sums computed where the data live.

``source`` (DuckDB connections, tables, queries, Parquet and CSV files; Spark DataFrames and
sessions), ``dialect`` (the SQL words the engines spell differently), ``spark``, ``moments``
(exact per-group sums that add across partitions and files), ``oneway`` (:func:`oneway_sql`),
``passes`` (the second passes: group centres, Levene, Kruskal–Wallis, the residuals'
normality) and ``analysis`` (:func:`analyse_sql`). ``engine()`` is the DuckDB module, or one
line saying how to install it.
"""

from .analysis import DEFAULT_SEED, RowsOrigin, SqlAnalysis, analyse_sql
from .moments import GroupSums, NotExact, group_sums
from .oneway import oneway_sql
from .passes import MAX_DISTINCT
from .source import engine

__all__ = [
    "GroupSums", "NotExact", "group_sums", "oneway_sql",
    "DEFAULT_SEED", "MAX_DISTINCT", "RowsOrigin", "SqlAnalysis", "analyse_sql", "engine",
]
