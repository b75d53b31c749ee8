"""Second passes inside the engine (DuckDB or Spark) for the analyses that need more than
per-group sums.

After the first pass (:mod:`sheetfuncs.engines.moments`) each of these runs one or two more
queries over the same rows (a NULL group label, or a missing value, leaves a row out):

* :func:`group_centres` — per group the smallest and largest value and the two middle values
  (``quantile_disc(x, 0.5)`` is the lower middle value, ``-quantile_disc(-x, 0.5)`` the upper;
  equal for an odd count; on Spark the values of ranks ``(n + 1) div 2`` and ``n div 2 + 1``,
  from running sums of the counts per distinct value), in the data's unit and as integers ``m = value * 10**scale``.
* :func:`levene_sql` — Levene's test from exact integer sums of the absolute deviations: from
  the median, ``w = |2 m - (lo + hi)|`` (twice the deviation, a whole number); from the mean,
  ``w = |n_i m - sum_i m|`` (``n_i`` times it). Their per-group sums are exact (DuckDB's
  checked 128-bit integers; Spark's checked DECIMAL(38, 0) under ANSI mode), and the one-way F on the deviations is formed from them as an exact
  rational, rounded once (:func:`sheetfuncs.stats.levene_result`). Median-centred, this is the
  in-memory :func:`sheetfuncs.levene` to the last bit whenever that one works in decimal
  integers (every value of at most 15 significant digits); mean-centred it is exact, where the
  in-memory test rounds each deviation once (they agree to about 1e-12, relative).
* :func:`kruskal_sql` — Kruskal–Wallis from the counts per (group, distinct value), the
  mid-ranks and the tie correction formed in Python (:func:`sheetfuncs.stats.kruskal_from_counts`):
  the in-memory result to the last bit. At most ``max_distinct`` rows (default
  :data:`MAX_DISTINCT`, 2,000,000) are fetched; beyond that it is unavailable.
* :func:`normality_sql` — the residuals' normality test. Up to
  :data:`sheetfuncs.stats.SHAPIRO_WILK_MAX_N` values in all, every value is fetched and the
  in-memory test is run (the same result). Above that, Shapiro–Wilk runs on a random sample of
  that many rows, drawn by DuckDB's ``USING SAMPLE reservoir(N ROWS) REPEATABLE (seed)`` from
  the filtered rows: the same seed on the same rows and DuckDB version gives the same sample.
  On Spark the sample is the rows first in the order of a seeded hash (:meth:`.Dialect.sample`):
  the same seed on the same multiset of rows gives the same sample, whatever the partitioning.
  Each sampled value's residual is its value minus its group's exact mean (from the first
  pass), rounded once; a group of one value has no residual that informs and is left out.
"""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction

import numpy as np

from ..errors import InputError
from ..input import Groups, format_label
from ..distributions import shapiro_wilk
from ..stats import (
    SHAPIRO_WILK_MAX_N, KruskalResult, LeveneResult, NormalityResult, kruskal_from_counts,
    levene_result, middle_value, shapiro_residuals,
)
from .moments import GroupSums
from .source import Relation, run

__all__ = [
    "MAX_DISTINCT", "Centres", "group_centres", "levene_sql", "kruskal_sql", "normality_sql",
    "kept_rows",
]

#: The most (group, distinct value) rows fetched for Kruskal–Wallis.
MAX_DISTINCT = 2_000_000


def kept_rows(rel: Relation) -> str:
    """The rows analysed: ``g`` (the group), ``x`` (the value; DOUBLE for a DOUBLE column):
    no NULL label, no NULL or NaN value, inside the filter."""
    x = f"CAST({rel.value} AS DOUBLE)" if rel.kind == "double" else rel.value
    bad = f" AND NOT isnan({x})" if rel.kind == "double" else ""
    return (
        f"SELECT {rel.group} AS g, {x} AS x FROM {rel.src} WHERE {rel.group} IS NOT NULL "
        f"AND {rel.where} AND {rel.value} IS NOT NULL{bad}"
    )


def _integers(rel: Relation, scale: int) -> str:
    """Rows ``g, x, m`` with ``m = x * 10**scale`` as a HUGEINT, and ``ok`` whether ``m`` is
    exact (a DOUBLE must scale to a whole number below 1e15 that gives ``x`` back)."""
    rows = kept_rows(rel)
    if rel.kind == "double":
        p = f"CAST({10 ** scale} AS DOUBLE)"
        r = rel.dialect.rint(f"x * {p}")
        return (
            f"SELECT g, x, CASE WHEN abs({r}) < CAST(1e15 AS DOUBLE) AND {r} / {p} = x "
            f"THEN CAST({r} AS {rel.dialect.wide}) END AS m FROM ({rows})"
        )
    if rel.kind == "decimal":
        s = rel.decimals
        m = f"CAST(CAST(x AS DECIMAL(38, {s})) * CAST({10 ** s} AS DECIMAL(38, 0)) AS {rel.dialect.wide})"
        if s != scale:
            raise InputError(f"internal: DECIMAL scale {s} differs from the sums' scale {scale}")
    else:
        m = f"CAST(x AS {rel.dialect.wide})"
    return f"SELECT g, x, {m} AS m FROM ({rows})"


