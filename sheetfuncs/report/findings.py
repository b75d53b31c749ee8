"""The Findings sheet's text: the answer in plain words, worked out from the analysis results.

Order follows what a reader needs first: the answer (does the factor matter), the key figures,
which groups differ, how large the differences are, which result to read given the checks and
why, notes on the data, and the cautions. Every number quoted comes from :func:`sheetfuncs.stats.analyse`.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from ..input import Groups
from ..stats import KruskalResult, PairRow, PairwiseResult, Unavailable, WelchResult, df_text, sentence
from .context import ReportContext
from .formats import format_measure, format_number, format_p, format_sig
from .reading import data_read_lines

__all__ = ["Findings", "KeyFigure", "findings", "CAUTIONS", "effect_label", "percent_words"]

CAUTIONS = (
    "Statistics support but do not replace engineering judgement.",
    "Check the assumptions this report lists (independent observations, similar spreads, "
    "roughly normal residuals) before relying on the result.",
    "Follow your organisation's quality procedures, applicable standards and regulations.",
    "Validate this tool under your organisation's software-validation procedure before using it "
    "for regulated decisions.",
)

#: One row of the key figures: (figure, value, df, p, reading); value, df and p may be missing.
KeyFigure = tuple[str, int | float | None, str | None, float | None, str]


@dataclass(frozen=True)
class Findings:
    """The plain-words reading of one analysis.

    ``verdict`` is ``"differs"``, ``"no difference"`` or ``"unsettled"`` (the rank test and the
    F test disagree); ``read`` is the checks' choice of result (``"oneway"``, ``"welch"`` or
    ``"kruskal"``); ``headline`` is the answer in one or two sentences; ``sections`` are
    ``(heading, paragraphs)`` pairs; ``key_figures`` rows are (figure, value, df, p, reading);
    ``data_read`` says what was read and left out (shown before the answer).
    """

    verdict: str
    read: str
    read_name: str
    headline: str
    sections: tuple[tuple[str, tuple[str, ...]], ...]
    key_figures: tuple[KeyFigure, ...]
    typo_notes: tuple[str, ...]
    data_read: tuple[str, ...] = ()

    def text(self) -> str:
        """Everything as one string (for logs and tests)."""
        parts = [*self.data_read, self.headline, *self.typo_notes]
        for head, paras in self.sections:
            parts.append(head)
            parts.extend(paras)
        return "\n".join(parts)


def effect_label(f: float) -> str:
    """Cohen's (1988) conventions for f: 0.10 small, 0.25 medium, 0.40 large."""
    if math.isnan(f):
        return "undefined"
    if f < 0.10:
        return "below the conventional 'small' (0.10)"
    if f < 0.25:
        return "small"
    if f < 0.40:
        return "medium"
    return "large"


def _alpha(a: float) -> str:
    return f"{a:g}"


def _quote(label: str) -> str:
    return f'"{label}"'


def _oneway_phrase(an: ReportContext) -> str:
    ow = an.oneway
    return f"one-way F test, F({ow.df_between}, {ow.df_within}) = {format_sig(ow.f)}, {format_p(ow.p)}"


def _welch_phrase(w: WelchResult) -> str:
    return f"Welch's test, F({df_text(w.df1, w.df2)}) = {format_sig(w.statistic)}, {format_p(w.p)}"


def _kruskal_phrase(k: KruskalResult) -> str:
    return f"Kruskal–Wallis test, H = {format_sig(k.statistic)} on {k.df} df, {format_p(k.p)}"


