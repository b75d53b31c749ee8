"""Every analysis of rows in a database or a Parquet or CSV file: :func:`analyse_sql`.

The first pass gives the exact per-group sums (:mod:`sheetfuncs.engines.moments`); from them
come the one-way analysis, Welch's and Bartlett's tests, the comparisons, the letters, the effect
sizes and the group means, SDs and intervals, by the same functions as the in-memory
:func:`sheetfuncs.analyse` (:func:`sheetfuncs.stats.analyse_of`). The second passes of
:mod:`sheetfuncs.engines.passes` give the group extremes and medians, the median-centred Levene
test, Kruskal–Wallis and the residuals' normality test; one that cannot run at this scale is
shown as not available, with the reason in one line. When a value has more than 15 significant
digits no exact sum can hold it: the values are then fetched and the in-memory analysis runs.
"""

from __future__ import annotations

import os
from collections.abc import Callable
from dataclasses import dataclass
from typing import Any

from ..errors import InputError
from ..input import RowsOrigin
from ..stats import Analysis, analyse, analyse_of, attempt, moments_only
from .moments import GroupSums, NotExact, sums_from_relation
from .oneway import check_sums_groups, fetched_groups, plain_sums, sums_notes
from .passes import MAX_DISTINCT, group_centres, kruskal_sql, levene_sql, normality_sql
from .source import Relation, engine, opened

__all__ = ["RowsOrigin", "SqlAnalysis", "analyse_sql", "DEFAULT_SEED"]

#: The seed of the residuals' random sample unless another is given.
DEFAULT_SEED = 20261203


@dataclass(frozen=True)
class SqlAnalysis:
    """The result of :func:`analyse_sql`: ``analysis`` (the :class:`~sheetfuncs.stats.Analysis`;
    its ``groups`` is ``None`` unless the values were fetched), ``sums`` (the exact per-group
    sums, or ``None`` when they could not be exact) and ``origin`` (:class:`RowsOrigin`)."""

    analysis: Analysis
    sums: GroupSums | None
    origin: RowsOrigin


def _version(rel: Relation) -> str:
    """The engine's version: a SparkSession's, or the DuckDB module's."""
    if rel.dialect.name == "DuckDB":
        return str(engine().__version__)
    return str(getattr(rel.con, "version", "?"))


def _origin(rel: Relation, where: str | None, sums: GroupSums, fetched: bool,
            source: Any) -> RowsOrigin:
    return RowsOrigin(
        engine=rel.dialect.name, engine_version=_version(rel), source=rel.name,
        from_sql=rel.src, where=where,
        rows_read=sum(sums.n) + sum(sums.missing) + sums.null_labels,
        null_labels=sums.null_labels, missing=sums.missing, notes=tuple(sums_notes(sums)),
        fetched=fetched,
        path=os.path.abspath(os.fspath(source)) if isinstance(source, (str, os.PathLike)) else None,
    )


def analyse_sql(
    source: Any, *, group: str, value: str, where: str | None = None, missing: str = "stop",
    alpha: Any = 0.05, method: Any = "tukey", control: Any = None, conf: Any = None,
    comparisons: bool = True, seed: int = DEFAULT_SEED, max_distinct: int = MAX_DISTINCT,
    progress: Callable[[str, int, int], None] | None = None,
) -> SqlAnalysis:
    """Every analysis of ``value`` by ``group`` (see :func:`sheetfuncs.analyse` for ``alpha``,
    ``method``, ``control``, ``conf`` and ``comparisons``) with the sums computed inside
    the engine (DuckDB or Spark). ``source``, ``where`` and ``missing`` are as in :func:`sheetfuncs.oneway_sql`.

    The exact path gives the results of :func:`sheetfuncs.analyse` on the same values: to the
    last bit for everything from the sums, the median-centred Levene test and Kruskal–Wallis;
    the residuals' normality test on every value up to 5,000 values and above that on a seeded
    random sample of 5,000 rows (``seed``; the result says so). Kruskal–Wallis fetches one row
    per (group, distinct value), at most ``max_distinct``, else it is not available. The
    analysis's ``groups`` is ``None``: the values stay in the database. ``progress(stage,
    done, total)``, when given, hears how far each DuckDB query running longer than a second
    is (``"query"``, percent, 100)."""
    if not isinstance(seed, int) or isinstance(seed, bool) or not 0 <= seed < 2**31:
        raise InputError(f"seed must be a whole number from 0 to 2147483647, not {seed!r}")
    if not isinstance(max_distinct, int) or max_distinct < 1:
        raise InputError(f"max_distinct must be a whole number of at least 1, not {max_distinct!r}")
    opts = dict(alpha=alpha, method=method, control=control, conf=conf, comparisons=comparisons)
    with opened(source, group, value, where, progress) as rel:
        sums = sums_from_relation(rel, missing=missing)
        if isinstance(sums, NotExact):
            base = plain_sums(rel, missing)
            check_sums_groups(base)
            an = analyse(fetched_groups(rel, base), **opts)
            return SqlAnalysis(an, None, _origin(rel, where, base, True, source))
        check_sums_groups(sums)
        gm = moments_only(sums.labels, sums.moments(), sums.missing)
        analyse_of(gm, **{**opts, "comparisons": False})  # the options' and the one-way analysis's messages before any second pass
        an = _second_passes(rel, sums, gm, opts, seed, max_distinct)
        return SqlAnalysis(an, sums, _origin(rel, where, sums, False, source))


def _second_passes(rel: Relation, sums: GroupSums, gm: Any, opts: dict[str, Any], seed: int,
                   max_distinct: int) -> Analysis:
    """The analysis with the tests that need a second pass over the rows."""
    centres = group_centres(rel, sums)
    return analyse_of(
        gm, **opts, extremes=centres.extremes(),
        levene=attempt("Levene's test", lambda: levene_sql(rel, sums, centres, "median"), numerical=True),
        kruskal=attempt("Kruskal-Wallis", lambda: kruskal_sql(rel, sums, max_distinct), numerical=True),
        normality=attempt("the normality test", lambda: normality_sql(rel, sums, seed), numerical=True),
        scale="from the database's sums",
    )
