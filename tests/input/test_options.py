"""sheetfuncs.input.options: checks of scalar options and values shown as a spreadsheet user reads
them (the conventions of the project guide; common practice)."""

from __future__ import annotations

import math

import pytest

from sheetfuncs import InputError
from sheetfuncs.input import as_real, check_alpha, check_conf, check_number, one_line, shown


def test_values_are_shown_as_a_spreadsheet_user_reads_them():
    assert [shown(v) for v in (None, "  ", True, False, 3.0, 2.5, "x", 7)] == [
        "blank", "blank", "TRUE", "FALSE", "3", "2.5", '"x"', "7"]


def test_as_real_takes_numbers_only():
    assert as_real(2) == 2.0 and as_real(2.5) == 2.5
    assert as_real(True) is None and as_real("3") is None and as_real(None) is None
    assert as_real(10**400) == math.inf and as_real(-(10**400)) == -math.inf


@pytest.mark.parametrize("bad, words", [
    (0, "strictly between 0 and 1 (e.g. 0.05), not 0"), (1, "not 1"), (1.5, "not 1.5"),
    ("x", 'must be a number, not "x"'), (None, "must be a number, not blank"), (True, "not TRUE"),
])
def test_alpha_outside_zero_and_one_is_one_clear_line(bad, words):
    with pytest.raises(InputError) as e:
        check_alpha(bad)
    assert str(e.value).startswith("sheetfuncs: alpha ") and words in str(e.value)


def test_confidence_level_and_numbers():
    assert check_conf(0.9) == 0.9 and check_alpha(0.05) == 0.05 and check_number(3, "k") == 3.0
    with pytest.raises(InputError, match="the confidence level must lie strictly between 0 and 1"):
        check_conf(95)
    with pytest.raises(InputError, match="k must be a finite number, not inf"):
        check_number(math.inf, "k")


def test_one_line_reads_a_row_or_a_column():
    assert one_line([[1], [2], [None]], "weights") == [1, 2, None]  # a column; blanks kept
    assert one_line([[1, 2, 3]], "weights") == [1, 2, 3]  # a row
    assert one_line([[1, None], [2, None]], "weights") == [1, 2]  # a column drawn wider
    assert one_line([1, 2], "weights") == [1, 2] and one_line(5, "weights") == [5]
    with pytest.raises(InputError, match="weights fill a block of 2 rows and 2 columns"):
        one_line([[1, 2], [3, 4]], "weights")


# --------------------------------------------------------------------------------------------
# short forms and ranges (issue 10)


def test_shown_keeps_huge_numbers_and_long_text_short():
    from sheetfuncs.input import shown
    assert shown(19 * 10**309) == "1.9e+310"  # was all 311 digits
    assert shown(10**15) == "1000000000000000"
    assert shown(1e308) == "1e+308"
    assert shown("a" * 300) == '"' + "a" * 59 + '…"'
    assert shown("two\nlines") == '"two lines"'


def test_check_whole_and_check_range_name_the_argument_and_the_range():
    from sheetfuncs.input import check_range, check_whole
    assert check_whole(12.0, "k (the number of groups)", 2, 10_000) == 12
    for bad, text in ((1e308, "1e+308"), (1.5, "1.5"), (1, "1"), (10_001, "10001")):
        with pytest.raises(InputError) as info:
            check_whole(bad, "k (the number of groups)", 2, 10_000)
        assert info.value.reason == (
            f"k (the number of groups) must be a whole number from 2 to 10,000, not {text}"
        )
    with pytest.raises(InputError, match="k must be a number, not TRUE"):
        check_whole(True, "k", 2, 10)
    assert check_range(0.05, "alpha", 1e-10, 0.5, "0.05") == 0.05
    with pytest.raises(InputError) as info:
        check_range(5e-324, "alpha", 1e-10, 0.5, "0.05")
    assert info.value.reason == "alpha must be a number from 1e-10 to 0.5 (e.g. 0.05), not 5e-324"