def _headline(an: ReportContext) -> tuple[str, str, str]:
    """(verdict, read, headline). A test the checks point to that could not run is replaced by
    the one-way F test."""
    a = an.alpha
    read = an.checks.read
    fac, resp = an.factor, an.response
    wl, kw = an.welch, an.kruskal
    if read == "kruskal" and not isinstance(kw, Unavailable):
        return _rank_headline(an, kw)
    if read == "welch" and not isinstance(wl, Unavailable):
        p, phrase = wl.p, _welch_phrase(wl)
    else:
        read = "oneway"
        p, phrase = an.oneway.p, _oneway_phrase(an)
    if p < a:
        return "differs", read, (
            f"Yes: {fac} matters. The mean {resp} is not the same in every group ({phrase}, "
            f"below alpha = {_alpha(a)})."
        )
    return "no difference", read, (
        f"No clear effect: these data do not show that {fac} changes the mean {resp} ({phrase}, "
        f"not below alpha = {_alpha(a)}). This does not prove the groups equal: see how large a "
        "difference the data leave open, under 'How large'."
    )


def _rank_headline(an: ReportContext, kw: KruskalResult) -> tuple[str, str, str]:
    """(verdict, read, headline) when the rank test is read alongside the one-way F test."""
    a = an.alpha
    fac, resp = an.factor, an.response
    f_sig = an.oneway.p < a
    k_sig = kw.p < a
    both = f"{_kruskal_phrase(kw)}; {_oneway_phrase(an)}"
    if f_sig and k_sig:
        return "differs", "kruskal", (
            f"Yes: {fac} matters. The {resp} is not the same in every group ({both}; both "
            f"below alpha = {_alpha(a)})."
        )
    if not f_sig and not k_sig:
        return "no difference", "kruskal", (
            f"No clear effect: these data do not show that {fac} changes the {resp} ({both}; "
            f"neither below alpha = {_alpha(a)}). This does not prove the groups equal."
        )
    return "unsettled", "kruskal", (
        f"Unsettled: the two tests disagree ({both}, alpha = {_alpha(a)}). With non-normal "
        "residuals and small groups the rank test is the safer reading, but treat the "
        f"question of whether {fac} matters as open: look at the data and, if it matters, "
        "collect more."
    )


def _pair_sentence(an: ReportContext, row: PairRow) -> str:
    d, (lo, hi) = row.difference, row.ci
    a_lab, b_lab = row.group_a, row.group_b
    if d < 0:
        a_lab, b_lab, d, lo, hi = b_lab, a_lab, -d, -hi, -lo
    dec = an.precision.mean
    return (
        f"{_quote(a_lab)} is higher than {_quote(b_lab)} by "
        f"{an.units(format_measure(d, dec))} (the interval {format_measure(lo, dec)} to "
        f"{format_measure(hi, dec)}; {format_p(row.p)})."
    )


_MAX_PAIRS = 12


def _count_phrase(hits: int, pairs: int) -> str:
    verb = "differs" if hits == 1 else "differ"
    return f"{hits} of the {pairs} pair{'' if pairs == 1 else 's'} of groups {verb} clearly"


def _hits(res: PairwiseResult) -> list[PairRow]:
    return sorted((r for r in res.rows if r.differs), key=lambda r: -abs(r.difference))


def _listed(an: ReportContext, hits: list[PairRow]) -> list[str]:
    """One line per pair that differs (at most twelve), then how many more there are."""
    out = ["• " + _pair_sentence(an, r) for r in hits[:_MAX_PAIRS]]
    if len(hits) > _MAX_PAIRS:
        out.append(f"… and {len(hits) - _MAX_PAIRS} more pairs; see the Comparisons sheet.")
    return out


def _pair_lines(an: ReportContext, res: PairwiseResult, name: str, lead: str = "") -> list[str]:
    """A count of the pairs that differ, with one line per pair (largest difference first)."""
    hits = _hits(res)
    a = _alpha(an.alpha)
    if not hits:
        return [f"{lead}No pair of groups differs clearly ({name} comparisons at alpha = {a})."]
    interval = res.interval or "confidence"
    return [f"{lead}{_count_phrase(len(hits), len(res.rows))} ({name} comparisons at alpha = {a}; "
            f"intervals: {interval}):", *_listed(an, hits)]


