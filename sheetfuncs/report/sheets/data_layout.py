"""Where every group's values sit on the Data sheets, shared by the Data, Chart and Audit sheets.

The long-form data run down the Data sheets in group order, a sheet's rows below its header
row; beyond the host's row limit they continue on ``Data 2``, ``Data 3``, ... A group may
straddle two sheets, so a group's values are a tuple of :class:`Segment` s.
"""

from __future__ import annotations

from dataclasses import dataclass

from ..grid import quote_sheet

__all__ = ["Segment", "DataLayout"]


@dataclass(frozen=True)
class Segment:
    """Rows ``first..last`` (1-based, inclusive) of one Data sheet."""

    sheet: str
    first: int
    last: int

    def col(self, letter: str) -> str:
        """The absolute reference of the segment's rows in column ``letter``: ``Data!$D$2:$D$31``."""
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
        """Rows of values (or log entries) one Data sheet holds."""
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
        """The layout of groups of ``counts`` values and ``n_log`` log entries, ``row_limit``
        rows per sheet (the header counts)."""
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
