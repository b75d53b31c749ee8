"""The Tables sheet: the one-way table, the tests that assume less, the effect sizes, the checks.

The key figures' cells are returned as :class:`Positions`, for the workbook-level names
(:data:`NAMES`) and for the Audit sheet's comparisons.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

from ...stats import Unavailable
from ..context import ReportContext
from ..formats import format_measure
from ..grid import Grid, Style
from .styles import HEADING, NOTE, finish_rules, put_title
from .tabular import put_table

__all__ = ["NAMES", "Positions", "build_tables"]

#: The workbook-level names of the key figures (Tables) and of their Audit twins.
NAMES = ("ss_between", "ss_within", "df_between", "df_within", "f_ratio", "p_value")


@dataclass(frozen=True)
class Positions:
    """Addresses of the key figures, for defined names and the Audit's comparisons."""

    cells: dict[str, str]


def build_tables(an: ReportContext) -> tuple[Grid, Positions]:
    """The Tables sheet of ``an`` and the addresses of its key figures."""
    g = Grid("Tables")
    put_title(g, f"Tables · {an.title}", f"alpha = {an.alpha:g} · {an.conf:.0%} intervals · {_path_words(an)}")
    r, pos = _put_oneway(g, an, 4)
    r, alt = _put_alternatives(g, an, r)
    r = _put_effects(g, an, r)
    _put_checks(g, an, r)
    g.widths = {1: 30.0, 2: 13.0, 3: 12.0, 4: 13.0, 5: 12.0, 6: 12.0, 7: 62.0}
    g.freeze = "A3"
    g.landscape = True
    finish_rules(g, an.alpha)
    return g, Positions({**pos, **alt})


def _path_words(an: ReportContext) -> str:
    return "decimal-exact sums of squares" if an.exact else "floating-point sums of squares"


def _put_oneway(g: Grid, an: ReportContext, r: int) -> tuple[int, dict[str, str]]:
    """The one-way table and its note; returns the next row and the key figures' cells."""
    prec = an.precision
    g.put(r, 1, "One-way analysis of variance", HEADING)
    r += 1
    first, last, _ = put_table(g, r, an.oneway.table(an.factor), prec)
    g.put(first, 1, an.factor, Style(valign="top"))
    b = first  # the factor row
    w = first + 1  # the residual row
    pos = dict(
        df_between=g.ref(b, 2), ss_between=g.ref(b, 3), ms_between=g.ref(b, 4), f_ratio=g.ref(b, 5),
        p_value=g.ref(b, 6), df_within=g.ref(w, 2), ss_within=g.ref(w, 3), ms_within=g.ref(w, 4),
        df_total=g.ref(w + 1, 2), ss_total=g.ref(w + 1, 3),
    )
    r = last + 1
    g.put(r, 1, f"F is referred to the F distribution on ({an.oneway.df_between}, "
          f"{an.oneway.df_within}) degrees of freedom; p is its upper tail. R² = "
          f"{an.oneway.r_squared:.4f}; residual SD = {format_measure(an.oneway.residual_sd, prec.mean)}.", NOTE)
    g.merge(r, 1, r, 7)
    return r + 2, pos


def _put_alternatives(g: Grid, an: ReportContext, r: int) -> tuple[int, dict[str, str]]:
    """Welch's and the Kruskal–Wallis tests; returns the next row and their p-values' cells."""
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
    first, last, _ = put_table(g, r, rows, an.precision, text_col=7)
    pos = {}
    if not isinstance(wl, Unavailable):
        pos["welch_p"] = g.ref(first, 5)
    if not isinstance(kw, Unavailable):
        pos["kruskal_p"] = g.ref(first + 1, 5)
    return last + 2, pos


def _put_effects(g: Grid, an: ReportContext, r: int) -> int:
    """The effect sizes with their intervals (or why they are not available); returns the next row."""
    g.put(r, 1, "Effect sizes", HEADING)
    r += 1
    eff = an.effects
    if isinstance(eff, Unavailable):
        g.put(r, 1, "not available: " + eff.reason, NOTE)
        return r + 2
    shares = {"Value": "share", "CI low": "share", "CI high": "share"}
    first, last, _ = put_table(g, r, eff.table(), an.precision, shares, text_col=7)
    return last + 2


def _put_checks(g: Grid, an: ReportContext, r: int) -> None:
    """The assumption checks, and a note for each check that could not run."""
    g.put(r, 1, "Assumption checks", HEADING)
    r += 1
    first, last, _ = put_table(g, r, an.checks.table(), an.precision, {"Statistic": "stat"}, text_col=7)
    r = last + 1
    for na, why in an.checks.not_available:
        g.put(r, 1, f"{na}: not available: {why}", NOTE)
        g.merge(r, 1, r, 7)
        r += 1