def _p_read(an: ReportContext, read: str) -> float:
    """The p-value of the result read (``read`` names one that could run)."""
    if read == "welch" and not isinstance(an.welch, Unavailable):
        return an.welch.p
    if read == "kruskal" and not isinstance(an.kruskal, Unavailable):
        return an.kruskal.p
    return an.oneway.p


def _near_alpha(p: float, alpha: float) -> bool:
    """A p-value within a factor of five below alpha, or at most twice alpha (common practice
    for "near the threshold": a small change in the data could move it across)."""
    return math.isfinite(p) and alpha / 5 <= p < 2 * alpha


def _differ_section(an: ReportContext, verdict: str, read: str = "oneway") -> tuple[str, ...]:
    """Which groups differ: the pairs read, how they square with the overall test, the compact
    letters, the comparison with the control, and the Games–Howell reading of unequal spreads."""
    gh = an.unequal_pairs
    # When Welch's test is read and the chosen method pools the variances, the pairs are read
    # from Games–Howell (which does not pool them) and the pooled method comes second.
    welch_lead = read == "welch" and gh is not None
    if welch_lead and gh is not None:
        out, primary = _welch_led_pairs(an, gh)
    else:
        out, primary = _method_pairs(an)
    if primary is not None:
        out.extend(_overall_and_pairs(an, primary, verdict, read))
    out.extend(_letters_lines(an, welch_lead))
    out.extend(_control_lines(an, welch_lead))
    if gh is not None and not welch_lead:
        out.extend(_unequal_lines(an, gh))
    return tuple(out)


def _not_run(an: ReportContext, pw: Unavailable) -> str:
    return f"The {an.method_name} comparisons could not run: {pw.reason}."


def _method_pairs(an: ReportContext) -> tuple[list[str], PairwiseResult | None]:
    """The chosen method's pairs, and the comparisons read (``None`` if they could not run)."""
    pw = an.pairwise
    if isinstance(pw, Unavailable):
        return [_not_run(an, pw)], None
    return _pair_lines(an, pw, an.method_name), pw


def _welch_led_pairs(an: ReportContext, gh: PairwiseResult | Unavailable) -> tuple[list[str], PairwiseResult | None]:
    """The Games–Howell pairs first, then the chosen pooled method for reference; and the
    comparisons read (``None`` if Games–Howell could not run)."""
    out: list[str] = []
    primary: PairwiseResult | None = None
    lead = ("The group spreads look unequal and Welch's test is the result to read, so the pairs "
            "are read from the Games–Howell comparisons, which do not pool the variances")
    if isinstance(gh, Unavailable):
        out.append(f"{lead}; they could not run: {gh.reason}.")
    else:
        primary = gh
        out.extend(_pair_lines(an, gh, "Games–Howell", lead + ". "))
    pw = an.pairwise
    if isinstance(pw, Unavailable):
        out.append(_not_run(an, pw))
    else:
        n_pooled = len(_hits(pw))
        found = ("find no pair that differs clearly" if n_pooled == 0 else
                 f"find that {_count_phrase(n_pooled, len(pw.rows))}")
        out.append(
            f"For reference, the {an.method_name} comparisons (the chosen method) {found}; they "
            "pool the group variances, which spreads as unequal as these do not support, so "
            "they are shown on the Comparisons sheet but not read here."
        )
    return out, primary


def _overall_and_pairs(an: ReportContext, primary: PairwiseResult, verdict: str, read: str) -> list[str]:
    """A sentence when the overall test and the pairs read do not tell the same story."""
    hits = _hits(primary)
    if verdict == "differs" and not hits:
        if _near_alpha(_p_read(an, read), an.alpha):
            return [
                "The overall test and the pairwise comparisons can disagree near the threshold: "
                "the overall difference is not pinned on any single pair."
            ]
        return [
            "The overall test finds a difference that no single pair pins down: it may be "
            "spread over several groups; see the intervals on the Comparisons sheet."
        ]
    if verdict == "no difference" and hits:
        return [
            "Some pairs differ although the overall test does not: treat them with care, "
            "they may be chance findings among many comparisons."
        ]
    return []


