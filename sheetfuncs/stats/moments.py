"""Per-group moments, computed exactly for the decimal value of every cell, or accurately in floats.

Decimal-exact path
    Every value is read as its shortest round-trip decimal. When each of those has at most 15
    significant digits (anything typed into a spreadsheet does), every value equals
    ``N_i / 10**D`` for integers ``N_i`` and one scale ``D``. The integers are centred by one
    integer offset ``c`` and the counts, sums ``S = sum(N_i - c)`` and sums of squares
    ``Q = sum((N_i - c)**2)`` are accumulated exactly: int64 in chunks short enough that no sum
    can overflow, Python integers for the totals (and for chunks whose values are too wide for
    int64 squares). Sums of squares are then exact rationals, rounded once at the end.

    The scaling is vectorised. For a value ``x`` and scale ``10**D`` (``D <= 22``, so the power
    is exact), ``r = rint(x * 10**D)`` is accepted when the correctly rounded quotient
    ``r / 10**D`` gives back ``x`` and ``r`` has at most 15 significant digits: then
    ``r * 10**-D`` is a decimal of at most 15 digits that rounds to ``x``, and such a decimal
    is unique (DBL_DIG = 15), so it is the shortest round-trip decimal. Values that fail this
    check are read one by one through ``repr`` (exact), which also settles whether the exact
    path applies at all.

Floating-point path
    Per group, the corrected-sum form (Chan, Golub & LeVeque 1983) about a shift ``t`` near the
    mean: ``M2 = sum((x - t)**2) - (sum(x - t))**2 / n``. ``t`` is the mean of an evenly spaced
    sample, and a second pass about the computed mean (the classical two-pass algorithm)
    follows whenever that sample missed the mean by more than half a standard deviation, so
    the error stays within a few units of rounding of the two-pass result.
"""

from __future__ import annotations

import decimal
import math
from dataclasses import dataclass
from fractions import Fraction
from collections.abc import Sequence

import numpy as np

from ..errors import InputError
from ..input import Groups
from .scaled_sums import DOT_ROW, MAX_VECTOR_SCALE, dot_rows, scaled_sums

__all__ = [
    "ExactMoments", "FloatMoments", "compute_moments", "decimal_parts", "check_ss_range",
    "check_float_zero_spread", "scaled", "unit_fsum",
]

_CHUNK = 65536  # a multiple of DOT_ROW: the runs, and so the results, do not depend on it
_SAMPLE_PER_GROUP = 64
MAX_DIGITS = 15


def rounded(x: Fraction | float) -> float:
    """``x`` rounded once to the nearest double; ``+-inf`` beyond the largest one."""
    try:
        return float(x)
    except OverflowError:
        return math.inf if x > 0 else -math.inf


def decimal_parts(x: float) -> tuple[int, int, int]:
    """``(integer, exponent, significant digits)`` of the shortest round-trip decimal of x."""
    d = decimal.Decimal(repr(float(x)))
    if d == 0:
        return 0, 0, 1
    sign, digits, exp = d.as_tuple()
    # strip trailing zeros
    n = len(digits)
    while n > 1 and digits[n - 1] == 0:
        n -= 1
        exp += 1
    mant = int("".join(map(str, digits[:n])))
    return (-mant if sign else mant), int(exp), n


@dataclass(frozen=True)
class ExactMoments:
    """Exact integer moments: value ``= (offset + m) / 10**scale`` for the centred integers m."""

    scale: int
    offset: int
    n: tuple[int, ...]
    s: tuple[int, ...]
    q: tuple[int, ...]

    exact = True

    @property
    def denom(self) -> int:
        return 10 ** self.scale

    def mean(self, g: int) -> Fraction:
        return (self.offset + Fraction(self.s[g], self.n[g])) / self.denom

    def means(self) -> tuple[Fraction, ...]:
        return tuple(self.mean(g) for g in range(len(self.n)))

    def mean_differences(self, ref: int = 0) -> tuple[Fraction, ...]:
        """``mean(g) - mean(ref)`` for every group, exactly."""
        return tuple(
            Fraction(self.s[g] * self.n[ref] - self.s[ref] * self.n[g], self.n[g] * self.n[ref])
            / self.denom
            for g in range(len(self.n))
        )

    def ss_within_parts(self, parts: Sequence[Sequence[int]]) -> Fraction:
        """Sum of squares about the part means, the groups of each part sharing one mean."""
        total = Fraction(0)
        for p in parts:
            n = sum(self.n[g] for g in p)
            s = sum(self.s[g] for g in p)
            q = sum(self.q[g] for g in p)
            total += q - Fraction(s * s, n)
        return total / (self.denom * self.denom)

    def ss_group(self, g: int) -> Fraction:
        return self.ss_within_parts([[g]])


