"""oneway_sql: the exact sums pushed down to DuckDB give the in-memory result, bit for bit.

Sources of the checks: NIST StRD one-way ANOVA datasets (certified values, tests/reference/nist);
otherwise the Python call through the harness (``sheetfuncs.oneway`` on the same values).
"""

from __future__ import annotations

import duckdb
import numpy as np
import pytest

import sheetfuncs as sf
from sheetfuncs.engines import oneway_sql
from tests.support import nist
from tests.support.engines import (
    csv_file, decimal_table, double_table, fields, frame, parquet_file, sorted_groups,
)

FIELDS = ("ss_between", "ss_within", "ms_between", "ms_within", "f", "r_squared", "residual_sd")
SOURCES = ("double", "decimal", "parquet", "csv")


def _source(kind: str, data: nist.Dataset, tmp_path):
    con = duckdb.connect()
    if kind == "double":
        double_table(con, "t", data.groups)
        return (con, "t")
    if kind == "decimal":
        decimal_table(con, "t", data.text_values)
        return (con, "t")
    if kind == "parquet":
        return parquet_file(tmp_path / f"{data.name}.parquet", data.groups)
    return csv_file(tmp_path / f"{data.name}.csv", data.text_values)


@pytest.mark.parametrize("kind", SOURCES)
@pytest.mark.parametrize("name", nist.NAMES)
def test_nist_certified_and_bit_identical(name, kind, tmp_path):
    # NIST StRD certified values: LRE >= 14 on every figure; and the same fields, bit for bit,
    # as sheetfuncs.oneway on the same values (the Python call through the harness)
    data = nist.load(name)
    res = oneway_sql(_source(kind, data, tmp_path), group="g", value="x")
    assert res.exact
    for f in FIELDS:
        assert nist.lre(getattr(res, f), getattr(data.certified, f)) >= 14, (name, kind, f)
    assert (res.df_between, res.df_within) == (data.certified.df_between, data.certified.df_within)
    mem = sf.oneway(sorted_groups(data.groups))
    assert fields(res) == fields(mem)


def _random_datasets(count: int, seed: int) -> list[dict[str, list[float]]]:
    rng = np.random.default_rng(seed)
    out = []
    for _ in range(count):
        k = int(rng.integers(2, 7))
        decimals = int(rng.integers(0, 7))
        centre = float(rng.choice([0.0, 1.0, 250.0, -3e4, 1e6]))
        groups = {}
        for i in range(k):
            n = int(rng.integers(1 if i else 2, 40))
            spread = 10.0 ** (2 - decimals + int(rng.integers(0, 3)))
            v = np.round(centre + rng.normal(i * 0.3, 1.0 + i, n) * spread, decimals)
            groups[f"L{int(rng.integers(0, 10**6)):06d}"] = [float(x) for x in v]
        out.append(groups)
    return out


def test_200_random_decimal_datasets_equal_in_memory_to_the_last_bit():
    # the Python call through the harness: sheetfuncs.oneway on the same values
    sets = _random_datasets(200, 20260313)
    con = duckdb.connect()
    parts = []
    for i, groups in enumerate(sets):
        f = frame(groups)
        f["ds"] = i
        parts.append(f)
    df = __import__("pandas").concat(parts)  # noqa: F841 (read by DuckDB)
    con.execute("CREATE TABLE t AS SELECT ds, g, CAST(x AS DOUBLE) AS x FROM df")
    for i, groups in enumerate(sets):
        if len(groups) < 2:
            continue
        res = oneway_sql((con, "t"), group="g", value="x", where=f"ds = {i}")
        mem = sf.oneway(sorted_groups(groups))
        assert res.exact and mem.exact, i
        assert fields(res) == fields(mem), i


def test_more_than_22_decimals_finished_in_python():
    # values like 1.5e-30 have few digits but 31 decimals: read one by one, still exact
    # (the Python call through the harness)
    groups = {"a": [1.5e-30, 2.5e-30, 1.25], "b": [3.0, 4.5, 2.0e-25], "c": [0.125, 7.0, 9.5]}
    con = duckdb.connect()
    double_table(con, "t", groups)
    res = oneway_sql((con, "t"), group="g", value="x")
    mem = sf.oneway(groups)
    assert res.exact and fields(res) == fields(mem)