def _letters_lines(an: ReportContext, welch_lead: bool) -> list[str]:
    """The compact letters in words (none when they could not be drawn)."""
    let = an.letters
    if isinstance(let, Unavailable):
        return []
    shown = ", ".join(f"{_quote(row[0])} ({row[2]})" for row in let.table()[1:])
    if welch_lead:
        return [f"Compact letters, from the pooled {an.method_name} comparisons (read them "
                f"with the same reserve): groups that share a letter are not shown to differ: {shown}."]
    return [f"Groups that share a letter are not shown to differ: {shown}."]


def _control_lines(an: ReportContext, welch_lead: bool) -> list[str]:
    """Dunnett's comparisons with the control in words (none without a control)."""
    dn = an.dunnett
    if dn is None:
        return []
    if isinstance(dn, Unavailable):
        return [f"The comparison with the control {_quote(an.control or '')} could not run: {dn.reason}."]
    hits = [r for r in dn.rows if r.differs]
    quiet = [r.group_a for r in dn.rows if not r.differs]
    pooled = ", which pools the group variances" if welch_lead else ""
    lead = f"Against the control {_quote(an.control or '')} (Dunnett{pooled}, alpha = {_alpha(an.alpha)}): "
    if not hits:
        return [lead + "no group is shown to differ from the control."]
    parts = []
    for r in hits:
        word = "higher" if r.difference > 0 else "lower"
        parts.append(
            f"{_quote(r.group_a)} is {word} by "
            f"{an.units(format_measure(abs(r.difference), an.precision.mean))} ({format_p(r.p)})"
        )
    text = lead + "; ".join(parts) + "."
    if quiet:
        text += " " + _names(quiet) + (" is" if len(quiet) == 1 else " are") + " not shown to differ."
    return [text]


def _unequal_lines(an: ReportContext, gh: PairwiseResult | Unavailable) -> list[str]:
    """The Games–Howell reading of the pairs, when the spreads look unequal but the pooled
    comparisons are read."""
    lead = ("The group spreads look unequal, so the Games–Howell comparisons (which do not "
            "pool the variances) are the safer reading of pairs")
    if isinstance(gh, Unavailable):
        return [f"{lead}, but they could not run: {gh.reason}."]
    hits = _hits(gh)
    if not hits:
        return [f"{lead}: by them no pair of groups differs clearly (alpha = {_alpha(an.alpha)})."]
    return [f"{lead}: by them {_count_phrase(len(hits), len(gh.rows))} (intervals: {gh.interval}):",
            *_listed(an, hits)]


def _names(labels: list[str]) -> str:
    q = [_quote(x) for x in labels]
    if len(q) <= 2:
        return " and ".join(q)
    return ", ".join(q[:-1]) + " and " + q[-1]


