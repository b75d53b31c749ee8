"""Every figure of a report, from one set of core calls on one set of cleaned groups.

The report writer never computes statistics of its own: it runs the core analyses once here
(one-way table, group summaries, assumption checks with Welch and Kruskal–Wallis, effect sizes,
pairwise comparisons, Dunnett against a control, compact letters) and the sheet builders only
shape these results. The one addition is the Audit sheet's centring constant, a round number
near the grand mean, and the centred data values (value minus that constant, computed as the
exact decimal difference and rounded once), which let a spreadsheet's own floating-point
functions reproduce the exact figures.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from decimal import Decimal
from fractions import Fraction
from typing import Any

import numpy as np

from ..stats.assumptions import ChecksResult, checks
from ..stats.describe import DescribeResult, describe
from ..stats.effects import EffectSizes, effect_sizes
from ..errors import InputError
from ..input.groups import Groups, as_groups
from ..stats.lettering import LettersResult, letters
from ..stats.moments import ExactMoments, FloatMoments, compute_moments
from ..stats.oneway import OneWayResult, oneway_from_moments, require_two_groups
from ..stats.comparisons import PairwiseResult, dunnett, pairwise
from ..input.options import check_alpha
from .formats import Precision

__all__ = ["Unavailable", "Analysis", "analyse", "centring_constant", "centred_values", "METHOD_NAMES"]

#: Pairwise methods and the names a reader knows them by.
METHOD_NAMES = {
    "tukey": "Tukey–Kramer",
    "games-howell": "Games–Howell",
    "bonferroni": "Bonferroni",
    "holm": "Holm",
    "sidak": "Šidák",
    "scheffe": "Scheffé",
    "dunnett": "Dunnett",
}


@dataclass(frozen=True)
class Unavailable:
    """An analysis that could not run on these data, with the reason in plain words."""

    what: str
    reason: str

    def __bool__(self) -> bool:  # lets ``if result:`` read naturally
        return False


def _attempt(what: str, fn: Any, *args: Any, **kw: Any) -> Any:
    try:
        return fn(*args, **kw)
    except InputError as err:
        return Unavailable(what, err.reason)


@dataclass(frozen=True)
class Analysis:
    """All results one report shows (``Unavailable`` where an analysis could not run).

    ``unequal_pairs`` holds Games–Howell comparisons when the checks find unequal spreads and
    the chosen method pools the variances (else ``None``).
    """

    groups: Groups
    alpha: float
    conf: float
    method: str
    control: str | None
    factor: str
    response: str
    unit: str | None
    title: str
    moments: ExactMoments | FloatMoments
    oneway: OneWayResult
    describe: DescribeResult
    checks: ChecksResult
    welch: Any
    kruskal: Any
    effects: EffectSizes | Unavailable
    pairwise: PairwiseResult | Unavailable
    dunnett: PairwiseResult | Unavailable | None
    letters: LettersResult | Unavailable
    unequal_pairs: PairwiseResult | Unavailable | None
    centre: Decimal
    precision: Precision

    @property
    def exact(self) -> bool:
        return bool(self.oneway.exact)

    @property
    def method_name(self) -> str:
        return METHOD_NAMES.get(self.method, self.method)

    def units(self, text: str) -> str:
        """``text`` followed by the unit, when there is one: ``2.95 Shore A``."""
        return f"{text} {self.unit}" if self.unit else text


def _text_option(value: Any, name: str, default: str | None) -> str | None:
    if value is None:
        return default
    if not isinstance(value, str):
        raise InputError(f"{name} must be text, not {value!r}")
    s = value.strip()
    return s if s else default


def _method(method: Any) -> str:
    from ..stats.comparisons import parse_method

    return parse_method(method)


def centring_constant(mom: ExactMoments | FloatMoments, ow: OneWayResult) -> Decimal:
    """A round number near the grand mean: the mean rounded at the leading digit of the SD.

    On the decimal-exact path it is never finer than the data's own decimals; on the
    floating-point path it is a whole number that a double holds exactly.
    """
    n = ow.n_total
    if isinstance(mom, ExactMoments):
        grand = Fraction(mom.offset * n + sum(mom.s), n * mom.denom)
    else:
        grand = Fraction(math.fsum(c * m for c, m in zip(mom.n, mom.means())) / n)
    sd = math.sqrt(ow.ss_total / ow.df_total) if ow.df_total > 0 else 0.0
    e = int(math.floor(math.log10(sd))) if sd > 0 and math.isfinite(sd) else 0
    if isinstance(mom, ExactMoments):
        e = max(e, -mom.scale)
    else:
        e = max(e, 0)
    step = Fraction(10) ** e
    q = math.floor(grand / step + Fraction(1, 2))
    c = Decimal(q).scaleb(e)
    if not isinstance(mom, ExactMoments):
        c = Decimal(float(c))  # a double exactly, so that x - C rounds once
    return c


def centred_values(a: np.ndarray, mom: ExactMoments | FloatMoments, centre: Decimal) -> np.ndarray:
    """``value - centre`` for every value, as the exact decimal difference rounded once.

    Decimal-exact path: each value is its shortest decimal ``r / 10**D`` (``r`` an integer);
    with ``K = centre * 10**D`` (an integer), ``(r - K) / 10**D`` is formed from exact integers
    and one correctly rounded division. Values the vectorised reading cannot settle go through
    :class:`decimal.Decimal`. Floating-point path: the centre is a double, and the IEEE
    subtraction is itself the exact difference rounded once.
    """
    x = np.asarray(a, dtype=np.float64)
    if not isinstance(mom, ExactMoments):
        return x - float(centre)
    scale = mom.scale
    if scale <= 22:
        k_int = int(centre.scaleb(scale))
        if abs(k_int) < 2**53:
            p10 = 10.0**scale
            r = np.rint(x * p10)
            d = r - float(k_int)
            ok = (r / p10 == x) & (np.abs(r) < 1e15) & (np.abs(d) < 2.0**53)
            out = d / p10
            if not ok.all():
                idx = np.flatnonzero(~ok)
                out[idx] = [float(Decimal(repr(v)) - centre) for v in x[idx].tolist()]
            return out
    return np.array([float(Decimal(repr(v)) - centre) for v in x.tolist()], dtype=np.float64)


def _smallest_spread(desc: DescribeResult, ow: OneWayResult) -> float | None:
    """The smallest positive group SD (the overall SD when no group varies): it sets the
    decimals of the floating-point path, whose values carry no decimals of their own."""
    sds = [float(s.sd) for s in desc if s.n > 1 and math.isfinite(float(s.sd)) and float(s.sd) > 0]
    if sds:
        return min(sds)
    if ow.df_total > 0 and ow.ss_total > 0 and math.isfinite(ow.ss_total):
        return math.sqrt(ow.ss_total / ow.df_total)
    return None


def _label_option(control: Any, g: Groups) -> str | None:
    if control is None:
        return None
    from ..input.groups import format_label

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


def analyse(
    groups: Any,
    *,
    alpha: float = 0.05,
    method: str = "tukey",
    control: Any = None,
    factor: str | None = "Factor",
    response: str | None = "Response",
    unit: str | None = None,
    title: str | None = None,
) -> Analysis:
    """Run every analysis of the report. Option errors and an impossible one-way analysis
    raise :class:`InputError`; a secondary analysis that cannot run is kept as
    :class:`Unavailable` with its reason."""
    g = as_groups(groups)
    a = check_alpha(alpha)
    m = _method(method)
    fac = _text_option(factor, "the factor name", "Factor")
    resp = _text_option(response, "the response name", "Response")
    un = _text_option(unit, "the unit", None)
    require_two_groups(g)
    ctrl = _label_option(control, g)
    ttl = _text_option(title, "the title", None) or f"{resp} by {fac}"
    mom = compute_moments(g)
    ow = oneway_from_moments(g, mom)
    conf = 1.0 - a
    desc = describe(g, conf)
    chk = checks(g, a)
    missing = dict(chk.not_available)
    wel = chk.welch if chk.welch is not None else Unavailable("Welch", missing.get("Welch", "not available"))
    kw = chk.kruskal if chk.kruskal is not None else Unavailable(
        "Kruskal-Wallis", missing.get("Kruskal-Wallis", "not available")
    )
    eff = _attempt("effect sizes", effect_sizes, g, conf)
    let = _attempt("letters", letters, g, m, a)
    shared = getattr(let, "comparisons", None)
    if isinstance(shared, PairwiseResult) and shared.method == m and shared.alpha == a:
        pw = shared  # the very comparisons the letters were drawn from
    else:
        pw = _attempt(METHOD_NAMES[m], pairwise, g, m, a)
    dn = _attempt("Dunnett", dunnett, g, ctrl, a) if ctrl is not None else None
    gh = None
    if chk.variances_unequal and m != "games-howell":
        gh = _attempt(METHOD_NAMES["games-howell"], pairwise, g, "games-howell", a)
    centre = centring_constant(mom, ow)
    prec = Precision(mom.scale if isinstance(mom, ExactMoments) else None, _smallest_spread(desc, ow))
    return Analysis(
        groups=g, alpha=a, conf=conf, method=m, control=ctrl, factor=fac, response=resp,
        unit=un, title=ttl, moments=mom, oneway=ow, describe=desc, checks=chk, welch=wel,
        kruskal=kw, effects=eff, pairwise=pw, dunnett=dn, letters=let, unequal_pairs=gh, centre=centre,
        precision=prec,
    )
