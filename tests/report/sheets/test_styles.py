"""The report's look: the marks of conditional formatting and the number formats of df and test
statistics."""

from __future__ import annotations

import math

from sheetfuncs.report.grid import Grid
from sheetfuncs.report.sheets.styles import (
    INT_STYLE, SUBTITLE, TITLE, df_style, finish_rules, p_rule, put_title, stat_style, yes_rule,
)


def test_the_p_mark_tests_for_a_number_first():
    # a text such as "undefined" compares greater than any number in the host (common practice),
    # so the rule must test ISNUMBER before comparing with alpha
    assert p_rule(0.05, "D5").formula == ["AND(ISNUMBER(D5),D5<0.05)"]
    assert p_rule(0.01, "F12").formula == ["AND(ISNUMBER(F12),F12<0.01)"]
    rule = yes_rule("differs")
    assert rule.operator == "equal" and rule.formula == ['"differs"']


def test_finish_rules_gives_every_p_range_its_mark():
    g = Grid("T")
    g.conditional = [("F5:F7", None), ("I5:I7", yes_rule("yes"))]
    finish_rules(g, 0.1)
    (rng, rule), (rng2, rule2) = g.conditional
    assert rng == "F5:F7" and rule.formula == ["AND(ISNUMBER(F5),F5<0.1)"]
    assert rng2 == "I5:I7" and rule2.formula == ['"yes"']


def test_df_and_statistic_formats():
    # common practice: whole df without decimals, Welch's fractional df with two; statistics
    # with four significant digits, scientific below 1e-4
    assert df_style(3) == INT_STYLE and df_style(3.0) == INT_STYLE and df_style(7.41).num == "0.00"
    assert stat_style(12.345).num == "0.00" and stat_style(0.5).num == "0.0000"
    assert stat_style(5e-5).num == "0.000E+00" and stat_style(4) == INT_STYLE
    assert stat_style(math.inf).num is None and stat_style("undefined").num is None


def test_title_and_subtitle():
    g = Grid("T")
    put_title(g, "Tables · Hardness", "alpha = 0.05")
    assert (g.cells[(1, 1)].value, g.cells[(1, 1)].style) == ("Tables · Hardness", TITLE)
    assert (g.cells[(2, 1)].value, g.cells[(2, 1)].style) == ("alpha = 0.05", SUBTITLE)
