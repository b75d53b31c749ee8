"""Tests of sheetfuncs.input.files.words: the words an analyst reads a sheet by (from memory of
common QA sheets: summary rows, identifier and comment headings, replicate headings, units and
sign-off lines)."""

from __future__ import annotations

from sheetfuncs.input.files.words import (
    is_comment_header, is_identifier_header, is_replicate_heading, is_row_heading, is_signoff,
    is_unit_row, summary_word,
)


def test_summary_words():
    assert all(map(summary_word, ["Mean", "SD", "Std dev:", "CV%", "Average", "Max."]))
    assert not any(map(summary_word, ["Head 1", "Meaning", 3.0, None]))


def test_identifier_comment_and_replicate_headings():
    assert is_identifier_header("Sample no") and is_identifier_header("#")
    assert not is_identifier_header("Run 1")
    assert is_row_heading("Lot") and is_row_heading("Batch no") and is_row_heading("Day")
    assert not is_row_heading("Line 1") and not is_row_heading("Head 2")
    assert is_comment_header("Comments") and is_comment_header("Remarks:")
    assert not is_comment_header("Comment on line 2")
    assert all(map(is_replicate_heading, ["Rep 1", "Replicate 2", "Run #3", "Reading 4", "5"]))
    assert not any(map(is_replicate_heading, ["Lot 1", "Head 2", "Press A", "1001x", 3.0]))


def test_units_and_sign_off_lines():
    assert is_unit_row(["mm", "mm", "mm"]) and is_unit_row(["(HRC)", "(HRC)"])
    assert not is_unit_row(["Line A", "Line B"])
    assert is_signoff("Checked by:") and is_signoff("Approved by") and not is_signoff("Line A")
