"""oneway_sql and group_sums on Spark in local mode: the same exact sums, bit for bit, as
sheetfuncs.oneway and as the DuckDB push-down; ANSI mode forced; bad input in one line.

Sources of the checks: NIST StRD one-way ANOVA datasets (certified values, tests/reference/nist);
otherwise the Python call through the harness (``sheetfuncs.oneway`` on the same values), or
Python integers on the same values (common practice: exact integer arithmetic).
"""

from __future__ import annotations

import sys

import pytest

import sheetfuncs as sf
from sheetfuncs.engines import GroupSums, group_sums, oneway_sql
from sheetfuncs.engines import moments as engine_moments
from sheetfuncs.engines import source as engine_source
from sheetfuncs.stats import oneway_from_sums
from tests.engines.test_oneway import FIELDS, _random_datasets
from tests.support import nist
from tests.support.engines import assert_integer_sums, datasets_parquet, fields, sorted_groups
from tests.support.spark import decimal_frame, double_frame

ANSI = "spark.sql.ansi.enabled"


@pytest.mark.parametrize("kind", ("double", "decimal"))
@pytest.mark.parametrize("name", nist.NAMES)
def test_nist_certified_and_bit_identical(spark_session, name, kind, tmp_path):
    # NIST StRD certified values: LRE >= 14 on every figure; and the same fields, bit for bit,
    # as sheetfuncs.oneway on the same values (the Python call through the harness)
    data = nist.load(name)
    if kind == "double":
        df = double_frame(spark_session, data.groups, tmp_path)
    else:
        df = decimal_frame(spark_session, data.text_values, tmp_path)
    res = oneway_sql(df, group="g", value="x")
    assert res.exact
    for f in FIELDS:
        assert nist.lre(getattr(res, f), getattr(data.certified, f)) >= 14, (name, kind, f)
    assert (res.df_between, res.df_within) == (data.certified.df_between, data.certified.df_within)
    assert fields(res) == fields(sf.oneway(sorted_groups(data.groups)))


def _split(sums: GroupSums, ds: str) -> GroupSums:
    """The groups of dataset ``ds`` out of sums grouped by ``ds/label``."""
    idx = [i for i, lab in enumerate(sums.labels) if lab.split("/")[0] == ds]

    def pick(t: tuple[int, ...]) -> tuple[int, ...]:
        return tuple(t[i] for i in idx)

    labels = tuple(sums.labels[i].split("/", 1)[1] for i in idx)
    return GroupSums(labels, sums.scale, sums.offset, pick(sums.n), pick(sums.s), pick(sums.q), pick(sums.missing))


def test_200_random_decimal_datasets_equal_in_memory_to_the_last_bit(spark_session, tmp_path):
    # all 200 datasets in one DataFrame, summed in one query grouped by dataset and label;
    # each dataset's analysis equals sheetfuncs.oneway's to the last bit (the Python call)
    sets = [g for g in _random_datasets(200, 20260313) if len(g) >= 2]
    df = spark_session.read.parquet(str(datasets_parquet(tmp_path / "random.parquet", sets)))
    df.createOrReplaceTempView("random_sets")
    query = "SELECT concat(CAST(ds AS STRING), '/', g) AS k, x FROM random_sets"
    sums = group_sums((spark_session, query), group="k", value="x")
    assert isinstance(sums, GroupSums)
    for i, groups in enumerate(sets):
        part = _split(sums, str(i))
        res = oneway_from_sums(part.labels, part.moments(), part.missing, [])
        mem = sf.oneway(sorted_groups(groups))
        assert res.exact and mem.exact, i
        assert fields(res) == fields(mem), i
    # and the user's path, a filter on the one DataFrame (the Python call through the harness)
    for i in (0, 7, 123):
        res = oneway_sql(df, group="g", value="x", where=f"ds = {i}")
        assert fields(res) == fields(sf.oneway(sorted_groups(sets[i]))), i


def _big(spark):
    # BIGINT values near +-2**62: sum m**2 needs 129 bits, beyond DECIMAL(38) (126 bits)
    df = spark.sql(
        "SELECT CAST(id % 2 AS INT) AS g, CASE WHEN id % 4 < 2 THEN 4611686018427387000 "
        "ELSE -4611686018427387000 END + id AS x FROM range(40)"
    )
    rows = [(i % 2, (4611686018427387000 if i % 4 < 2 else -4611686018427387000) + i) for i in range(40)]
    assert sorted(tuple(r) for r in df.collect()) == sorted(rows)
    return rows, df


