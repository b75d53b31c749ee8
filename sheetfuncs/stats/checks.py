"""All checks of the one-way model's assumptions, and a plain-words reading of which test to read.

The checks: equal variances (:mod:`sheetfuncs.stats.variances`: the median-centred Levene test,
Bartlett's test for reference, and the ratio of the largest to the smallest group SD), normal
residuals (:mod:`sheetfuncs.stats.normality`) and the size of the smallest group; alongside them
the one-way F, Welch's test and Kruskal–Wallis (:mod:`sheetfuncs.stats.alternatives`).

The reading rule of :func:`checks` is documented there and in ``docs/checks.md``.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Mapping
from dataclasses import dataclass
from typing import Any, ClassVar

from .alternatives import KruskalResult, WelchResult, kruskal, welch, welch_of
from ..input import Groups, as_groups, check_alpha
from .group_moments import GroupMoments, require_two
from .moments import ExactMoments, FloatMoments, compute_moments
from .normality import NormalityResult, shapiro_residuals
from .oneway import OneWayResult, oneway_from_moments, oneway_of, require_two_groups
from .outcome import Unavailable, attempt
from .variances import BartlettResult, LeveneResult, bartlett, bartlett_of, levene
from .wording import df_text, sentence

__all__ = ["ChecksResult", "checks", "checks_of", "SD_RATIO_LIMIT", "SMALL_GROUP_N", "CAUTION"]

#: Rule of thumb (common practice): variances look unequal when the largest SD is more than this
#: many times the smallest.
SD_RATIO_LIMIT = 2.0
#: Rule of common practice: with fewer values than this in the smallest group, non-normal
#: residuals call for the Kruskal–Wallis test alongside the F test.
SMALL_GROUP_N = 15

CAUTION = (
    "Pre-testing assumptions is itself a judgement: a check with few values may miss a real "
    "problem and one with many values may flag a harmless one; look at the data (plots of "
    "residuals and spreads), weigh how the data were collected, and follow your organisation's "
    "procedures before acting on the result."
)


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
    * ``oneway`` — the :class:`~sheetfuncs.stats.oneway.OneWayResult`;
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
                         (f"residuals look non-normal ({nm.residuals_text})" if nm.p < a
                          else f"no sign of non-normal residuals ({nm.residuals_text})")])
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


def _sd_ratio(mom: ExactMoments | FloatMoments) -> float:
    sds = [math.sqrt(float(mom.ss_group(i) / (n - 1))) for i, n in enumerate(mom.n) if n >= 2]
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
    missing: str = "stop",
    relabel: Mapping[str, str] | None = None,
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

    ``missing`` (``"stop"`` or ``"drop"``) and ``relabel`` are as in :func:`sheetfuncs.as_groups`.
    """
    g = as_groups(groups, missing=missing, relabel=relabel)
    a = check_alpha(alpha)
    require_two_groups(g)
    mom = moments if moments is not None else compute_moments(g, exact)
    ow = oneway if oneway is not None else oneway_from_moments(g, mom)
    return _assemble(_secondary_tests(g, exact), mom, a, ow)


def checks_of(
    gm: GroupMoments,
    alpha: float = 0.05,
    *,
    levene: LeveneResult | Unavailable,
    normality: NormalityResult | Unavailable,
    kruskal: KruskalResult | Unavailable,
    oneway: OneWayResult | None = None,
) -> ChecksResult:
    """The checks and their reading (the rule of :func:`checks`) from the groups' labels,
    counts and moments, with the tests that need the values computed elsewhere (e.g. by a
    database): the median-centred Levene test, the residuals' normality test and
    Kruskal–Wallis, each a result or :class:`Unavailable` with the reason it could not run.
    Welch's and Bartlett's tests are computed here from the moments."""
    a = check_alpha(alpha)
    require_two(gm)
    ow = oneway if oneway is not None else oneway_of(gm)
    missing: list[tuple[str, str]] = []

    def given(name: str, got: Any) -> Any:
        if isinstance(got, Unavailable):
            missing.append((name, got.reason))
            return None
        return got

    def secondary(name: str, call: Callable[[], Any]) -> Any:
        return given(name, attempt(name, call, numerical=True))

    lev = given("Levene (median)", levene)
    bart = secondary("Bartlett", lambda: bartlett_of(gm))
    norm = given("Normal residuals", normality)
    wel = secondary("Welch", lambda: welch_of(gm))
    kw = given("Kruskal-Wallis", kruskal)
    return _assemble(_Secondary(lev, bart, norm, wel, kw, tuple(missing)), gm.moments, a, ow)


