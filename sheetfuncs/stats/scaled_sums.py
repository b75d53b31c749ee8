"""Exact sums of the scaled integers of a decimal-exact group, chunk by chunk.

For a scale ``D`` (``D <= 22``, so ``10.0**D`` is exact) every value ``x`` is read as the
integer ``r = rint(x * 10**D)`` when the correctly rounded quotient ``r / 10**D`` gives back
``x`` (see :mod:`sheetfuncs.stats.moments` for why that settles its shortest round-trip
decimal). The counts, sums ``sum(r - c)`` and sums of squares ``sum((r - c)**2)`` about an
integer offset ``c`` are exact: float64 dot products while they provably stay below 2**53,
int64 blocks that cannot overflow otherwise, Python integers for the totals.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np

__all__ = ["DOT_ROW", "EXACT_CHUNK", "MAX_VECTOR_SCALE", "dot_rows", "scaled_sums"]

#: The largest scale ``D`` for which ``10.0**D`` is exact (and the vectorised check applies).
MAX_VECTOR_SCALE = 22
_TWO53 = 9007199254740992.0
_TWO53_INT = 1 << 53
_INT64_MAX = (1 << 63) - 1


def scaled_sums(
    arrays: Sequence[np.ndarray], scale: int, offset: int
) -> tuple[list[int], list[int], list[int], list[list[float]]]:
    """Counts, exact centred sums and sums of squares per group, and per group the values
    the vectorised check cannot settle, left to be read one by one (all of them when the
    scale is too large to vectorise).

    Each chunk first takes :func:`_fast_chunk` (a few passes in cache); the chunks it cannot
    settle take :func:`_general_chunk`. Both give the same exact integers.
    """
    vector = scale <= MAX_VECTOR_SCALE
    ns: list[int] = []
    ss: list[int] = []
    qs: list[int] = []
    fallbacks: list[list[float]] = []
    p10 = 10.0**scale if vector else 1.0
    bufs = _ChunkBuffers.make(min(max((a.size for a in arrays), default=1), EXACT_CHUNK))
    # huge values overflow when scaled: they fail the round-trip test and take the fallback
    with np.errstate(over="ignore", invalid="ignore"):
        for a in arrays:
            s_tot = q_tot = 0
            raw = [0, 0, 0]  # count, sum and sum of squares of the uncentred chunks
            fb: list[float] = [] if vector else a.tolist()
            centre = False  # set once uncentred squares prove too wide for this group
            for i in range(0, a.size if vector else 0, EXACT_CHUNK):
                x = a[i : i + EXACT_CHUNK]
                got = _fast_chunk(x, p10, offset, bufs, centre)
                if got is None:
                    s, q, left = _general_chunk(x, p10, offset)
                    s_tot, q_tot = s_tot + s, q_tot + q
                    fb.extend(left)
                elif got[0]:  # centred sums
                    s_tot, q_tot = s_tot + got[1], q_tot + got[2]
                    centre = True
                else:
                    raw = [raw[0] + x.size, raw[1] + got[1], raw[2] + got[2]]
            # sum (r - c) = sum r - n c; sum (r - c)^2 = sum r^2 - 2 c sum r + n c^2
            ns.append(int(a.size))
            ss.append(s_tot + raw[1] - raw[0] * offset)
            qs.append(q_tot + raw[2] - 2 * offset * raw[1] + raw[0] * offset * offset)
            fallbacks.append(fb)
    return ns, ss, qs, fallbacks


#: Values per chunk of the exact path (a multiple of :data:`DOT_ROW`): fewer Python-level
#: calls, while the chunk and its scratch arrays stay in cache.
EXACT_CHUNK = 65536
#: Values per dot product. OpenBLAS runs a dot product of more than 10,000 values on several
#: threads, which is slower for chunks this size and much slower on a busy machine.
DOT_ROW = 8192
#: Row-wise dot products in one call (numpy 2); one call per row with older numpy.
_VECDOT = getattr(np, "vecdot", None)


@dataclass(frozen=True)
class _ChunkBuffers:
    """Scratch arrays for one chunk: scaled integers, quotients, a mask, and ones."""

    r: np.ndarray
    t: np.ndarray
    ok: np.ndarray
    ones: np.ndarray

    @staticmethod
    def make(size: int) -> _ChunkBuffers:
        return _ChunkBuffers(
            np.empty(size), np.empty(size), np.empty(size, bool), np.ones(DOT_ROW)
        )


def _fast_chunk(
    x: np.ndarray, p10: float, offset: int, bufs: _ChunkBuffers, centre: bool
) -> tuple[bool, int, int] | None:
    """``(centred, sum, sum of squares)`` of one chunk's scaled integers, or ``None``.

    ``r = rint(x * 10**D)`` and the round-trip check ``r / 10**D == x`` run in preallocated
    buffers, and the sums are dot products (:func:`_exact_dots`). Uncentred sums are tried
    first (``centre=False``; no pass to subtract the offset), then the sums of ``r - offset``.
    ``None`` (the general path decides) when a value fails the check, or the squares are too
    wide, or a scaled value may reach 1e15 (where the check needs more care).
    """
    n = x.size
    r, t, ok = bufs.r[:n], bufs.t[:n], bufs.ok[:n]
    np.multiply(x, p10, out=r)
    np.rint(r, out=r)
    np.divide(r, p10, out=t)
    np.equal(t, x, out=ok)
    if not ok.all():
        return None
    if not centre:
        got = _exact_dots(r, bufs.ones)
        if got is not None:  # then every |r| < 2**26.5: far below 1e15
            return False, got[0], got[1]
    if abs(offset) >= 1e15 - 2**27:
        return None
    np.subtract(r, offset, out=r)
    got = _exact_dots(r, bufs.ones)
    # |r - offset| < 2**26.5 and |offset| < 1e15 - 2**27: so |r| < 1e15
    return None if got is None else (True, got[0], got[1])


def _exact_dots(r: np.ndarray, ones: np.ndarray) -> tuple[int, int] | None:
    """Exact ``sum(r)`` and ``sum(r*r)`` of integer-valued doubles, or ``None`` when the sum
    of squares of a row of :data:`DOT_ROW` values reaches 2**53.

    A dot product is exact when the computed sum of squares is below 2**53, in any order of
    summation, with or without fused multiply-add: rounding is monotone and every term is
    non-negative, so a true sum of squares of 2**53 or more is never computed as less; below
    it every partial sum is an integer below 2**53, and so is every partial sum of ``r``
    (``|r| <= r*r`` for integers).
    """
    q = dot_rows(r)
    if not all(v < _TWO53 for v in q):
        return None
    return sum(map(int, dot_rows(r, ones))), sum(map(int, q))


def dot_rows(a: np.ndarray, b: np.ndarray | None = None) -> list[float]:
    """Per run of :data:`DOT_ROW` values of ``a`` (the last run may be shorter), the dot
    product with the same run of ``b``; with ``b=None`` the sum of squares, and with ``b``
    a row of :data:`DOT_ROW` ones the sum. Each product is one BLAS call short enough to run
    on one thread."""
    n = a.size
    k = n - n % DOT_ROW if _VECDOT is not None else 0
    row = b is not None and b.size == DOT_ROW and n != DOT_ROW  # one row for every run
    out: list[float] = []
    if k:
        rows = a[:k].reshape(-1, DOT_ROW)
        out = _VECDOT(rows, rows if b is None else b if row else b[:k].reshape(-1, DOT_ROW)).tolist()
    for i in range(k, n, DOT_ROW):
        x = a[i : i + DOT_ROW]
        y = x if b is None else b[: x.size] if row else b[i : i + x.size]
        out.append(float(np.dot(x, y)))
    return out


def _general_chunk(x: np.ndarray, p10: float, offset: int) -> tuple[int, int, list[float]]:
    """Exact centred sums of one chunk's values that pass the check, and the values that
    fail it (left for :func:`sheetfuncs.stats.moments`' one-by-one reading)."""
    r = x * p10
    np.rint(r, out=r)
    ok = r / p10 == x
    hi, lo = float(r.max()), float(r.min())
    if max(hi, -lo) >= 1e15:
        # 16-digit scaled values are exact only with trailing zeros
        ar = np.abs(r)
        ok &= (ar < 1e15) | ((ar < _TWO53) & (np.fmod(r, 10.0) == 0.0))
    left: list[float] = []
    if not ok.all():
        left = x[~ok].tolist()
        r = r[ok]
        if r.size == 0:
            return 0, 0, left
        hi, lo = float(r.max()), float(r.min())
    s, q = _exact_sums(r, offset, hi, lo)
    return s, q, left


def _blocked_sum(v: np.ndarray, block: int) -> int:
    """Exact sum of an int64 array whose every run of ``block`` values sums without overflow."""
    n = v.size
    if n <= block:
        return int(v.sum())
    full = n - n % block
    parts = v[:full].reshape(-1, block).sum(axis=1)  # each partial sum fits in int64
    return sum(parts.tolist()) + int(v[full:].sum())


def _exact_sums(r: np.ndarray, offset: int, hi: float, lo: float) -> tuple[int, int]:
    """Exact ``sum(r - offset)`` and ``sum((r - offset)**2)`` of integer-valued floats.

    ``r`` holds integers below 2**53 in size, ``hi``/``lo`` its extremes, and ``r`` may be
    overwritten. While every partial sum stays below 2**53 the sums run in float64 (then
    float addition is exact). Otherwise each centred integer is split as ``m = a * 2**h + b``
    with ``0 <= b < 2**h`` and ``|a|`` of about the same size, so that ``a*a``, ``a*b`` and
    ``b*b`` fit comfortably in int64; they are summed in int64 blocks short enough never to
    overflow and combined in Python integers: ``sum m^2 = 4**h sum a^2 + 2**(h+1) sum ab +
    sum b^2``.
    """
    big = int(max(hi - offset, offset - lo, 0.0)) + 2  # a safe bound on |r - offset|
    n = r.size
    if n * big * big < _TWO53_INT:
        # exact in float64: every value, square and partial sum is an integer below 2**53.
        # (Elementwise square and sum rather than a BLAS dot, which may spin up threads.)
        np.subtract(r, offset, out=r)
        s = int(r.sum())
        np.multiply(r, r, out=r)
        return s, int(r.sum())
    m = r.astype(np.int64)
    m -= offset
    h = max(1, (big.bit_length() + 1) // 2)
    a = m >> h                      # floor division by 2**h
    b = m - (a << h)                # 0 <= b < 2**h
    top = max(int(abs(a).max()) if a.size else 0, 1 << h)
    block = max(1, _INT64_MAX // (top * top))
    s = (_blocked_sum(a, block) << h) + _blocked_sum(b, block)
    ab = a * b
    np.multiply(a, a, out=a)
    np.multiply(b, b, out=b)
    q = (_blocked_sum(a, block) << (2 * h)) + (_blocked_sum(ab, block) << (h + 1)) + _blocked_sum(b, block)
    return s, q