@dataclass(frozen=True)
class Centres:
    """Per group, in the order of the sums' labels: ``low``, ``median``, ``high`` (the
    smallest, middle and largest values), ``lo_m`` and ``hi_m`` (the two middle values as
    integers ``value * 10**scale``, ``None`` when some value of the group does not scale
    exactly), and ``inexact`` the number of such values over all groups."""

    low: tuple[float, ...]
    median: tuple[float, ...]
    high: tuple[float, ...]
    lo_m: tuple[int | None, ...]
    hi_m: tuple[int | None, ...]
    inexact: int

    def extremes(self) -> list[tuple[float, float, float]]:
        """``(smallest, median, largest)`` per group, for the group summaries."""
        return list(zip(self.low, self.median, self.high))


def _order(sums: GroupSums, got: list[tuple]) -> list[tuple]:
    """The rows of ``got`` (group value first) in the order of the sums' labels."""
    by = {format_label(r[0]): r for r in got}
    missing = [lab for lab in sums.labels if lab not in by]
    if missing:
        raise InputError(
            f'group "{missing[0]}" was in the first pass but not in the second: the rows '
            "changed between the two queries; run the analysis again on data that do not change"
        )
    return [by[lab] for lab in sums.labels]


def _middles(rel: Relation, rows: str, c: str) -> str:
    """A query of ``g``, ``lo``, ``hi``: per group of the query ``rows`` the two middle values
    of its column ``c`` (NULL left out), by the dialect's aggregate or else by ranks: the
    counts per distinct value, summed in order, reach ``(n + 1) div 2`` at the lower middle
    value and ``n div 2 + 1`` at the upper (sorting the distinct values only, not every row)."""
    low = rel.dialect.lower_middle(c)
    if low is not None:
        return f"SELECT g, {low} AS lo, -{rel.dialect.lower_middle('-' + c)} AS hi FROM ({rows}) GROUP BY g"
    div = rel.dialect.intdiv
    counts = f"SELECT g, {c} AS v, count(*) AS k FROM ({rows}) WHERE {c} IS NOT NULL GROUP BY g, {c}"
    ranked = (
        "SELECT g, v, sum(k) OVER (PARTITION BY g ORDER BY v ROWS BETWEEN UNBOUNDED PRECEDING "
        f"AND CURRENT ROW) AS r, sum(k) OVER (PARTITION BY g) AS n FROM ({counts})"
    )
    return (
        f"SELECT g, min(v) FILTER (WHERE r >= ({div('(n + 1)', '2')})) AS lo, "
        f"min(v) FILTER (WHERE r >= ({div('n', '2')}) + 1) AS hi FROM ({ranked}) GROUP BY g"
    )


def _centres_sql(rel: Relation, ints: str) -> str:
    """Per group: the smallest and largest value, the two middle integers and the count of
    values that do not scale exactly (one query where the engine has a middle-value aggregate)."""
    low = rel.dialect.lower_middle("m")
    if low is not None:
        return (
            f"SELECT g, min(x), max(x), {low}, -{rel.dialect.lower_middle('-m')}, "
            f"count(*) FILTER (WHERE m IS NULL) FROM ({ints}) GROUP BY g"
        )
    ends = f"SELECT g, min(x) AS a, max(x) AS b, count(*) FILTER (WHERE m IS NULL) AS k FROM ({ints}) GROUP BY g"
    return (
        f"SELECT e.g, e.a, e.b, c.lo, c.hi, e.k FROM ({ends}) e "
        f"LEFT JOIN ({_middles(rel, ints, 'm')}) c ON e.g = c.g"
    )


def group_centres(rel: Relation, sums: GroupSums) -> Centres:
    """The smallest, middle and largest values of every group (one query; a second one for the
    middle values in the data's unit only when some value does not scale exactly)."""
    rows = _order(sums, run(rel.con, _centres_sql(rel, _integers(rel, sums.scale))))
    inexact = sum(int(r[5]) for r in rows)
    p = 10**sums.scale
    if inexact:
        q = _middles(rel, kept_rows(rel), "x")
        middle = [(float(r[1]), float(r[2])) for r in _order(sums, run(rel.con, q))]
    else:  # an exact m is the value times 10**scale, and m / 10**scale rounds back to it
        middle = [(int(r[3]) / p, int(r[4]) / p) for r in rows]
    return Centres(
        low=tuple(float(r[1]) for r in rows),
        median=tuple(middle_value(lo, hi, True) for lo, hi in middle),
        high=tuple(float(r[2]) for r in rows),
        lo_m=tuple(None if r[5] else int(r[3]) for r in rows),
        hi_m=tuple(None if r[5] else int(r[4]) for r in rows),
        inexact=inexact,
    )


