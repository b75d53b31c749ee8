"""Builders of the report's small sheets: Findings, Tables, Comparisons, Groups, Chart, Audit, About.

Each builder lays one sheet out on a :class:`~._grid.Grid` from the results of
:func:`._analysis.analyse`; none computes a statistic. The Audit sheet holds formulas only: they
recompute n, SS, df, MS, F and p from the Data sheets with the host's own functions.
"""

from __future__ import annotations

import datetime as _dt
import math
import platform
from dataclasses import dataclass
from typing import Any

import numpy as np
from openpyxl.chart import LineChart, Reference, ScatterChart, Series
from openpyxl.chart.data_source import NumDataSource, NumRef
from openpyxl.chart.error_bar import ErrorBars
from openpyxl.chart.layout import Layout, ManualLayout
from openpyxl.chart.shapes import GraphicalProperties
from openpyxl.formatting.rule import CellIsRule, FormulaRule
from openpyxl.styles import Font, PatternFill
from openpyxl.utils import get_column_letter

from ...stats import Unavailable
from ..context import ReportContext
from ..findings import CAUTIONS, Findings
from ..formats import P_FORMAT, Precision, fixed, format_measure, sig_decimals
from ..grid import Formula, Grid, Style, quote_sheet, safe_text

__all__ = [
    "DataLayout", "Segment", "NAMES", "build_findings", "build_tables", "build_comparisons",
    "build_groups", "build_chart", "build_audit", "build_about", "p_rule",
]

# ---------------------------------------------------------------------------------------------
# look

NAVY = "1F3864"
GREY = "595959"
TITLE = Style(bold=True, size=15, color=NAVY)
SUBTITLE = Style(italic=True, color=GREY)
HEADING = Style(bold=True, size=12, color=NAVY, rule_below=True)
TH = Style(bold=True, fill="D9E1F2", rule_below=True, wrap=True, valign="bottom")
TEXT = Style(wrap=True, valign="top")
NOTE = Style(italic=True, color=GREY, wrap=True, valign="top")
BOLD = Style(bold=True)
KEY = Style(bold=True, valign="top")
ANSWER_FILL = {"differs": "E2EFDA", "no difference": "EDEDED", "unsettled": "FFF2CC"}
MARK_FILL = "FCE4D6"
MARK_FONT = "9C0006"

#: The workbook-level names of the key figures (Tables) and of their Audit twins.
NAMES = ("ss_between", "ss_within", "df_between", "df_within", "f_ratio", "p_value")

P_STYLE = Style(num=P_FORMAT, halign="right")
INT_STYLE = Style(num="0")


def p_rule(alpha: float, first_cell: str) -> FormulaRule:
    """Conditional format that marks p-values below alpha in a range whose top-left cell is
    ``first_cell``. Only numbers are marked: blank cells and texts such as "undefined" never are."""
    return FormulaRule(
        formula=[f"AND(ISNUMBER({first_cell}),{first_cell}<{float(alpha)!r})"],
        fill=PatternFill("solid", start_color=MARK_FILL, end_color=MARK_FILL),
        font=Font(bold=True, color=MARK_FONT),
    )


def _yes_rule(word: str) -> CellIsRule:
    return CellIsRule(
        operator="equal", formula=[f'"{word}"'],
        fill=PatternFill("solid", start_color=MARK_FILL, end_color=MARK_FILL),
        font=Font(bold=True, color=MARK_FONT),
    )


def _df_style(v: Any) -> Style:
    if isinstance(v, (int, np.integer)) or (isinstance(v, float) and v.is_integer()):
        return INT_STYLE
    return Style(num="0.00")


def _stat_style(v: Any) -> Style:
    if isinstance(v, (int, np.integer)) and not isinstance(v, bool):
        return INT_STYLE
    if isinstance(v, (int, float)) and not isinstance(v, bool) and math.isfinite(float(v)):
        if v != 0 and abs(v) < 1e-4:
            return Style(num="0.000E+00")
        return Style(num=fixed(sig_decimals(float(v))))
    return Style()


def _column_stat_format(values: list[Any]) -> str | None:
    """One format for a column of test statistics: four significant digits of its largest
    value, between two and four decimals (scientific when every value is tiny)."""
    finite = [abs(float(v)) for v in values
              if isinstance(v, (int, float, np.floating)) and not isinstance(v, bool) and math.isfinite(float(v))]
    if not finite:
        return None
    top = max(finite)
    if 0 < top < 1e-3:
        return "0.000E+00"
    return fixed(min(4, max(2, sig_decimals(top))))


def _kind_style(kind: str, v: Any, prec: Precision) -> Style:
    """The style of one table cell by the kind of its column."""
    if kind == "p":
        return P_STYLE
    if kind == "df":
        return _df_style(v)
    if kind == "n":
        return INT_STYLE
    if kind == "value":
        return Style(num=prec.value_format(v))
    if kind == "mean":
        return Style(num=prec.mean_format(v))
    if kind == "square":
        return Style(num=prec.square_format(v))
    if kind == "share":
        return Style(num="0.000")
    if kind == "stat":
        return _stat_style(v)
    if kind == "text":
        return TEXT
    if kind == "flag":
        return Style(halign="center")
    if kind == "label":
        return Style(valign="top")
    return Style()


