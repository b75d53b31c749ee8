"""The built-in demo: an invented dataset in a scenario of our own.

Scenario (invented numbers): Shore A hardness of one gasket compound, five gaskets sampled per
shift from each of four zones of a curing oven. Zone 3 runs hot. The range below is laid out as an
analyst might keep it: one column per zone, a header row, a blank where a gasket was lost, and one
text note typed into a data cell.
"""

from __future__ import annotations

from .groups import Groups
from .ranges import groups_from_range

__all__ = ["DEMO_TITLE", "DEMO_FACTOR", "DEMO_RESPONSE", "DEMO_UNIT", "demo_rows", "demo_groups"]

DEMO_TITLE = "Gasket hardness by cure-oven zone (invented demo data)"
DEMO_FACTOR = "Oven zone"
DEMO_RESPONSE = "Hardness"
DEMO_UNIT = "Shore A"

_ROWS: tuple[tuple[object, ...], ...] = (
    ("Zone 1", "Zone 2", "Zone 3", "Zone 4"),
    (61.2, 60.8, 63.9, 61.0),
    (60.7, 61.5, 64.4, 60.6),
    (61.9, 60.9, 63.1, 61.4),
    (60.4, 61.2, 64.8, None),
    (61.5, 60.6, 63.6, 60.9),
    (60.9, 61.8, 64.1, 61.7),
    (61.1, 61.0, "retest", 60.5),
    (61.6, 60.5, 63.4, 61.2),
)


def demo_rows() -> list[list[object]]:
    """The demo range as rows of cells (header row first), as a spreadsheet would hand it over."""
    return [list(r) for r in _ROWS]


def demo_groups() -> Groups:
    """The demo range cleaned into groups."""
    return groups_from_range(demo_rows())