@dataclass(frozen=True)
class FloatMoments:
    """Floating-point moments: count, mean and sum of squared deviations per group.

    ``mean_`` holds the group means; ``dev`` holds the same means minus one common ``shift``
    (a double near the data), accurate to the last bits even when the data share many leading
    digits, so that differences between means (and the between-group sum of squares) keep
    their accuracy where ``mean_[i] - mean_[j]`` would cancel.

    The moments are computed on the data scaled by ``2**-exp2`` (an exact scaling, chosen from
    the largest magnitude so that no square can overflow or underflow), and ``unit_dev`` and
    ``unit_m2`` keep the deviations and sums of squares in that unit: the sums of squares
    (:meth:`ss_within_parts`, :meth:`ss_between`) are formed there and scaled back once, so
    they are accurate whenever the result is a double, and ``inf`` (or 0) only when the result
    itself is beyond the double range. ``m2`` and ``dev`` are the same quantities in the data's
    unit (``inf`` where they overflow).
    """

    n: tuple[int, ...]
    mean_: tuple[float, ...]
    m2: tuple[float, ...]
    shift: float = 0.0
    dev: tuple[float, ...] | None = None
    exp2: int = 0
    unit_dev: tuple[float, ...] | None = None
    unit_m2: tuple[float, ...] | None = None

    exact = False

    def means(self) -> tuple[float, ...]:
        return self.mean_

    def mean(self, g: int) -> float:
        return self.mean_[g]

    def _unit(self) -> tuple[tuple[float, ...], tuple[float, ...], int]:
        """Deviations and sums of squares in the unit ``2**exp2``, and ``exp2``."""
        if self.unit_dev is not None and self.unit_m2 is not None:
            return self.unit_dev, self.unit_m2, self.exp2
        return self.deviations(), self.m2, 0

    def deviations(self) -> tuple[float, ...]:
        """Group means minus :attr:`shift`, accurate (see the class docstring)."""
        if self.dev is not None:
            return self.dev
        return tuple(m - self.shift for m in self.mean_)

    def mean_differences(self, ref: int = 0) -> tuple[float, ...]:
        """``mean(g) - mean(ref)`` for every group, without cancellation (``+-inf`` beyond
        the double range)."""
        d, _, e = self._unit()
        return tuple(scaled(x - d[ref], e) for x in d)

    def ss_within_parts(self, parts: Sequence[Sequence[int]]) -> float:
        """Sum of squares about the part means, the groups of each part sharing one mean."""
        d, m2, e = self._unit()
        total = 0.0
        for p in parts:
            n = sum(self.n[g] for g in p)
            m = math.fsum(self.n[g] * d[g] for g in p) / n
            terms = [m2[g] for g in p] + [self.n[g] * ((d[g] - m) * (d[g] - m)) for g in p]
            total += unit_fsum(terms)
        return scaled(total, 2 * e)

    def ss_between(self) -> float:
        """The between-group sum of squares ``sum n_i (mean_i - grand mean)**2``."""
        d, _, e = self._unit()
        n = sum(self.n)
        grand = math.fsum(c * m for c, m in zip(self.n, d)) / n
        return scaled(unit_fsum([c * ((m - grand) * (m - grand)) for c, m in zip(self.n, d)]), 2 * e)

    def ss_group(self, g: int) -> float:
        return self.m2[g]


def scaled(x: float, e: int) -> float:
    """``x * 2**e``, exact unless it leaves the double range: ``+-inf`` above, rounded below."""
    if not math.isfinite(x):
        return x
    try:
        return math.ldexp(x, e)
    except OverflowError:
        return math.inf if x > 0 else -math.inf


def unit_fsum(terms: Sequence[float]) -> float:
    """``math.fsum`` of terms, ``inf`` when a term or the sum is beyond the double range."""
    if not all(map(math.isfinite, terms)):
        return math.inf
    try:
        return math.fsum(terms)
    except OverflowError:
        return math.inf


# --------------------------------------------------------------------------------------------
# sums of squares a double can carry

