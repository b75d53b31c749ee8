"""Exact analyses pushed down to database engines: per-group exact sums computed where the data live.

``source`` (DuckDB connections, tables, queries, Parquet and CSV files), ``moments`` (exact
per-group sums that add across partitions and files), ``oneway`` (:func:`oneway_sql`).
"""

from .moments import GroupSums, NotExact, group_sums
from .oneway import oneway_sql

__all__ = ["GroupSums", "NotExact", "group_sums", "oneway_sql"]
