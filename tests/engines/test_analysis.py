"""analyse_sql: every analysis from DuckDB equals the in-memory sheetfuncs call on the same values.

Sources of the checks: NIST StRD one-way ANOVA datasets (tests/reference/nist; certified values
for the one-way table) and, for every other figure, the in-memory sheetfuncs call
(``sheetfuncs.stats.analyse`` on the same values), compared bit for bit through ``repr``.
"""

from __future__ import annotations

import duckdb
import numpy as np
import pytest

from sheetfuncs.engines import analyse_sql
from sheetfuncs.errors import InputError
from sheetfuncs.input import as_groups
from sheetfuncs.stats import Unavailable, analyse
from tests.support import nist
from tests.support.engines import (
    check_analysis_equal, csv_file, double_table, parquet_file, random_decimal_groups, same,
    sorted_groups,
)

@pytest.mark.parametrize("name", nist.NAMES)
def test_nist_every_analysis_equals_in_memory(name, tmp_path):
    # NIST StRD: certified F (LRE >= 14); every other figure the in-memory sheetfuncs call, bit for bit
    data = nist.load(name)
    got = analyse_sql(parquet_file(tmp_path / "d.parquet", data.groups), group="g", value="x")
    assert nist.lre(got.analysis.oneway.f, data.certified.f) >= 14
    n = sum(len(v) for v in data.groups.values())
    check_analysis_equal(got, data.groups, all_residuals=n <= 5000)
    mem = analyse(sorted_groups(data.groups))
    if n <= 5000:  # every residual tested: the in-memory result
        assert same(got.analysis.checks.normality, mem.checks.normality)
    else:  # a seeded sample of 5000 residuals, and the result says so
        nm = got.analysis.checks.normality
        assert (nm.method, nm.n, nm.of_total) == ("Shapiro-Wilk", 5000, n)
        assert f"test on a random sample of 5000 of the {n} residuals, seed 20261203, gives p" in " ".join(got.analysis.checks.reasons)
    assert got.origin.rows_read == n and got.origin.source == "d.parquet"


def test_csv_file_equals_in_memory(tmp_path):
    # NIST StRD SiRstv read from CSV text; every figure the in-memory sheetfuncs call, bit for bit
    data = nist.load("SiRstv")
    got = analyse_sql(csv_file(tmp_path / "s.csv", data.text_values), group="g", value="x")
    assert nist.lre(got.analysis.oneway.f, data.certified.f) >= 14
    check_analysis_equal(got, data.groups)


@pytest.mark.parametrize("seed", range(30))
def test_random_data_with_ties_equal_in_memory(seed):
    # the in-memory sheetfuncs call on the same values, bit for bit (normality too: under 5000 values)
    groups = random_decimal_groups(seed)
    con = duckdb.connect()
    double_table(con, "t", groups)
    control = sorted(groups)[0] if seed % 3 == 0 else None
    got = analyse_sql((con, "t"), group="g", value="x", control=control, method="holm" if seed % 2 else "tukey")
    check_analysis_equal(got, groups, control=control, method="holm" if seed % 2 else "tukey")
    mem = analyse(sorted_groups(groups), control=control)
    assert same(got.analysis.checks.normality, mem.checks.normality)


def test_decimal_table_and_filter_and_dropped():
    # the in-memory sheetfuncs call on the rows the filter keeps (NULL values dropped and counted)
    con = duckdb.connect()
    con.execute("CREATE TABLE t (line VARCHAR, head INTEGER, w DECIMAL(10, 2))")
    rng = np.random.default_rng(5)
    rows = [(f"L{h % 2}", h, round(float(v), 2)) for h in range(4) for v in rng.normal(50 + h, 1, 25)]
    con.executemany("INSERT INTO t VALUES (?, ?, ?)", rows)
    con.execute("INSERT INTO t VALUES ('L0', 0, NULL), ('L0', NULL, 3.5)")
    got = analyse_sql((con, "t"), group="head", value="w", where="line = 'L0'", missing="drop")
    groups = {str(h): [w for ln, hh, w in rows if hh == h] + ([None] if h == 0 else []) for h in (0, 2)}
    check_analysis_equal(got, as_groups(groups, missing="drop"))
    o = got.origin
    assert (o.rows_read, o.null_labels, o.missing, o.where) == (52, 1, (1, 0), "line = 'L0'")
    assert o.notes == ("1 row with no group label (NULL) left out", '1 missing value (NULL or NaN) dropped: "0" 1')


