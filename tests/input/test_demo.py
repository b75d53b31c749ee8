"""sheetfuncs.input.demo: the built-in demo data (invented), cleaned by the range rules."""

from __future__ import annotations

from sheetfuncs.input import DEMO_TITLE, demo_groups, demo_rows


def test_the_demo_is_a_messy_range_cleaned_by_the_range_rules():
    rows = demo_rows()
    assert rows[0] == ["Zone 1", "Zone 2", "Zone 3", "Zone 4"] and len(rows) == 9
    g = demo_groups()
    # a lost gasket (a blank) in zone 4 and a text note in zone 3 leave seven values each
    assert g.labels == ("Zone 1", "Zone 2", "Zone 3", "Zone 4") and g.counts == (8, 8, 7, 7)
    assert [(c.position, c.value, c.action) for c in g.cells] == [("row 8, column 3", "retest", "ignored")]
    assert "invented" in DEMO_TITLE
    rows[1][0] = 0.0  # the caller gets a copy: the demo itself does not change
    assert demo_rows()[1][0] == 61.2
