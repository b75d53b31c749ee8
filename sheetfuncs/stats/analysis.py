"""Every result of one analysis of the groups, computed once, for every front that shows several.

The report and the command line never compute statistics of their own: they call
:func:`analyse` once and shape what it returns. It runs the one-way analysis on the groups'
moments, the group summaries, the assumption checks (with Welch and Kruskal–Wallis, reusing those
moments and that one-way result), the effect sizes, the compact letters and the pairwise
comparisons they are drawn from, Dunnett's comparisons with a control when one is named, and
Games–Howell when the checks find unequal spreads and the chosen method pools the variances.
An analysis that cannot run on these data is kept as :class:`~sheetfuncs.stats.outcome.Unavailable`
with its reason; the one-way analysis itself and the options must be possible, else
:class:`~sheetfuncs.errors.InputError`.
"""

from __future__ import annotations

from dataclasses import dataclass
from collections.abc import Sequence
from typing import Any

from ..errors import InputError
from ..input import Groups, as_groups, check_alpha, check_conf, format_label
from .alternatives import KruskalResult, WelchResult
from .checks import ChecksResult, checks, checks_of
from .comparisons import METHOD_NAMES, PairwiseResult, dunnett_of, pairwise_of, parse_method
from .describe import DescribeResult, describe, describe_of
from .effects import EffectSizes, effect_sizes_of
from .group_moments import GroupMoments, group_moments, require_two
from .lettering import LettersResult, letters_of
from .moments import ExactMoments, FloatMoments, compute_moments
from .normality import NormalityResult
from .oneway import OneWayResult, oneway_from_moments, oneway_of, require_two_groups
from .outcome import Unavailable, attempt
from .variances import LeveneResult

__all__ = ["Analysis", "analyse", "analyse_of"]


@dataclass(frozen=True)
class Analysis:
    """Every result of one analysis (``Unavailable`` where an analysis could not run).

    ``alpha`` is the significance level and ``conf`` the confidence level of the group and
    effect-size intervals (``1 - alpha`` unless given); ``method`` the pairwise method (canonical name) and ``control`` the control's
    label or ``None``; ``welch`` and ``kruskal`` are the checks' own results (or
    ``Unavailable`` with the checks' reason); ``pairwise`` are the comparisons the ``letters``
    were drawn from; ``unequal_pairs`` holds Games–Howell comparisons when the checks find
    unequal spreads and ``method`` pools the variances (else ``None``).

    ``groups`` are the cleaned groups with their values when the analysis ran on values
    (:func:`analyse`), and ``None`` when it ran on per-group sums without values
    (:func:`analyse_of`, e.g. sums computed inside a database). ``summary`` is always set: the
    groups' labels, counts, moments and dropped values
    (:class:`~sheetfuncs.stats.group_moments.GroupMoments`); the properties ``labels``,
    ``counts``, ``k``, ``n_total`` and ``dropped`` read from it, so a front that needs only
    those works on both kinds.
    """

    groups: Groups | None
    alpha: float
    conf: float
    method: str
    control: str | None
    moments: ExactMoments | FloatMoments
    oneway: OneWayResult
    describe: DescribeResult
    checks: ChecksResult
    welch: WelchResult | Unavailable
    kruskal: KruskalResult | Unavailable
    effects: EffectSizes | Unavailable
    pairwise: PairwiseResult | Unavailable
    dunnett: PairwiseResult | Unavailable | None
    letters: LettersResult | Unavailable
    unequal_pairs: PairwiseResult | Unavailable | None
    summary: GroupMoments

    @property
    def labels(self) -> tuple[str, ...]:
        """The groups' labels, in order."""
        return self.summary.labels

    @property
    def counts(self) -> tuple[int, ...]:
        """The groups' sizes."""
        return self.summary.counts

    @property
    def k(self) -> int:
        """The number of groups."""
        return self.summary.k

    @property
    def n_total(self) -> int:
        """The number of values analysed."""
        return self.summary.n_total

    @property
    def dropped(self) -> tuple[int, ...]:
        """The missing values left out of each group."""
        return self.summary.dropped

    @property
    def exact(self) -> bool:
        """Whether the decimal-exact path was used."""
        return bool(self.oneway.exact)

    @property
    def method_name(self) -> str:
        """The pairwise method's published name, e.g. ``Tukey–Kramer``."""
        return METHOD_NAMES[self.method]


def control_label(control: Any, g: Groups | GroupMoments) -> str | None:
    """The control's label (matched as the groups' labels are formed), ``None`` when not given."""
    if control is None:
        return None
    label = format_label(control)
    if label == "":
        return None
    if label not in g.labels:
        shown = ", ".join(f'"{x}"' for x in g.labels[:8]) + (", ..." if len(g.labels) > 8 else "")
        raise InputError(
            f'the control "{label}" is not one of the groups ({shown}); give the '
            "label of the control group exactly as it heads its column"
        )
    return label


def _checked(result: Any, what: str, chk: ChecksResult) -> Any:
    """One of the checks' results, or ``Unavailable`` with the reason the checks recorded."""
    if result is not None:
        return result
    return Unavailable(what, dict(chk.not_available).get(what, "not available"))


