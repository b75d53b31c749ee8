"""The Comparisons sheet: the chosen pairwise method, Dunnett's comparisons with a control, the
Games–Howell comparisons when the spreads look unequal, and the compact letter display.

The three kinds of pairwise table are laid out by one :func:`_put_pairs`: a heading, a line
above the table, the table with its pairs that differ marked, and (for the chosen method) its
notes.
"""

from __future__ import annotations

from collections.abc import Callable

from ...stats import PairwiseResult, Unavailable
from ..context import ReportContext
from ..formats import Precision
from ..grid import Grid
from .styles import HEADING, NOTE, finish_rules, put_title
from .tabular import mark_differs, put_table

__all__ = ["build_comparisons"]


def build_comparisons(an: ReportContext) -> Grid:
    """The Comparisons sheet of ``an``."""
    g = Grid("Comparisons")
    prec = an.precision
    put_title(g, f"Comparisons · {an.title}",
              f"alpha = {an.alpha:g} · Differs = adjusted p below alpha · difference = first group minus second")
    r = _put_pairs(g, 4, f"Pairwise comparisons: {an.method_name}", an.pairwise, prec, _intervals,
                   with_notes=True)
    if an.dunnett is not None:
        r = _put_pairs(g, r, f'Against the control "{an.control}": Dunnett', an.dunnett, prec, _intervals)

    def unequal(res: PairwiseResult) -> str:
        return (f"Shown because the checks find unequal spreads and {an.method_name} pools "
                f"the variances. Intervals: {res.interval}")

    if an.unequal_pairs is not None:
        r = _put_pairs(g, r, "Games–Howell comparisons (the group spreads look unequal)", an.unequal_pairs,
                       prec, unequal, span=9)
    _put_letters(g, an, r)
    g.auto_widths(minimum=10, maximum=28)
    for c in range(1, 3):
        g.widths[c] = max(g.widths.get(c, 0), 16.0)
    g.freeze = "A3"
    g.landscape = True
    finish_rules(g, an.alpha)
    return g


def _intervals(res: PairwiseResult) -> str:
    return f"Intervals: {res.interval}" if res.interval else ""


def _put_pairs(g: Grid, r: int, heading: str, res: PairwiseResult | Unavailable, prec: Precision,
               intro: Callable[[PairwiseResult], str], span: int = 1, with_notes: bool = False) -> int:
    """A heading, then ``res``'s table under the line ``intro(res)`` (merged over ``span``
    columns; none when empty) and, ``with_notes``, the result's notes; or why it is not
    available. Returns the row after the block and one blank row (two when not available)."""
    g.put(r, 1, heading, HEADING)
    r += 1
    if isinstance(res, Unavailable):
        g.put(r, 1, "not available: " + res.reason, NOTE)
        return r + 2
    line = intro(res)
    if line:
        g.put(r, 1, line, NOTE)
        g.merge(r, 1, r, span)
        r += 1
    table = res.table()
    first, last, _ = put_table(g, r, table, prec)
    mark_differs(g, table[0], first, last)
    r = last + 1
    for note in res.notes if with_notes else ():
        g.put(r, 1, note, NOTE)
        g.merge(r, 1, r, 9)
        r += 1
    return r + 1


def _put_letters(g: Grid, an: ReportContext, r: int) -> None:
    """The compact letter display (highest mean first), or why it is not available."""
    let = an.letters
    g.put(r, 1, "Compact letter display", HEADING)
    r += 1
    if isinstance(let, Unavailable):
        g.put(r, 1, "not available: " + let.reason, NOTE)
        return
    g.put(r, 1, f"Groups that share a letter are not shown to differ ({an.method_name}, "
          f"alpha = {an.alpha:g}); highest mean first.", NOTE)
    g.merge(r, 1, r, 6)
    r += 1
    put_table(g, r, let.table(), an.precision)
