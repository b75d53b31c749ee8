"""The Audit sheet: formulas only, which recompute n, SS, df, MS, F and p from the Data sheets
with the host's own functions (COUNT, COUNTIF, SUMIF, SUMPRODUCT, DEVSQ, F.DIST.RT), each beside
its Tables figure with the relative difference and a check that says ``agrees`` or ``differs``.

The formulas work on the Data sheets' centred values (each value minus the centring constant,
as the exact decimal difference), so that the host's floating-point sums reproduce the exact
figures; see ``docs/report.md``.
"""

from __future__ import annotations

from dataclasses import dataclass

from ..context import ReportContext
from ..formats import fixed
from ..grid import Formula, Grid, Style
from .data_layout import DataLayout, Segment
from .styles import INT_STYLE, KEY, NOTE, P_STYLE, TH, finish_rules, put_title, stat_style, yes_rule
from .sums import SumsColumns
from .tables import NAMES, Positions

__all__ = ["build_audit"]

#: The header row of the per-group table; the groups follow it.
_TOP = 7
#: The cell of the centring constant.
_CENTRE = "$B$5"
_INTRO = (
    "Column D of the Data sheet holds each value minus the centring constant below, written "
    "as the exact decimal difference, so that the spreadsheet's floating-point arithmetic "
    "reproduces the exact figures even when the values share many leading digits. "
    "'agrees' means within 1e-9 relative of the Tables sheet, or, for a figure near 0, within "
    "a floor set by the figures' scale: 1e-9 of SS total for sums of squares, 1e-9 of the "
    "larger mean square for mean squares, 1e-9 for F and 1e-12 for p (equal group means give "
    "SS between = 0, which floating-point sums reproduce only to rounding noise)."
)

_SUMS_INTRO = (
    "The values stayed in the database; the Sums sheet holds each group's n and exact sums, "
    "and its mean and sum of squares formed from them. The formulas below recompute the "
    "one-way figures from those with the spreadsheet's own functions. 'agrees' means within "
    "1e-9 relative of the Tables sheet, or, for a figure near 0, within a floor set by the "
    "figures' scale: 1e-9 of SS total for sums of squares, 1e-9 of the larger mean square for "
    "mean squares, 1e-9 for F and 1e-12 for p."
)


@dataclass(frozen=True)
class _Figure:
    """One recomputed figure: ``formula`` may name other figures' rows as ``{key}``; ``twin``
    is the Tables figure it is checked against (``None``: no Tables twin)."""

    key: str
    label: str
    formula: str
    twin: str | None
    words: str
    style: Style


def build_audit(an: ReportContext, layout: DataLayout | SumsColumns, tables: Positions) -> tuple[Grid, dict[str, str]]:
    """The Audit sheet of ``an`` and the cells of its recomputed figures (by key): over the Data
    sheets of ``layout``, or, for rows that stayed in a database, over the Sums sheet's
    per-group figures."""
    g = Grid("Audit")
    if isinstance(layout, SumsColumns):
        put_title(g, "Audit · the one-way figures recomputed by the spreadsheet's own functions",
                  "Every figure in column B is a formula over the Sums sheet; nothing here is typed in.")
        g.put(3, 1, _SUMS_INTRO, NOTE)
        vsegs: tuple[Segment, ...] = ()
    else:
        vsegs = layout.value_segments
        put_title(g, "Audit · the one-way figures recomputed by the spreadsheet's own functions",
                  "Every figure in column B is a formula over the Data sheet"
                  + ("s" if len(layout.sheets) > 1 else "") + "; nothing here is typed in.")
        g.put(3, 1, _INTRO, NOTE)
    g.merge(3, 1, 3, 7)
    g.put(5, 1, "Centring constant", KEY)
    g.put(5, 2, float(an.centre), Style(num=fixed(max(0, -an.centre.as_tuple().exponent))))
    g.put(5, 3, f"exactly {an.centre:f}", NOTE)
    if isinstance(layout, SumsColumns):
        _put_group_sums(g, an, layout)
    else:
        _put_groups(g, an, vsegs)
    g1, gk = _TOP + 1, _TOP + an.k
    r = gk + 2
    g.put_row(r, 1, ["Quantity", "Recomputed", "Tables", "Relative difference", "Check"], TH)
    g.put(r, 7, "Formula in words", TH)
    figures = _figures(an, g1, gk, ",".join(s.col("D") for s in vsegs) if vsegs else None)
    rows = {f.key: r + j for j, f in enumerate(figures, start=1)}
    audit_refs = {f.key: _put_figure(g, an, f, rows, tables) for f in figures}
    last = rows["p_value"]
    g.conditional.append((f"E{rows['n']}:E{last}", yes_rule("differs")))
    r = last + 2
    used = (f"Sums sheet rows {layout.first}–{layout.last}" if isinstance(layout, SumsColumns)
            else "Data ranges used: " + "; ".join(f"{s.sheet} rows {s.first}–{s.last}" for s in vsegs))
    g.put(r, 1, used, NOTE)
    g.merge(r, 1, r, 7)
    g.widths = {1: 22.0, 2: 20.0, 3: 20.0, 4: 16.0, 5: 16.0, 6: 16.0, 7: 46.0}
    g.freeze = "A3"
    g.landscape = True
    finish_rules(g, an.alpha)
    return g, audit_refs