def test_mean_centred_levene_within_tolerance():
    # Levene (mean) exact in the engine; the in-memory one rounds each deviation once: agree to 1e-12
    from sheetfuncs.engines.passes import group_centres, levene_sql
    from sheetfuncs.engines.moments import sums_from_relation
    from sheetfuncs.engines.source import open_relation
    from sheetfuncs.stats import levene
    for seed in range(10):
        groups = random_decimal_groups(100 + seed)
        con = duckdb.connect()
        double_table(con, "t", groups)
        rel = open_relation((con, "t"), "g", "x", None)
        sums = sums_from_relation(rel)
        got = levene_sql(rel, sums, group_centres(rel, sums), "mean")
        mem = levene(sorted_groups(groups), "mean")
        assert got.statistic == pytest.approx(mem.statistic, rel=1e-12)
        assert got.p == pytest.approx(mem.p, rel=1e-10, abs=1e-300)


def test_kruskal_too_many_distinct_values_is_unavailable():
    # common practice: the table of (group, value) counts is capped; here the cap is lowered to 10
    con = duckdb.connect()
    double_table(con, "t", random_decimal_groups(7))
    got = analyse_sql((con, "t"), group="g", value="x", max_distinct=10)
    kw = got.analysis.kruskal
    assert isinstance(kw, Unavailable)
    assert kw.reason == (
        "more than 10 distinct (group, value) pairs, too many to rank outside the database; "
        "Kruskal-Wallis needs the ranks of all values"
    )
    assert "Kruskal-Wallis" in dict(got.analysis.checks.not_available)


def test_sample_is_reproducible_and_seeded():
    # from memory: reservoir sampling with REPEATABLE(seed) gives the same rows on the same data
    rng = np.random.default_rng(11)
    groups = {f"Z{i}": [float(v) for v in np.round(rng.normal(i, 1, 2000), 3)] for i in range(4)}
    con = duckdb.connect()
    double_table(con, "t", groups)
    a = analyse_sql((con, "t"), group="g", value="x", seed=7, comparisons=False)
    b = analyse_sql((con, "t"), group="g", value="x", seed=7, comparisons=False)
    c = analyse_sql((con, "t"), group="g", value="x", seed=8, comparisons=False)
    na, nc = a.analysis.checks.normality, c.analysis.checks.normality
    assert same(na, b.analysis.checks.normality) and (na.seed, na.n, na.of_total) == (7, 5000, 8000)
    assert na.statistic != nc.statistic
    row = [r for r in a.analysis.checks.table() if r[0] == "Shapiro-Wilk (residuals)"][0]
    assert row[-1].endswith("(a random sample of 5000 of the 8000 residuals, seed 7)")


def test_bad_options_give_one_line():
    con = duckdb.connect()
    double_table(con, "t", random_decimal_groups(1))
    with pytest.raises(InputError, match="^sheetfuncs: seed must be a whole number from 0 to 2147483647, not -1$"):
        analyse_sql((con, "t"), group="g", value="x", seed=-1)
    with pytest.raises(InputError, match="^sheetfuncs: max_distinct must be a whole number of at least 1, not 0$"):
        analyse_sql((con, "t"), group="g", value="x", max_distinct=0)
    with pytest.raises(InputError, match='^sheetfuncs: unknown comparison method "nope"'):
        analyse_sql((con, "t"), group="g", value="x", method="nope")


def test_values_of_many_digits_fall_back_to_in_memory():
    # the in-memory sheetfuncs call on the fetched values (floating-point path)
    groups = {"A": [0.1 + 0.2, 1.0 / 3, 2.5, 2.25], "B": [2.0 / 3, 3.5, 1.75, 4.0]}
    con = duckdb.connect()
    double_table(con, "t", groups)
    got = analyse_sql((con, "t"), group="g", value="x")
    assert got.sums is None and got.origin.fetched and got.analysis.groups is not None
    assert same(got.analysis.oneway, analyse(groups).oneway)