def analyse(
    groups: Any, *, alpha: Any = 0.05, method: Any = "tukey", control: Any = None, conf: Any = None,
    comparisons: bool = True,
) -> Analysis:
    """Run every analysis once (see the module docstring). The group intervals and the effect
    sizes' intervals are at ``conf``, by default ``1 - alpha``; the comparisons' intervals are
    at ``1 - alpha``. ``comparisons=False`` leaves out the pairwise comparisons, the letters and
    Dunnett's comparisons (their number grows with the square of the number of groups): they
    are then :class:`Unavailable` (``None`` for the two optional ones)."""
    g = as_groups(groups)
    a = check_alpha(alpha)
    level = 1.0 - a if conf is None else check_conf(conf)
    m = parse_method(method)
    require_two_groups(g)
    ctrl = control_label(control, g)
    mom = compute_moments(g)
    ow = oneway_from_moments(g, mom)
    chk = checks(g, a, moments=mom, oneway=ow)
    gm = group_moments(g, mom)
    return _assembled(g, gm, a, level, m, ctrl, ow, describe(g, level), chk, comparisons)


def analyse_of(
    gm: GroupMoments, *, alpha: Any = 0.05, method: Any = "tukey", control: Any = None,
    conf: Any = None, comparisons: bool = True,
    levene: LeveneResult | Unavailable | None = None,
    normality: NormalityResult | Unavailable | None = None,
    kruskal: KruskalResult | Unavailable | None = None,
    extremes: Sequence[tuple[float, float, float]] | None = None,
    scale: str = "from per-group sums alone",
) -> Analysis:
    """The same :class:`Analysis` from the groups' labels, counts and moments, without values
    (``Analysis.groups`` is then ``None``). The tests that need the values (the median-centred
    Levene test, the residuals' normality test, Kruskal–Wallis) and each group's smallest,
    median and largest value (``extremes``) may be given, computed elsewhere (e.g. by a
    database); a test not given is :class:`Unavailable`, its reason saying it needs the values,
    which are not available ``scale`` (e.g. "from per-group sums alone"). Welch's and Bartlett's
    tests, the comparisons, the letters, the effect sizes and the group summaries are computed
    from the moments, by the same functions as :func:`analyse` uses."""
    a = check_alpha(alpha)
    level = 1.0 - a if conf is None else check_conf(conf)
    m = parse_method(method)
    require_two(gm)
    ctrl = control_label(control, gm)
    ow = oneway_of(gm)

    def need(got: Any, what: str, needs: str) -> Any:
        return got if got is not None else Unavailable(what, f"{what} needs {needs}, not available {scale}")

    chk = checks_of(
        gm, a, oneway=ow,
        levene=need(levene, "Levene's test", "each value's distance from its group median"),
        normality=need(normality, "the normality test", "the residuals of the values"),
        kruskal=need(kruskal, "Kruskal-Wallis", "the ranks of the values"),
    )
    return _assembled(None, gm, a, level, m, ctrl, ow, describe_of(gm, level, extremes), chk, comparisons)


def _assembled(
    g: Groups | None, gm: GroupMoments, a: float, level: float, m: str, ctrl: str | None,
    ow: OneWayResult, desc: DescribeResult, chk: ChecksResult, comparisons: bool,
) -> Analysis:
    """The :class:`Analysis` from the checks and the moments: the comparisons, the letters,
    Dunnett's comparisons and the effect sizes."""
    if not comparisons:
        skipped = "not computed: comparisons were not asked for"
        let = Unavailable("letters", skipped)
        pw = Unavailable(METHOD_NAMES[m], skipped)
    else:
        let, pw = _letters_and_pairs(gm, m, a)
    gh = None
    if comparisons and chk.variances_unequal and m != "games-howell":
        gh = attempt(METHOD_NAMES["games-howell"], lambda: pairwise_of(gm, "games-howell", a))
    return Analysis(
        groups=g, alpha=a, conf=level, method=m, control=ctrl, moments=gm.moments, oneway=ow,
        describe=desc, checks=chk,
        welch=_checked(chk.welch, "Welch", chk), kruskal=_checked(chk.kruskal, "Kruskal-Wallis", chk),
        effects=attempt("effect sizes", lambda: effect_sizes_of(gm, level)),
        pairwise=pw,
        dunnett=(attempt("Dunnett", lambda: dunnett_of(gm, ctrl, a))
                 if ctrl is not None and comparisons else None),
        letters=let, unequal_pairs=gh, summary=gm,
    )


def _letters_and_pairs(gm: GroupMoments, m: str, a: float) -> tuple[
        LettersResult | Unavailable, PairwiseResult | Unavailable]:
    """The letters and the comparisons they were drawn from (or the comparisons alone, when the
    letters could not be drawn)."""
    let = attempt("letters", lambda: letters_of(gm, m, a))
    if isinstance(let, LettersResult):
        pw: PairwiseResult | Unavailable = let.comparisons  # the comparisons the letters were drawn from
    else:
        pw = attempt(METHOD_NAMES[m], lambda: pairwise_of(gm, m, a))
    return let, pw
