"""The Sums sheet of a report whose rows stayed in a database: the exact per-group sums.

Every value is ``(c + m) / 10**D`` for a whole number ``m`` (``D`` the scale, ``c`` the
offset); per group the engine summed ``n``, ``Σm`` and ``Σm²`` exactly. Those whole numbers are
written as text, digit for digit (a spreadsheet number keeps only 15 digits), for an exact
re-check; beside them, each group's mean minus the centring constant and its sum of squares,
formed from them as exact rationals and rounded once, are the numbers the Audit sheet's formulas
recompute the one-way figures from.
"""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction

from ...stats import ExactMoments
from ..context import ReportContext
from ..grid import Grid, Style
from .styles import INT_STYLE, KEY, NOTE, TH, put_title

__all__ = ["SumsColumns", "build_sums", "SUMS_SHEET"]

SUMS_SHEET = "Sums"
#: The header row of the per-group table; the groups follow it.
_TOP = 9


@dataclass(frozen=True)
class SumsColumns:
    """Where the Audit sheet finds each group's figures on the Sums sheet: rows ``first..last``
    of the columns ``n``, ``centred_mean`` and ``ss`` (letters)."""

    first: int
    last: int
    n: str = "C"
    centred_mean: str = "G"
    ss: str = "H"

    def cell(self, column: str, i: int) -> str:
        """The absolute reference of group ``i``'s (0-based) cell in ``column``."""
        return f"{SUMS_SHEET}!${column}${self.first + i}"


def _intro(an: ReportContext) -> str:
    o = an.origin
    engine = f"{o.engine} {o.engine_version}" if o is not None else "the database engine"
    return (
        f"The values stayed in the database: {engine} computed, for each group, the count n, "
        "the sum of m and the sum of m² of the whole numbers m = value × 10^D − c, exactly "
        "(every value is (c + m) / 10^D). The sums are written as text, digit for digit, for an "
        "exact re-check: mean = (c + Σm / n) / 10^D and the sum of squares within the group = "
        "(Σm² − (Σm)² / n) / 10^(2D). Columns G and H hold these two, formed as exact fractions "
        "and rounded once (G minus the centring constant); the Audit sheet recomputes the one-way "
        "figures from them with the spreadsheet's own functions."
    )


def build_sums(an: ReportContext) -> tuple[Grid, SumsColumns]:
    """The Sums sheet of ``an`` (whose ``moments`` are the engine's exact sums)."""
    mom = an.moments
    if not isinstance(mom, ExactMoments):
        raise ValueError("the Sums sheet needs the exact per-group sums")
    g = Grid(SUMS_SHEET)
    put_title(g, "Sums · the exact per-group sums computed in the database",
              "What the analysis was computed from; the individual values are not in this workbook")
    g.put(3, 1, _intro(an), NOTE)
    g.merge(3, 1, 3, 8)
    g.put(5, 1, "Scale D (decimals)", KEY)
    g.put(5, 2, mom.scale, INT_STYLE.but(halign="left"))
    g.put(6, 1, "Offset c", KEY)
    g.put(6, 2, str(mom.offset), Style(halign="left"))
    g.put(7, 1, "Centring constant", KEY)
    g.put(7, 2, f"{an.centre:f}", Style(halign="left"))
    head = ["Group no.", an.factor, "n", "Left out (NULL or NaN)", "Σm (exact)", "Σm² (exact)",
            f"Mean − {an.centre:f}", "SS within group"]
    g.put_row(_TOP, 1, head, TH)
    prec = an.precision
    right = Style(halign="right")
    for i, label in enumerate(an.labels):
        r = _TOP + 1 + i
        centred = float(mom.mean(i) - Fraction(an.centre))
        ss = float(mom.ss_group(i))
        g.put(r, 1, i + 1, INT_STYLE)
        g.put(r, 2, label)
        g.put(r, 3, mom.n[i], INT_STYLE)
        g.put(r, 4, an.dropped[i], INT_STYLE)
        g.put(r, 5, str(mom.s[i]), right)
        g.put(r, 6, str(mom.q[i]), right)
        g.put(r, 7, centred, Style(num=prec.mean_format(centred)))
        g.put(r, 8, ss, Style(num=prec.square_format(ss)))
    g.widths = {1: 18.0, 2: 16.0, 3: 9.0, 4: 12.0, 5: 16.0, 6: 22.0, 7: 14.0, 8: 14.0}
    g.freeze = f"C{_TOP + 1}"
    g.print_rows = f"{_TOP}:{_TOP}"
    return g, SumsColumns(_TOP + 1, _TOP + an.k)