def _put_groups(g: Grid, an: ReportContext, vsegs: tuple[Segment, ...]) -> None:
    """Per group: n, the centred and the plain mean, and SS within the group, as formulas."""
    prec = an.precision
    g.put_row(_TOP, 1, ["Group no.", an.factor, "n", "Mean (centred)", "Mean", "SS within group"], TH)
    summaries = list(an.describe)
    for i, label in enumerate(an.labels, start=1):
        r = _TOP + i
        g.put(r, 1, i, INT_STYLE)
        g.put(r, 2, label)
        n_f = "+".join(f"COUNTIF({s.col('A')},$A{r})" for s in vsegs)
        s_f = "+".join(f"SUMIF({s.col('A')},$A{r},{s.col('D')})" for s in vsegs)
        q_f = "+".join(f"SUMPRODUCT(({s.col('A')}=$A{r})*({s.col('D')}-$D{r})^2)" for s in vsegs)
        s_i = summaries[i - 1]
        ss_i = float(s_i.sd) ** 2 * (s_i.n - 1) if s_i.n > 1 else 0.0
        g.put(r, 3, Formula(f"={n_f}"), INT_STYLE)
        g.put(r, 4, Formula(f"=({s_f})/C{r}"), Style(num=prec.mean_format(s_i.mean - float(an.centre))))
        g.put(r, 5, Formula(f"={_CENTRE}+D{r}"), Style(num=prec.mean_format(s_i.mean)))
        g.put(r, 6, Formula(f"={q_f}"), Style(num=prec.square_format(ss_i)))


def _put_group_sums(g: Grid, an: ReportContext, cols: SumsColumns) -> None:
    """Per group: n, the centred and the plain mean, and SS within the group, from the Sums
    sheet."""
    prec = an.precision
    g.put_row(_TOP, 1, ["Group no.", an.factor, "n", "Mean (centred)", "Mean", "SS within group"], TH)
    for i, (label, s_i) in enumerate(zip(an.labels, an.describe)):
        r = _TOP + 1 + i
        ss_i = float(s_i.sd) ** 2 * (s_i.n - 1) if s_i.n > 1 else 0.0
        g.put(r, 1, i + 1, INT_STYLE)
        g.put(r, 2, label)
        g.put(r, 3, Formula(f"={cols.cell(cols.n, i)}"), INT_STYLE)
        g.put(r, 4, Formula(f"={cols.cell(cols.centred_mean, i)}"),
              Style(num=prec.mean_format(s_i.mean - float(an.centre))))
        g.put(r, 5, Formula(f"={_CENTRE}+D{r}"), Style(num=prec.mean_format(s_i.mean)))
        g.put(r, 6, Formula(f"={cols.cell(cols.ss, i)}"), Style(num=prec.square_format(ss_i)))


