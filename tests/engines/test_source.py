"""Where oneway_sql reads rows from, and the one line for each source it cannot use.

The analyses themselves are checked in test_oneway.py; these tests check the messages (common
practice: one line that says what is wrong and what to do).
"""

from __future__ import annotations

import duckdb
import pytest

import sheetfuncs as sf
from sheetfuncs.engines import oneway_sql
from sheetfuncs.engines.source import open_relation, quote
from tests.support.engines import csv_file, double_table


@pytest.fixture()
def con():
    c = duckdb.connect()
    double_table(c, "t", {"A": [1.0, 2.0], "B": [3.0, 4.5]})
    c.execute("CREATE TABLE s AS SELECT * FROM (VALUES ('A', 'x'), ('B', 'y')) v(g, x)")
    return c


def _message(source, **kw) -> str:
    args = {"group": "g", "value": "x", **kw}
    with pytest.raises(sf.InputError) as e:
        oneway_sql(source, **args)
    return str(e.value)


def test_table_query_and_files_read_the_same(con, tmp_path):
    # the same rows through a table, a query and a CSV file: the same result (the Python call)
    path = csv_file(tmp_path / "d.csv", {"A": ["1.0", "2.0"], "B": ["3.0", "4.5"]})
    a = oneway_sql((con, "t"), group="g", value="x")
    b = oneway_sql((con, "  select g, x from t"), group="G", value="X")
    c = oneway_sql(path, group="g", value="x")
    d = oneway_sql(str(path), group="g", value="x")
    assert a == b == c == d
    assert a.f == sf.oneway({"A": [1.0, 2.0], "B": [3.0, 4.5]}).f


def test_quote_doubles_quotes():
    assert quote('we"ird') == '"we""ird"'


def test_kind_of_the_value_column(con):
    con.execute("CREATE TABLE k AS SELECT 'A' AS g, 1::INTEGER AS i, 1.5::DECIMAL(9, 2) AS d, 2.5::FLOAT AS f")
    kinds = {v: open_relation((con, "k"), "g", v, None).kind for v in ("i", "d", "f")}
    assert kinds == {"i": "integer", "d": "decimal", "f": "double"}
    assert open_relation((con, "k"), "g", "d", None).decimals == 2


def test_missing_column(con):
    assert _message((con, "t"), value="weight") == (
        'sheetfuncs: no column "weight" in t (its columns: g, x); check the value name'
    )
    assert _message((con, "t"), group="line") == (
        'sheetfuncs: no column "line" in t (its columns: g, x); check the group name'
    )


def test_non_numeric_value_column(con):
    assert _message((con, "s")) == (
        'sheetfuncs: the value column "x" holds VARCHAR, not numbers; give a numeric column '
        '(or cast it in a query: (con, "SELECT ..., CAST(x AS DOUBLE) AS x ..."))'
    )


def test_engine_errors_give_the_engines_first_line(con):
    assert _message((con, "nope")) == (
        "sheetfuncs: the database engine rejected the query: Catalog Error: Table with name nope "
        "does not exist!; check the table or query, the column names and the filter"
    )
    assert _message((con, "select g, x fro t")).startswith(
        "sheetfuncs: the database engine rejected the query: Parser Error: syntax error at or near"
    )
    assert "\n" not in _message((con, "t"), where="x >")


def test_sources_that_cannot_be_read(con, tmp_path):
    assert _message(con) == (
        'sheetfuncs: a connection alone does not say which rows to read; pass (con, "table") or '
        '(con, "SELECT ...")'
    )
    assert _message(42) == (
        "sheetfuncs: cannot read rows from int; give a .parquet or .csv path, or "
        "(DuckDB connection, table name or query)"
    )
    assert _message(("not a connection", "t")) == (
        "sheetfuncs: the first item of source must be a DuckDB connection, not str"
    )
    missing = tmp_path / "none.parquet"
    assert _message(missing) == f"sheetfuncs: no file {str(missing)!r}; give the path of a .parquet or .csv file"
    other = tmp_path / "data.xlsx"
    other.write_bytes(b"")
    assert _message(other).startswith(f"sheetfuncs: cannot tell how to read {str(other)!r}; give a .parquet")


def test_bad_options(con):
    assert _message((con, "t"), group="x") == (
        'sheetfuncs: the group and the value are the same column "x"; give two columns'
    )
    assert _message((con, "t"), where="  ") == (
        "sheetfuncs: where must be SQL text such as \"line = 'A'\", not '  '"
    )
    assert _message((con, "t"), group=3) == "sheetfuncs: group must be a column name, not 3"
    assert _message((con, "t"), missing="skip") == (
        'sheetfuncs: missing must be "stop" (a NULL or NaN value stops the analysis) or "drop" '
        "(they are left out and counted), not 'skip'"
    )


def test_without_duckdb_one_line_says_how_to_install_it(tmp_path, monkeypatch):
    import sys

    import sheetfuncs as sf

    data = tmp_path / "x.csv"
    data.write_text("head,w\nA,1.5\nA,1.6\nB,1.7\nB,1.9\n", encoding="utf-8")
    monkeypatch.setitem(sys.modules, "duckdb", None)  # as if it were not installed
    with pytest.raises(sf.InputError) as err:
        sf.oneway_sql(data, group="head", value="w")
    assert str(err.value) == ('sheetfuncs: reading from a database engine needs DuckDB, which is not '
                              'installed; install it with: pip install "sheetfuncs[sql]" (or pip '
                              'install duckdb)')
