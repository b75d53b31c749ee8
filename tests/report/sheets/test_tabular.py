"""Result tables on a sheet: column kinds read from headers, cells styled by kind, p-values and
pairs that differ marked."""

from __future__ import annotations

from sheetfuncs.report.formats import P_FORMAT, Precision
from sheetfuncs.report.grid import Grid
from sheetfuncs.report.sheets.tabular import column_stat_format, header_kind, mark_differs, put_table


def test_header_kinds():
    kinds = {h: header_kind(h) for h in (
        "p", "Adjusted p", "p (Holm)", "df1", "df", "n", "Differs", "Letters", "SS", "MS", "Mean",
        "CI low (simultaneous 95%)", "Min", "F", "q", "Reading", "Group", None)}
    assert kinds == {
        "p": "p", "Adjusted p": "p", "p (Holm)": "p", "df1": "df", "df": "df", "n": "n",
        "Differs": "flag", "Letters": "flag", "SS": "square", "MS": "square", "Mean": "mean",
        "CI low (simultaneous 95%)": "mean", "Min": "value", "F": "stat", "q": "stat",
        "Reading": "text", "Group": "label", None: "label",
    }
    assert header_kind("Value", {"Value": "share"}) == "share"


def test_column_stat_format():
    # four significant digits of the column's largest value, two to four decimals (common practice)
    assert column_stat_format([12.3, 4.5]) == "0.00"
    assert column_stat_format([0.1234, 0.05]) == "0.0000"
    assert column_stat_format([0.0001, 0.0002]) == "0.000E+00"
    assert column_stat_format([None, "undefined"]) is None


def test_put_table_styles_by_kind_and_marks():
    g = Grid("T")
    table = [["Group", "Mean", "p", "Differs", "Reading"],
             ["a", 1.5, 0.01, True, "first"],
             ["b", 2.25, "undefined", False, "second"]]
    first, last, kinds = put_table(g, 4, table, Precision(1), text_col=7)
    assert (first, last) == (5, 6)
    assert kinds == ["label", "mean", "p", "flag", "text"]
    assert g.cells[(4, 2)].style.halign == "right" and g.cells[(4, 4)].style.halign == "center"
    assert g.cells[(5, 2)].style.num == "0.000"  # a mean: the data's decimals and two more
    assert g.cells[(5, 3)].style.num == P_FORMAT
    assert g.cells[(6, 3)].value == "undefined" and g.cells[(6, 3)].style.halign == "right"
    assert [g.cells[(r, 4)].value for r in (5, 6)] == ["yes", "no"]
    assert g.cells[(5, 7)].value == "first" and (5, 5) not in g.cells  # the text in column G
    assert g.conditional == [("C5:C6", None)]
    mark_differs(g, table[0], first, last)
    rng, rule = g.conditional[-1]
    assert rng == "D5:D6" and rule.formula == ['"yes"']


def test_a_header_only_table_marks_nothing():
    g = Grid("T")
    assert put_table(g, 4, [["Group", "p"]], Precision(1))[:2] == (5, 4)
    assert g.conditional == []