def _figures(an: ReportContext, g1: int, gk: int, d_all: str | None) -> list[_Figure]:
    """The recomputed figures, in order, for groups in rows ``g1..gk`` and centred values
    ``d_all`` (``None``: the values stayed in a database, and the figures come from the
    groups' rows alone); each is formatted for its Python value."""
    prec = an.precision
    ow = an.oneway
    grand = (sum(float(s_.mean) * s_.n for s_ in an.describe) / ow.n_total) - float(an.centre)

    def square(v: float) -> Style:
        return Style(num=prec.square_format(v))

    if d_all is None:
        n_fig = _Figure("n", "Values (n)", f"=SUM(C{g1}:C{gk})", None, "SUM of the groups' n", INT_STYLE)
        grand_fig = _Figure("grand", "Grand mean (centred)", f"=SUMPRODUCT(C{g1}:C{gk},D{g1}:D{gk})/B{{n}}",
                            None, "Σ n·(group mean) / n", Style(num=prec.mean_format(grand)))
        total_fig = _Figure("ss_total", "SS total", "=B{ss_between}+B{ss_within}", "ss_total",
                            "SS between + SS within (the values stayed in the database)",
                            square(ow.ss_total))
    else:
        n_fig = _Figure("n", "Values (n)", f"=COUNT({d_all})", None, "COUNT of the centred values", INT_STYLE)
        grand_fig = _Figure("grand", "Grand mean (centred)", f"=SUM({d_all})/B{{n}}", None, "SUM / n",
                            Style(num=prec.mean_format(grand)))
        total_fig = _Figure("ss_total", "SS total", f"=DEVSQ({d_all})", "ss_total", "DEVSQ of all centred values",
                            square(ow.ss_total))
    return [
        n_fig,
        _Figure("k", "Groups (k)", f'=COUNTIF(C{g1}:C{gk},">0")', None, "groups with values", INT_STYLE),
        grand_fig,
        _Figure("ss_between", "SS between", f"=SUMPRODUCT(C{g1}:C{gk},(D{g1}:D{gk}-B{{grand}})^2)", "ss_between",
                "Σ n·(group mean − grand mean)²", square(ow.ss_between)),
        _Figure("ss_within", "SS within (residual)", f"=SUM(F{g1}:F{gk})", "ss_within",
                "Σ of the groups' SUMPRODUCT of squared deviations" if d_all is not None
                else "Σ of the groups' SS (from the Sums sheet)", square(ow.ss_within)),
        total_fig,
        _Figure("df_between", "df between", "=B{k}-1", "df_between", "k − 1", INT_STYLE),
        _Figure("df_within", "df within", "=B{n}-B{k}", "df_within", "n − k", INT_STYLE),
        _Figure("ms_between", "MS between", "=B{ss_between}/B{df_between}", "ms_between", "SS / df",
                square(ow.ms_between)),
        _Figure("ms_within", "MS within", "=B{ss_within}/B{df_within}", "ms_within", "SS / df",
                square(ow.ms_within)),
        _Figure("f_ratio", "F", '=IF(B{ms_within}=0,"infinite",B{ms_between}/B{ms_within})', "f_ratio",
                "MS between / MS within", stat_style(ow.f)),
        _Figure("p_value", "p", "=IF(ISNUMBER(B{f_ratio}),_xlfn.F.DIST.RT(B{f_ratio},B{df_between},B{df_within}),0)",
                "p_value", "F.DIST.RT(F, df between, df within)", P_STYLE),
    ]


def _put_figure(g: Grid, an: ReportContext, f: _Figure, rows: dict[str, int], tables: Positions) -> str:
    """One figure's row: recomputed, its Tables twin, their relative difference, the check and
    the formula in words. Returns the recomputed figure's cell."""
    rr = rows[f.key]
    g.put(rr, 1, f.label)
    g.put(rr, 2, Formula(f.formula.format(**rows)), f.style)
    if f.key == "n":
        g.put(rr, 3, an.oneway.n_total, INT_STYLE)
    elif f.key == "k":
        g.put(rr, 3, an.k, INT_STYLE)
    elif f.twin is not None and f.twin in tables.cells:
        ref = f.twin if f.twin in NAMES else tables.cells[f.twin]
        g.put(rr, 3, Formula(f"={ref}"), f.style)
    if f.key != "grand":
        tol = _audit_floor(f.key, rows)
        g.put(rr, 4, Formula(
            f'=IF(AND(ISNUMBER(B{rr}),ISNUMBER(C{rr})),IF(C{rr}=0,ABS(B{rr}-C{rr}),'
            f'ABS(B{rr}-C{rr})/ABS(C{rr})),"")'), Style(num="0.0E+00"))
        g.put(rr, 5, Formula(
            f'=IF(AND(ISNUMBER(B{rr}),ISNUMBER(C{rr})),IF(ABS(B{rr}-C{rr})<=MAX(1E-9*ABS(C{rr}),{tol}),'
            f'"agrees","differs"),IF(B{rr}&""=C{rr}&"","agrees","differs"))'), Style(halign="center"))
    g.put(rr, 7, f.words, NOTE)
    return g.ref(rr, 2)


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
