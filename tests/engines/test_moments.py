"""Exact per-group sums from DuckDB: they add across partitions and files, rescale exactly, and
never overflow silently.

Sources: NIST StRD one-way datasets (tests/reference/nist) for the data; the exact sums are
checked against Python integers and fractions on the same values (common practice: exact
integer arithmetic) and against sheetfuncs.oneway (the Python call through the harness).
"""

from __future__ import annotations

from fractions import Fraction

import duckdb
import pytest

import sheetfuncs as sf
from sheetfuncs.engines import GroupSums, NotExact, group_sums
from sheetfuncs.engines import moments as engine_moments
from sheetfuncs.stats import oneway_from_sums
from tests.support import nist
from tests.support.engines import (
    assert_integer_sums, decimal_table, double_table, fields, parquet_file, sorted_groups,
)


def _within(sums: GroupSums) -> Fraction:
    return sums.moments().ss_within_parts([[i] for i in range(len(sums.labels))])


def test_sums_add_across_files(tmp_path):
    # SmLs04 split into two Parquet files: the sum of the parts is the whole (exact integers),
    # and its analysis is sheetfuncs.oneway's, bit for bit (the Python call through the harness)
    data = nist.load("SmLs04")
    first = {g: v[: len(v) // 3] for g, v in data.groups.items()}
    second = {g: v[len(v) // 3 :] for g, v in data.groups.items()}
    a = group_sums(parquet_file(tmp_path / "a.parquet", first), group="g", value="x")
    b = group_sums(parquet_file(tmp_path / "b.parquet", second), group="g", value="x")
    whole = a + b
    assert isinstance(whole, GroupSums) and whole.labels == tuple(sorted(data.groups))
    assert whole.n == tuple(len(data.groups[g]) for g in whole.labels)
    res = oneway_from_sums(whole.labels, whole.moments())
    assert fields(res) == fields(sf.oneway(sorted_groups(data.groups)))


def test_sums_add_across_scales_and_types():
    # a DECIMAL(38, 1) partition and a DOUBLE partition with 3 decimals: rescaled exactly
    # (the Python call through the harness)
    con = duckdb.connect()
    decimal_table(con, "p", {"A": ["10.5", "11.0"], "B": ["12.5"]})
    double_table(con, "q", {"A": [10.125], "B": [12.75, 13.0], "C": [9.5, 9.875]})
    a = group_sums((con, "p"), group="g", value="x")
    b = group_sums((con, "q"), group="g", value="x")
    assert (a.scale, b.scale) == (1, 3)
    whole = a + b
    assert whole.scale == 3 and whole.labels == ("A", "B", "C")
    mem = sf.oneway({"A": [10.5, 11.0, 10.125], "B": [12.5, 12.75, 13.0], "C": [9.5, 9.875]})
    assert fields(oneway_from_sums(whole.labels, whole.moments())) == fields(mem)


def test_rebased_keeps_the_exact_sums():
    # common practice: changing the scale and the offset changes no sum of squares
    con = duckdb.connect()
    double_table(con, "t", {"A": [1.25, 2.5, 3.0], "B": [4.5, 4.75]})
    s = group_sums((con, "t"), group="g", value="x")
    r = s.rebased(s.scale + 4, -123456789)
    assert (r.scale, r.offset) == (s.scale + 4, -123456789)
    assert _within(r) == _within(s) == Fraction(1625, 1000) + Fraction(3125, 100000)
    assert r.moments().means() == s.moments().means() == (Fraction(27, 12), Fraction(37, 8))
    with pytest.raises(sf.InputError, match="cannot rescale sums from 2 to 1 decimals"):
        s.rebased(1, 0)


def test_sum_of_squares_beyond_128_bits_uses_the_split_form():
    # BIGINT values near +-2**62: sum m**2 needs 129 bits, more than DuckDB's HUGEINT holds;
    # the split form gives the exact integers (common practice: Python integers as reference)
    con = duckdb.connect()
    con.execute(
        "CREATE TABLE b AS SELECT i % 2 AS g, CAST(CASE WHEN i % 4 < 2 THEN 4611686018427387000 "
        "ELSE -4611686018427387000 END + i AS BIGINT) AS x FROM range(40) r(i)"
    )
    rows = con.execute("SELECT g, x FROM b").fetchall()
    s = group_sums((con, "b"), group="g", value="x")
    assert max(q.bit_length() for q in s.q) > 128
    assert_integer_sums(s, rows)


def test_split_form_on_doubles_gives_the_same_sums(monkeypatch):
    # the split form forced on NIST SmLs07 (values near 1e12 with one decimal): same integers
    # as the direct sums (common practice: the identity m = a*K + b)
    data = nist.load("SmLs07")
    con = duckdb.connect()
    double_table(con, "t", data.groups)
    direct = group_sums((con, "t"), group="g", value="x")
    monkeypatch.setattr(engine_moments, "_DIRECT", 1)
    monkeypatch.setattr(engine_moments, "_MAX_LEFT", -1)  # straight to the scan and the bounds
    split = group_sums((con, "t"), group="g", value="x")
    assert split == direct


def test_too_wide_integers_are_refused_in_one_line():
    con = duckdb.connect()
    con.execute("CREATE TABLE h AS SELECT i % 2 AS g, CAST(i AS HUGEINT) * 1000000000000000000000000 AS x FROM range(10) r(i)")
    with pytest.raises(sf.InputError) as e:
        group_sums((con, "h"), group="g", value="x")
    assert str(e.value) == (
        'sheetfuncs: the values of column "x" span more than 2**64 units of their last decimal; '
        "they cannot be summed exactly here: rescale them in a query"
    )


def test_too_large_decimals_are_refused_in_one_line():
    con = duckdb.connect()
    con.execute("CREATE TABLE d AS SELECT i % 2 AS g, CAST(CAST(i AS VARCHAR) || '0000000000000000000000000.5' AS DECIMAL(38, 10)) AS x FROM range(4) r(i)")
    with pytest.raises(sf.InputError, match=r"^sheetfuncs: the DECIMAL values reach 30{25}\.50*, too large to "
                       "scale to integers with their 10 decimals inside the engine; cast them to fewer "
                       "decimals in a query$"):
        group_sums((con, "d"), group="g", value="x")


def test_more_than_15_digits_is_not_exact():
    # 0.1 + 0.2 is 0.30000000000000004, 17 significant digits (from memory)
    con = duckdb.connect()
    double_table(con, "t", {"A": [0.5, 0.1 + 0.2], "B": [1.0, 2.0]})
    got = group_sums((con, "t"), group="g", value="x")
    assert got == NotExact(0.30000000000000004, "A", 17)


def test_literal_decimal_column_is_read_exactly():
    # DuckDB reads the literal 1000.0 as DECIMAL: its stored decimals are used, not a double
    # (the Python call through the harness)
    con = duckdb.connect()
    con.execute("CREATE TABLE t AS SELECT * FROM (VALUES ('A', 1000.0), ('A', 1000.5), ('B', 999.25), ('B', 1001.0)) v(g, x)")
    s = group_sums((con, "t"), group="g", value="x")
    assert s.scale == 2
    mem = sf.oneway({"A": [1000.0, 1000.5], "B": [999.25, 1001.0]})
    assert fields(oneway_from_sums(s.labels, s.moments())) == fields(mem)


def test_far_values_are_finished_in_python():
    # 5e9 at two decimals is 5e11 units from the centre, beyond a 64-bit square: left over
    # from the first pass, read in Python, still exact (the Python call through the harness)
    groups = {"A": [1.25, 2.5, 5e9], "B": [1.0, 2.0, -7.5e9]}
    con = duckdb.connect()
    double_table(con, "t", groups)
    s = group_sums((con, "t"), group="g", value="x")
    assert fields(oneway_from_sums(s.labels, s.moments())) == fields(sf.oneway(groups))


def test_a_wrong_first_guess_takes_the_scan(monkeypatch):
    # the first rows have one decimal, the later ones three: with a tiny sample and a tiny
    # allowance for left-over rows the scan finds the scale (the Python call through the harness)
    groups = {"A": [1.5, 2.5, 3.125, 4.375, 2.001], "B": [0.5, 9.5, 7.25, 1.999]}
    con = duckdb.connect()
    double_table(con, "t", groups)
    monkeypatch.setattr(engine_moments, "_SAMPLE", 2)
    monkeypatch.setattr(engine_moments, "_MAX_LEFT", 1)
    s = group_sums((con, "t"), group="g", value="x")
    assert s.scale == 3
    assert fields(oneway_from_sums(s.labels, s.moments())) == fields(sf.oneway(groups))
