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
from typing import Any

from ..errors import InputError
from ..input import Groups, as_groups, check_alpha, check_conf, format_label
from .alternatives import KruskalResult, WelchResult
from .checks import ChecksResult, checks
from .comparisons import METHOD_NAMES, PairwiseResult, dunnett, pairwise, parse_method
from .describe import DescribeResult, describe
from .effects import EffectSizes, effect_sizes
from .lettering import LettersResult, letters
from .moments import ExactMoments, FloatMoments, compute_moments
from .oneway import OneWayResult, oneway_from_moments, require_two_groups
from .outcome import Unavailable, attempt

__all__ = ["Analysis", "analyse"]


@dataclass(frozen=True)
class Analysis:
    """Every result of one analysis (``Unavailable`` where an analysis could not run).

    ``alpha`` is the significance level and ``conf`` the confidence level of the group and
    effect-size intervals (``1 - alpha`` unless given); ``method`` the pairwise method (canonical name) and ``control`` the control's
    label or ``None``; ``welch`` and ``kruskal`` are the checks' own results (or
    ``Unavailable`` with the checks' reason); ``pairwise`` are the comparisons the ``letters``
    were drawn from; ``unequal_pairs`` holds Games–Howell comparisons when the checks find
    unequal spreads and ``method`` pools the variances (else ``None``).
    """

    groups: Groups
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

    @property
    def exact(self) -> bool:
        """Whether the decimal-exact path was used."""
        return bool(self.oneway.exact)

    @property
    def method_name(self) -> str:
        """The pairwise method's published name, e.g. ``Tukey–Kramer``."""
        return METHOD_NAMES[self.method]


def control_label(control: Any, g: Groups) -> str | None:
    """The control's label (matched as the groups' labels are formed), ``None`` when not given."""
    if control is None:
        return None
    label = format_label(control)
    if label == "":
        return None
    if label not in g.labels:
        shown = ", ".join(f'"{x}"' for x in g.labels[:8]) + (", ..." if g.k > 8 else "")
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
    if not comparisons:
        skipped = "not computed: comparisons were not asked for"
        let = Unavailable("letters", skipped)
        pw = Unavailable(METHOD_NAMES[m], skipped)
    else:
        let, pw = _letters_and_pairs(g, m, a)
    gh = None
    if comparisons and chk.variances_unequal and m != "games-howell":
        gh = attempt(METHOD_NAMES["games-howell"], lambda: pairwise(g, "games-howell", a))
    return Analysis(
        groups=g, alpha=a, conf=level, method=m, control=ctrl, moments=mom, oneway=ow,
        describe=describe(g, level), checks=chk,
        welch=_checked(chk.welch, "Welch", chk), kruskal=_checked(chk.kruskal, "Kruskal-Wallis", chk),
        effects=attempt("effect sizes", lambda: effect_sizes(g, level)),
        pairwise=pw,
        dunnett=(attempt("Dunnett", lambda: dunnett(g, ctrl, a))
                 if ctrl is not None and comparisons else None),
        letters=let, unequal_pairs=gh,
    )


def _letters_and_pairs(g: Groups, m: str, a: float) -> tuple[
        LettersResult | Unavailable, PairwiseResult | Unavailable]:
    """The letters and the comparisons they were drawn from (or the comparisons alone, when the
    letters could not be drawn)."""
    let = attempt("letters", lambda: letters(g, m, a))
    if isinstance(let, LettersResult):
        pw: PairwiseResult | Unavailable = let.comparisons  # the comparisons the letters were drawn from
    else:
        pw = attempt(METHOD_NAMES[m], lambda: pairwise(g, m, a))
    return let, pw
