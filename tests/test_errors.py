"""Issue 2 item 8: every class of bad input gives one InputError with a one-line message that
says what is wrong and what to do (common practice for the product's messages: they start with
``sheetfuncs: `` so that a cell shows where the text came from)."""

from __future__ import annotations

import math

import pytest

import sheetfuncs as sf
from sheetfuncs import InputError


def message_of(fn, *args, **kwargs) -> str:
    with pytest.raises(InputError) as e:
        fn(*args, **kwargs)
    msg = str(e.value)
    assert msg.startswith("sheetfuncs: ")
    assert "\n" not in msg, "messages are one line"
    return msg


def test_input_error_is_a_value_error_with_cells():
    assert issubclass(InputError, ValueError)
    err = InputError("x", cells=((1, 2),))
    assert err.cells == ((1, 2),)
    assert InputError("y").cells == ()


def test_input_error_carries_the_prefix_and_the_bare_reason():
    # common practice for the product's messages: the prefix is added once, by InputError
    err = InputError('group "Head 3" has no numbers')
    assert str(err) == 'sheetfuncs: group "Head 3" has no numbers'
    assert err.reason == 'group "Head 3" has no numbers'
    assert sf.errors.message("  two\n lines ") == "sheetfuncs: two lines"


def test_no_message_in_the_package_types_the_prefix():
    # the prefix lives in errors.py only: a message written with it would show it twice
    import ast
    from pathlib import Path

    root = Path(sf.__file__).parent
    # the Calc component runs inside LibreOffice before sheetfuncs can be imported: its one line
    # for a failed import is the only message written out in full
    apart = {root / "errors.py", root / "worksheet" / "calc" / "component.py"}
    for path in root.rglob("*.py"):
        if path in apart:
            continue
        for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
            if isinstance(node, ast.Constant) and isinstance(node.value, str):
                assert not node.value.startswith("sheetfuncs: "), f"{path}: {node.value[:60]!r}"


def test_fewer_than_two_groups():
    msg = message_of(sf.oneway, {"Head 1": [1.0, 2.0, 3.0]})
    assert msg == (
        'sheetfuncs: at least two groups are needed to compare means, got 1 (only "Head 1"); '
        "check the layout (one group per column, per row, or label and value columns)"
    )
    # a range that holds one column only
    msg = message_of(sf.oneway, sf.groups_from_range([["Head 1"], [1.0], [2.0]]))
    assert "got 1" in msg
    assert message_of(sf.linear_test, {"A": [1.0, 2.0]}, ["x"]).startswith(
        "sheetfuncs: at least two groups are needed")
    assert message_of(sf.contrast, {"A": [1.0, 2.0]}, [1.0]).startswith(
        "sheetfuncs: at least two groups are needed")


def test_labelled_group_with_no_numbers():
    msg = message_of(sf.groups_from_range, [["Head 1", "Head 3"], [1.0, None], [2.0, "n/a"]])
    assert msg == (
        'sheetfuncs: group "Head 3" has no numbers; enter its values or leave it out of the range'
    )
    msg = message_of(sf.groups_from_range, [["H1", 1.0], ["H3", "n/a"]], layout="long")
    assert msg.startswith('sheetfuncs: group "H3" has no numbers')
    assert message_of(sf.oneway, {"A": [1.0], "B": []}) == 'sheetfuncs: group "B" has no numbers; give it values or leave it out'


def test_no_residual_degrees_of_freedom():
    msg = message_of(sf.oneway, [[1.0], [2.0], [4.0]])
    assert msg == (
        "sheetfuncs: no residual degrees of freedom (3 values in 3 groups); at least one group "
        "needs two or more values"
    )
    assert "no residual degrees of freedom" in message_of(sf.linear_test, [[1.0], [2.0], [3.0]], ["a", "a", "b"])
    assert "no residual degrees of freedom" in message_of(sf.contrast, [[1.0], [2.0]], [1, -1])


def test_all_values_identical():
    msg = message_of(sf.oneway, [[7.5, 7.5], [7.5, 7.5, 7.5]])
    assert msg == (
        "sheetfuncs: all values are identical, so there is no variation to analyse; check that "
        "the range holds the measurements"
    )
    assert message_of(sf.oneway, [[7.5, 7.5], [7.5]], exact=False) == msg


@pytest.mark.parametrize("bad, word", [(math.nan, "NaN (not a number)"), (math.inf, "an infinite value"),
                                       (-math.inf, "an infinite value")])
def test_nan_or_infinity(bad, word):
    msg = message_of(sf.oneway, {"A": [1.0, bad], "B": [2.0, 3.0]})
    way_out = (
        'remove it, or pass missing="drop" to leave missing values out' if math.isnan(bad)
        else "remove it or replace it with the measured value"
    )
    assert msg == f'sheetfuncs: {word} at position 2 of group "A"; {way_out}'
    msg = message_of(sf.groups_from_range, [["A", "B"], [1.0, 2.0], [bad, 3.0]])
    assert msg == (
        f"sheetfuncs: {word} at row 3, column 1 of the range; remove it or replace it with the "
        "measured value"
    )