def _check_big(s: GroupSums, rows) -> None:
    # Python integers on the same values (common practice: exact integer arithmetic)
    assert max(q.bit_length() for q in s.q) > 128
    assert_integer_sums(s, rows)


def test_sum_of_squares_beyond_128_bits_uses_the_split_form(spark_session, monkeypatch):
    # Spark's 64-bit sums overflow (an error in ANSI mode), and the query runs again with
    # DECIMAL(38, 0) totals: exact all the same
    queries = []
    real = engine_source.spark_rows
    monkeypatch.setattr(engine_source, "spark_rows", lambda spark, sql: queries.append(sql) or real(spark, sql))
    rows, df = _big(spark_session)
    _check_big(group_sums(df, group="g", value="x"), rows)
    assert sum("sum(CAST(a * a AS DECIMAL(38, 0)))" in q for q in queries) == 1


def test_usual_data_keep_the_fast_64_bit_sums(spark_session, monkeypatch, tmp_path):
    queries = []
    real = engine_source.spark_rows
    monkeypatch.setattr(engine_source, "spark_rows", lambda spark, sql: queries.append(sql) or real(spark, sql))
    group_sums(double_frame(spark_session, nist.load("SiRstv").groups, tmp_path), group="g", value="x")
    assert queries and not any("DECIMAL(38, 0)" in q for q in queries)


@pytest.mark.parametrize("setting", ("false", "true"))
def test_the_sessions_ansi_setting_is_forced_then_restored(spark_session, setting, monkeypatch):
    # with ANSI off Spark wraps 9223372036854775807 + 1 and turns a DECIMAL overflow into NULL
    # (issue 13); every query of the call runs with ANSI on, the sums are exact (Python
    # integers) and the user's setting is put back
    seen = []
    real = engine_source.spark_rows

    def spy(spark, sql):
        seen.append(spark.conf.get(ANSI))
        return real(spark, sql)

    monkeypatch.setattr(engine_source, "spark_rows", spy)
    rows, df = _big(spark_session)
    before = spark_session.conf.get(ANSI)
    spark_session.conf.set(ANSI, setting)
    try:
        _check_big(group_sums(df, group="g", value="x"), rows)
        assert seen and set(seen) == {"true"}
        assert spark_session.conf.get(ANSI) == setting
        with pytest.raises(sf.InputError):
            oneway_sql(df, group="g", value="nope")
        assert spark_session.conf.get(ANSI) == setting
    finally:
        spark_session.conf.set(ANSI, before)


def test_split_form_on_doubles_gives_the_same_sums(spark_session, monkeypatch, tmp_path):
    # the split form and the scan forced on NIST SmLs07 (values near 1e12 with one decimal):
    # the same integers as the direct sums (common practice: the identity m = a*K + b)
    df = double_frame(spark_session, nist.load("SmLs07").groups, tmp_path)
    direct = group_sums(df, group="g", value="x")
    monkeypatch.setattr(engine_moments, "_DIRECT", 1)
    monkeypatch.setattr(engine_moments, "_MAX_LEFT", -1)
    assert group_sums(df, group="g", value="x") == direct


def test_table_and_query_sources_and_no_view_left_behind(spark_session, tmp_path):
    # the same sums from a table name, a query and the DataFrame (common practice)
    data = nist.load("SmLs01")
    df = double_frame(spark_session, data.groups, tmp_path)
    views = {t.name for t in spark_session.catalog.listTables()}
    whole = group_sums(df, group="g", value="x")
    assert {t.name for t in spark_session.catalog.listTables()} == views
    df.createOrReplaceTempView("smls01")
    assert group_sums((spark_session, "smls01"), group="g", value="x") == whole
    assert group_sums((spark_session, "SELECT g, x FROM smls01"), group="G", value="X") == whole


def test_more_than_15_digits_and_exact_false_take_the_float_path(spark_session, tmp_path):
    # 0.1 + 0.2 has 17 digits: the values are fetched and go the in-memory float path, as
    # sheetfuncs.oneway does (the Python call through the harness)
    groups = {"a": [0.1 + 0.2, 0.5, 0.7], "b": [1.0, 1.25, 1.5]}
    res = oneway_sql(double_frame(spark_session, groups, tmp_path), group="g", value="x")
    assert not res.exact and fields(res) == fields(sf.oneway(groups))
    data = nist.load("SmLs03")
    res = oneway_sql(double_frame(spark_session, data.groups, tmp_path), group="g", value="x", exact=False)
    assert not res.exact
    assert fields(res) == fields(sf.oneway(sorted_groups(data.groups), exact=False))


