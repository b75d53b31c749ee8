"""What the report says first: which cells were read, each group with its n, and what was left out.

The words come from the :class:`~sheetfuncs.input.Reading` of a file (``None`` for data passed
from Python, which gets one line with the groups). When block detection left cells out, the
Findings say so before the answer, so that a reader checks them before trusting it.
"""

from __future__ import annotations

from pathlib import Path

from ..input import group_sizes
from .context import ReportContext

__all__ = ["LEFT_OUT_SHOWN", "data_read_lines", "left_out_lines"]

#: How many left-out entries the Findings name before pointing to the Data sheet's log.
LEFT_OUT_SHOWN = 6


def _groups_phrase(an: ReportContext) -> str:
    g = an.groups
    each = group_sizes(g.labels, g.counts)
    return f"{g.n_total} values in {g.k} group{'s' if g.k != 1 else ''} ({each})"


def left_out_lines(an: ReportContext) -> tuple[str, ...]:
    """One line per left-out entry (address and reason), the rest counted."""
    r = an.reading
    if r is None or not r.left_out:
        return ()
    lines = [f"{r.address(x.ref)}: {x.described}" for x in r.left_out[:LEFT_OUT_SHOWN]]
    more = len(r.left_out) - LEFT_OUT_SHOWN
    if more > 0:
        lines.append(f"… and {more} more: see the log on the Data sheet.")
    return tuple(lines)


def data_read_lines(an: ReportContext) -> tuple[str, ...]:
    """The paragraph that opens the Findings: the block read and the groups, what was left
    out (with a request to check it when detection chose the block), missing values, notes."""
    r = an.reading
    if r is None:
        return (f"Data passed from Python: {_groups_phrase(an)}.",)
    name = Path(r.path).name if r.path else "the input"
    how = "found by reading the sheet, no range given" if r.detected else "the range given"
    lines = [f"Read {r.where} of {name} ({how}): {_groups_phrase(an)}."]
    if r.left_out:
        n = r.cells_left_out
        lead = (f"{n} non-blank cell{'s' if n != 1 else ''} of the {r.cells_read} read "
                f"{'were' if n != 1 else 'was'} left out")
        if r.detected:
            lead += "; check that none of them are measurements before relying on the answer"
        lines.append(lead + ":")
        lines.extend("  " + x for x in left_out_lines(an))
    if r.missing:
        lines.append(f"{r.missing} error cell{'s were' if r.missing != 1 else ' was'} read as "
                     "missing values (--errors missing); each is in the log on the Data sheet.")
    lines.extend(n for n in r.notes if n not in an.groups.notes)  # case notes: by the answer
    return tuple(lines)