def _header_kind(h: Any, overrides: dict[str, str] | None = None) -> str:
    s = str(h or "").strip()
    low = s.lower()
    if overrides and s in overrides:
        return overrides[s]
    if low in ("p", "p-value", "adjusted p", "p (adjusted)", "p adj", "p (adj.)") or low.startswith("p ("):
        return "p"
    if low in ("df", "df1", "df2") or low.startswith("df"):
        return "df"
    if low == "n":
        return "n"
    if low in ("differs", "letters"):
        return "flag"
    if low in ("ss", "ms"):
        return "square"
    if low in ("mean", "sd", "se", "difference", "median", "lower", "upper") or low.startswith(("ci low", "ci high")):
        return "mean"
    if low in ("min", "max"):
        return "value"
    if low in ("f", "statistic", "h", "w", "t", "q", "value"):
        return "stat"
    if low in ("reading", "note", "what it means", "interval"):
        return "text"
    return "label"


def _put_table(
    grid: Grid,
    top: int,
    table: list[list[Any]],
    prec: Precision,
    overrides: dict[str, str] | None = None,
    left: int = 1,
    bools: tuple[str, str] = ("yes", "no"),
    text_col: int | None = None,
) -> tuple[int, int, list[str]]:
    """Write a header-first table; returns (first body row, last body row, kinds per column).

    With ``text_col``, a last column of plain-words text is placed in that column, so that the
    tables of one sheet share one wide text column."""
    header = table[0]
    kinds = [_header_kind(h, overrides) for h in header]
    cols = [left + j for j in range(len(header))]
    if text_col is not None and kinds and kinds[-1] == "text" and cols[-1] < text_col:
        cols[-1] = text_col
    for j, h in enumerate(header):
        numeric = kinds[j] not in ("label", "text", "flag")
        align = "right" if numeric else ("center" if kinds[j] == "flag" else None)
        grid.put(top, cols[j], "" if h is None else str(h), TH.but(halign=align))
    stat_formats = {j: _column_stat_format([row[j] for row in table[1:] if j < len(row)])
                    for j, kind in enumerate(kinds) if kind == "stat"}
    r = top
    for r, row in enumerate(table[1:], top + 1):
        for j, v in enumerate(row):
            kind = kinds[j] if j < len(kinds) else "label"
            col = cols[j] if j < len(cols) else left + j
            if isinstance(v, (bool, np.bool_)):
                grid.put(r, col, bools[0] if v else bools[1], Style(halign="center", valign="top"))
                continue
            st = _kind_style(kind, v, prec)
            if j in stat_formats and stat_formats[j] and not isinstance(v, (int, np.integer)):
                st = Style(num=stat_formats[j])
            st = st.but(valign="top")
            if isinstance(v, str) and kind not in ("label", "text", "flag"):
                st = Style(halign="right")
            grid.put(r, col, v, st)
    first = top + 1
    last = max(r, top)
    for j, kind in enumerate(kinds):
        if kind == "p" and last >= first:
            col = get_column_letter(cols[j])
            grid.conditional.append((f"{col}{first}:{col}{last}", None))
    return first, last, kinds


def _finish_rules(grid: Grid, alpha: float) -> None:
    grid.conditional = [
        (rng, rule if rule is not None else p_rule(alpha, rng.split(":")[0])) for rng, rule in grid.conditional
    ]


def _title(grid: Grid, an: ReportContext, title: str, subtitle: str) -> None:
    grid.put(1, 1, title, TITLE)
    grid.put(2, 1, subtitle, SUBTITLE)


def _path_words(an: ReportContext) -> str:
    return "decimal-exact sums of squares" if an.exact else "floating-point sums of squares"


# ---------------------------------------------------------------------------------------------
# Data layout: where every group's values sit, shared by the Data, Chart and Audit builders


@dataclass(frozen=True)
class Segment:
    """Rows ``first..last`` (1-based, inclusive) of one Data sheet."""

    sheet: str
    first: int
    last: int

    def col(self, letter: str) -> str:
        return f"{quote_sheet(self.sheet)}!${letter}${self.first}:${letter}${self.last}"


