"""sheetfuncs.stats.wording: the plain-words pieces the checks and the report share (common practice)."""

from __future__ import annotations

from sheetfuncs.stats import df_text, sentence


def test_sentence():
    assert sentence("  the groups differ ") == "The groups differ."
    assert sentence("a group has one value", capital=False) == "a group has one value."
    assert sentence("Done.") == "Done." and sentence("really?") == "Really?" and sentence("") == ""


def test_df_text():
    assert df_text(3, 17.4213) == "3, 17.42"
    assert df_text(2.0) == "2" and df_text(4, 36) == "4, 36"