def levene_sql(rel: Relation, sums: GroupSums, centres: Centres, center: str = "median") -> LeveneResult:
    """Levene's test (``center="median"``: Brown & Forsythe's form; ``"mean"``: Levene's) from a
    second query of exact integer sums of the absolute deviations (see the module docstring)."""
    if centres.inexact:
        raise InputError(
            f"{centres.inexact} values do not scale exactly to whole numbers at "
            f"{sums.scale} decimals (more than 15 significant digits at that scale), so the "
            "deviations cannot be summed exactly in the database"
        )
    base = _integers(rel, sums.scale)
    low = rel.dialect.lower_middle("m")
    if center == "median":  # lo + hi = quantile_disc(m, 0.5) - quantile_disc(-m, 0.5)
        w = "abs(2 * r.m - c.t)"
        if low is not None:
            cte = f"c AS (SELECT g, {low} - {rel.dialect.lower_middle('-m')} AS t FROM ({base}) GROUP BY g)"
        else:
            cte = f"c AS (SELECT g, lo + hi AS t FROM ({_middles(rel, base, 'm')}))"
    else:
        w = "abs(c.n * r.m - c.t)"
        cte = f"c AS (SELECT g, CAST(count(*) AS {rel.dialect.wide}) AS n, sum(m) AS t FROM ({base}) GROUP BY g)"
    q = (
        f"WITH {cte}, d AS (SELECT r.g AS g, {w} AS w FROM ({base}) r JOIN c ON r.g = c.g) "
        "SELECT g, count(*), sum(w), sum(w * w), min(w), max(w) FROM d GROUP BY g"
    )
    rows = _order(sums, run(rel.con, q))
    div = [Fraction(2)] * len(rows) if center == "median" else [Fraction(int(r[1])) for r in rows]
    n = [int(r[1]) for r in rows]
    sz = [Fraction(int(r[2])) / d for r, d in zip(rows, div)]
    szz = [Fraction(int(r[3])) / (d * d) for r, d in zip(rows, div)]
    lows = [Fraction(int(r[4])) / d for r, d in zip(rows, div)]
    highs = [Fraction(int(r[5])) / d for r, d in zip(rows, div)]
    return levene_result(center, n, sz, szz, (min(lows), max(highs)))


def kruskal_sql(rel: Relation, sums: GroupSums, max_distinct: int = MAX_DISTINCT) -> KruskalResult:
    """Kruskal–Wallis from the counts per (group, distinct value), fetched when there are at
    most ``max_distinct`` such rows (else InputError, whose reason the analysis shows)."""
    q = (
        f"SELECT g, CAST(x AS DOUBLE) AS v, count(*) FROM ({kept_rows(rel)}) GROUP BY g, v "
        f"LIMIT {int(max_distinct) + 1}"
    )
    got = run(rel.con, q)
    if len(got) > max_distinct:
        raise InputError(
            f"more than {max_distinct:,} distinct (group, value) pairs, too many to rank "
            "outside the database; Kruskal-Wallis needs the ranks of all values"
        )
    index = {lab: i for i, lab in enumerate(sums.labels)}
    group = np.fromiter((index[format_label(r[0])] for r in got), dtype=np.int64, count=len(got))
    values = np.fromiter((r[1] for r in got), dtype=np.float64, count=len(got))
    counts = np.fromiter((r[2] for r in got), dtype=np.int64, count=len(got))
    return kruskal_from_counts(len(sums.labels), values, group, counts)


def normality_sql(rel: Relation, sums: GroupSums, seed: int) -> NormalityResult:
    """The residuals' normality test: on every value up to the in-memory limit, else on a
    seeded random sample of that many rows (see the module docstring)."""
    total = sum(sums.n)
    if total <= SHAPIRO_WILK_MAX_N:
        got = run(rel.con, f"SELECT g, {rel.dialect.collect('x')} FROM ({kept_rows(rel)}) GROUP BY g")
        arrays = {format_label(g): np.asarray(v, dtype=np.float64) for g, v in got}
        return shapiro_residuals(Groups(sums.labels, tuple(arrays[lab] for lab in sums.labels)))
    q = rel.dialect.sample(kept_rows(rel), SHAPIRO_WILK_MAX_N, seed)
    mom = sums.moments()
    index = {lab: i for i, lab in enumerate(sums.labels)}
    res: list[float] = []
    for g, x in run(rel.con, q):
        i = index[format_label(g)]
        if sums.n[i] >= 2:
            res.append(float(Fraction(x) - mom.mean(i)))
    kept = sum(n for n in sums.n if n >= 2)
    left_out = tuple(lab for lab, n in zip(sums.labels, sums.n) if n < 2)
    r = np.asarray(res, dtype=np.float64)
    if r.size < 3 or not np.any(r):
        raise InputError(
            f"the random sample holds {r.size} residuals that are not all zero; the normality "
            "test needs at least 3 that vary"
        )
    stat, p = shapiro_wilk(r / float(np.max(np.abs(r))))
    return NormalityResult(
        statistic=stat, p=p, n=int(r.size), method="Shapiro-Wilk", left_out=left_out,
        of_total=kept, seed=int(seed),
    )
