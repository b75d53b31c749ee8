"""analyse_sql on Spark in local mode: every analysis, the second passes included, equals the
in-memory sheetfuncs call on the same values and the DuckDB push-down on the same Parquet file.

Sources of the checks: NIST StRD one-way ANOVA datasets (certified F, tests/reference/nist); for
every other figure the in-memory sheetfuncs call (``sheetfuncs.stats.analyse`` on the same
values) and DuckDB's analyse_sql on the same file, compared bit for bit through ``repr``; numpy
for the middle values (np.sort's middle pair).
"""

from __future__ import annotations

from collections import Counter

import numpy as np
import pytest

from sheetfuncs.engines import analyse_sql
from sheetfuncs.engines.dialect import SPARK
from sheetfuncs.engines.moments import sums_from_relation
from sheetfuncs.engines.passes import group_centres, kept_rows
from sheetfuncs.engines.source import opened, run
from sheetfuncs.stats import analyse
from tests.support import nist
from tests.support.engines import (
    check_analysis_equal, datasets_parquet, parquet_file, random_decimal_groups, same, sorted_groups,
)
from tests.support.spark import decimal_frame


@pytest.mark.parametrize("name", ("AtmWtAg", "SiRstv", "SmLs07"))
def test_nist_on_spark_equals_in_memory_and_duckdb(spark_session, name, tmp_path):
    # NIST StRD: certified F (LRE >= 14); every other figure the in-memory sheetfuncs call and
    # DuckDB's analyse_sql on the same Parquet file, bit for bit (normality on every residual)
    data = nist.load(name)
    path = parquet_file(tmp_path / "d.parquet", data.groups)
    got = analyse_sql(spark_session.read.parquet(str(path)), group="g", value="x")
    assert nist.lre(got.analysis.oneway.f, data.certified.f) >= 14
    check_analysis_equal(got, data.groups)
    assert same(got.analysis.checks.normality, analyse(sorted_groups(data.groups)).checks.normality)
    duck = analyse_sql(path, group="g", value="x")
    assert same(got.analysis, duck.analysis) and got.sums == duck.sums
    assert (got.origin.engine, got.origin.engine_version) == ("Spark", spark_session.version)
    assert duck.origin.engine == "DuckDB" and got.origin.rows_read == duck.origin.rows_read


def test_decimal_column_on_spark_equals_in_memory(spark_session, tmp_path):
    # NIST StRD SiRstv as DECIMAL(38, 4) in Spark; the in-memory sheetfuncs call, bit for bit
    data = nist.load("SiRstv")
    got = analyse_sql(decimal_frame(spark_session, data.text_values, tmp_path), group="g", value="x")
    check_analysis_equal(got, data.groups)
    assert same(got.analysis.checks.normality, analyse(sorted_groups(data.groups)).checks.normality)


def test_random_data_with_ties_on_spark_equal_in_memory(spark_session, tmp_path):
    # seeded random decimal data with ties and unequal groups (invented), one DataFrame, one
    # dataset per filter: the in-memory sheetfuncs call, bit for bit, normality included
    sets = [random_decimal_groups(seed) for seed in (0, 4, 5, 12)]
    df = spark_session.read.parquet(str(datasets_parquet(tmp_path / "random.parquet", sets)))
    for i, groups in enumerate(sets):
        method = "holm" if i % 2 else "tukey"
        got = analyse_sql(df, group="g", value="x", where=f"ds = {i}", method=method)
        check_analysis_equal(got, groups, method=method)
        assert same(got.analysis.checks.normality, analyse(sorted_groups(groups)).checks.normality), i


def test_centres_by_ranks_for_every_size(spark_session, tmp_path):
    # numpy on the same values: sizes 1 to 12 (odd and even), with ties (invented values); and a
    # group whose values do not all scale exactly takes its middle values from the doubles
    rng = np.random.default_rng(4)
    groups = {f"S{n:02d}": [float(v) for v in rng.integers(0, 6, n) * 0.5] for n in range(1, 13)}
    groups["T"] = [1000000000000.5, 0.001, 2.0, 7.0]
    df = spark_session.read.parquet(str(parquet_file(tmp_path / "c.parquet", groups)))
    for where, inexact in (("g <> 'T'", 0), (None, 1)):
        with opened(df, "g", "x", where) as rel:
            sums = sums_from_relation(rel)
            c = group_centres(rel, sums)
        assert c.inexact == inexact
        for i, lab in enumerate(sums.labels):
            a = np.sort(groups[lab])
            lo, hi = a[(a.size - 1) // 2], a[a.size // 2]
            assert (c.low[i], c.high[i], c.median[i]) == (a[0], a[-1], (lo + hi) / 2), lab
            if not inexact:
                assert (c.lo_m[i], c.hi_m[i]) == (round(lo * 10), round(hi * 10)), lab


def _big_ties(tmp_path):
    # 6000 invented values at one decimal (many ties), four groups
    rng = np.random.default_rng(21)
    groups = {f"Z{i}": [float(v) for v in np.round(rng.normal(i, 1, 1500), 1)] for i in range(4)}
    return parquet_file(tmp_path / "big.parquet", groups), groups


def test_sample_is_seeded_and_the_same_for_any_partitioning(spark_session, tmp_path):
    # from memory: xxhash64 is a fixed function of its inputs; equal rows are interchangeable,
    # so the sample's values depend only on the seed and the rows, not on the partitioning
    path, groups = _big_ties(tmp_path)
    df = spark_session.read.parquet(str(path))

    def sample(frame, seed):
        with opened(frame, "g", "x", None) as rel:
            return sorted(run(rel.con, SPARK.sample(kept_rows(rel), 5000, seed)))

    a = sample(df, 7)
    # rows are drawn, not blocks of equal rows: most values repeated 10 or more times are taken
    # in part (common practice: each of c copies is kept with probability 5/6, all c rarely)
    whole = Counter((g, x) for g, vs in groups.items() for x in vs)
    taken = Counter(a)
    many = [k for k, c in whole.items() if c >= 10]
    assert len(a) == 5000 and sum(0 < taken[k] < whole[k] for k in many) > len(many) / 2
    assert sample(df.repartition(5), 7) == a
    assert sample(df, 8) != a
    got = analyse_sql(df.repartition(3), group="g", value="x", seed=7, comparisons=False)
    again = analyse_sql(df, group="g", value="x", seed=7, comparisons=False)
    nm = got.analysis.checks.normality
    assert same(nm, again.analysis.checks.normality) and (nm.seed, nm.n, nm.of_total) == (7, 5000, 6000)
    # worded as DuckDB's sampled test (tests/engines/test_analysis.py)
    row = [r for r in got.analysis.checks.table() if r[0] == "Shapiro-Wilk (residuals)"][0]
    assert row[-1].endswith("(a random sample of 5000 of the 6000 residuals, seed 7)")
    assert "test on a random sample of 5000 of the 6000 residuals, seed 7, gives p" in " ".join(got.analysis.checks.reasons)
