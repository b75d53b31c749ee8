"""Checks of the one-way model's assumptions, and a plain-words reading of which test to read.

Equal variances
    Levene (1960), "Robust tests for equality of variances", in Olkin (ed.), *Contributions to
    Probability and Statistics*, 278–292: the one-way F test applied to the absolute deviations
    ``z_ij = |y_ij - c_i|`` with ``c_i`` the group mean. Brown & Forsythe (1974), "Robust tests
    for the equality of variances", *JASA* 69, 364–367: the same with ``c_i`` the group median
    (``center="median"``, the default, robust to skewed data).

    Bartlett (1937), "Properties of sufficiency and statistical tests", *Proc. R. Soc. A* 160,
    268–282: with ``s_p^2 = SSW / (N - k)``,
    ``T = [(N - k) ln s_p^2 - sum (n_i - 1) ln s_i^2] / C``,
    ``C = 1 + [sum 1/(n_i - 1) - 1/(N - k)] / (3 (k - 1))``, referred to chi-square(k - 1).
    It is evaluated as ``sum (n_i - 1) [(r_i - 1) - ln r_i] / C`` with ``r_i = s_i^2 / s_p^2``
    taken exactly, which is the same number without the cancellation of the textbook form: near
    ``r_i = 1`` as ``u_i - ln(1 + u_i)`` with ``u_i = r_i - 1`` rounded once, below ``r_i = 1/2``
    from ``r_i`` itself, with ``ln r_i`` formed from the exact ratio scaled by a power of two
    (so variances that differ by more than the double range still give a finite statistic).

Normal residuals
    Shapiro & Wilk (1965), *Biometrika* 52, 591–611, with the coefficients and p-value
    approximation of Royston (1992), "Approximating the Shapiro-Wilk W-test for non-normality",
    *Statistics and Computing* 2, 117–119 (Royston 1995, *Applied Statistics* 44, 547–551,
    algorithm AS R94), for 3 to 5,000 residuals. Above 5,000 residuals the approximation is not
    validated, and the D'Agostino–Pearson omnibus test is used instead: D'Agostino & Pearson
    (1973), *Biometrika* 60, 613–622, from D'Agostino's (1970) skewness test and Anscombe &
    Glynn's (1983) kurtosis test, as set out in D'Agostino, Belanger & D'Agostino (1990), *The
    American Statistician* 44, 316–321.

    The residuals are ``y_ij - ybar_i``; each is formed as ``(y_ij - r_i) - (ybar_i - r_i)``
    around a value ``r_i`` of the group, with the exact mean on the decimal-exact path, so data
    with many constant leading digits keep their residuals' precision. A group of one value has
    a residual of exactly zero that carries no information; such groups are left out (and
    named in the result).

The reading rule of :func:`checks` is documented there and in ``docs/checks.md``.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from fractions import Fraction
from typing import Any, ClassVar

import numpy as np
from scipy import stats

from .alternatives import KruskalResult, WelchResult, kruskal, welch
from .group_variances import prepare_with_variances, unit_free_moments
from ..errors import InputError
from ..distributions import SHAPIRO_WILK_MAX_N, dagostino_pearson, shapiro_wilk
from ..input import Groups, as_groups
from .moments import ExactMoments, FloatMoments, compute_moments
from .oneway import OneWayResult, oneway, oneway_from_moments, require_two_groups
from ..input import check_alpha, shown
from .outcome import Unavailable, attempt
from .wording import df_text, sentence

__all__ = [
    "LeveneResult",
    "BartlettResult",
    "NormalityResult",
    "ChecksResult",
    "levene",
    "bartlett",
    "shapiro_residuals",
    "checks",
    "residuals",
    "SHAPIRO_WILK_MAX_N",
    "SD_RATIO_LIMIT",
    "SMALL_GROUP_N",
]

#: Rule of thumb (common practice): variances look unequal when the largest SD is more than this
#: many times the smallest.
SD_RATIO_LIMIT = 2.0
#: Rule of common practice: with fewer values than this in the smallest group, non-normal
#: residuals call for the Kruskal–Wallis test alongside the F test.
SMALL_GROUP_N = 15

SHAPIRO_WILK = "Shapiro-Wilk"
DAGOSTINO_PEARSON = "D'Agostino-Pearson"

CAUTION = (
    "Pre-testing assumptions is itself a judgement: a check with few values may miss a real "
    "problem and one with many values may flag a harmless one; look at the data (plots of "
    "residuals and spreads), weigh how the data were collected, and follow your organisation's "
    "procedures before acting on the result."
)


# --------------------------------------------------------------------------------------------
# residuals and deviations, formed around a value of each group


def _middle_pair(a: np.ndarray) -> tuple[float, float]:
    """The lower and upper middle values of a group (equal when its size is odd)."""
    n = a.size
    if n % 2:
        v = float(np.partition(a, n // 2)[n // 2])
        return v, v
    part = np.partition(a, (n // 2 - 1, n // 2))
    return float(part[n // 2 - 1]), float(part[n // 2])


def _decimal_integers(g: Groups, mom: ExactMoments | FloatMoments) -> list[np.ndarray] | None:
    """Each group's values as whole numbers ``m`` with ``value = m / 10**scale`` (as float64,
    exact below 1e15), when the decimal-exact path applies to every value; else ``None``.

    ``rint(x * 10**D)`` is the decimal integer when ``rint(x * 10**D) / 10**D == x`` and it has
    at most 15 digits (the argument of :mod:`sheetfuncs.moments`).
    """
    if not mom.exact or mom.scale > 22:
        return None
    p10 = 10.0**mom.scale
    out = []
    for a in g.arrays:
        r = np.rint(a * p10)
        if not (np.all(np.abs(r) < 1e15) and np.all(r / p10 == a)):
            return None
        out.append(r)
    return out


class _Deviations:
    """Residuals and absolute deviations of every group, in one common unit.

    On the decimal-exact path the unit is ``10**-scale`` of the data's unit and every value is
    its decimal integer, so differences between values are exact; each group's residuals are
    ``(m - r) - (mean - r)`` around a value ``r`` of the group, with the exact mean, rounded
    once. Otherwise the same is done in floating point on the values themselves.
    """

    def __init__(self, g: Groups, mom: ExactMoments | FloatMoments) -> None:
        self.g, self.mom = g, mom
        self.ints = _decimal_integers(g, mom)
        self.unit = 10.0 ** -mom.scale if self.ints is not None else 1.0

    def _values(self, i: int) -> np.ndarray:
        return self.ints[i] if self.ints is not None else self.g.arrays[i]

    def residuals(self, i: int) -> np.ndarray:
        """Residuals of group i, in the common unit."""
        v = self._values(i)
        ref, _ = _middle_pair(v)
        if self.ints is not None:
            shift = float(self.mom.mean(i) * self.mom.denom - Fraction(ref))
        elif self.mom.exact:
            shift = float(self.mom.mean(i) - Fraction(ref))
        else:
            shift = float(self.mom.mean(i)) - ref
        return (v - ref) - shift

    def abs_from_median(self, i: int) -> np.ndarray:
        """|value - group median|, in the common unit (exact on the decimal-integer path)."""
        v = self._values(i)
        lo, hi = _middle_pair(v)
        return np.abs((v - lo) - (hi - lo) * 0.5)

    def abs_from_mean(self, i: int) -> np.ndarray:
        return np.abs(self.residuals(i))


def residuals(groups: Any, *, exact: bool | None = None) -> tuple[np.ndarray, ...]:
    """The one-way residuals ``y_ij - ybar_i`` of each group, in group order."""
    g = as_groups(groups)
    dev = _Deviations(g, compute_moments(g, exact))
    return tuple(dev.residuals(i) * dev.unit for i in range(g.k))


# --------------------------------------------------------------------------------------------
# Levene / Brown–Forsythe


@dataclass(frozen=True)
class LeveneResult:
    """Levene's test of equal variances (``center="mean"``) or its Brown–Forsythe form
    (``center="median"``): the one-way F test on absolute deviations from each group's centre.

    Fields: ``statistic`` (F), ``df_between = k - 1``, ``df_within = N - k``, ``p`` (upper
    tail of F(df_between, df_within)), ``center`` (``"median"`` or ``"mean"``).

    Sources: Levene (1960); Brown & Forsythe (1974), *JASA* 69, 364–367.
    """

    statistic: float
    df_between: int
    df_within: int
    p: float
    center: str

    #: The table's header row.
    HEADER: ClassVar[tuple[str, ...]] = ("Test", "Statistic", "df1", "df2", "p")

    @property
    def name(self) -> str:
        return f"Levene ({self.center})"

    def table(self) -> list[list[Any]]:
        """Header row, then one row for the test."""
        return [
            list(self.HEADER),
            [self.name, self.statistic, self.df_between, self.df_within, self.p],
        ]


def _parse_center(center: Any) -> str:
    if center is None:
        return "median"
    s = center.strip().lower() if isinstance(center, str) else None
    if s == "":
        return "median"
    if s in ("median", "mean"):
        return s
    raise InputError(
        f'center must be "median" (Brown-Forsythe, the default) or "mean" '
        f"(Levene's original), not {shown(center)}"
    )


def levene(groups: Any, center: str = "median", *, exact: bool | None = None) -> LeveneResult:
    """Test whether the groups' variances are equal, by Levene's method.

    ``center="median"`` (default) measures each value's distance from its group median
    (Brown & Forsythe 1974), ``"mean"`` from its group mean (Levene 1960). Every group needs two
    or more values.
    """
    c = _parse_center(center)
    g, mom = prepare_with_variances(groups, "Levene's test", exact)
    dev = _Deviations(g, mom)
    # F is unchanged by a common unit, so the deviations stay in the exact integer unit
    z = [dev.abs_from_median(i) if c == "median" else dev.abs_from_mean(i) for i in range(g.k)]
    allz = np.concatenate(z)
    if float(allz.max()) == float(allz.min()):
        what = "zero" if float(allz.max()) == 0.0 else "the same"
        raise InputError(
            f"every value's distance from its group {c} is {what}, so Levene's test "
            "has no differences in spread to compare; check that the range holds the "
            "measurements"
        )
    top = float(allz.max())
    if not (2.0**-400 < top < 2.0**400):  # F is free of the unit: keep the sums of squares finite
        shift = -math.frexp(top)[1]
        z = [np.ldexp(a, shift) for a in z]
    ow = oneway(dict(zip(g.labels, z)))
    return LeveneResult(statistic=ow.f, df_between=ow.df_between, df_within=ow.df_within, p=ow.p, center=c)


# --------------------------------------------------------------------------------------------
# Bartlett


@dataclass(frozen=True)
class BartlettResult:
    """Bartlett's test of equal variances (sensitive to non-normal data).

    Fields: ``statistic`` (the corrected chi-square statistic T), ``df = k - 1``, ``p`` (upper
    tail of chi-square(df)); ``exact`` says whether the variance ratios came from the
    decimal-exact moments.

    Source: Bartlett, M. S. (1937), *Proc. R. Soc. A* 160, 268–282.
    """

    statistic: float
    df: int
    p: float
    exact: bool = False

    #: The table's header row.
    HEADER: ClassVar[tuple[str, ...]] = ("Test", "Statistic", "df", "p")

    def table(self) -> list[list[Any]]:
        """Header row, then one row for the test."""
        return [list(self.HEADER), ["Bartlett", self.statistic, self.df, self.p]]


def _u_minus_log1p(u: float) -> float:
    """``u - ln(1 + u)`` without cancellation for small ``u`` (series below |u| = 0.1)."""
    if abs(u) >= 0.1:
        return u - math.log1p(u)
    # u^2/2 - u^3/3 + u^4/4 - ...; |u| < 0.1, so 17 terms reach double precision
    total = 0.0
    power = u * u
    for j in range(2, 20):
        total += power / j if j % 2 == 0 else -power / j
        power *= u
    return total


def _log_fraction(r: Fraction) -> float:
    """``ln r`` of a positive rational, accurate however large or small its terms: ``r`` is
    scaled by a power of two to lie near 1, converted once, and the power added back."""
    e = r.numerator.bit_length() - r.denominator.bit_length()
    m = r / (Fraction(2) ** e) if e >= 0 else r * (Fraction(2) ** -e)  # in (1/2, 2)
    return math.log(float(m)) + e * math.log(2.0)


def _bartlett_term_exact(r: Fraction) -> float:
    """``(r - 1) - ln r`` for the exact variance ratio ``r = s_i^2 / s_p^2 > 0``.

    Near ``r = 1`` it is ``u - ln(1 + u)`` with ``u = r - 1`` rounded once; below ``r = 1/2``
    (``u < -1/2``, where rounding ``u`` would lose the digits of ``1 + u``, or round it to 0
    when the variances differ by more than about 2^53) it is formed from ``r`` itself.
    """
    u = r - 1
    if u >= Fraction(-1, 2):
        return _u_minus_log1p(float(u))
    return float(u) - _log_fraction(r)


def _bartlett_term_float(ss: float, df: int, sp2: float) -> float:
    """``(r - 1) - ln r`` for ``r = (ss / df) / sp2`` on the floating-point path (as above)."""
    v = ss / df
    u = (v - sp2) / sp2
    if u >= -0.5:
        return _u_minus_log1p(u)
    # ln r from the logarithms of its parts, so that a ratio below the double range stays finite
    return (v / sp2 - 1.0) - (math.log(ss) - math.log(df) - math.log(sp2))


def bartlett(groups: Any, *, exact: bool | None = None) -> BartlettResult:
    """Bartlett's chi-square test that the group variances are equal.

    Every group needs two or more values and a non-zero variance (the test takes logarithms of
    the variances).
    """
    g, mom = prepare_with_variances(groups, "Bartlett's test", exact)
    k = g.k
    ns = g.counts
    dfw = g.n_total - k
    ss = [mom.ss_group(i) for i in range(k)]
    for label, s in zip(g.labels, ss):
        if s == 0:
            raise InputError(
                f'group "{label}" has zero variance (all its values are equal), and '
                "Bartlett's test takes the logarithm of each group's variance; check the "
                "measurement resolution, or use Levene's test instead"
            )
    if mom.exact:
        ssw = sum(ss, Fraction(0))
        terms = [_bartlett_term_exact(s * dfw / (ssw * (n - 1))) for s, n in zip(ss, ns)]
    else:
        sp2 = math.fsum(float(s) for s in ss) / dfw
        terms = [_bartlett_term_float(float(s), n - 1, sp2) for s, n in zip(ss, ns)]
    num = math.fsum((n - 1) * t for t, n in zip(terms, ns))
    corr = 1.0 + (math.fsum(1.0 / (n - 1) for n in ns) - 1.0 / dfw) / (3.0 * (k - 1))
    t = max(num / corr, 0.0)
    p = float(stats.chi2.sf(t, k - 1)) if t > 0 else 1.0
    return BartlettResult(statistic=t, df=k - 1, p=p, exact=mom.exact)


# --------------------------------------------------------------------------------------------
# normality of residuals

@dataclass(frozen=True)
class NormalityResult:
    """A test that the one-way residuals come from a normal distribution.

    Fields: ``statistic`` (Shapiro–Wilk W, or the D'Agostino–Pearson K^2), ``p``, ``n`` (number
    of residuals tested), ``method`` (``"Shapiro-Wilk"`` for up to 5,000 residuals, else
    ``"D'Agostino-Pearson"``), ``left_out`` (labels of groups of one value, whose residual is
    zero by construction and is not tested).

    Sources: Shapiro & Wilk (1965); Royston (1992, 1995); D'Agostino & Pearson (1973).
    """

    statistic: float
    p: float
    n: int
    method: str
    left_out: tuple[str, ...] = ()

    #: The table's header row.
    HEADER: ClassVar[tuple[str, ...]] = ("Test", "Statistic", "n", "p")

    def table(self) -> list[list[Any]]:
        """Header row, then one row for the test."""
        return [
            list(self.HEADER),
            [f"{self.method} (residuals)", self.statistic, self.n, self.p],
        ]


def shapiro_residuals(groups: Any, *, exact: bool | None = None) -> NormalityResult:
    """Test the normality of the one-way residuals ``y_ij - ybar_i``.

    Shapiro–Wilk for 3 to 5,000 residuals; above that the D'Agostino–Pearson omnibus test (the
    result's ``method`` says which). Groups of one value are left out.
    """
    g = as_groups(groups)
    require_two_groups(g)
    g, mom = unit_free_moments(g, exact)
    kept = [i for i, n in enumerate(g.counts) if n >= 2]
    left_out = tuple(g.labels[i] for i, n in enumerate(g.counts) if n < 2)
    dev = _Deviations(g, mom)
    # W and K^2 are unchanged by a common unit: test the residuals in the exact integer unit
    res = np.concatenate([dev.residuals(i) for i in kept]) if kept else np.empty(0)
    n = int(res.size)
    if n < 3:
        raise InputError(
            f"only {n} residuals from groups of two or more values; the normality "
            "test needs at least 3: add values to the groups"
        )
    if not np.any(res):
        raise InputError(
            "all residuals are zero (within each group every value is the same), so "
            "their normality cannot be tested; check the measurement resolution"
        )
    res = res / float(np.max(np.abs(res)))  # both statistics are free of the unit
    if n <= SHAPIRO_WILK_MAX_N:
        stat, p = shapiro_wilk(res)
        method = SHAPIRO_WILK
    else:
        stat, p = dagostino_pearson(res)
        method = DAGOSTINO_PEARSON
    return NormalityResult(statistic=stat, p=p, n=n, method=method, left_out=left_out)


# --------------------------------------------------------------------------------------------
# all checks together


@dataclass(frozen=True)
class ChecksResult:
    """The assumption checks together, with a plain-words reading of which test to read.

    Fields:

    * ``read`` — ``"oneway"``, ``"welch"`` or ``"kruskal"`` (read Kruskal–Wallis alongside the
      one-way F);
    * ``reasons`` — plain-words sentences explaining the reading, one per point;
    * ``variances_unequal`` — median-centred Levene p < alpha, or largest SD > 2 x smallest;
    * ``residuals_nonnormal`` — the residual normality test has p < alpha;
    * ``sd_ratio`` — largest / smallest group SD over groups of two or more values (``inf``
      when the smallest is zero, ``nan`` when undefined);
    * ``smallest_n`` — the size of the smallest group; ``alpha``;
    * ``levene`` (median-centred), ``bartlett``, ``normality``, ``welch``, ``kruskal`` — each
      test's result, or ``None`` when the test could not run (see ``not_available``);
    * ``oneway`` — the :class:`~sheetfuncs.oneway.OneWayResult`;
    * ``not_available`` — ``(test, reason)`` pairs for the tests that could not run;
    * ``caution`` — the caution that pre-testing assumptions is itself a judgement.

    Sources of the reading rule: the thresholds (largest SD more than twice the smallest;
    Kruskal–Wallis alongside the F test below 15 values in the smallest group) are rules of
    thumb of common practice, not published results. The tests it combines are published:
    Brown & Forsythe (1974), *JASA* 69, 364–367 (median-centred Levene; Levene 1960);
    Shapiro & Wilk (1965), *Biometrika* 52, 591–611, with Royston (1992, 1995), or above 5,000
    residuals D'Agostino & Pearson (1973), *Biometrika* 60, 613–622; Welch (1951),
    *Biometrika* 38, 330–336; Kruskal & Wallis (1952), *JASA* 47, 583–621; Bartlett (1937),
    *Proc. R. Soc. A* 160, 268–282 (shown for reference only).
    """

    read: str
    reasons: tuple[str, ...]
    variances_unequal: bool
    residuals_nonnormal: bool
    sd_ratio: float
    smallest_n: int
    alpha: float
    levene: LeveneResult | None
    bartlett: BartlettResult | None
    normality: NormalityResult | None
    welch: WelchResult | None
    kruskal: KruskalResult | None
    oneway: OneWayResult
    not_available: tuple[tuple[str, str], ...] = ()
    caution: str = CAUTION

    #: The table's header row.
    HEADER: ClassVar[tuple[str, ...]] = ("Check", "Statistic", "df", "p", "Reading")

    @property
    def read_name(self) -> str:
        """The test to read, in words."""
        return {
            "oneway": "One-way F",
            "welch": "Welch",
            "kruskal": "Kruskal-Wallis, alongside the one-way F",
        }[self.read]

    def _row(self, check: str, result: Any, cells: Any, reading: Any) -> list[Any]:
        """One table row: ``cells()`` gives (statistic, df, p) and ``reading()`` the words, or
        the row says why the test is not available."""
        if result is None:
            why = dict(self.not_available).get(check)
            return [check, None, None, None, "not available: " + why if why else "not available"]
        return [check, *cells(), reading()]

    def table(self) -> list[list[Any]]:
        """Header row (Check, Statistic, df, p, Reading), the test to read, then one row per check."""
        a = self.alpha
        ow, w, kw, lev, b, nm = self.oneway, self.welch, self.kruskal, self.levene, self.bartlett, self.normality
        rows: list[list[Any]] = [list(self.HEADER)]
        if self.read == "welch" and w is not None:
            rows.append(["Read", w.statistic, df_text(w.df1, w.df2), w.p, self.read_name])
        elif self.read == "kruskal" and kw is not None:
            rows.append(["Read", kw.statistic, kw.df, kw.p, self.read_name])
        else:
            rows.append(["Read", ow.f, df_text(ow.df_between, ow.df_within), ow.p, self.read_name])
        rows.append(self._row(
            "Levene (median)", lev, lambda: (lev.statistic, df_text(lev.df_between, lev.df_within), lev.p),
            lambda: "variances look unequal" if lev.p < a else "no sign of unequal variances"))
        ratio = self.sd_ratio
        if math.isnan(ratio):
            rows.append(["Largest / smallest SD", None, None, None,
                         "undefined (fewer than two groups with a non-zero SD to compare)"])
        else:
            rows.append(["Largest / smallest SD", ratio, None, None,
                         f"more than {SD_RATIO_LIMIT:g}: variances look unequal" if ratio > SD_RATIO_LIMIT
                         else f"{SD_RATIO_LIMIT:g} or less"])
        rows.append(self._row(
            "Bartlett", b, lambda: (b.statistic, b.df, b.p),
            lambda: ("p < alpha; " if b.p < a else "") + "for reference only (sensitive to non-normal data)"))
        if nm is None:
            rows.append(self._row("Normal residuals", None, None, None))
        else:
            rows.append([f"{nm.method} (residuals)", nm.statistic, None, nm.p,
                         (f"residuals look non-normal ({nm.n} residuals)" if nm.p < a
                          else f"no sign of non-normal residuals ({nm.n} residuals)")])
        rows.append(["Smallest group size", self.smallest_n, None, None,
                     f"fewer than {SMALL_GROUP_N}" if self.smallest_n < SMALL_GROUP_N
                     else f"{SMALL_GROUP_N} or more"])
        rows.append(["One-way F", ow.f, df_text(ow.df_between, ow.df_within), ow.p,
                     "assumes equal variances and normal residuals"])
        rows.append(self._row(
            "Welch", w, lambda: (w.statistic, df_text(w.df1, w.df2), w.p),
            lambda: "does not assume equal variances"))
        rows.append(self._row(
            "Kruskal-Wallis", kw, lambda: (kw.statistic, kw.df, kw.p),
            lambda: "rank-based; does not assume normal residuals"))
        return rows


def _p_text(p: float) -> str:
    return "p < 1e-300" if p < 1e-300 else f"p = {p:.3g}"


def _sd_ratio(g: Groups, mom: ExactMoments | FloatMoments) -> float:
    sds = [math.sqrt(float(mom.ss_group(i) / (n - 1))) for i, n in enumerate(g.counts) if n >= 2]
    if len(sds) < 2:
        return math.nan
    hi, lo = max(sds), min(sds)
    if hi == 0.0:
        return math.nan
    return math.inf if lo == 0.0 else hi / lo


def checks(
    groups: Any,
    alpha: float = 0.05,
    *,
    exact: bool | None = None,
    moments: ExactMoments | FloatMoments | None = None,
    oneway: OneWayResult | None = None,
) -> ChecksResult:
    """Run the assumption checks and say, in plain words, which test to read.

    The rule (see ``docs/checks.md``):

    * variances look unequal when the median-centred Levene test has p < alpha or the largest
      group SD is more than twice the smallest (a rule of thumb of common practice);
    * residuals look non-normal when the normality test on the residuals has p < alpha;
    * read Welch when variances look unequal; otherwise read Kruskal–Wallis alongside the F test
      when residuals look non-normal and the smallest group has fewer than 15 values (common
      practice); otherwise read the one-way F.

    A check that cannot run (a group of one value, a group with zero variance, too few
    residuals) is recorded in ``not_available`` with its reason and the rest still answer. A
    check that cannot run is not counted as a warning sign. When the rule points to Welch but
    Welch cannot run (a group with zero variance or a single value), the one-way F is read and
    the reasons say plainly that its p-value may mislead. The one-way analysis itself must be
    possible (two groups, some variation, residual degrees of freedom), else InputError.

    ``moments`` and ``oneway``, when given, are the groups' moments and one-way result already
    computed (by :func:`sheetfuncs.stats.analyse`), and are used instead of computing them again.
    """
    g = as_groups(groups)
    a = check_alpha(alpha)
    require_two_groups(g)
    mom = moments if moments is not None else compute_moments(g, exact)
    ow = oneway if oneway is not None else oneway_from_moments(g, mom)
    missing: list[tuple[str, str]] = []

    def secondary(name: str, call):
        # an unforeseen numerical failure of one secondary test must not hide the others
        got = attempt(name, call, numerical=True)
        if isinstance(got, Unavailable):
            missing.append((name, got.reason))
            return None
        return got

    lev = secondary("Levene (median)", lambda: levene(g, "median", exact=exact))
    bart = secondary("Bartlett", lambda: bartlett(g, exact=exact))
    norm = secondary("Normal residuals", lambda: shapiro_residuals(g, exact=exact))
    wel = secondary("Welch", lambda: welch(g, exact=exact))
    kw = secondary("Kruskal-Wallis", lambda: kruskal(g))

    ratio = _sd_ratio(g, mom)
    smallest = min(g.counts)
    reasons: list[str] = []

    lev_flag = lev is not None and lev.p < a
    ratio_flag = not math.isnan(ratio) and ratio > SD_RATIO_LIMIT
    if lev is None:
        reasons.append(
            "Levene's test (median-centred) could not run: "
            + sentence(dict(missing)["Levene (median)"], capital=False)
        )
    elif lev_flag:
        reasons.append(
            f"Levene's test (median-centred) gives {_p_text(lev.p)}, below alpha = {a:g}: the "
            "group variances look unequal."
        )
    else:
        reasons.append(
            f"Levene's test (median-centred) gives {_p_text(lev.p)}, not below alpha = {a:g}: "
            "no sign of unequal variances from this test."
        )
    if math.isnan(ratio):
        reasons.append("The ratio of the largest to the smallest group SD is undefined here.")
    elif ratio_flag:
        if math.isinf(ratio):
            shown = "A group has zero SD while others vary, so the ratio of the largest to the smallest SD is infinite"
        else:
            shown = f"The largest group SD is {ratio:.3g} times the smallest"
        reasons.append(
            f"{shown}, more than {SD_RATIO_LIMIT:g} (a rule of thumb): the group variances look "
            "unequal."
        )
    else:
        reasons.append(
            f"The largest group SD is {ratio:.3g} times the smallest, within the rule of thumb "
            f"of {SD_RATIO_LIMIT:g}."
        )
    unequal = lev_flag or ratio_flag

    nonnormal = norm is not None and norm.p < a
    if norm is None:
        reasons.append(
            "The normality of the residuals could not be tested: "
            + sentence(dict(missing)["Normal residuals"], capital=False)
        )
    else:
        reasons.append(
            f"The {norm.method} test on the {norm.n} residuals gives {_p_text(norm.p)}: "
            + ("the residuals look non-normal." if nonnormal else "no sign of non-normal residuals.")
        )
    if bart is not None:
        reasons.append(
            f"Bartlett's test ({_p_text(bart.p)}) is shown for reference only: it is sensitive "
            "to non-normal data, so the reading uses the median-centred Levene test."
        )

    if unequal and wel is not None:
        read = "welch"
        reasons.append(
            f"Read Welch's test ({_p_text(wel.p)}), which does not assume equal variances."
        )
    elif unequal:
        read = "oneway"
        reasons.append(
            "The variances look unequal, but Welch's test could not run: "
            + sentence(dict(missing)["Welch"], capital=False)
            + " The one-way F is shown instead, and with unequal variances its p-value may "
            "mislead: look at the data of that group before relying on any result."
        )
    elif nonnormal and smallest < SMALL_GROUP_N and kw is not None:
        read = "kruskal"
        reasons.append(
            f"The residuals look non-normal and the smallest group has {smallest} values "
            f"(fewer than {SMALL_GROUP_N}): read the Kruskal-Wallis test ({_p_text(kw.p)}) "
            f"alongside the one-way F ({_p_text(ow.p)})."
        )
    elif nonnormal:
        read = "oneway"
        reasons.append(
            f"The residuals look non-normal, but every group has {SMALL_GROUP_N} or more values, "
            f"where the one-way F is robust to moderate non-normality (common practice): read the "
            f"one-way F ({_p_text(ow.p)})."
        )
    else:
        read = "oneway"
        if lev is None or norm is None:
            reasons.append(
                f"No check that could run suggests a problem: read the one-way F "
                f"({_p_text(ow.p)}), keeping in mind the checks that could not run."
            )
        else:
            reasons.append(
                f"No check suggests a problem: read the one-way F ({_p_text(ow.p)})."
            )
    return ChecksResult(
        read=read, reasons=tuple(reasons), variances_unequal=unequal,
        residuals_nonnormal=nonnormal, sd_ratio=ratio, smallest_n=smallest, alpha=a,
        levene=lev, bartlett=bart, normality=norm, welch=wel, kruskal=kw, oneway=ow,
        not_available=tuple(missing),
    )
