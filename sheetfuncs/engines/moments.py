"""Exact per-group moments computed inside the engine (DuckDB or Spark): counts, sums and sums of squares of scaled,
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

A 128-bit ``sum(m * m)`` overflows after about 2e6 rows whose centred spread is near 2**53,
and a BIGINT square beyond 2**31: centred integers that reach 2**31 are summed in the split
form ``m = a * K + b`` (``K = 2**h``, ``|a|, |b| < 2**32``), ``sum m^2 = K^2 sum a^2 + 2 K sum ab
+ sum b^2``, every product in 64 bits (128 for values beyond 2**62) and every sum in DuckDB's
128-bit accumulator, which cannot overflow below 2**63 rows. DuckDB's integer arithmetic is
checked: an overflow is an error, never a wrapped number. Spark's (with ANSI mode, forced) is
checked too; its sums are 64-bit, and an overflow runs the query again with DECIMAL(38, 0)
totals (:mod:`.dialect`).

DOUBLE columns usually take one pass: the scale and the offset are guessed from the first
values, and the rows that do not fit (more decimals, or ``|m| >= 2**31``) are left over; when
more than 100,000 are, a scan finds the scale and the bounds and a second pass sums them all.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace
from decimal import Decimal
from fractions import Fraction
from typing import Any

from ..errors import InputError
from ..input import format_label
from ..stats import ExactMoments
from ..stats.moments import MAX_DIGITS, decimal_parts
from .dialect import EngineOverflow
from .source import Relation, opened, run

__all__ = ["GroupSums", "NotExact", "group_sums", "sums_from_relation"]

_MAX_SCALE = 22
_WIDE = 99
#: Centred integers below this size are squared directly in BIGINT; larger ones are split.
_DIRECT = 1 << 31
#: Rows read for the first guess of the scale, and rows the first pass may leave to Python.
_SAMPLE = 4096
_MAX_LEFT = 100_000


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


def _fits(rel: Relation, d: int) -> str:
    r = rel.dialect.rint(f"x * {_p10(d)}")
    return f"(abs({r}) < {_p10(15)} AND {r} / {_p10(d)} = x)"


def _scan(rel: Relation) -> dict[str, Any]:
    """Counts of NULL labels, missing and infinite values, the scale, the extremes, the rows."""
    if rel.kind == "double":
        sql = rel.dialect
        chain = " ".join(f"WHEN {_fits(rel, d)} THEN {d}" for d in range(_MAX_SCALE + 1))
        inner = f"SELECT g, x, CASE WHEN {sql.isfinite('x')} THEN CASE {chain} ELSE {_WIDE} END END AS d FROM ({_rows(rel, labelled=False)})"
        bad, inf = f"(x IS NULL OR {sql.isnan('x')})", sql.isinf("x")
        scale = f"max(d) FILTER (WHERE g IS NOT NULL AND d < {_WIDE})"
        wide, fin = f"d = {_WIDE}", "d < " + str(_WIDE)
    else:
        inner = f"SELECT g, x FROM ({_rows(rel, labelled=False)})"
        bad, inf, scale, wide, fin = "x IS NULL", "FALSE", str(rel.decimals), "FALSE", "x IS NOT NULL"
    text = (
        "SELECT count(*) FILTER (WHERE g IS NULL), "
        f"count(*) FILTER (WHERE g IS NOT NULL AND {bad}), count(*) FILTER (WHERE g IS NOT NULL AND {inf}), "
        f"{scale}, count(*) FILTER (WHERE g IS NOT NULL AND {wide}), "
        f"min(x) FILTER (WHERE g IS NOT NULL AND {fin}), max(x) FILTER (WHERE g IS NOT NULL AND {fin}), "
        f"count(*) FILTER (WHERE g IS NOT NULL AND {fin}) FROM ({inner})"
    )
    keys = ("null_labels", "missing", "infinite", "scale", "wide", "low", "high", "rows")
    return dict(zip(keys, run(rel.con, text)[0]))


def _first_label(rel: Relation, cond: str) -> str:
    got = run(rel.con, f"SELECT g FROM ({_rows(rel)}) WHERE {cond} LIMIT 1")
    return format_label(got[0][0]) if got else "?"


def _check_values(rel: Relation, scan: dict[str, Any], drop: bool) -> None:
    if scan["infinite"]:
        k = scan["infinite"]
        raise InputError(
            f'{k} infinite value{"s" if k != 1 else ""} in column "{rel.value_name}", the first '
            f'in group "{_first_label(rel, rel.dialect.isinf("x"))}"; remove {"it" if k == 1 else "them"} or '
            f'replace {"it" if k == 1 else "them"} with the measured value{"s" if k != 1 else ""}'
        )
    if scan["missing"] and not drop:
        k = scan["missing"]
        cond = f"x IS NULL OR {rel.dialect.isnan('x')}" if rel.kind == "double" else "x IS NULL"
        raise InputError(
            f'{k} missing value{"s" if k != 1 else ""} (NULL or NaN) in column "{rel.value_name}", '
            f'the first in group "{_first_label(rel, cond)}"; filter them out in the query or the '
            'where filter, or leave them out and count them with missing="drop" (on the '
            "command line: --missing drop)"
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


def _m_expr(rel: Relation, scale: int, offset: int, typ: str, narrow: bool = False) -> str:
    """The centred integer ``m`` of a row (NULL for a double that SQL cannot scale exactly, or,
    with ``narrow``, whose ``|m|`` reaches 2**31)."""
    if rel.kind == "double":
        p = _p10(scale)
        near = f" AND abs(r - {offset}) < {_DIRECT}" if narrow else ""
        return (
            f"CASE WHEN {rel.dialect.isfinite('x')} AND abs(r) < {_p10(15)} AND r / {p} = x{near} "
            f"THEN CAST(r AS BIGINT) - {offset} END"
        )
    if rel.kind == "decimal":
        s = rel.decimals
        m = f"CAST(CAST(x AS DECIMAL(38, {s})) * CAST({10**s} AS DECIMAL(38, 0)) AS {rel.dialect.wide}) - {offset}"
    else:
        m = f"CAST(x AS {rel.dialect.wide}) - {offset}"
    return f"CAST({m} AS {typ})"


def _inner(rel: Relation, scale: int, offset: int, typ: str, narrow: bool) -> str:
    r = f", {rel.dialect.rint(f'x * {_p10(scale)}')} AS r" if rel.kind == "double" else ""
    rows = f"SELECT g, x{r} FROM ({_rows(rel, labelled=False)})"
    return f"SELECT g, x, {_m_expr(rel, scale, offset, typ, narrow)} AS m FROM ({rows})"


def _sums_sql(rel: Relation, inner: str, split: int, typ: str) -> str:
    """Per group (NULL labels as one more row): count, sum m, the square sums (one, or three in
    the split form ``m = a * K + b``), the missing, infinite and left-over values, all rows."""
    sql = rel.dialect
    if split:
        k = f"CAST({1 << split} AS {typ})"
        div = sql.intdiv("m", k)
        inner = f"SELECT g, x, m, {div} AS a, m - ({div}) * {k} AS b FROM ({inner})"
        squares = ", ".join(f"sum({sql.total(t)})" for t in ("a * a", "a * b", "b * b"))
    else:
        squares = f"sum({sql.total('m * m')}), 0, 0"
    if rel.kind == "double":
        bad, inf = f"x IS NULL OR {sql.isnan('x')}", sql.isinf("x")
        left = f"m IS NULL AND {sql.isfinite('x')}"
    else:
        bad, inf, left = "x IS NULL", "FALSE", "FALSE"
    return (
        f"SELECT g, count(m), sum({sql.total('m')}), {squares}, count(*) FILTER (WHERE {bad}), "
        f"count(*) FILTER (WHERE {inf}), count(*) FILTER (WHERE {left}), count(*) "
        f"FROM ({inner}) GROUP BY g"
    )


def _run_sums(rel: Relation, inner: str, split: int, typ: str) -> list[tuple[Any, ...]]:
    """The rows of :func:`_sums_sql`; after a checked overflow of the engine's 64-bit totals
    (Spark), the same query again with wider totals."""
    try:
        return run(rel.con, _sums_sql(rel, inner, split, typ))
    except EngineOverflow:
        wider = rel.dialect.widened()
        if wider is None:
            raise
        return run(rel.con, _sums_sql(replace(rel, dialect=wider), inner, split, typ))


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
    rel: Relation, inner: str, labels: list[str], raw: list[Any], sums: GroupSums
) -> GroupSums | NotExact:
    """``sums`` with the rows SQL could not scale read in Python through their shortest
    decimals (the scale grows to theirs), or :class:`NotExact` for a value of too many digits."""
    where = {repr(v): i for i, v in enumerate(raw)}
    rows = run(rel.con, f"SELECT g, x FROM ({inner}) WHERE g IS NOT NULL AND m IS NULL AND {rel.dialect.isfinite('x')}")
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


def _pass(
    rel: Relation, scale: int, offset: int, bound: int, drop: bool, max_left: int | None
) -> GroupSums | NotExact | None:
    """One pass of exact sums at ``scale`` and ``offset`` (``|m| <= bound``); ``None`` when more
    than ``max_left`` rows are left for Python (``bound = 0``: none known, rows with
    ``|m| >= 2**31`` are left over)."""
    typ = "BIGINT" if bound < 1 << 62 else rel.dialect.wide
    split = 0 if bound < _DIRECT else (bound.bit_length() + 1) // 2
    inner = _inner(rel, scale, offset, typ, narrow=bound == 0)
    got = _run_sums(rel, inner, split, typ)
    nulls = sum(int(r[9]) for r in got if r[0] is None)
    got = [r for r in got if r[0] is not None]
    counts = {"infinite": sum(int(r[7]) for r in got), "missing": sum(int(r[6]) for r in got)}
    _check_values(rel, counts, drop)
    left = sum(int(r[8]) for r in got)
    if max_left is not None and left > max_left:
        return None
    raw = [r[0] for r in got]
    labels = _labels(raw)
    k = 1 << split
    n = tuple(int(r[1]) for r in got)
    s = tuple(int(r[2] or 0) for r in got)
    q = tuple(
        int(r[3] or 0) * k * k + 2 * int(r[4] or 0) * k + int(r[5] or 0) if split else int(r[3] or 0)
        for r in got
    )
    sums = GroupSums(tuple(labels), scale, offset, n, s, q, tuple(int(r[6]) for r in got), nulls)
    return _add_left(rel, inner, labels, raw, sums) if left else sums


def _guess(rel: Relation) -> tuple[int, int]:
    """A scale and an offset from the first few thousand finite values (read in Python)."""
    sample = run(rel.con, f"SELECT x FROM ({_rows(rel)}) WHERE {rel.dialect.isfinite('x')} LIMIT {_SAMPLE}")
    parts = [decimal_parts(v) for (v,) in sample]
    parts = [(m, e) for m, e, nd in parts if nd <= MAX_DIGITS and -e <= _MAX_SCALE]
    if not parts:
        return 0, 0
    scale = max(0, max(-e for _, e in parts))
    ints = sorted(m * 10 ** (e + scale) for m, e in parts)
    return scale, max(-(2**53), min(2**53, ints[len(ints) // 2]))


def sums_from_relation(rel: Relation, *, missing: str = "stop") -> GroupSums | NotExact:
    """Exact per-group sums of ``rel`` (see the module docstring), or :class:`NotExact`.

    DOUBLE values first take one pass at a scale and offset guessed from a sample; when more
    than a few rows are left over (the guess was wrong) a scan finds the scale and the bounds,
    and a second pass sums at those."""
    drop = _parse_missing(missing)
    if rel.kind == "double":
        scale, offset = _guess(rel)
        quick = _pass(rel, scale, offset, 0, drop, _MAX_LEFT)
        if quick is not None:
            return _sorted(quick) if isinstance(quick, GroupSums) else quick
    scan = _scan(rel)
    scale = int(scan["scale"] or 0)
    offset, bound = _offset_and_bound(scan, scale, rel.kind)
    if bound.bit_length() > 64:
        raise InputError(
            f'the values of column "{rel.value_name}" span more than 2**64 units of their last '
            "decimal; they cannot be summed exactly here: rescale them in a query"
        )
    done = _pass(rel, scale, offset, bound, drop, None)
    assert done is not None
    return _sorted(done) if isinstance(done, GroupSums) else done


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
    :func:`sheetfuncs.oneway_sql` for the sources), computed inside the engine; labels sorted as
    text. :class:`NotExact` when a value has more than 15 significant digits."""
    with opened(source, group, value, where) as rel:
        return sums_from_relation(rel, missing=missing)