def _assemble(
    sec: _Secondary, mom: ExactMoments | FloatMoments, a: float, ow: OneWayResult
) -> ChecksResult:
    """The checks' result and reading from the secondary tests and the groups' moments."""
    ratio = _sd_ratio(mom)
    smallest = min(mom.n)
    spread, unequal = _spread_reasons(sec, ratio, a)
    normal, nonnormal = _normality_reasons(sec, a)
    read, why = _reading(sec, unequal, nonnormal, smallest, ow)
    return ChecksResult(
        read=read, reasons=tuple(spread + normal + [why]), variances_unequal=unequal,
        residuals_nonnormal=nonnormal, sd_ratio=ratio, smallest_n=smallest, alpha=a,
        levene=sec.levene, bartlett=sec.bartlett, normality=sec.normality, welch=sec.welch,
        kruskal=sec.kruskal, oneway=ow, not_available=sec.missing,
    )


@dataclass(frozen=True)
class _Secondary:
    """The secondary tests of :func:`checks`: each result, or ``None`` when the test could not
    run, with ``(test, reason)`` in ``missing``."""

    levene: LeveneResult | None
    bartlett: BartlettResult | None
    normality: NormalityResult | None
    welch: WelchResult | None
    kruskal: KruskalResult | None
    missing: tuple[tuple[str, str], ...]

    def reason(self, test: str) -> str:
        """Why ``test`` could not run."""
        return dict(self.missing)[test]


def _secondary_tests(g: Groups, exact: bool | None) -> _Secondary:
    """Run the secondary tests, each on its own: an unforeseen numerical failure of one must
    not hide the others."""
    missing: list[tuple[str, str]] = []

    def secondary(name: str, call: Callable[[], Any]) -> Any:
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
    return _Secondary(lev, bart, norm, wel, kw, tuple(missing))


def _spread_reasons(sec: _Secondary, ratio: float, a: float) -> tuple[list[str], bool]:
    """The sentences on the spreads (Levene's test, the SD ratio), and whether the group
    variances look unequal."""
    lev = sec.levene
    reasons: list[str] = []
    lev_flag = lev is not None and lev.p < a
    ratio_flag = not math.isnan(ratio) and ratio > SD_RATIO_LIMIT
    if lev is None:
        reasons.append(
            "Levene's test (median-centred) could not run: "
            + sentence(sec.reason("Levene (median)"), capital=False)
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
    return reasons, lev_flag or ratio_flag


def _tested(norm: NormalityResult) -> str:
    """The residuals tested, as the reasons name them."""
    return norm.residuals_text + "," if norm.of_total else f"the {norm.n} residuals"


def _normality_reasons(sec: _Secondary, a: float) -> tuple[list[str], bool]:
    """The sentences on the residuals' normality (and on Bartlett's test, shown for reference
    only), and whether the residuals look non-normal."""
    norm, bart = sec.normality, sec.bartlett
    reasons: list[str] = []
    nonnormal = norm is not None and norm.p < a
    if norm is None:
        reasons.append(
            "The normality of the residuals could not be tested: "
            + sentence(sec.reason("Normal residuals"), capital=False)
        )
    else:
        reasons.append(
            f"The {norm.method} test on {_tested(norm)} gives {_p_text(norm.p)}: "
            + ("the residuals look non-normal." if nonnormal else "no sign of non-normal residuals.")
        )
    if bart is not None:
        reasons.append(
            f"Bartlett's test ({_p_text(bart.p)}) is shown for reference only: it is sensitive "
            "to non-normal data, so the reading uses the median-centred Levene test."
        )
    return reasons, nonnormal


def _reading(
    sec: _Secondary, unequal: bool, nonnormal: bool, smallest: int, ow: OneWayResult
) -> tuple[str, str]:
    """Which test to read (``"oneway"``, ``"welch"`` or ``"kruskal"``), and the sentence that
    says why."""
    wel, kw = sec.welch, sec.kruskal
    if unequal and wel is not None:
        return "welch", (
            f"Read Welch's test ({_p_text(wel.p)}), which does not assume equal variances."
        )
    if unequal:
        return "oneway", (
            "The variances look unequal, but Welch's test could not run: "
            + sentence(sec.reason("Welch"), capital=False)
            + " The one-way F is shown instead, and with unequal variances its p-value may "
            "mislead: look at the data of that group before relying on any result."
        )
    if nonnormal and smallest < SMALL_GROUP_N and kw is not None:
        return "kruskal", (
            f"The residuals look non-normal and the smallest group has {smallest} values "
            f"(fewer than {SMALL_GROUP_N}): read the Kruskal-Wallis test ({_p_text(kw.p)}) "
            f"alongside the one-way F ({_p_text(ow.p)})."
        )
    if nonnormal:
        return "oneway", (
            f"The residuals look non-normal, but every group has {SMALL_GROUP_N} or more values, "
            f"where the one-way F is robust to moderate non-normality (common practice): read the "
            f"one-way F ({_p_text(ow.p)})."
        )
    if sec.levene is None or sec.normality is None:
        return "oneway", (
            f"No check that could run suggests a problem: read the one-way F "
            f"({_p_text(ow.p)}), keeping in mind the checks that could not run."
        )
    return "oneway", f"No check suggests a problem: read the one-way F ({_p_text(ow.p)})."
