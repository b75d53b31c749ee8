"""The Tables sheet: the core's figures, unrounded, with p-values below alpha marked."""

from __future__ import annotations

import pytest
from scipy import stats

from sheetfuncs import oneway
from sheetfuncs.input.demo import DEMO_FACTOR
from sheetfuncs.stats import checks
from sheetfuncs.stats.effects import effect_sizes

from tests.support.scenarios import name_cell


def test_conditional_formatting_marks_p_below_alpha(demo):
    _, _, wb = demo
    rules = [(cf.sqref, r.formula[0]) for cf in wb["Tables"].conditional_formatting for r in cf.rules]
    assert rules, "no conditional formatting on Tables"
    assert any("<0.05" in f and "ISNUMBER" in f for _, f in rules)
    p_cell = name_cell(wb, "p_value")
    assert any(p_cell.coordinate in str(sq) for sq, _ in rules)


def test_tables_equal_the_core(demo):
    g, _, wb = demo
    ws = wb["Tables"]
    rows = [[c.value for c in r] for r in ws.iter_rows()]
    ow = oneway(g).table(DEMO_FACTOR)
    start = next(i for i, r in enumerate(rows) if r[0] == "Source")
    for got, want in zip(rows[start:start + 4], ow):
        assert got[:6] == [w for w in want]
    chk = checks(g, 0.05)
    wel, kw = chk.welch, chk.kruskal
    welch_row = next(r for r in rows if r[0] == "Welch F")
    assert welch_row[1:5] == [wel.statistic, wel.df1, wel.df2, wel.p]
    kw_row = next(r for r in rows if r[0] == "Kruskal–Wallis H")
    assert kw_row[1] == kw.statistic and kw_row[4] == kw.p
    # Kruskal–Wallis against scipy.stats.kruskal (reference library)
    assert kw_row[4] == pytest.approx(stats.kruskal(*g.arrays).pvalue, rel=1e-9)
    eff = effect_sizes(g, 0.95)
    eta_row = next(r for r in rows if r[0] == "Eta squared")
    assert eta_row[1:4] == [eff.eta_squared, *eff.eta_squared_ci]
