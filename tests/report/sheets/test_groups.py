"""The Groups sheet: per-group summaries equal to the core's."""

from __future__ import annotations

from sheetfuncs import describe


def test_groups_equal_the_core(demo):
    g, _, wb = demo
    got = [[c.value for c in r][:10] for r in wb["Groups"].iter_rows(min_row=5, max_row=4 + g.k)]
    want = describe(g, 0.95).table()[1:]
    assert got == want

