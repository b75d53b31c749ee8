"""The method references of the About sheet: each method used, once, in order."""

from __future__ import annotations

from sheetfuncs.report.context import prepare
from sheetfuncs.report.sheets.references import REFERENCES, reference_keys

from tests.support.scenarios import CLEAR


def test_the_chosen_method_and_the_control_are_cited():
    keys = reference_keys(prepare(CLEAR, method="holm", control="Line A"))
    assert keys == ["oneway", "fdist", "t", "welch", "kruskal", "levene", "bartlett", "normality",
                    "effects", "holm", "dunnett", "letters"]
    assert "Holm, S. (1979)" in REFERENCES["holm"]


def test_no_control_no_dunnett_and_every_method_has_a_source():
    keys = reference_keys(prepare(CLEAR))
    assert "dunnett" not in keys and keys[-2:] == ["tukey", "letters"]
    for method in ("tukey", "games-howell", "bonferroni", "holm", "sidak", "scheffe"):
        assert reference_keys(prepare(CLEAR, method=method)).count(method) == 1
        assert REFERENCES[method]


def test_book_titles_are_cited_as_published():
    # from memory: the titles of the two books (Montgomery; Cohen 1988), which a code rename
    # once changed
    assert "Design and Analysis of Experiments" in REFERENCES["oneway"]
    assert "Statistical Power Analysis for the Behavioral Sciences" in REFERENCES["effects"]
    assert not any("Context" in text for text in REFERENCES.values())
