"""What differs between the SQL engines that the exact sums run in: DuckDB and Spark SQL.

The queries in :mod:`sheetfuncs.engines.moments` are written once; the few words the engines
spell differently come from a :class:`Dialect`:

* identifiers: DuckDB quotes with ``"``, Spark with backticks (``"`` is a string there);
* NaN and infinity: Spark has ``isnan`` but no ``isfinite`` or ``isinf``; ``NaN = NaN`` is
  true in both, so NaN is always tested for explicitly;
* the wide integer: DuckDB's 128-bit ``HUGEINT``; Spark's ``DECIMAL(38, 0)``;
* sums: DuckDB sums a BIGINT column into a HUGEINT; Spark into a BIGINT, which without ANSI
  mode wraps silently. ANSI mode is forced, so an overflow is an error (:class:`EngineOverflow`);
  the query is then run again with every summed term cast to ``DECIMAL(38, 0)``
  (:meth:`Dialect.widened`), which is exact but about three times slower in Spark;
* rounding a double to an integer: ``round`` (DuckDB); ``rint`` in Spark, whose ``round`` on
  doubles goes through Java's BigDecimal (slow). The tie rule does not matter: every rounded
  value is checked by ``r / 10**D = x``;
* integer division ``//`` (DuckDB) and ``div`` (Spark); ``list`` and ``collect_list``;
* the middle values of a group (:mod:`.passes`): DuckDB's ``quantile_disc(m, 0.5)`` is the
  lower middle value, exactly in the column's type; Spark's ``percentile_disc`` returns a DOUBLE
  (inexact beyond 2**53), so Spark has no such aggregate (:meth:`Dialect.lower_middle` gives
  ``None``) and the middle ranks are found from running sums of the counts per distinct value;
* the seeded sample of rows (:meth:`Dialect.sample`): DuckDB's
  ``USING SAMPLE reservoir(N ROWS) REPEATABLE (seed)``; Spark has no repeatable reservoir, so
  the rows are ordered by ``xxhash64(seed, g, x, k)``, where ``k`` numbers the copies of equal
  rows (``row_number()`` over ``g, x``), and the first N are taken. Equal rows are
  interchangeable, so the sample's values depend only on the seed and the multiset of rows:
  not on the partitioning, the files' order or the number of cores. xxhash64 is Spark's
  documented 64-bit hash (seed 42), stable across versions.

Literals are the same in both: every power of ten is cast explicitly (``1000.0`` is a DECIMAL
in both engines).
"""

from __future__ import annotations

from dataclasses import dataclass, replace

from ..errors import InputError

__all__ = ["Dialect", "DUCKDB", "EngineOverflow", "SPARK"]

_INF = "CAST('Infinity' AS DOUBLE)"


class EngineOverflow(InputError):
    """An engine's checked integer overflow: the sums can be run again with wider totals."""


@dataclass(frozen=True)
class Dialect:
    """DuckDB's spelling; ``name`` is what messages call the engine, ``wide`` its widest
    integer type."""

    name: str = "DuckDB"
    wide: str = "HUGEINT"

    def quote(self, name: str) -> str:
        """``name`` as a quoted SQL identifier."""
        return '"' + name.replace('"', '""') + '"'

    def isfinite(self, x: str) -> str:
        return f"isfinite({x})"

    def isnan(self, x: str) -> str:
        return f"isnan({x})"

    def isinf(self, x: str) -> str:
        return f"isinf({x})"

    def intdiv(self, a: str, b: str) -> str:
        return f"{a} // {b}"

    def rint(self, x: str) -> str:
        """``x`` (a DOUBLE) rounded to an integer, as a DOUBLE."""
        return f"round({x})"

    def total(self, term: str) -> str:
        """``term`` as the argument of a ``sum`` (DuckDB's sums of BIGINT are 128-bit)."""
        return term

    def widened(self) -> Dialect | None:
        """The dialect with wider totals, to run again after an :class:`EngineOverflow`
        (``None``: none wider)."""
        return None

    def collect(self, x: str) -> str:
        """The aggregate that gathers ``x`` into one list per group."""
        return f"list({x})"

    def lower_middle(self, x: str) -> str | None:
        """The aggregate giving the lower middle value of ``x`` per group, exactly in its type
        (``None``: the engine has none; the middle ranks are picked with window functions)."""
        return f"quantile_disc({x}, 0.5)"

    def sample(self, rows: str, n: int, seed: int) -> str:
        """``g, x`` of a seeded random sample of ``n`` of the rows of the query ``rows``."""
        return f"SELECT g, x FROM ({rows}) USING SAMPLE reservoir({n} ROWS) REPEATABLE ({int(seed)})"


@dataclass(frozen=True)
class SparkDialect(Dialect):
    """Spark SQL's spelling (ANSI mode is forced for the duration of a call elsewhere)."""

    name: str = "Spark"
    wide: str = "DECIMAL(38, 0)"
    wide_totals: bool = False

    def quote(self, name: str) -> str:
        return "`" + name.replace("`", "``") + "`"

    def isfinite(self, x: str) -> str:
        return f"(NOT isnan({x}) AND abs({x}) < {_INF})"

    def isinf(self, x: str) -> str:
        return f"(abs({x}) = {_INF})"

    def intdiv(self, a: str, b: str) -> str:
        return f"{a} div {b}"

    def rint(self, x: str) -> str:
        return f"rint({x})"

    def total(self, term: str) -> str:
        return f"CAST({term} AS DECIMAL(38, 0))" if self.wide_totals else term

    def widened(self) -> Dialect | None:
        return None if self.wide_totals else replace(self, wide_totals=True)

    def collect(self, x: str) -> str:
        return f"collect_list({x})"

    def lower_middle(self, x: str) -> str | None:
        return None

    def sample(self, rows: str, n: int, seed: int) -> str:
        keyed = f"SELECT g, x, row_number() OVER (PARTITION BY g, x ORDER BY x) AS k FROM ({rows})"
        return (
            f"SELECT g, x FROM ({keyed}) ORDER BY xxhash64(CAST({int(seed)} AS INT), g, x, k), "
            f"g, x, k LIMIT {int(n)}"
        )


DUCKDB = Dialect()
SPARK = SparkDialect()