TOO_LARGE = (
    "the values are too large for double-precision sums of squares (they exceed "
    "about 1e300); rescale the data, e.g. express them in larger units"
)
TOO_SMALL = (
    "the values differ by too little for double-precision sums of squares (below "
    "about 1e-290); rescale the data, e.g. express them in smaller units"
)

#: Sums of squares outside this range cannot be shown (or computed in floats) to full precision.
_SS_MAX = 1e300
_SS_MIN = 1e-290


def check_ss_range(ss: Fraction | float) -> None:
    """An :class:`InputError` when a sum of squares is beyond what a double can carry.

    Values near 1e155 or more make sums of squares overflow the largest double (1.8e308);
    values that differ by less than about 1e-145 make them underflow. Both are asked to be
    rescaled rather than answered with an overflowed or underflowed number.
    """
    v = ss if isinstance(ss, Fraction) else float(ss)
    if isinstance(v, float) and (math.isnan(v) or math.isinf(v)) or v > _SS_MAX:
        raise InputError(TOO_LARGE)
    if 0 < v < _SS_MIN:
        raise InputError(TOO_SMALL)


def check_float_zero_spread(g: Groups, ss: float, within: bool) -> None:
    """On the floating-point path, a zero sum of squares must be a real zero, not underflow.

    ``within=True`` checks that every group is constant, ``False`` that all values are equal.
    """
    if ss != 0:
        return
    arrays = [a for a in g.arrays if a.size]
    if within:
        real = all(float(a.min()) == float(a.max()) for a in arrays)
    else:
        first = float(arrays[0][0])
        real = all(float(a.min()) == first == float(a.max()) for a in arrays)
    if not real:
        raise InputError(TOO_SMALL)


# --------------------------------------------------------------------------------------------


def _shifted_sums(a: np.ndarray, c: float, buf: np.ndarray) -> tuple[float, float]:
    """``sum(x - c)`` and ``sum((x - c)**2)``: the differences chunk by chunk in cache, their
    sums and sums of squares as dot products over short runs (:func:`dot_rows`), the runs'
    results added with ``math.fsum``."""
    s1: list[float] = []
    s2: list[float] = []
    ones = np.ones(DOT_ROW)
    with np.errstate(over="ignore", invalid="ignore"):
        for i in range(0, a.size, _CHUNK):
            x = a[i : i + _CHUNK]
            d = buf[: x.size]
            np.subtract(x, c, out=d)
            s1 += dot_rows(d, ones)
            s2 += dot_rows(d)
    if not (all(map(math.isfinite, s2)) and all(map(math.isfinite, s1))):
        # squares beyond the double range: the analyses see inf and say so (check_ss_range)
        return (math.nan if not all(map(math.isfinite, s1)) else math.fsum(s1)), math.inf
    return math.fsum(s1), math.fsum(s2)


#: Data whose largest magnitude lies within ``2**-_SAFE_EXP2 .. 2**_SAFE_EXP2`` are summed as
#: they are: no square (of up to 2**40 values) can overflow, nor a difference of two distinct
#: values square to below the normal range.
_SAFE_EXP2 = 300


def _float_moments(arrays: Sequence[np.ndarray]) -> FloatMoments:
    """Floating-point moments (see :func:`_float_moments_impl`), overflow-safe.

    When the largest magnitude is beyond ``2**+-300`` the data are first scaled by a power of
    two (exact, apart from values that become subnormal, which are then below the result's
    precision), so that values up to 1.8e308 and down to the subnormals are summed without
    overflow or underflow; the moments keep that unit (:class:`FloatMoments`). The sums are
    first formed as they are, and formed again in the scaled unit only when their size shows
    that the data reach beyond that range (a power-of-two scale changes nothing in between), so
    ordinary data pay no extra pass.
    """
    with np.errstate(over="ignore", invalid="ignore", under="ignore"):
        ns, means, m2s, shift, devs = _float_moments_impl(arrays)
    e = 0
    if not _in_safe_range(ns, means, m2s):
        top = max((max(float(a.max()), -float(a.min())) for a in arrays if a.size), default=0.0)
        if top > 0 and math.isfinite(top) and not 2.0**-_SAFE_EXP2 < top < 2.0**_SAFE_EXP2:
            e = math.frexp(top)[1]
            with np.errstate(over="ignore", invalid="ignore", under="ignore"):
                ns, means, m2s, shift, devs = _float_moments_impl([np.ldexp(a, -e) for a in arrays])
    return FloatMoments(
        ns, tuple(scaled(m, e) for m in means), tuple(scaled(m, 2 * e) for m in m2s),
        scaled(shift, e), tuple(scaled(d, e) for d in devs), e, devs, m2s,
    )


