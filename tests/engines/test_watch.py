"""Progress of long DuckDB queries (sheetfuncs.engines.watch)."""

from __future__ import annotations

import duckdb
import pytest

from sheetfuncs.engines import analyse_sql
from sheetfuncs.engines.watch import Watched
from sheetfuncs.errors import InputError
from sheetfuncs.engines.source import run


def test_a_long_query_reports_its_progress_and_returns_its_rows():
    heard = []
    con = Watched(duckdb.connect(), lambda *a: heard.append(a), quiet=0.0)
    # a sum over 300 million rows, long enough to be polled (Gauss's formula, common practice)
    rows = con.execute("SELECT sum(i::HUGEINT) FROM range(300000000) t(i)").fetchall()
    assert rows == [(300000000 * 299999999 // 2,)]
    assert heard and all(h[0] == "query 1" and 0 <= h[1] <= 100 and h[2] == 100 for h in heard)


def test_a_short_query_says_nothing_and_errors_are_the_engines_line():
    heard = []
    con = Watched(duckdb.connect(), lambda *a: heard.append(a))
    assert con.execute("SELECT 41 + 1").fetchall() == [(42,)]
    assert heard == []
    with pytest.raises(InputError, match="the database engine rejected the query: Parser Error"):
        run(con, "SELEC 1")


def test_analyse_sql_with_progress_gives_the_same_result(tmp_path):
    con = duckdb.connect()
    con.execute("CREATE TABLE t AS SELECT 'L' || (i % 3) AS g, (i % 17) / 10.0 AS x FROM range(3000) r(i)")
    heard = []
    plain = analyse_sql((con, "t"), group="g", value="x")
    watched = analyse_sql((con, "t"), group="g", value="x", progress=lambda *a: heard.append(a))
    assert repr(watched.analysis.oneway) == repr(plain.analysis.oneway)  # the same sheetfuncs call
    assert watched.origin == plain.origin
