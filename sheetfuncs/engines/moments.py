"""Exact per-group moments computed inside DuckDB: counts, sums and sums of squares of scaled,
centred integers, as Python integers that add across partitions and files.

Every value is ``(offset + m) / 10**scale`` for an integer ``m`` (the convention of
:class:`sheetfuncs.stats.ExactMoments`), so the sums of squares formed from them are the same
exact rationals as :func:`sheetfuncs.oneway`'s, whatever scale and offset the engine uses.

How the scale is found, by column type:

* DECIMAL(w, s): the stored decimals are exact; the scale is ``s`` (values below ``10**(38 - 2s)``).
* integers: scale 0.
* DOUBLE (and FLOAT, read as DOUBLE): a first query finds, per row, the smallest ``D <= 22``
  with ``r = round(x * 10**D)``, ``|r| < 10**15`` and ``r / 10**D = x`` (then ``r / 10**D`` is
  the value's shortest round-trip decimal, as in :mod:`sheetfuncs.stats.moments`), and the
  largest such ``D``. The second query sums the rows that pass at that scale; the rest (more
  than 22 decimals, or too many digits at that scale) are fetched, and only they, and read one
  by one through their shortest decimals in Python. A value of more than 15 significant digits
  cannot be exact: the caller then takes the floating-point path.

A 128-bit ``sum(m * m)`` overflows after about 2e6 rows whose centred spread is near 2**53:
when ``rows * bound**2`` could pass 2**126 the squares are summed in the split form
``m = a * K + b`` (``K = 2**h``): ``sum m^2 = K^2 sum a^2 + 2 K sum ab + sum b^2``.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from decimal import Decimal
from fractions import Fraction
from typing import Any

from ..errors import InputError
from ..input import format_label
from ..stats import ExactMoments
from ..stats.moments import MAX_DIGITS, decimal_parts
from .source import Relation, run

__all__ = ["GroupSums", "NotExact", "group_sums", "sums_from_relation"]

_MAX_SCALE = 22
_WIDE = 99
_LIMIT = 1 << 126


@dataclass(frozen=True)
class NotExact:
    """A value that no exact sum can hold: ``digits`` significant digits (more than 15)."""

    value: float
    label: str
    digits: int


@dataclass(frozen=True)
class GroupSums:
    """Exact per-group sums: labels sorted as text; value ``= (offset + m) / 10**scale``;
    ``n``, ``s = sum m`` and ``q = sum m**2`` per group; ``missing`` the NULL or NaN values left
    out per group; ``null_labels`` the rows left out for a NULL group label. Adds with ``+``
    (rescaled to the larger scale and to the left operand's offset)."""

    labels: tuple[str, ...]
    scale: int
    offset: int
    n: tuple[int, ...]
    s: tuple[int, ...]
    q: tuple[int, ...]
    missing: tuple[int, ...]
    null_labels: int = 0

    def rebased(self, scale: int, offset: int) -> GroupSums:
        """The same sums at a scale ``>= self.scale`` and another offset, exactly."""
        if scale < self.scale:
            raise InputError(f"cannot rescale sums from {self.scale} to {scale} decimals")
        g = 10 ** (scale - self.scale)
        d = self.offset * g - offset  # m' = m * g + d
        s = tuple(si * g + ni * d for ni, si in zip(self.n, self.s))
        q = tuple(
            qi * g * g + 2 * d * g * si + ni * d * d for ni, si, qi in zip(self.n, self.s, self.q)
        )
        return GroupSums(self.labels, scale, offset, self.n, s, q, self.missing, self.null_labels)

    def __add__(self, other: GroupSums) -> GroupSums:
        scale = max(self.scale, other.scale)
        a = self.rebased(scale, self.offset * 10 ** (scale - self.scale))
        b = other.rebased(scale, a.offset)
        rows: dict[str, list[int]] = {}
        for part in (a, b):
            for i, lab in enumerate(part.labels):
                acc = rows.setdefault(lab, [0, 0, 0, 0])
                for j, v in enumerate((part.n[i], part.s[i], part.q[i], part.missing[i])):
                    acc[j] += v
        labs = tuple(sorted(rows))
        cols = list(zip(*(rows[lab] for lab in labs)))
        return GroupSums(
            labs, scale, a.offset, *(tuple(c) for c in cols),  # type: ignore[arg-type]
            null_labels=a.null_labels + b.null_labels,
        )

    def moments(self) -> ExactMoments:
        return ExactMoments(self.scale, self.offset, self.n, self.s, self.q)


def _rows(rel: Relation, *, labelled: bool = True) -> str:
    x = f"CAST({rel.value} AS DOUBLE)" if rel.kind == "double" else rel.value
    keep = f"{rel.group} IS NOT NULL AND " if labelled else ""
    return f"SELECT {rel.group} AS g, {x} AS x FROM {rel.src} WHERE {keep}{rel.where}"


def _p10(d: int) -> str:
    return f"CAST({10 ** d} AS DOUBLE)"


def _fits(d: int) -> str:
    r = f"round(x * {_p10(d)})"
    return f"(abs({r}) < {_p10(15)} AND {r} / {_p10(d)} = x)"


def _scan(rel: Relation) -> dict[str, Any]:
    """Counts of NULL labels, missing and infinite values, the scale, the extremes, the rows."""
    if rel.kind == "double":
        chain = " ".join(f"WHEN {_fits(d)} THEN {d}" for d in range(_MAX_SCALE + 1))
        inner = f"SELECT g, x, CASE WHEN isfinite(x) THEN CASE {chain} ELSE {_WIDE} END END AS d FROM ({_rows(rel, labelled=False)})"
        bad, inf, scale = "(x IS NULL OR isnan(x))", "isinf(x)", f"max(d) FILTER (WHERE g IS NOT NULL AND d < {_WIDE})"
        wide, fin = f"d = {_WIDE}", "d < " + str(_WIDE)
    else:
        inner = f"SELECT g, x FROM ({_rows(rel, labelled=False)})"
        bad, inf, scale, wide, fin = "x IS NULL", "FALSE", str(rel.decimals), "FALSE", "x IS NOT NULL"
    sql = (
        "SELECT count(*) FILTER (WHERE g IS NULL), "
        f"count(*) FILTER (WHERE g IS NOT NULL AND {bad}), count(*) FILTER (WHERE g IS NOT NULL AND {inf}), "
        f"{scale}, count(*) FILTER (WHERE g IS NOT NULL AND {wide}), "
        f"min(x) FILTER (WHERE g IS NOT NULL AND {fin}), max(x) FILTER (WHERE g IS NOT NULL AND {fin}), "
        f"count(*) FILTER (WHERE g IS NOT NULL AND {fin}) FROM ({inner})"
    )
    keys = ("null_labels", "missing", "infinite", "scale", "wide", "low", "high", "rows")
    return dict(zip(keys, run(rel.con, sql)[0]))


def _first_label(rel: Relation, cond: str) -> str:
    got = run(rel.con, f"SELECT g FROM ({_rows(rel)}) WHERE {cond} LIMIT 1")
    return format_label(got[0][0]) if got else "?"


def _check_values(rel: Relation, scan: dict[str, Any], drop: bool) -> None:
    if scan["infinite"]:
        k = scan["infinite"]
        raise InputError(
            f'{k} infinite value{"s" if k != 1 else ""} in column "{rel.value_name}", the first '
            f'in group "{_first_label(rel, "isinf(x)")}"; remove {"it" if k == 1 else "them"} or '
            f'replace {"it" if k == 1 else "them"} with the measured value{"s" if k != 1 else ""}'
        )
    if scan["missing"] and not drop:
        k = scan["missing"]
        cond = "x IS NULL OR isnan(x)" if rel.kind == "double" else "x IS NULL"
        raise InputError(
            f'{k} missing value{"s" if k != 1 else ""} (NULL or NaN) in column "{rel.value_name}", '
            f'the first in group "{_first_label(rel, cond)}"; filter them out in the query or the '
            'where filter, or pass missing="drop" to leave them out and count them'
        )


def _offset_and_bound(scan: dict[str, Any], scale: int, kind: str) -> tuple[int, int]:
    """An integer centring offset and a bound on ``|m|``."""
    lo, hi = scan["low"], scan["high"]
    if lo is None:
        return 0, 1
    p = 10**scale
    lo_i = Fraction(Decimal(lo) if not isinstance(lo, float) else lo) * p
    hi_i = Fraction(Decimal(hi) if not isinstance(hi, float) else hi) * p
    offset = round((lo_i + hi_i) / 2)
    bound = math.ceil(max(hi_i - offset, offset - lo_i)) + 2
    if kind == "decimal" and max(abs(hi_i), abs(lo_i)) >= Fraction(10 ** (38 - scale)):
        raise InputError(
            f"the DECIMAL values reach {max(abs(hi), abs(lo))}, too large to scale to integers "
            f"with their {scale} decimals inside the engine; cast them to fewer decimals in a query"
        )
    if kind == "double":  # only |r| < 1e15 is summed in SQL, the rest in Python
        offset = max(-(2**53), min(2**53, offset))
        bound = min(bound, 10**15 + abs(offset) + 2)
    return offset, bound


def _m_expr(rel: Relation, scale: int, offset: int) -> str:
    if rel.kind == "double":
        r = f"round(x * {_p10(scale)})"
        return f"CASE WHEN isfinite(x) AND {_fits(scale)} THEN CAST({r} AS HUGEINT) - {offset} END"
    if rel.kind == "decimal":
        s = rel.decimals
        return f"CAST(CAST(x AS DECIMAL(38, {s})) * CAST({10**s} AS DECIMAL(38, 0)) AS HUGEINT) - {offset}"
    return f"CAST(x AS HUGEINT) - {offset}"


def _sums_sql(rel: Relation, scale: int, offset: int, split: int) -> str:
    """Per group: count, sum m, the square sums (one, or three in the split form), the missing
    values and the rows left for Python."""
    missing = "x IS NULL OR isnan(x)" if rel.kind == "double" else "x IS NULL"
    inner = f"SELECT g, x, {_m_expr(rel, scale, offset)} AS m FROM ({_rows(rel)})"
    if split:
        k = f"CAST({1 << split} AS HUGEINT)"
        inner = f"SELECT g, x, m, m // {k} AS a, m - (m // {k}) * {k} AS b FROM ({inner})"
        squares = "sum(a * a), sum(a * b), sum(b * b)"
    else:
        squares = "sum(m * m), 0, 0"
    left = "count(*) FILTER (WHERE m IS NULL AND isfinite(x))" if rel.kind == "double" else "0"
    return (
        f"SELECT g, count(m), sum(m), {squares}, count(*) FILTER (WHERE {missing}), {left} "
        f"FROM ({inner}) GROUP BY g"
    )


def _labels(raw: list[Any]) -> list[str]:
    labels = [format_label(v) for v in raw]
    seen: dict[str, Any] = {}
    for v, lab in zip(raw, labels):
        if lab in seen:
            raise InputError(
                f'the group values {seen[lab]!r} and {v!r} both read as the label "{lab}"; '
                "make the group column's values distinct (e.g. trim them in a query)"
            )
        seen[lab] = v
    return labels


def _add_left(
    rel: Relation, sql_inner: str, labels: list[str], raw: list[Any], sums: GroupSums
) -> GroupSums | NotExact:
    """``sums`` with the rows SQL could not scale read in Python through their shortest
    decimals (the scale grows to theirs), or :class:`NotExact` for a value of too many digits."""
    where = {repr(v): i for i, v in enumerate(raw)}
    rows = run(rel.con, f"SELECT g, x FROM ({sql_inner}) WHERE m IS NULL AND isfinite(x)")
    parts: list[tuple[int, int, int]] = []
    for g, x in rows:
        i = where[repr(g)]
        mant, exp, nd = decimal_parts(x)
        if nd > MAX_DIGITS:
            return NotExact(float(x), labels[i], nd)
        parts.append((i, mant, exp))
    scale = max([sums.scale] + [-e for _, _, e in parts])
    out = sums.rebased(scale, sums.offset * 10 ** (scale - sums.scale))
    n, s, q = list(out.n), list(out.s), list(out.q)
    for i, mant, exp in parts:
        m = mant * 10 ** (exp + scale) - out.offset
        n[i] += 1
        s[i] += m
        q[i] += m * m
    return GroupSums(out.labels, scale, out.offset, tuple(n), tuple(s), tuple(q), out.missing, out.null_labels)


def sums_from_relation(rel: Relation, *, missing: str = "stop") -> GroupSums | NotExact:
    """Exact per-group sums of ``rel`` (see the module docstring), or :class:`NotExact`."""
    drop = _parse_missing(missing)
    scan = _scan(rel)
    _check_values(rel, scan, drop)
    scale = int(scan["scale"] or 0)
    offset, bound = _offset_and_bound(scan, scale, rel.kind)
    if bound.bit_length() > 64:
        raise InputError(
            f'the values of column "{rel.value_name}" span more than 2**64 units of their last '
            "decimal; they cannot be summed exactly here: rescale them in a query"
        )
    split = 0 if (scan["rows"] or 1) * bound * bound < _LIMIT else (bound.bit_length() + 1) // 2
    sql = _sums_sql(rel, scale, offset, split)
    got = run(rel.con, sql)
    raw = [r[0] for r in got]
    labels = _labels(raw)
    k = 1 << split
    n, s, q, miss = [], [], [], []
    for _, cnt, sm, a2, ab, b2, mi, _left in got:
        n.append(int(cnt))
        s.append(int(sm or 0))
        q.append(int(a2 or 0) * k * k + 2 * int(ab or 0) * k + int(b2 or 0) if split else int(a2 or 0))
        miss.append(int(mi))
    sums = GroupSums(tuple(labels), scale, offset, tuple(n), tuple(s), tuple(q), tuple(miss), int(scan["null_labels"]))
    if any(r[7] for r in got):
        inner = f"SELECT g, x, {_m_expr(rel, scale, offset)} AS m FROM ({_rows(rel)})"
        done = _add_left(rel, inner, labels, raw, sums)
        if isinstance(done, NotExact):
            return done
        sums = done
    return _sorted(sums)


def _sorted(s: GroupSums) -> GroupSums:
    order = sorted(range(len(s.labels)), key=lambda i: s.labels[i])

    def pick(t: tuple[Any, ...]) -> tuple[Any, ...]:
        return tuple(t[i] for i in order)

    return GroupSums(
        pick(s.labels), s.scale, s.offset, pick(s.n), pick(s.s), pick(s.q), pick(s.missing), s.null_labels
    )


def _parse_missing(missing: Any) -> bool:
    text = str(missing).strip().lower() if isinstance(missing, str) else None
    if text not in ("stop", "drop"):
        raise InputError(
            'missing must be "stop" (a NULL or NaN value stops the analysis) or "drop" (they '
            f"are left out and counted), not {missing!r}"
        )
    return text == "drop"


def group_sums(
    source: Any, *, group: str, value: str, where: str | None = None, missing: str = "stop"
) -> GroupSums | NotExact:
    """Exact per-group sums of ``value`` by ``group`` from ``source`` (see
    :func:`sheetfuncs.oneway_sql` for the sources), computed inside DuckDB; labels sorted as
    text. :class:`NotExact` when a value has more than 15 significant digits."""
    from .source import open_relation

    return sums_from_relation(open_relation(source, group, value, where), missing=missing)
