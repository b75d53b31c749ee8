"""The one-way analysis of variance of rows in a database or a Parquet or CSV file."""

from __future__ import annotations

from dataclasses import replace
from typing import Any

import numpy as np

from ..errors import InputError
from ..input import Groups, format_label
from ..stats import OneWayResult, compute_moments, oneway_from_moments, oneway_from_sums
from .moments import GroupSums, NotExact, sums_from_relation
from .source import Relation, opened, run

__all__ = ["oneway_sql", "sums_notes", "plain_sums", "fetched_groups", "check_sums_groups"]


def sums_notes(sums: GroupSums) -> list[str]:
    notes = []
    if sums.null_labels:
        k = sums.null_labels
        notes.append(f"{k} row{'s' if k != 1 else ''} with no group label (NULL) left out")
    if any(sums.missing):
        k = sum(sums.missing)
        each = ", ".join(f'"{lab}" {c}' for lab, c in zip(sums.labels, sums.missing) if c)
        notes.append(f"{k} missing value{'s' if k != 1 else ''} (NULL or NaN) dropped: {each}")
    return notes


def check_sums_groups(sums: GroupSums) -> None:
    for lab, n, mi in zip(sums.labels, sums.n, sums.missing):
        if n == 0:
            raise InputError(
                f'group "{lab}" has no numbers left after dropping its {mi} missing value'
                f"{'s' if mi != 1 else ''} (NULL or NaN); filter it out or give it values"
            )


def fetched_groups(rel: Relation, sums: GroupSums) -> Groups:
    """Every finite value fetched per group, as in-memory groups in the order of ``sums``."""
    got = run(
        rel.con,
        f"SELECT {rel.group}, {rel.dialect.collect(f'CAST({rel.value} AS DOUBLE)')} FROM {rel.src} "
        f"WHERE {rel.group} IS NOT NULL AND {rel.where} AND {rel.value} IS NOT NULL "
        f"AND {rel.dialect.isfinite(f'CAST({rel.value} AS DOUBLE)')} GROUP BY {rel.group}",
    )
    arrays = {format_label(g): np.asarray(v, dtype=np.float64) for g, v in got}
    return Groups(sums.labels, tuple(arrays[lab] for lab in sums.labels), dropped=sums.missing)


def _float_path(rel: Relation, sums: GroupSums, exact: bool | None) -> OneWayResult:
    """Every finite value fetched per group, then the in-memory moments (floats, or the
    in-memory message when ``exact=True``)."""
    g = fetched_groups(rel, sums)
    res = oneway_from_moments(g, compute_moments(g, exact))
    return replace(res, notes=tuple(sums_notes(sums)))


def oneway_sql(
    source: Any, *, group: str, value: str, where: str | None = None,
    exact: bool | None = None, missing: str = "stop",
) -> OneWayResult:
    """One-way analysis of variance of ``value`` by ``group``, the sums computed inside the engine.

    ``source`` is a ``.parquet`` or ``.csv`` path (read by an in-process DuckDB), or a pair
    ``(connection, "table")`` / ``(connection, "SELECT ...")`` of a DuckDB connection and a
    table name or query; or Spark: a DataFrame, or ``(spark, "table")`` / ``(spark, "SELECT
    ...")`` (ANSI mode is forced for the call, the session's setting restored afterwards).
    ``where`` is an optional SQL filter. Groups are sorted by label (as
    text). Rows with a NULL group label are left out and noted; NULL or NaN values stop the
    analysis (``missing="stop"``) or are left out and counted (``"drop"``); infinite values
    stop it.

    ``exact=None`` returns the decimal-exact result, bit-identical to :func:`sheetfuncs.oneway`
    on the same values, whenever every value has at most 15 significant digits (a DECIMAL column
    always); otherwise the values are fetched and the in-memory floating-point path is used
    (``result.exact`` says which). ``exact=True`` demands the exact path; ``exact=False`` fetches
    the values and uses the floating-point path.
    """
    if exact is not None and not isinstance(exact, bool):
        raise InputError(f"exact must be None (automatic), True or False, not {exact!r}")
    with opened(source, group, value, where) as rel:
        sums = sums_from_relation(rel, missing=missing)
        if isinstance(sums, NotExact):
            base = plain_sums(rel, missing)
            check_sums_groups(base)
            return _float_path(rel, base, exact)
        check_sums_groups(sums)
        if exact is False:
            return _float_path(rel, sums, exact)
    return oneway_from_sums(sums.labels, sums.moments(), sums.missing, sums_notes(sums))


def plain_sums(rel: Relation, missing: str) -> GroupSums:
    """Labels, counts and missing values only (for the floating-point path)."""
    miss = f"{rel.value} IS NULL" + (
        f" OR {rel.dialect.isnan(f'CAST({rel.value} AS DOUBLE)')}" if rel.kind == "double" else ""
    )
    got = run(
        rel.con,
        f"SELECT {rel.group}, count(*) FILTER (WHERE NOT ({miss})), count(*) FILTER (WHERE {miss}) "
        f"FROM {rel.src} WHERE {rel.group} IS NOT NULL AND {rel.where} GROUP BY {rel.group}",
    )
    nulls = run(rel.con, f"SELECT count(*) FROM {rel.src} WHERE {rel.group} IS NULL AND {rel.where}")[0][0]
    rows = sorted((format_label(g), int(n), int(m)) for g, n, m in got)
    z = tuple(0 for _ in rows)
    return GroupSums(
        tuple(r[0] for r in rows), 0, 0, tuple(r[1] for r in rows), z, z,
        tuple(r[2] for r in rows), int(nulls),
    )
