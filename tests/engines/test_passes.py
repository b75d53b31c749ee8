"""The second passes in DuckDB: group centres, Levene, Kruskal-Wallis, the residuals' sample.

Sources of the checks: numpy (np.min, np.median's middle pair, np.max) and the in-memory
sheetfuncs call on the same values; messages as written.
"""

from __future__ import annotations

import duckdb
import numpy as np

from sheetfuncs.engines import analyse_sql
from sheetfuncs.engines.moments import sums_from_relation
from sheetfuncs.engines.passes import group_centres, kruskal_sql, levene_sql
from sheetfuncs.engines.source import open_relation
from sheetfuncs.stats import Unavailable, kruskal, levene
from tests.support.engines import double_table, sorted_groups


def _relation(groups):
    con = duckdb.connect()
    double_table(con, "t", groups)
    rel = open_relation((con, "t"), "g", "x", None)
    return rel, sums_from_relation(rel)


def test_centres_are_the_middle_pair_for_every_size():
    # numpy on the same values: sizes 1 to 12 (odd and even), with ties (invented values)
    rng = np.random.default_rng(4)
    groups = {f"S{n:02d}": [float(v) for v in rng.integers(0, 6, n) * 0.5] for n in range(1, 13)}
    rel, sums = _relation(groups)
    c = group_centres(rel, sums)
    for i, lab in enumerate(sums.labels):
        a = np.sort(groups[lab])
        lo, hi = a[(a.size - 1) // 2], a[a.size // 2]
        assert (c.low[i], c.high[i], c.median[i]) == (a[0], a[-1], (lo + hi) / 2), lab
        assert (c.lo_m[i], c.hi_m[i]) == (round(lo * 10), round(hi * 10))
    assert c.inexact == 0


def test_levene_and_kruskal_passes_equal_in_memory():
    # the in-memory sheetfuncs call, bit for bit (median-centred Levene; Kruskal-Wallis)
    rng = np.random.default_rng(9)
    groups = {f"H{i}": [float(v) for v in np.round(rng.gamma(2 + i, 1.5, 30 + 7 * i), 2)] for i in range(5)}
    rel, sums = _relation(groups)
    mem = sorted_groups(groups)
    assert repr(levene_sql(rel, sums, group_centres(rel, sums))) == repr(levene(mem))
    assert repr(kruskal_sql(rel, sums)) == repr(kruskal(mem))


def test_levene_unavailable_when_values_do_not_scale_exactly():
    # from memory: 1000000000000.5 at 3 decimals is 1.0000000000005e15, beyond exact doubles' 1e15
    groups = {"A": [1000000000000.5, 0.001, 2.0], "B": [3.25, 4.5, 1000000000001.5]}
    rel, _ = _relation(groups)
    got = analyse_sql((rel.con, "t"), group="g", value="x")
    lev = dict(got.analysis.checks.not_available)["Levene (median)"]
    assert lev == (
        "2 values do not scale exactly to whole numbers at 3 decimals (more than 15 significant "
        "digits at that scale), so the deviations cannot be summed exactly in the database"
    )
    assert not isinstance(got.analysis.kruskal, Unavailable)
