"""The Findings sheet: the answer, the key figures and the plain-words sections, in that order.

The words come from :func:`sheetfuncs.report.findings.findings`; this module only lays them out.
"""

from __future__ import annotations

from ..context import ReportContext
from ..findings import Findings, KeyFigure
from ..grid import Grid, Style
from .styles import (
    ANSWER_FILL, HEADING, INT_STYLE, MARK_FONT, NOTE, P_STYLE, TEXT, TH, finish_rules, put_title,
    stat_style,
)

__all__ = ["build_findings"]

#: The Findings sheet's text spans columns A to E.
_WIDE = 5


def build_findings(an: ReportContext, fi: Findings, written: str) -> Grid:
    """The Findings sheet of ``an``, whose words are ``fi``; ``written`` is the report's time."""
    g = Grid("Findings")
    g.widths = {1: 30.0, 2: 16.0, 3: 14.0, 4: 12.0, 5: 44.0}
    put_title(g, an.title, f"Findings · {an.oneway.n_total} values in {an.oneway.k} groups · "
              f"alpha = {an.alpha:g} · written {written}")
    r = _put_data_read(g, an, fi, 4)
    r = _put_answer(g, fi, r)
    r = _put_key_figures(g, an, fi.key_figures, r)
    for head, paras in fi.sections:
        g.put(r, 1, head, HEADING)
        r += 1
        for para in paras:
            st = NOTE if para.startswith("Pre-testing") else TEXT
            g.put(r, 1, para, st)
            g.merge(r, 1, r, _WIDE)
            r += 1
        r += 1
    g.put(r, 1, "Tables, Comparisons and Groups hold the full results; Audit recomputes the "
          "one-way figures with the spreadsheet's own functions; About lists the inputs, "
          "options and method references.", NOTE)
    g.merge(r, 1, r, _WIDE)
    g.freeze = "A3"
    finish_rules(g, an.alpha)
    return g


def _put_data_read(g: Grid, an: ReportContext, fi: Findings, r: int) -> int:
    """What was read and what was left out, before the answer; returns the next row. When
    block detection left cells out, the lines are marked for checking."""
    g.put(r, 1, "What was read", HEADING)
    r += 1
    check = an.reading is not None and an.reading.detected and bool(an.reading.left_out)
    for i, line in enumerate(fi.data_read):
        st = Style(bold=True, color=MARK_FONT, wrap=True, valign="top") if check and i == 1 else TEXT
        g.put(r, 1, line, st)
        g.merge(r, 1, r, _WIDE)
        r += 1
    return r + 1


def _put_answer(g: Grid, fi: Findings, r: int) -> int:
    """The answer (filled by its verdict) and the possible-typo notes; returns the next row."""
    g.put(r, 1, "The answer", HEADING)
    r += 1
    g.put(r, 1, fi.headline, Style(bold=True, size=12, wrap=True, valign="top", fill=ANSWER_FILL[fi.verdict]))
    g.merge(r, 1, r, _WIDE)
    r += 2
    for note in fi.typo_notes:
        g.put(r, 1, note, Style(bold=True, color=MARK_FONT, wrap=True, valign="top"))
        g.merge(r, 1, r, _WIDE)
        r += 1
    if fi.typo_notes:
        r += 1
    return r


def _put_key_figures(g: Grid, an: ReportContext, rows: tuple[KeyFigure, ...], r: int) -> int:
    """The key figures table (its p-values marked below alpha); returns the next row."""
    g.put(r, 1, "Key figures", HEADING)
    r += 1
    for j, h in enumerate(("Figure", "Value", "df", "p", "Reading")):
        g.put(r, 1 + j, h, TH.but(halign="right") if j in (1, 2, 3) else TH)
    first = r + 1
    for fig, val, df, p, reading in rows:
        r += 1
        g.put(r, 1, fig, Style(valign="top"))
        if val is not None:
            g.put(r, 2, val, _figure_style(an, fig, val))
        if df is not None:
            g.put(r, 3, df, Style(halign="right"))
        if p is not None:
            g.put(r, 4, p, P_STYLE)
        g.put(r, 5, reading, Style(wrap=True, valign="top"))
    g.conditional.append((f"D{first}:D{r}", None))
    return r + 2


def _figure_style(an: ReportContext, fig: str, val: float) -> Style:
    """A key figure's number format: counts whole, shares with three decimals, the residual SD
    as a mean, statistics with four significant digits."""
    if isinstance(val, int) and not isinstance(val, bool):
        return INT_STYLE
    if "η²" in fig or "Cohen" in fig:
        return Style(num="0.000")
    if fig.startswith("Residual"):
        return Style(num=an.precision.mean_format(val))
    return stat_style(val)
