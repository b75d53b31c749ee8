"""The Groups sheet: per group n, mean, SD, standard error, t interval for the mean, min, median, max."""

from __future__ import annotations

from ..context import ReportContext
from ..grid import Grid
from .styles import NOTE, put_title
from .tabular import put_table

__all__ = ["build_groups"]


def build_groups(an: ReportContext) -> Grid:
    """The Groups sheet of ``an``."""
    g = Grid("Groups")
    unit = f" ({an.unit})" if an.unit else ""
    put_title(g, f"Groups · {an.response}{unit} by {an.factor}",
              f"{an.conf:.0%} t intervals for each group's mean (SD with n − 1)")
    table = an.describe.table()
    table[0] = [an.factor] + list(table[0][1:])
    _, last, _ = put_table(g, 4, table, an.precision, {an.factor: "label"})
    if any(s.n == 1 for s in an.describe):
        r = last + 2
        g.put(r, 1, "undefined: a group of one value has no SD, standard error or interval.", NOTE)
        g.merge(r, 1, r, 8)
    g.auto_widths(minimum=9, maximum=30)
    g.widths[1] = max(g.widths.get(1, 0), 16.0)
    g.freeze = "B5"
    g.print_rows = "4:4"
    return g