def _size_section(an: ReportContext, verdict: str) -> tuple[str, ...]:
    out: list[str] = []
    desc = an.describe
    means = [(s.mean, s.label) for s in desc]
    lo_m, lo_l = min(means)
    hi_m, hi_l = max(means)
    dec = an.precision.mean
    out.append(
        f"The group means run from {format_measure(lo_m, dec)} ({_quote(lo_l)}) to "
        f"{format_measure(hi_m, dec)} ({_quote(hi_l)}): a spread of "
        f"{an.units(format_measure(hi_m - lo_m, dec))}."
    )
    eff = an.effects
    if isinstance(eff, Unavailable):
        out.append(f"Effect sizes could not be computed: {eff.reason}.")
        return tuple(out)
    eta = eff.eta_squared
    e_lo, e_hi = eff.eta_squared_ci
    cl = f"{an.conf:.0%}"
    out.append(
        f"{an.factor} accounts for {percent_words(eta)} of the variation in {an.response} "
        f"(η² = {format_number(eta, 3)}, {cl} interval {format_number(e_lo, 3)} to "
        f"{format_number(e_hi, 3)}; ω² = {format_number(eff.omega_squared, 3)}, which corrects "
        "η²'s upward bias)."
    )
    f = eff.cohens_f
    out.append(
        f"Cohen's f = {format_number(f, 2)}: {effect_label(f)} by Cohen's (1988) conventions "
        "(0.10 small, 0.25 medium, 0.40 large). These are conventions, not a judgement of "
        "practical importance: compare the differences with your specification or tolerance."
    )
    if an.checks.variances_unequal:
        out.append(
            "These effect sizes come from the one-way table, which pools the group spreads; with "
            "spreads as unequal as here they describe the data less well: judge the size of the "
            "effect mainly by the differences between the means, in the response's own units."
        )
    if verdict != "differs":
        out.append(
            f"The interval for η² reaches {format_number(e_hi, 3)}: an effect of that size is "
            "not ruled out by these data; more observations would narrow it."
        )
    return tuple(out)


def percent_words(x: float) -> str:
    """A share in words: ``about 25%``, ``less than 1%``, ``an undefined share``."""
    if math.isnan(x):
        return "an undefined share"
    if 0 < x < 0.005:
        return "less than 1%"
    return f"about {x:.0%}"


def _read_section(an: ReportContext, read: str) -> tuple[str, ...]:
    names = {
        "oneway": "the one-way F test",
        "welch": "Welch's test (it does not assume equal variances)",
        "kruskal": "the Kruskal–Wallis rank test, alongside the one-way F test",
    }
    out = [f"Read {names[read]}. The checks behind that choice:"]
    out.extend("• " + r for r in an.checks.reasons)
    if read != an.checks.read:
        out.append(
            "• The checks point to a test that could not run on these data, so the one-way F "
            "test is read; its p-value may mislead."
        )
    if an.checks.caution:
        out.append(an.checks.caution)
    return tuple(out)


_READ_NAMES = {"oneway": "the one-way F test", "welch": "Welch's test",
               "kruskal": "the Kruskal–Wallis rank test"}


def _input_notes(g: Groups) -> tuple[list[str], tuple[str, ...]]:
    """Notes on the groups as read (case typos, renames and drops, input cells not used);
    rows that stayed in a database have none: what was left out is in the data-read lines."""
    notes: list[str] = []
    typos = tuple("Possible typo: " + n for n in g.case_notes)
    if typos:
        notes.append(
            f"Labels that differ only in case are kept as separate groups ({len(typos)} possible "
            f"typo{'' if len(typos) == 1 else 's'}, listed under the answer above)."
        )
    notes += [n[:1].upper() + n[1:] + "." for n in g.notes if n not in g.case_notes]  # renames, drops
    ignored = [c for c in g.cells if c.action == "ignored"]
    if ignored:
        kinds: dict[str, int] = {}
        for c in ignored:
            kinds[c.kind] = kinds.get(c.kind, 0) + 1
        what = ", ".join(f"{n} {k}" for k, n in sorted(kinds.items()))
        notes.append(
            f"{len(ignored)} input cell{'s were' if len(ignored) != 1 else ' was'} not used ({what}), "
            "as the spreadsheet's own statistics functions skip them; each is listed with its "
            "address on the Data sheet."
        )
    return notes, typos