def test_error_value_in_the_data_says_where():
    msg = message_of(sf.groups_from_range, [["A", "B"], [1.0, 2.0], [3.0, "#DIV/0!"]])
    assert msg == (
        "sheetfuncs: the data hold the error #DIV/0! at row 3, column 2 of the range; fix or "
        "clear that cell"
    )
    msg = message_of(sf.groups_from_range, [["A", 1.0, -2146826246]], layout="rowwise")
    assert "the error #N/A at row 1, column 3" in msg


def test_label_and_value_columns_of_different_lengths():
    msg = message_of(sf.groups_from_long, ["A", "B", "A", "B"], [1.0, 2.0, 3.0])
    assert msg == (
        "sheetfuncs: the label column has 4 entries but the value column has 3; give one label "
        "per value"
    )


def test_unknown_layout():
    msg = message_of(sf.groups_from_range, [["A", "B"], [1.0, 2.0]], layout="columns")
    assert msg == (
        "sheetfuncs: unknown layout \"columns\"; use \"wide\" (one group per column), \"long\" "
        "(label and value columns) or \"rowwise\" (one group per row)"
    )
    msg = message_of(sf.groups_from_range, [["A", "B"], [1.0, 2.0]], labels="sometimes")
    assert msg == 'sheetfuncs: labels must be "auto", TRUE or FALSE, not "sometimes"'


def test_bad_contrast_weights():
    data = {"A": [1.0, 2.0], "B": [2.0, 4.0], "C": [3.0, 3.5]}
    assert message_of(sf.contrast, data, [1, -1]) == (
        "sheetfuncs: 2 weights for 3 groups; give one per group, in the order of the groups "
        "(A, B, C)"
    )
    assert message_of(sf.contrast, data, [1, -0.5, -0.4]) == (
        "sheetfuncs: contrast weights must sum to zero, but they sum to 0.1; adjust them "
        "(e.g. 1, -0.5, -0.5)"
    )
    assert message_of(sf.contrast, data, [0, 0, 0]) == (
        "sheetfuncs: all contrast weights are zero; give weights such as 1, -1, 0"
    )
    assert message_of(sf.contrast, data, [1, "a", -1]) == (
        "sheetfuncs: the weight for group \"B\" is \"a\", not a number"
    )


def test_bad_pooling_length():
    data = {"A": [1.0, 2.0], "B": [2.0, 4.0], "C": [3.0, 3.5]}
    assert message_of(sf.linear_test, data, ["x", "x", "y", "y"]) == (
        "sheetfuncs: 4 pooling labels for 3 groups; give one per group, in the order of the "
        "groups (A, B, C)"
    )


def test_zero_within_variance_is_not_an_error():
    # issue 2: different means with no variation inside the groups gives F = inf and p = 0
    r = sf.oneway({"A": [3.0, 3.0], "B": [4.0, 4.0, 4.0]})
    assert r.f == math.inf and r.p == 0.0


def test_other_option_errors_are_one_line_too():
    for fn, args in [
        (sf.f_tail, (1.0, -2, 3)), (sf.f_critical, (2.0, 1, 3)), (sf.describe, ({"A": [1.0]}, 2)),
        (sf.oneway_from_summary, ([2, 2], [1.0, 2.0], [-1.0, 1.0])), (sf.as_groups, ([1.0, 2.0],)),
        (sf.groups_from_range, ([],)), (sf.oneway, ({"A": [1.0, 2.0], "B": [0.1 + 0.2, 0.5]},)),
    ]:
        kwargs = {"exact": True} if fn is sf.oneway else {}
        message_of(fn, *args, **kwargs)


@pytest.mark.parametrize("value, expected", [
    (None, "sheetfuncs: alpha must be a number, not blank"),
    ("0.05", "sheetfuncs: alpha must be a number, not \"0.05\""),
    (True, "sheetfuncs: alpha must be a number, not TRUE"),
    (math.inf, "sheetfuncs: alpha must lie strictly between 0 and 1 (e.g. 0.05), not inf"),
    (0.0, "sheetfuncs: alpha must lie strictly between 0 and 1 (e.g. 0.05), not 0"),
    (5, "sheetfuncs: alpha must lie strictly between 0 and 1 (e.g. 0.05), not 5"),
])
def test_shared_option_checks(value, expected):
    from sheetfuncs.input.options import check_alpha
    assert message_of(check_alpha, value) == expected


def test_shared_option_checks_accept_good_values():
    from sheetfuncs.input.options import check_alpha, check_conf, check_number, check_probability
    assert check_alpha(0.05) == 0.05 and check_conf(0.99) == 0.99
    assert check_number(3, "the count") == 3.0
    assert check_probability(0.5, "the power", "0.8") == 0.5
    assert message_of(check_conf, 1.0).startswith("sheetfuncs: the confidence level must lie strictly")