@dataclass(frozen=True)
class DataLayout:
    """How the long-form data and the input-cell log are split over the Data sheets."""

    sheets: tuple[str, ...]
    row_limit: int
    n_values: int
    n_log: int
    group_segments: tuple[tuple[Segment, ...], ...]

    @property
    def capacity(self) -> int:
        return self.row_limit - 1  # row 1 of every Data sheet is the header

    @property
    def value_segments(self) -> tuple[Segment, ...]:
        """One segment per Data sheet that holds values."""
        out = []
        for i, name in enumerate(self.sheets):
            start = i * self.capacity
            count = min(self.capacity, self.n_values - start)
            if count > 0:
                out.append(Segment(name, 2, 1 + count))
        return tuple(out)

    @staticmethod
    def plan(counts: tuple[int, ...], n_log: int, row_limit: int) -> "DataLayout":
        if row_limit < 2:
            raise ValueError("a Data sheet needs room for a header and one row")
        cap = row_limit - 1
        n = int(sum(counts))
        rows = max(n, n_log, 1)
        n_sheets = -(-rows // cap)
        names = tuple("Data" if i == 0 else f"Data {i + 1}" for i in range(n_sheets))
        segs = []
        pos = 0
        for c in counts:
            parts = []
            start, end = pos, pos + c  # 0-based value indices [start, end)
            while start < end:
                s = start // cap
                stop = min(end, (s + 1) * cap)
                parts.append(Segment(names[s], 2 + start - s * cap, 1 + stop - s * cap))
                start = stop
            segs.append(tuple(parts))
            pos = end
        return DataLayout(names, row_limit, n, n_log, tuple(segs))


# ---------------------------------------------------------------------------------------------
# Findings


def build_findings(an: ReportContext, fi: Findings, written: str) -> Grid:
    g = Grid("Findings")
    g.widths = {1: 30.0, 2: 16.0, 3: 14.0, 4: 12.0, 5: 44.0}
    wide = 5
    _title(g, an, an.title, f"Findings · {an.oneway.n_total} values in {an.oneway.k} groups · "
           f"alpha = {an.alpha:g} · written {written}")
    r = 4
    g.put(r, 1, "The answer", HEADING)
    r += 1
    g.put(r, 1, fi.headline, Style(bold=True, size=12, wrap=True, valign="top", fill=ANSWER_FILL[fi.verdict]))
    g.merge(r, 1, r, wide)
    r += 2
    for note in fi.typo_notes:
        g.put(r, 1, note, Style(bold=True, color=MARK_FONT, wrap=True, valign="top"))
        g.merge(r, 1, r, wide)
        r += 1
    if fi.typo_notes:
        r += 1
    g.put(r, 1, "Key figures", HEADING)
    r += 1
    for j, h in enumerate(("Figure", "Value", "df", "p", "Reading")):
        g.put(r, 1 + j, h, TH.but(halign="right") if j in (1, 2, 3) else TH)
    first = r + 1
    for fig, val, df, p, reading in fi.key_figures:
        r += 1
        g.put(r, 1, fig, Style(valign="top"))
        if isinstance(val, int) and not isinstance(val, bool):
            g.put(r, 2, val, INT_STYLE)
        elif val is not None:
            if "η²" in fig or "Cohen" in fig:
                g.put(r, 2, val, Style(num="0.000"))
            elif fig.startswith("Residual"):
                g.put(r, 2, val, Style(num=an.precision.mean_format(val)))
            else:
                g.put(r, 2, val, _stat_style(val))
        if df is not None:
            g.put(r, 3, df, Style(halign="right"))
        if p is not None:
            g.put(r, 4, p, P_STYLE)
        g.put(r, 5, reading, Style(wrap=True, valign="top"))
    g.conditional.append((f"D{first}:D{r}", None))
    r += 2
    for head, paras in fi.sections:
        g.put(r, 1, head, HEADING)
        r += 1
        for para in paras:
            st = NOTE if para.startswith("Pre-testing") else TEXT
            g.put(r, 1, para, st)
            g.merge(r, 1, r, wide)
            r += 1
        r += 1
    g.put(r, 1, "Tables, Comparisons and Groups hold the full results; Audit recomputes the "
          "one-way figures with the spreadsheet's own functions; About lists the inputs, "
          "options and method references.", NOTE)
    g.merge(r, 1, r, wide)
    g.freeze = "A3"
    _finish_rules(g, an.alpha)
    return g


def _lines(text: str, per_line: float) -> int:
    return max(1, sum(max(1, math.ceil(len(part) / per_line)) for part in text.split("\n")))


# ---------------------------------------------------------------------------------------------
# Tables


@dataclass
class Positions:
    """Addresses of the key figures, for defined names and the Audit's comparisons."""

    cells: dict[str, str]


def build_tables(an: ReportContext) -> tuple[Grid, Positions]:
    g = Grid("Tables")
    prec = an.precision
    _title(g, an, f"Tables · {an.title}", f"alpha = {an.alpha:g} · {an.conf:.0%} intervals · {_path_words(an)}")
    pos: dict[str, str] = {}
    r = 4
    g.put(r, 1, "One-way analysis of variance", HEADING)
    r += 1
    table = an.oneway.table(an.factor)
    first, last, _ = _put_table(g, r, table, prec)
    g.put(first, 1, an.factor, Style(valign="top"))
    b = first  # the factor row
    w = first + 1  # the residual row
    pos.update(
        df_between=g.ref(b, 2), ss_between=g.ref(b, 3), ms_between=g.ref(b, 4), f_ratio=g.ref(b, 5),
        p_value=g.ref(b, 6), df_within=g.ref(w, 2), ss_within=g.ref(w, 3), ms_within=g.ref(w, 4),
        df_total=g.ref(w + 1, 2), ss_total=g.ref(w + 1, 3),
    )
    r = last + 1
    g.put(r, 1, f"F is referred to the F distribution on ({an.oneway.df_between}, "
          f"{an.oneway.df_within}) degrees of freedom; p is its upper tail. R² = "
          f"{an.oneway.r_squared:.4f}; residual SD = {format_measure(an.oneway.residual_sd, prec.mean)}.", NOTE)
    g.merge(r, 1, r, 7)
    r += 2

    g.put(r, 1, "Tests that do not assume equal variances or normal residuals", HEADING)
    r += 1
    rows: list[list[Any]] = [["Test", "Statistic", "df1", "df2", "p", "Reading"]]
    wl, kw = an.welch, an.kruskal
    if isinstance(wl, Unavailable):
        rows.append(["Welch F", None, None, None, None, "not available: " + wl.reason])
    else:
        rows.append(["Welch F", wl.statistic, wl.df1, wl.df2, wl.p, "does not assume equal variances"])
    if isinstance(kw, Unavailable):
        rows.append(["Kruskal–Wallis H", None, None, None, None, "not available: " + kw.reason])
    else:
        rows.append(["Kruskal–Wallis H", kw.statistic, kw.df, None, kw.p,
                     "ranks; does not assume normal residuals (chi-square approximation)"])
    first, last, _ = _put_table(g, r, rows, prec, text_col=7)
    if not isinstance(wl, Unavailable):
        pos["welch_p"] = g.ref(first, 5)
    if not isinstance(kw, Unavailable):
        pos["kruskal_p"] = g.ref(first + 1, 5)
    r = last + 2

    g.put(r, 1, "Effect sizes", HEADING)
    r += 1
    eff = an.effects
    if isinstance(eff, Unavailable):
        g.put(r, 1, "not available: " + eff.reason, NOTE)
        r += 2
    else:
        first, last, _ = _put_table(g, r, eff.table(), prec, {"Value": "share", "CI low": "share", "CI high": "share"},
                                    text_col=7)
        r = last + 2

    g.put(r, 1, "Assumption checks", HEADING)
    r += 1
    ct = an.checks.table()
    first, last, _ = _put_table(g, r, ct, prec, {"Statistic": "stat"}, text_col=7)
    r = last + 1
    for na, why in an.checks.not_available:
        g.put(r, 1, f"{na}: not available: {why}", NOTE)
        g.merge(r, 1, r, 7)
        r += 1
    g.widths = {1: 30.0, 2: 13.0, 3: 12.0, 4: 13.0, 5: 12.0, 6: 12.0, 7: 62.0}
    g.freeze = "A3"
    g.landscape = True
    _finish_rules(g, an.alpha)
    return g, Positions(pos)


# ---------------------------------------------------------------------------------------------
# Comparisons


def build_comparisons(an: ReportContext) -> Grid:
    g = Grid("Comparisons")
    prec = an.precision
    _title(g, an, f"Comparisons · {an.title}",
           f"alpha = {an.alpha:g} · Differs = adjusted p below alpha · difference = first group minus second")
    r = 4
    pw = an.pairwise
    g.put(r, 1, f"Pairwise comparisons: {an.method_name}", HEADING)
    r += 1
    if isinstance(pw, Unavailable):
        g.put(r, 1, "not available: " + pw.reason, NOTE)
        r += 2
    else:
        interval = getattr(pw, "interval", "")
        if interval:
            g.put(r, 1, f"Intervals: {interval}", NOTE)
            r += 1
        first, last, kinds = _put_table(g, r, pw.table(), prec)
        _mark_differs(g, pw.table()[0], first, last)
        r = last + 1
        for note in getattr(pw, "notes", ()) or ():
            g.put(r, 1, note, NOTE)
            g.merge(r, 1, r, 9)
            r += 1
        r += 1
    dn = an.dunnett
    if dn is not None:
        g.put(r, 1, f'Against the control "{an.control}": Dunnett', HEADING)
        r += 1
        if isinstance(dn, Unavailable):
            g.put(r, 1, "not available: " + dn.reason, NOTE)
            r += 2
        else:
            interval = getattr(dn, "interval", "")
            if interval:
                g.put(r, 1, f"Intervals: {interval}", NOTE)
                r += 1
            first, last, _ = _put_table(g, r, dn.table(), prec)
            _mark_differs(g, dn.table()[0], first, last)
            r = last + 2
    gh = an.unequal_pairs
    if gh is not None:
        g.put(r, 1, "Games–Howell comparisons (the group spreads look unequal)", HEADING)
        r += 1
        if isinstance(gh, Unavailable):
            g.put(r, 1, "not available: " + gh.reason, NOTE)
            r += 2
        else:
            g.put(r, 1, f"Shown because the checks find unequal spreads and {an.method_name} pools "
                  f"the variances. Intervals: {gh.interval}", NOTE)
            g.merge(r, 1, r, 9)
            r += 1
            first, last, _ = _put_table(g, r, gh.table(), prec)
            _mark_differs(g, gh.table()[0], first, last)
            r = last + 2
    let = an.letters
    g.put(r, 1, "Compact letter display", HEADING)
    r += 1
    if isinstance(let, Unavailable):
        g.put(r, 1, "not available: " + let.reason, NOTE)
        r += 1
    else:
        g.put(r, 1, f"Groups that share a letter are not shown to differ ({an.method_name}, "
              f"alpha = {an.alpha:g}); highest mean first.", NOTE)
        g.merge(r, 1, r, 6)
        r += 1
        first, last, _ = _put_table(g, r, let.table(), prec)
        r = last + 1
    g.auto_widths(minimum=10, maximum=28)
    for c in range(1, 3):
        g.widths[c] = max(g.widths.get(c, 0), 16.0)
    g.freeze = "A3"
    g.landscape = True
    _finish_rules(g, an.alpha)
    return g


def _mark_differs(g: Grid, header: list[Any], first: int, last: int) -> None:
    for j, h in enumerate(header):
        if str(h).strip().lower() in ("differs", "differs?", "different"):
            col = get_column_letter(1 + j)
            g.conditional.append((f"{col}{first}:{col}{last}", _yes_rule("yes")))


# ---------------------------------------------------------------------------------------------
# Groups


def build_groups(an: ReportContext) -> tuple[Grid, dict[str, Any]]:
    g = Grid("Groups")
    prec = an.precision
    unit = f" ({an.unit})" if an.unit else ""
    _title(g, an, f"Groups · {an.response}{unit} by {an.factor}",
           f"{an.conf:.0%} t intervals for each group's mean (SD with n − 1)")
    table = an.describe.table()
    table[0] = [an.factor] + list(table[0][1:])
    top = 4
    first, last, _ = _put_table(g, top, table, prec, {an.factor: "label"})
    r = last + 1
    ones = [s.label for s in an.describe if s.n == 1]
    if ones:
        g.put(r + 1, 1, "undefined: a group of one value has no SD, standard error or interval.", NOTE)
        g.merge(r + 1, 1, r + 1, 8)
    g.auto_widths(minimum=9, maximum=30)
    g.widths[1] = max(g.widths.get(1, 0), 16.0)
    g.freeze = "B5"
    g.print_rows = "4:4"
    return g, {"first": first, "last": last}


# ---------------------------------------------------------------------------------------------
# Chart

_DIRECT_LIMIT = 10_000
#: Above this many groups the values chart draws one series for all groups: the host allows
#: 255 series per chart (the means are one more series).
MAX_GROUP_SERIES = 250
_PLOTTED_PER_GROUP = 201


def build_chart(an: ReportContext, layout: DataLayout) -> Grid:
    g = Grid("Chart")
    prec = an.precision
    k = an.groups.k
    unit = f" ({an.unit})" if an.unit else ""
    _title(g, an, f"Chart · {an.response}{unit} by {an.factor}",
           f"Group means with {an.conf:.0%} t intervals, and the individual values")
    # helper table for the means chart, under the charts
    top = 43
    g.put(top - 1, 1, "Chart data: means and interval half-widths (from the Groups sheet)", HEADING)
    head = ["Position", an.factor, "Mean", "CI low", "CI high", "Minus", "Plus"]
    g.put_row(top, 1, head, TH)
    for i, s in enumerate(an.describe, start=1):
        r = top + i
        g.put(r, 1, i, INT_STYLE)
        g.put(r, 2, s.label)
        g.put(r, 3, s.mean, Style(num=prec.mean_format(s.mean)))
        if s.n > 1:
            for col, v in ((4, s.ci.low), (5, s.ci.high), (6, s.mean - s.ci.low), (7, s.ci.high - s.mean)):
                g.put(r, col, v, Style(num=prec.mean_format(v)))
        else:
            g.put(r, 4, math.nan)
            g.put(r, 5, math.nan)
            g.put(r, 6, 0.0, comment="one value: no interval, drawn without an error bar")
            g.put(r, 7, 0.0, comment="one value: no interval, drawn without an error bar")
    last = top + k

    line = LineChart()
    line.title = f"Group means with {an.conf:.0%} intervals"
    line.y_axis.title = safe_text(f"{an.response}{unit}")
    line.x_axis.title = safe_text(an.factor)
    line.legend = None
    ser = Series(Reference(_Ref(g.name), min_col=3, min_row=top + 1, max_row=last), title="Mean")
    _markers_only(ser, "circle", 8, NAVY)
    ser.errBars = ErrorBars(
        errDir="y", errBarType="both", errValType="cust", noEndCap=False,
        plus=NumDataSource(numRef=NumRef(f=f"{quote_sheet(g.name)}!$G${top + 1}:$G${last}")),
        minus=NumDataSource(numRef=NumRef(f=f"{quote_sheet(g.name)}!$F${top + 1}:$F${last}")),
    )
    line.series.append(ser)
    line.set_categories(Reference(_Ref(g.name), min_col=2, min_row=top + 1, max_row=last))
    _axes_visible(line)
    line.width, line.height = 17.0, 8.5
    g.charts.append((line, "A4"))

    scatter = ScatterChart()
    scatter.title = "Individual values, with the group means"
    scatter.scatterStyle = "lineMarker"
    scatter.y_axis.title = safe_text(f"{an.response}{unit}")
    scatter.x_axis.title = safe_text(f"{an.factor} (position 1 to {k}; see the table below)")
    scatter.x_axis.scaling.min = 0
    scatter.x_axis.scaling.max = k + 1
    scatter.x_axis.majorUnit = 1
    scatter.x_axis.number_format = f'[<0.5]"";[>{k + 0.5}]"";0'
    scatter.x_axis.majorGridlines = None
    note_row = 40
    col0 = 1
    vtop = last + 3
    g.put(vtop - 1, col0, "Chart data: plotted values", HEADING)
    g.put_row(vtop, col0, ["Position", "Plotted at", an.response], TH)
    sample = layout.n_values > _DIRECT_LIMIT
    vstyle = Style(num=prec.value_format())
    merged = k > MAX_GROUP_SERIES  # one series per group would pass the host's series limit
    r = vtop
    for i, arr in enumerate(an.groups.arrays, start=1):
        pts = np.sort(arr)
        if sample and pts.size > _PLOTTED_PER_GROUP:
            pts = pts[np.round(np.linspace(0, pts.size - 1, _PLOTTED_PER_GROUP)).astype(int)]
        r0 = r + 1
        for j, v in enumerate(pts.tolist()):
            r += 1
            g.put(r, col0, i, INT_STYLE)
            g.put(r, col0 + 1, i + _LANES[j % len(_LANES)], Style(num="0.00"))
            g.put(r, col0 + 2, v, vstyle)
        if merged:
            continue
        ser = Series(Reference(_Ref(g.name), min_col=col0 + 2, min_row=r0, max_row=r),
                     Reference(_Ref(g.name), min_col=col0 + 1, min_row=r0, max_row=r),
                     title=safe_text(an.groups.labels[i - 1]))
        _markers_only(ser, "circle", 5, _PALETTE[(i - 1) % len(_PALETTE)])
        scatter.series.append(ser)
    if merged:
        ser = Series(Reference(_Ref(g.name), min_col=col0 + 2, min_row=vtop + 1, max_row=r),
                     Reference(_Ref(g.name), min_col=col0 + 1, min_row=vtop + 1, max_row=r),
                     title="Values")
        _markers_only(ser, "circle", 4, _PALETTE[0])
        scatter.series.append(ser)
    if sample:
        g.put(note_row, 1, f"The values chart plots, for groups of more than {_PLOTTED_PER_GROUP} "
              f"values, {_PLOTTED_PER_GROUP} evenly spaced order statistics (smallest to largest); "
              "every value is on the Data sheet. Points are spread sideways so that equal values "
              "stay visible.", NOTE)
    else:
        g.put(note_row, 1, "The values chart plots every value (a copy of the Data sheet's values, "
              "sorted within each group and spread sideways so that equal values stay visible).", NOTE)
    if merged:
        g.put(note_row + 1, 1, f"With {k} groups the values chart draws all groups as one series "
              f"(one colour): spreadsheet programs allow at most 255 series in a chart, so one "
              f"series per group is drawn only up to {MAX_GROUP_SERIES} groups.", NOTE)
        g.merge(note_row + 1, 1, note_row + 1, 8)
    g.merge(note_row, 1, note_row, 8)
    means = Series(Reference(_Ref(g.name), min_col=3, min_row=top + 1, max_row=last),
                   Reference(_Ref(g.name), min_col=1, min_row=top + 1, max_row=last), title="Mean")
    _markers_only(means, "dash", 16, "000000")
    scatter.series.append(means)
    _axes_visible(scatter)
    scatter.width, scatter.height = 17.0, 8.5
    g.charts.append((scatter, "A22"))
    g.widths = {1: 10.0, 2: 18.0, 3: 14.0, 4: 12.0, 5: 12.0, 6: 10.0, 7: 10.0}
    g.freeze = None
    return g


_LANES = (-0.16, -0.08, 0.0, 0.08, 0.16)
_PALETTE = ("4472C4", "ED7D31", "70AD47", "7F6000", "5B9BD5", "C00000", "7030A0", "264478",
            "9E480E", "43682B")


class _Ref:
    """A stand-in worksheet for ``openpyxl.chart.Reference`` (it needs only a title)."""

    def __init__(self, title: str) -> None:
        self.title = title


def _axes_visible(chart: Any) -> None:
    for ax in (chart.x_axis, chart.y_axis):
        try:
            ax.delete = False
        except AttributeError:
            pass
    chart.layout = Layout(manualLayout=ManualLayout(x=0.02, y=0.02, w=0.96, h=0.9))
    chart.layout = None


def _markers_only(s: Series, symbol: str, size: int, color: str) -> None:
    s.marker.symbol = symbol
    s.marker.size = size
    s.marker.graphicalProperties = GraphicalProperties(solidFill=color)
    s.marker.graphicalProperties.line.solidFill = color
    s.graphicalProperties.line.noFill = True
    s.smooth = False


# ---------------------------------------------------------------------------------------------
# Audit


def build_audit(an: ReportContext, layout: DataLayout, tables: Positions) -> tuple[Grid, dict[str, str]]:
    g = Grid("Audit")
    prec = an.precision
    k = an.groups.k
    vsegs = layout.value_segments
    _title(g, an, "Audit · the one-way figures recomputed by the spreadsheet's own functions",
           "Every figure in column B is a formula over the Data sheet"
           + ("s" if len(layout.sheets) > 1 else "") + "; nothing here is typed in.")
    g.put(3, 1, (
        "Column D of the Data sheet holds each value minus the centring constant below, written "
        "as the exact decimal difference, so that the spreadsheet's floating-point arithmetic "
        "reproduces the exact figures even when the values share many leading digits. "
        "'agrees' means within 1e-9 relative of the Tables sheet, or, for a figure near 0, within "
        "a floor set by the figures' scale: 1e-9 of SS total for sums of squares, 1e-9 of the "
        "larger mean square for mean squares, 1e-9 for F and 1e-12 for p (equal group means give "
        "SS between = 0, which floating-point sums reproduce only to rounding noise)."
    ), NOTE)
    g.merge(3, 1, 3, 7)
    g.put(5, 1, "Centring constant", KEY)
    g.put(5, 2, float(an.centre), Style(num=fixed(max(0, -an.centre.as_tuple().exponent))))
    g.put(5, 3, f"exactly {an.centre:f}", NOTE)
    c_ref = "$B$5"
    top = 7
    g.put_row(top, 1, ["Group no.", an.factor, "n", "Mean (centred)", "Mean", "SS within group"], TH)
    summaries = list(an.describe)
    for i, label in enumerate(an.groups.labels, start=1):
        r = top + i
        g.put(r, 1, i, INT_STYLE)
        g.put(r, 2, label)
        n_f = "+".join(f"COUNTIF({s.col('A')},$A{r})" for s in vsegs)
        s_f = "+".join(f"SUMIF({s.col('A')},$A{r},{s.col('D')})" for s in vsegs)
        q_f = "+".join(f"SUMPRODUCT(({s.col('A')}=$A{r})*({s.col('D')}-$D{r})^2)" for s in vsegs)
        s_i = summaries[i - 1]
        ss_i = float(s_i.sd) ** 2 * (s_i.n - 1) if s_i.n > 1 else 0.0
        g.put(r, 3, Formula(f"={n_f}"), INT_STYLE)
        g.put(r, 4, Formula(f"=({s_f})/C{r}"), Style(num=prec.mean_format(s_i.mean - float(an.centre))))
        g.put(r, 5, Formula(f"={c_ref}+D{r}"), Style(num=prec.mean_format(s_i.mean)))
        g.put(r, 6, Formula(f"={q_f}"), Style(num=prec.square_format(ss_i)))
    g1, gk = top + 1, top + k
    r = gk + 2
    g.put_row(r, 1, ["Quantity", "Recomputed", "Tables", "Relative difference", "Check"], TH)
    g.put(r, 7, "Formula in words", TH)
    d_all = ",".join(s.col("D") for s in vsegs)
    ow = an.oneway
    grand = (sum(float(s_.mean) * s_.n for s_ in an.describe) / ow.n_total) - float(an.centre)
    rows: dict[str, int] = {}
    spec = [
        ("n", "Values (n)", f"=COUNT({d_all})", None, "COUNT of the centred values", INT_STYLE),
        ("k", "Groups (k)", f'=COUNTIF(C{g1}:C{gk},">0")', None, "groups with values", INT_STYLE),
        ("grand", "Grand mean (centred)", f"=SUM({d_all})/B{{n}}", None, "SUM / n", Style(num=prec.mean_format(grand))),
        ("ss_between", "SS between", f"=SUMPRODUCT(C{g1}:C{gk},(D{g1}:D{gk}-B{{grand}})^2)", "ss_between",
         "Σ n·(group mean − grand mean)²", Style(num=prec.square_format(ow.ss_between))),
        ("ss_within", "SS within (residual)", f"=SUM(F{g1}:F{gk})", "ss_within",
         "Σ of the groups' SUMPRODUCT of squared deviations", Style(num=prec.square_format(ow.ss_within))),
        ("ss_total", "SS total", f"=DEVSQ({d_all})", "ss_total", "DEVSQ of all centred values",
         Style(num=prec.square_format(ow.ss_total))),
        ("df_between", "df between", "=B{k}-1", "df_between", "k − 1", INT_STYLE),
        ("df_within", "df within", "=B{n}-B{k}", "df_within", "n − k", INT_STYLE),
        ("ms_between", "MS between", "=B{ss_between}/B{df_between}", "ms_between", "SS / df",
         Style(num=prec.square_format(ow.ms_between))),
        ("ms_within", "MS within", "=B{ss_within}/B{df_within}", "ms_within", "SS / df",
         Style(num=prec.square_format(ow.ms_within))),
        ("f_ratio", "F", '=IF(B{ms_within}=0,"infinite",B{ms_between}/B{ms_within})', "f_ratio",
         "MS between / MS within", _stat_style(an.oneway.f)),
        ("p_value", "p", "=IF(ISNUMBER(B{f_ratio}),_xlfn.F.DIST.RT(B{f_ratio},B{df_between},B{df_within}),0)",
         "p_value", "F.DIST.RT(F, df between, df within)", P_STYLE),
    ]
    for j, (key, _, _, _, _, _) in enumerate(spec, start=1):
        rows[key] = r + j
    audit_refs: dict[str, str] = {}
    for key, label, formula, twin, words, style in spec:
        rr = rows[key]
        g.put(rr, 1, label)
        g.put(rr, 2, Formula(formula.format(**rows)), style)
        if key in ("n",):
            g.put(rr, 3, an.oneway.n_total, INT_STYLE)
        elif key == "k":
            g.put(rr, 3, k, INT_STYLE)
        elif twin is not None and twin in tables.cells:
            ref = twin if twin in NAMES else tables.cells[twin]
            g.put(rr, 3, Formula(f"={ref}"), style)
        if key not in ("grand",):
            tol = _audit_floor(key, rows)
            g.put(rr, 4, Formula(
                f'=IF(AND(ISNUMBER(B{rr}),ISNUMBER(C{rr})),IF(C{rr}=0,ABS(B{rr}-C{rr}),'
                f'ABS(B{rr}-C{rr})/ABS(C{rr})),"")'), Style(num="0.0E+00"))
            g.put(rr, 5, Formula(
                f'=IF(AND(ISNUMBER(B{rr}),ISNUMBER(C{rr})),IF(ABS(B{rr}-C{rr})<=MAX(1E-9*ABS(C{rr}),{tol}),'
                f'"agrees","differs"),IF(B{rr}&""=C{rr}&"","agrees","differs"))'), Style(halign="center"))
        g.put(rr, 7, words, NOTE)
        audit_refs[key] = g.ref(rr, 2)
    last = rows["p_value"]
    g.conditional.append((f"E{rows['n']}:E{last}", _yes_rule("differs")))
    r = last + 2
    g.put(r, 1, "Data ranges used: " + "; ".join(
        f"{s.sheet} rows {s.first}–{s.last}" for s in vsegs), NOTE)
    g.merge(r, 1, r, 7)
    g.widths = {1: 22.0, 2: 20.0, 3: 20.0, 4: 16.0, 5: 16.0, 6: 16.0, 7: 46.0}
    g.freeze = "A3"
    g.landscape = True
    _finish_rules(g, an.alpha)
    return g, audit_refs


def _audit_floor(key: str, rows: dict[str, int]) -> str:
    """The absolute part of an Audit check's tolerance (a formula over the Tables twins in column
    C): figures that are exactly 0 in Python are reproduced by the host's floating-point sums only
    to rounding noise at the scale of the whole analysis, so they are compared at that scale."""
    if key in ("ss_between", "ss_within", "ss_total"):
        return f"1E-9*ABS(C{rows['ss_total']})"
    if key in ("ms_between", "ms_within"):
        return f"1E-9*MAX(ABS(C{rows['ms_between']}),ABS(C{rows['ms_within']}))"
    if key == "f_ratio":
        return "1E-9"
    if key == "p_value":
        return "1E-12"
    return "0"


# ---------------------------------------------------------------------------------------------
# About

REFERENCES = {
    "oneway": "One-way analysis of variance: Fisher, R. A. (1925), Statistical Methods for Research "
              "Workers; e.g. Montgomery, D. C., Design and ReportContext of Experiments, ch. 3.",
    "fdist": "F upper tail from the regularised incomplete beta function: Abramowitz & Stegun (1964), 26.6.2.",
    "t": "t intervals for group means: NIST/SEMATECH e-Handbook of Statistical Methods, 7.2.2.1.",
    "welch": "Welch, B. L. (1951), Biometrika 38, 330–336.",
    "kruskal": "Kruskal, W. H. & Wallis, W. A. (1952), Journal of the American Statistical Association 47, 583–621.",
    "levene": "Levene, H. (1960), in Contributions to Probability and Statistics, 278–292; median-centred form: "
              "Brown, M. B. & Forsythe, A. B. (1974), JASA 69, 364–367.",
    "bartlett": "Bartlett, M. S. (1937), Proceedings of the Royal Society A 160, 268–282.",
    "normality": "Shapiro, S. S. & Wilk, M. B. (1965), Biometrika 52, 591–611 (Royston's 1995 approximation); "
                 "above 5,000 residuals D'Agostino, R. B. & Pearson, E. S. (1973), Biometrika 60, 613–622.",
    "effects": "Effect sizes and their intervals: Cohen, J. (1988), Statistical Power ReportContext for the Behavioral "
               "Sciences; Steiger, J. H. (2004), Psychological Methods 9, 164–182; Smithson, M. (2003), "
               "Confidence Intervals.",
    "tukey": "Tukey, J. W. (1953), The Problem of Multiple Comparisons; Kramer, C. Y. (1956), Biometrics 12, 307–310.",
    "games-howell": "Games, P. A. & Howell, J. F. (1976), Journal of Educational Statistics 1, 113–125.",
    "bonferroni": "Bonferroni adjustment: e.g. Dunn, O. J. (1961), JASA 56, 52–64.",
    "holm": "Holm, S. (1979), Scandinavian Journal of Statistics 6, 65–70.",
    "sidak": "Šidák, Z. (1967), JASA 62, 626–633.",
    "scheffe": "Scheffé, H. (1953), Biometrika 40, 87–104.",
    "dunnett": "Dunnett, C. W. (1955), JASA 50, 1096–1121.",
    "letters": "Compact letter display: Piepho, H.-P. (2004), Journal of Computational and Graphical Statistics 13, 456–466.",
}


def build_about(an: ReportContext, *, source: Any, written: str, version: str, data_sheets: tuple[str, ...]) -> Grid:
    g = Grid("About")
    _title(g, an, "About this report", "Inputs, options, software and the methods behind every figure")
    r = 4
    gr = an.groups

    def section(title: str) -> None:
        nonlocal r
        g.put(r, 1, title, HEADING)
        r += 1

    def item(key: str, value: Any, style: Style = TEXT) -> None:
        nonlocal r
        g.put(r, 1, key, KEY)
        g.put(r, 2, value, style)
        if isinstance(value, str):
            g.merge(r, 2, r, 4)
        r += 1

    section("Input")
    if source is not None and getattr(source, "path", None):
        item("File", str(source.path))
        if getattr(source, "sheet", None):
            item("Sheet", str(source.sheet))
        item("First cell of the range", source.address(0, 0) if hasattr(source, "address") else "A1")
    else:
        item("Source", "data passed from Python (no file)")
    item("Layout", {"wide": "wide (one group per column)", "long": "long (label and value columns)",
                    "rowwise": "one group per row", "python": "Python sequences"}.get(gr.layout, gr.layout))
    item("Labels", {"range": "read from the range", "default": "numbered (Group 1, Group 2, …)",
                    "given": "given with the data"}.get(gr.label_source, gr.label_source))
    left_int = INT_STYLE.but(halign="left")
    item("Groups", gr.k, left_int)
    item("Values used", gr.n_total, left_int)
    item("Input cells not used", len(gr.cells), left_int)
    item("Data sheets", ", ".join(data_sheets))
    r += 1
    section("Options")
    item("alpha (significance level)", an.alpha, Style(num="0.####", halign="left"))
    item("Confidence level of intervals", an.conf, Style(num="0.##%", halign="left"))
    item("Pairwise method", an.method_name)
    item("Control group (Dunnett)", an.control if an.control is not None else "none")
    item("Factor", an.factor)
    item("Response", an.response)
    item("Unit", an.unit or "none given")
    item("Title", an.title)
    r += 1
    section("Software and arithmetic")
    item("sheetfuncs version", version)
    item("Python, numpy, scipy, openpyxl", _versions())
    item("Written (UTC)", written)
    if an.exact:
        item("Arithmetic", "decimal-exact path: every value was read as its shortest decimal; counts, "
             "sums and sums of squares were accumulated exactly as integers and the sums of "
             f"squares rounded once at the end (the data carry {an.moments.scale} decimal"
             f"{'' if an.moments.scale == 1 else 's'}).")
    else:
        item("Arithmetic", "floating-point path: some values have more than 15 significant digits "
             "(typically formula results); per-group two-pass sums of squares with the "
             "corrected-sum term.")
    item("Centring constant (Audit)", f"{an.centre:f}")
    item("p-values", "upper tails from survival functions (never 1 − cdf), accurate far into the tail")
    r += 1
    section("Method references")
    keys = ["oneway", "fdist", "t", "welch", "kruskal", "levene", "bartlett", "normality", "effects",
            an.method]
    if an.control is not None:
        keys.append("dunnett")
    keys.append("letters")
    for key in dict.fromkeys(keys):
        g.put(r, 1, "•", Style(halign="right", valign="top"))
        g.put(r, 2, REFERENCES[key], TEXT)
        g.merge(r, 2, r, 4)
        r += 1
    r += 1
    section("Cautions")
    for c in CAUTIONS:
        g.put(r, 1, "•", Style(halign="right", valign="top"))
        g.put(r, 2, c, TEXT)
        g.merge(r, 2, r, 4)
        r += 1
    g.widths = {1: 32.0, 2: 40.0, 3: 30.0, 4: 30.0}
    g.freeze = "A3"
    return g


def _versions() -> str:
    import openpyxl
    import scipy

    return f"Python {platform.python_version()}, numpy {np.__version__}, scipy {scipy.__version__}, openpyxl {openpyxl.__version__}"


def timestamp() -> str:
    return _dt.datetime.now(_dt.timezone.utc).replace(microsecond=0).strftime("%Y-%m-%d %H:%M:%S UTC")