def test_more_than_15_digits_takes_the_float_path_as_in_memory():
    # 0.1 + 0.2 = 0.30000000000000004 has 17 digits: not exact, floats (the Python call)
    groups = {"a": [0.1 + 0.2, 0.5, 0.7], "b": [1.0, 1.25, 1.5]}
    con = duckdb.connect()
    double_table(con, "t", groups)
    res = oneway_sql((con, "t"), group="g", value="x")
    mem = sf.oneway(groups)
    assert not res.exact and not mem.exact
    assert fields(res) == fields(mem)
    with pytest.raises(sf.InputError) as e:
        oneway_sql((con, "t"), group="g", value="x", exact=True)
    assert str(e.value) == (
        "sheetfuncs: the exact path needs every value to have at most 15 significant digits, "
        "but 0.30000000000000004 in group \"a\" has 17; round the data or use exact=False"
    )


def test_exact_false_is_the_in_memory_float_path():
    data = nist.load("SmLs03")
    con = duckdb.connect()
    double_table(con, "t", data.groups)
    res = oneway_sql((con, "t"), group="g", value="x", exact=False)
    mem = sf.oneway(sorted_groups(data.groups), exact=False)
    assert not res.exact and fields(res) == fields(mem)  # the Python call through the harness
    with pytest.raises(sf.InputError, match="exact must be None"):
        oneway_sql((con, "t"), group="g", value="x", exact="yes")


def test_integer_labels_read_as_in_memory():
    # lot numbers 1, 2, 3 as INTEGER labels read as "1", "2", "3" (common practice)
    con = duckdb.connect()
    con.execute("CREATE TABLE t AS SELECT * FROM (VALUES (1, 2.5), (1, 3.5), (2, 4.0), (2, 4.5), (10, 1.0)) v(g, x)")
    res = oneway_sql((con, "t"), group="g", value="x")
    mem = sf.oneway({"1": [2.5, 3.5], "10": [1.0], "2": [4.0, 4.5]})
    assert res.labels == ("1", "10", "2")
    assert fields(res) == fields(mem)


@pytest.fixture()
def messy():
    con = duckdb.connect()
    con.execute(
        "CREATE TABLE n AS SELECT * FROM (VALUES ('A', 1.0::DOUBLE), ('A', 'nan'::DOUBLE), "
        "('B', 2.0), ('B', 3.0), (NULL, 4.0), (NULL, 5.0), ('A', NULL), ('A', 1.5), "
        "('C', 'inf'::DOUBLE), ('C', 1.0), ('D', NULL)) v(g, x)"
    )
    return con


def _message(source, **kw) -> str:
    with pytest.raises(sf.InputError) as e:
        oneway_sql(source, **{"group": "g", "value": "x", **kw})
    return str(e.value)


def test_infinite_values_stop_with_their_count(messy):
    # as in memory: an infinite value is never a measurement (common practice)
    assert _message((messy, "n")) == (
        'sheetfuncs: 1 infinite value in column "x", the first in group "C"; remove it or '
        "replace it with the measured value"
    )


def test_missing_values_stop_or_are_dropped_and_counted(messy):
    assert _message((messy, "n"), where="g <> 'C'") == (
        'sheetfuncs: 3 missing values (NULL or NaN) in column "x", the first in group "A"; '
        'filter them out in the query or the where filter, or leave them out and count them '
        'with missing="drop" (on the command line: --missing drop)'
    )
    assert _message((messy, "n"), where="g <> 'C'", missing="drop") == (
        'sheetfuncs: group "D" has no numbers left after dropping its 1 missing value (NULL or '
        "NaN); filter it out or give it values"
    )
    res = oneway_sql((messy, "n"), group="g", value="x", where="g IN ('A', 'B') OR g IS NULL", missing="drop")
    # the in-memory path on the same values, NaN and None dropped (the Python call)
    mem = sf.oneway({"A": [1.0, float("nan"), None, 1.5], "B": [2.0, 3.0]}, missing="drop")
    assert fields(res) == fields(mem) and res.dropped == (2, 0)
    assert res.notes == (
        "2 rows with no group label (NULL) left out",
        '2 missing values (NULL or NaN) dropped: "A" 2',
    )


def test_one_group(messy):
    assert _message((messy, "n"), where="g = 'B'") == (
        'sheetfuncs: at least two groups are needed to compare means, got 1 (only "B"); check '
        "the group column and the filter"
    )


def test_labels_that_read_alike():
    con = duckdb.connect()
    double_table(con, "t", {"A": [1.0, 2.0], " A": [3.0], "B": [4.0, 5.0]})
    assert _message((con, "t")) in (
        "sheetfuncs: the group values 'A' and ' A' both read as the label \"A\"; make the group "
        "column's values distinct (e.g. trim them in a query)",
        "sheetfuncs: the group values ' A' and 'A' both read as the label \"A\"; make the group "
        "column's values distinct (e.g. trim them in a query)",
    )