def _in_safe_range(ns: Sequence[int], means: Sequence[float], m2s: Sequence[float]) -> bool:
    """Whether sums formed without scaling are sound: all finite, and the largest mean or
    standard deviation (zero for all-zero data) within ``2**+-300``, where neither the values
    nor their squares can have left the double range."""
    sizes = [abs(m) for m in means] + [math.sqrt(m2 / n) for n, m2 in zip(ns, m2s) if n]
    if not all(map(math.isfinite, sizes)):
        return False
    big = max(sizes, default=0.0)
    return big == 0.0 or 2.0**-_SAFE_EXP2 < big < 2.0**_SAFE_EXP2


def _float_moments_impl(
    arrays: Sequence[np.ndarray],
) -> tuple[tuple[int, ...], tuple[float, ...], tuple[float, ...], float, tuple[float, ...]]:
    """Per group, the corrected sums about a shift ``t`` near the mean (Chan, Golub & LeVeque 1983):
    ``e = x - t``, mean ``= t + sum(e)/n``, ``M2 = sum(e^2) - sum(e)^2/n``.

    ``t`` is first the mean of an evenly spaced sample of the group, which saves a pass over the
    data. The corrected sum leaves an error of about ``(1 + (mean - t)^2 / var)`` units of
    rounding; when the sample mean misses by more than half a standard deviation
    (``sum(e)^2/n > M2/4``) a second pass about the computed mean follows: the classical
    two-pass algorithm. The distance of each group mean from the common shift (the first
    group's ``t``) is ``(t - shift) + sum(e)/n``, where ``t - shift`` is exact for nearby doubles
    (Sterbenz' lemma), so differences between group means lose nothing to shared leading digits.
    """
    ns, means, m2s, devs = [], [], [], []
    shift = None
    buf = np.empty(min(max((a.size for a in arrays), default=1), _CHUNK))
    for a in arrays:
        n = a.size
        step = max(1, n // _SAMPLE_PER_GROUP)
        t = float(np.mean(a[::step]))
        s1, s2 = _shifted_sums(a, t, buf)
        m2 = s2 - s1 * s1 / n
        if s1 * s1 / n > 0.25 * m2:
            t = t + s1 / n  # the sample missed the mean: sum again about the mean itself
            s1, s2 = _shifted_sums(a, t, buf)
            m2 = s2 - s1 * s1 / n
        if shift is None:
            shift = t
        ns.append(int(n))
        means.append(t + s1 / n)
        devs.append((t - shift) + s1 / n)
        m2s.append(max(m2, 0.0))
    return tuple(ns), tuple(means), tuple(m2s), float(shift or 0.0), tuple(devs)


class _NotExact(Exception):
    def __init__(self, value: float, group: int, digits: int) -> None:
        super().__init__(value)
        self.value, self.group, self.digits = value, group, digits


def _sample(arrays: Sequence[np.ndarray]) -> list[tuple[int, float]]:
    out = []
    for g, a in enumerate(arrays):
        step = max(1, a.size // _SAMPLE_PER_GROUP)
        for v in a[::step][:_SAMPLE_PER_GROUP].tolist():
            out.append((g, v))
        if a.size:
            out.append((g, float(a[-1])))
    return out




def _sample_scale(values: np.ndarray) -> tuple[int, np.ndarray] | None:
    """The scale of the sampled values and their scaled integers, in a few vectorised passes.

    The smallest ``D <= 22`` at which every value passes the check of the module docstring
    (``r = rint(x * 10**D)`` has at most 15 digits and ``r / 10**D == x``) is the largest
    number of decimals among the values' shortest round-trip decimals: a value that passes at
    ``D`` is ``r * 10**-D`` exactly, so its shortest decimal has at most ``D`` decimals, and a
    value with ``s <= D`` decimals and at most 15 digits passes at ``D`` as long as
    ``r < 10**15``. ``None`` when no ``D`` works (a wide or long value, or more than 22
    decimals): the caller then reads the sample one value at a time.
    """
    for d in range(MAX_VECTOR_SCALE + 1):
        p = 10.0**d
        r = np.rint(values * p)
        if not (np.abs(r) < 1e15).all():
            return None  # a larger D only makes the scaled values wider
        if (r / p == values).all():
            return d, r
    return None


def _exact_moments(arrays: Sequence[np.ndarray]) -> ExactMoments:
    """Decimal-exact moments of every group (see the module docstring), or :class:`_NotExact`.

    A sample of the values fixes the scale and the centring offset; every value is then scaled
    and summed in vectorised chunks, and the few values the vectorised check cannot settle are
    read one by one at the end (the scale grows if they need more decimals).
    """
    scale, offset = _scale_and_offset(_sample(arrays))
    ns, ss, qs, fallbacks = scaled_sums(arrays, scale, offset)
    if any(fallbacks):  # values the vectorised check could not settle: read them one by one
        scale, offset, ss, qs = _add_fallbacks(fallbacks, scale, offset, ss, qs)
    return ExactMoments(scale, offset, tuple(ns), tuple(ss), tuple(qs))


def _scale_and_offset(sample: list[tuple[int, float]]) -> tuple[int, int]:
    """The scale ``D`` and the integer centring offset, from a sample of ``(group, value)``."""
    found = _sample_scale(np.array([v for _, v in sample], dtype=np.float64))
    if found is not None:
        scale, scaled = found
        ints = sorted(map(int, scaled.tolist()))
        return scale, ints[len(ints) // 2] if ints else 0
    # one value at a time, through its shortest round-trip decimal
    parts = []
    for g, v in sample:
        mant, exp, nd = decimal_parts(v)
        if nd > MAX_DIGITS:
            raise _NotExact(v, g, nd)
        parts.append((mant, exp))
    scale = max(0, max(-e for _, e in parts))
    if scale > MAX_VECTOR_SCALE:
        # values with more than 22 decimals cannot be scaled in floats; scale the others
        # (if any) to theirs, and the main loop reads these few one by one as leftovers
        scale = max((-e for _, e in parts if -e <= MAX_VECTOR_SCALE), default=scale)
    offset = 0
    if scale <= MAX_VECTOR_SCALE:
        ints = sorted(m * 10 ** (e + scale) for m, e in parts if -e <= scale)
        offset = ints[len(ints) // 2]
        if abs(offset) >= 2**53:
            offset = 0
    return scale, offset


def _add_fallbacks(
    fallbacks: list[list[float]], scale: int, offset: int, ss: list[int], qs: list[int]
) -> tuple[int, int, list[int], list[int]]:
    """The scale, offset, sums and sums of squares once the values in ``fallbacks`` are read
    one by one through their shortest round-trip decimals (the scale grows to theirs)."""
    vector = scale <= MAX_VECTOR_SCALE
    decoded: list[list[tuple[int, int]]] = []
    new_scale = scale if vector else 0
    for g, fb in enumerate(fallbacks):
        row = []
        for v in fb:
            mant, exp, nd = decimal_parts(v)
            if nd > MAX_DIGITS:
                raise _NotExact(v, g, nd)
            row.append((mant, exp))
            new_scale = max(new_scale, -exp)
        decoded.append(row)
    grow = 10 ** (new_scale - scale) if vector else 1
    offset *= grow
    ss, qs = list(ss), list(qs)
    for g, row in enumerate(decoded):
        s_tot = ss[g] * grow
        q_tot = qs[g] * grow * grow
        for mant, exp in row:
            v = mant * 10 ** (exp + new_scale) - offset
            s_tot += v
            q_tot += v * v
        ss[g], qs[g] = s_tot, q_tot
    return new_scale, offset, ss, qs


def compute_moments(groups: Groups, exact: bool | None = None) -> ExactMoments | FloatMoments:
    """Moments of every group: decimal-exact when possible (``exact=None``), demanded
    (``exact=True``, an :class:`InputError` when impossible) or floating point (``False``)."""
    if exact is not None and not isinstance(exact, (bool, np.bool_)):
        raise InputError(
            f"exact must be None (automatic), True or False, not {exact!r}"
        )
    if exact is False:
        return _float_moments(groups.arrays)
    try:
        return _exact_moments(groups.arrays)
    except _NotExact as e:
        if exact:
            raise InputError(
                f"the exact path needs every value to have at most {MAX_DIGITS} "
                f"significant digits, but {e.value!r} in group \"{groups.labels[e.group]}\" has "
                f"{e.digits}; round the data or use exact=False"
            ) from None
        return _float_moments(groups.arrays)
