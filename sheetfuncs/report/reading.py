"""What the report says first: which cells were read, each group with its n, and what was left out.

The words come from the :class:`~sheetfuncs.input.Reading` of a file (``None`` for data passed
from Python, which gets one line with the groups). When block detection left cells out, the
Findings say so before the answer, so that a reader checks them before trusting it.
"""

from __future__ import annotations

from pathlib import Path

from ..input import group_sizes
from .context import ReportContext

__all__ = ["LEFT_OUT_SHOWN", "data_read_lines", "left_out_lines", "origin_line"]

#: How many left-out entries the Findings name before pointing to the Data sheet's log.
LEFT_OUT_SHOWN = 6


def _groups_phrase(an: ReportContext) -> str:
    each = group_sizes(an.labels, an.counts)
    return f"{an.n_total} values in {an.k} group{'s' if an.k != 1 else ''} ({each})"


def origin_line(an: ReportContext) -> str:
    """Rows read by a database engine, in words: how many, from where, by which engine."""
    o = an.origin
    if o is None:
        return ""
    rows = f"{o.rows_read:,} row{'s' if o.rows_read != 1 else ''}"
    where = f" (filter: {o.where})" if o.where else ""
    return f"Read {rows} of {o.source}{where} with {o.engine} {o.engine_version}"


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
    if an.origin is not None:
        return (f"{origin_line(an)}: {_groups_phrase(an)}.",
                *(n[:1].upper() + n[1:] + "." for n in an.origin.notes))
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
    lines.extend(n for n in r.notes if an.groups is None or n not in an.groups.notes)  # case notes: by the answer
    return tuple(lines)
