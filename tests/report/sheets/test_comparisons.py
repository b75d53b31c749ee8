"""The Comparisons sheet: the chosen method's pairs, Dunnett's with the control and the letters,
equal to the core's; an analysis that cannot run is reported, not fatal."""

from __future__ import annotations

import openpyxl

from sheetfuncs.stats.comparisons import dunnett, pairwise
from sheetfuncs.stats.lettering import letters

from tests.support.scenarios import cells_text, write_in


def test_comparisons_equal_the_core(demo):
    g, _, wb = demo
    comp = [[c.value for c in r] for r in wb["Comparisons"].iter_rows()]
    pw = pairwise(g, "tukey", 0.05)
    for row in pw.rows:
        line = next(r for r in comp if r[0] == row.group_a and r[1] == row.group_b and r[7] == row.p)
        assert line[2:8] == [row.difference, row.se, row.ci.low, row.ci.high, row.statistic, row.p]
        assert line[8] == ("yes" if row.differs else "no")
    dn = dunnett(g, "Zone 1", 0.05)
    for row in dn.rows:
        assert any(r[0] == row.group_a and r[1] == "Zone 1" and r[7] == row.p for r in comp)
    let = letters(g, "tukey", 0.05)
    for label in g.labels:
        assert any(r[0] == label and r[2] == let[label] for r in comp)


def test_unavailable_pairwise_method_is_reported_not_fatal(tmp_path):
    path = write_in(tmp_path, {"a": [1.0, 1.2, 1.1], "b": [2.0], "c": [1.5, 1.6, 1.4]}, method="games-howell")
    text = cells_text(openpyxl.load_workbook(path)["Comparisons"])
    assert "not available" in text