def _data_notes(an: ReportContext, read: str = "oneway") -> tuple[tuple[str, ...], tuple[str, ...]]:
    """(notes, possible-typo notes). The typo notes are shown once, under the answer; the notes
    only point to them."""
    g = an.groups
    notes, typos = _input_notes(g) if g is not None else ([], ())
    ones = [s.label for s in an.describe if s.n == 1]
    if ones:
        notes.append(
            f"{_names(ones)} {'has' if len(ones) == 1 else 'have'} a single value: no SD or "
            "interval for the mean can be given there."
        )
    for res in (an.welch, an.kruskal, an.effects, an.pairwise, an.letters, an.dunnett):
        if isinstance(res, Unavailable):
            notes.append(f"{res.what[:1].upper() + res.what[1:]} not available: {res.reason}.")
    eff = an.effects
    if not isinstance(eff, Unavailable):
        eff_notes = [n for n in eff.notes if n]
        if read == "oneway":
            notes.extend(sentence(n) for n in eff_notes)
        else:
            # the effect sizes come from the one-way table: say so when another result is read
            if eff_notes:
                notes.append(
                    f"About the effect sizes, which come from the one-way table and not from "
                    f"{_READ_NAMES[read]} (the result read here), so they describe the one-way "
                    "analysis only: " + " ".join(sentence(n) for n in eff_notes)
                )
    if an.exact and g is None:
        notes.append(
            "Sums of squares were computed exactly from whole-number sums taken inside the "
            "database for the decimal value of every row, and rounded once (decimal-exact path)."
        )
    elif an.exact:
        notes.append(
            "Sums of squares were computed exactly for the decimal value of every cell and "
            "rounded once (decimal-exact path)."
        )
    else:
        notes.append(
            "Some values have more than 15 significant digits (typically formula results), so the "
            "accurate floating-point path was used instead of the decimal-exact one."
        )
    return tuple(notes), typos


def _key_figures(an: ReportContext) -> tuple[KeyFigure, ...]:
    ow = an.oneway
    a = an.alpha
    rows: list[KeyFigure] = []

    def reading(p: float) -> str:
        return f"below alpha = {_alpha(a)}" if p < a else f"not below alpha = {_alpha(a)}"

    rows.append(("Values, groups", ow.n_total, f"{ow.k} groups", None, ""))
    rows.append((f"One-way F ({an.factor})", ow.f, f"{ow.df_between}, {ow.df_within}", ow.p, reading(ow.p)))
    w = an.welch
    if isinstance(w, Unavailable):
        rows.append(("Welch F", None, None, None, "not available: " + w.reason))
    else:
        rows.append(("Welch F", w.statistic, df_text(w.df1, w.df2), w.p, reading(w.p)))
    k = an.kruskal
    if isinstance(k, Unavailable):
        rows.append(("Kruskal–Wallis H", None, None, None, "not available: " + k.reason))
    else:
        rows.append(("Kruskal–Wallis H", k.statistic, str(k.df), k.p, reading(k.p)))
    eff = an.effects
    if not isinstance(eff, Unavailable):
        lo, hi = eff.eta_squared_ci
        rows.append(("η² (share of variation)", eff.eta_squared, None, None,
                     f"{an.conf:.0%} interval {format_number(lo, 3)} to {format_number(hi, 3)}"))
        rows.append(("Cohen's f", eff.cohens_f, None, None, effect_label(eff.cohens_f)))
    rows.append(("Residual SD", ow.residual_sd, None, None, "pooled within-group SD" + (f", in {an.unit}" if an.unit else "")))
    return tuple(rows)


def findings(an: ReportContext) -> Findings:
    """Work out the plain-words reading of ``an``."""
    verdict, read, headline = _headline(an)
    notes, typos = _data_notes(an, read)
    sections = (
        ("Which groups differ", _differ_section(an, verdict, read)),
        ("How large", _size_section(an, verdict)),
        ("Which result to read, and why", _read_section(an, read)),
        ("Notes on the data", notes),
        ("Cautions", tuple("• " + c for c in CAUTIONS)),
    )
    names = {"oneway": "One-way F", "welch": "Welch", "kruskal": "Kruskal–Wallis alongside the one-way F"}
    return Findings(
        verdict=verdict, read=read, read_name=names[read], headline=headline,
        sections=sections, key_figures=_key_figures(an), typo_notes=typos,
        data_read=data_read_lines(an),
    )