@pytest.fixture(scope="module")
def messy(spark_session):
    # NaN = NaN is true in Spark: NaN is counted by isnan, never by comparison
    return spark_session.sql(
        "SELECT g, CAST(x AS DOUBLE) AS x, 'text' AS t FROM VALUES ('A', '1.0'), ('A', 'NaN'), "
        "('B', '2.0'), ('B', '3.0'), (NULL, '4.0'), (NULL, '5.0'), ('A', NULL), ('A', '1.5'), "
        "('C', 'Infinity'), ('C', '1.0'), ('D', NULL) AS v(g, x)"
    )


def _message(source, **kw) -> str:
    with pytest.raises(sf.InputError) as e:
        oneway_sql(source, **{"group": "g", "value": "x", **kw})
    return str(e.value)


def test_infinite_and_missing_values_as_in_duckdb(messy):
    # the DuckDB path's messages, word for word (tests/engines/test_oneway.py)
    assert _message(messy) == (
        'sheetfuncs: 1 infinite value in column "x", the first in group "C"; remove it or '
        "replace it with the measured value"
    )
    assert _message(messy, where="g <> 'C'") == (
        'sheetfuncs: 3 missing values (NULL or NaN) in column "x", the first in group "A"; '
        'filter them out in the query or the where filter, or leave them out and count them '
        'with missing="drop" (on the command line: --missing drop)'
    )
    assert _message(messy, where="g <> 'C'", missing="drop") == (
        'sheetfuncs: group "D" has no numbers left after dropping its 1 missing value (NULL or '
        "NaN); filter it out or give it values"
    )


def test_null_labels_and_nan_counted_and_left_out(messy):
    res = oneway_sql(messy, group="g", value="x", where="g IN ('A', 'B') OR g IS NULL", missing="drop")
    # the in-memory path on the same values, NaN and None dropped (the Python call)
    mem = sf.oneway({"A": [1.0, float("nan"), None, 1.5], "B": [2.0, 3.0]}, missing="drop")
    assert fields(res) == fields(mem) and res.dropped == (2, 0)
    assert res.notes == (
        "2 rows with no group label (NULL) left out",
        '2 missing values (NULL or NaN) dropped: "A" 2',
    )


def test_one_line_for_each_bad_input(messy, spark_session):
    assert _message(messy, where="g = 'B'") == (
        'sheetfuncs: at least two groups are needed to compare means, got 1 (only "B"); check '
        "the group column and the filter"
    )
    assert _message(messy, value="y") == (
        'sheetfuncs: no column "y" in the DataFrame (its columns: g, x, t); check the value name'
    )
    assert _message(messy, value="t").startswith(
        'sheetfuncs: the value column "t" holds STRING, not numbers; give a numeric column'
    )
    assert _message(messy, where="g = = 'B'").startswith(
        "sheetfuncs: the database engine (Spark) rejected the query: [PARSE_SYNTAX_ERROR]"
    )
    assert _message((spark_session, "no_such_table")).startswith(
        "sheetfuncs: the database engine (Spark) rejected the query: [TABLE_OR_VIEW_NOT_FOUND]"
    )
    assert _message(spark_session) == (
        "sheetfuncs: a Spark SparkSession alone does not say which rows to read; pass a "
        "DataFrame, (spark, \"table\") or (spark, \"SELECT ...\")"
    )
    for msg in (_message(messy, value="y"), _message(messy, where="g = = 'B'")):
        assert "\n" not in msg


def test_too_wide_values_are_refused_in_one_line(spark_session):
    # the DuckDB path's message (tests/engines/test_moments.py)
    df = spark_session.sql(
        "SELECT id % 2 AS g, CAST(id AS DECIMAL(38, 0)) * CAST(1000000000000000000000000 AS "
        "DECIMAL(38, 0)) AS x FROM range(10)"
    )
    with pytest.raises(sf.InputError) as e:
        group_sums(df, group="g", value="x")
    assert str(e.value) == (
        'sheetfuncs: the values of column "x" span more than 2**64 units of their last decimal; '
        "they cannot be summed exactly here: rescale them in a query"
    )


def test_without_pyspark_one_line_says_how_to_install(messy, monkeypatch):
    monkeypatch.setitem(sys.modules, "pyspark.errors", None)
    assert _message(messy) == (
        "sheetfuncs: reading from Spark needs pyspark, which is not installed; install it with: "
        'pip install "sheetfuncs[spark]" (or pip install pyspark)'
    )
