"""Tests of sheetfuncs.input.groups: Groups, labels as text, and Python inputs through as_groups.

No check here needs an outside source: numbers are only checked and carried, never computed;
labels follow the engineering guide (common practice: the shortest form of a number).
"""

from __future__ import annotations

import decimal

import numpy as np
import pytest

from sheetfuncs import Groups, InputError, as_groups
from sheetfuncs.input.groups import format_label


def arrays(g: Groups) -> list[list[float]]:
    return [a.tolist() for a in g.arrays]


# -- labels ------------------------------------------------------------------------------------


def test_numeric_labels_as_text_in_shortest_form():
    assert format_label(3.0) == "3" and format_label(-0.25) == "-0.25" and format_label(12) == "12"
    assert format_label(1.5e300) == "1.5e+300"


# -- Python inputs -----------------------------------------------------------------------------


def test_as_groups_mapping_and_sequences():
    g = as_groups({"Lot 7": [1, 2], 3: np.array([4.0, 5.0])})
    assert g.labels == ("Lot 7", "3")
    assert arrays(g) == [[1.0, 2.0], [4.0, 5.0]]
    g = as_groups([[1.0, 2.0], (3.0, 4.0), np.arange(3)])
    assert g.labels == ("Group 1", "Group 2", "Group 3")
    assert as_groups(g) is g


def test_as_groups_accepts_decimal_values():
    g = as_groups({"A": [decimal.Decimal("0.1"), decimal.Decimal("0.25")], "B": [1, 2]})
    assert arrays(g)[0] == [0.1, 0.25]


@pytest.mark.parametrize("data, message", [
    ([1.0, 2.0, 3.0], "got one flat sequence of numbers"),
    (np.zeros((3, 2)), "a 2-D array is ambiguous"),
    ("1,2,3", "cannot read groups from str"),
    (42, "cannot read groups from int"),
    ({"A": [1.0, "x"]}, 'group "A" holds \'x\' at position 2'),
    ({"A": [1.0, True]}, 'group "A" holds True at position 2'),
    ({"A": [1.0, None]}, 'a missing value \\(None\\) at position 2 of group "A"'),
    ({"A": "123"}, 'group "A" is text'),
    ({"A": [[1.0, 2.0]]}, 'group "A" must be a flat sequence'),
    ({"A": [], "B": [1.0]}, 'group "A" has no numbers'),
    ({"A": [1.0, float("nan")]}, 'NaN \\(not a number\\) at position 2 of group "A"'),
    ({"A": [float("inf"), 1.0]}, 'an infinite value at position 1 of group "A"'),
    ({"A": [1.0], " A": [2.0]}, 'the label "A" is used twice'),
])
def test_as_groups_bad_python_input(data, message):
    with pytest.raises(InputError, match="^sheetfuncs: " + message):
        as_groups(data)


def test_groups_label_and_array_counts_must_match():
    with pytest.raises(InputError, match="^sheetfuncs: 1 labels for 2 groups"):
        Groups(labels=("A",), arrays=(np.ones(2), np.ones(2)))


def test_groups_repr_and_mapping_view():
    g = as_groups({"A": [1.0, 2.0], "B": [3.0]})
    assert repr(g) == "Groups('A': n=2, 'B': n=1)"
    assert list(g.as_dict()) == ["A", "B"]
    assert len(g) == 2


# -- missing values (NaN, None) and relabel in as_groups ---------------------------------------


def test_missing_drop_leaves_out_nan_and_none_and_counts_them_per_group():
    g = as_groups(
        {"Line 1": [1.0, 2.0], "Line 2": [3.0, None, 4.0], "Line 3": np.array([np.nan, 5.0, 6.0])},
        missing="drop",
    )
    assert arrays(g) == [[1.0, 2.0], [3.0, 4.0], [5.0, 6.0]]
    assert g.dropped == (0, 1, 1) and g.n_dropped == 2
    assert g.notes == ('2 missing values (NaN or None) dropped: "Line 2" 1, "Line 3" 1',)


def test_missing_drop_with_nothing_missing_records_zeros_and_no_note():
    g = as_groups([[1.0, 2.0], [3.0]], missing="drop")
    assert g.dropped == (0, 0) and g.notes == ()
    assert as_groups([[1.0, 2.0], [3.0]]).dropped == (0, 0)


def test_missing_drop_one_value_is_singular():
    g = as_groups([[1.0, float("nan")], [3.0]], missing="drop")
    assert g.notes == ('1 missing value (NaN or None) dropped: "Group 1" 1',)


def test_missing_drop_reads_a_pandas_series_with_nan():
    import pandas as pd  # installed with statsmodels, a test dependency; not one of sheetfuncs

    g = as_groups({"A": pd.Series([1.5, None, 2.5]), "B": pd.Series([1, 2, 3], dtype="Int64")},
                  missing="drop")
    assert arrays(g) == [[1.5, 2.5], [1.0, 2.0, 3.0]] and g.dropped == (1, 0)
    g = as_groups({"A": pd.Series([1.5, pd.NA, 2.5], dtype="Float64"), "B": [1.0]}, missing="drop")
    assert arrays(g)[0] == [1.5, 2.5] and g.dropped == (1, 0)
    g = as_groups({"A": [1.5, pd.NA, 2.5], "B": [1.0]}, missing="drop")  # pandas' NA in a list
    assert arrays(g)[0] == [1.5, 2.5] and g.dropped == (1, 0)
    with pytest.raises(InputError, match=r'^sheetfuncs: a missing value \(<NA>\) at position 2 of group "A"'):
        as_groups({"A": [1.5, pd.NA]})


@pytest.mark.parametrize("data, message", [
    ({"Line 2": [1.0, 2.0, float("nan")]},
     'NaN (not a number) at position 3 of group "Line 2"; remove it, or pass missing="drop" to '
     "leave missing values out"),
    ({"Line 2": np.array([1.0, np.nan])},
     'NaN (not a number) at position 2 of group "Line 2"; remove it, or pass missing="drop" to '
     "leave missing values out"),
    ({"Line 2": [None, 1.0]},
     'a missing value (None) at position 1 of group "Line 2"; remove it, or pass missing="drop" '
     "to leave missing values out"),
])
def test_missing_stop_names_the_value_and_the_way_out(data, message):
    with pytest.raises(InputError) as e:
        as_groups(data)
    assert str(e.value) == "sheetfuncs: " + message


def test_a_group_left_without_values_after_dropping_is_an_error():
    with pytest.raises(InputError) as e:
        as_groups({"A": [1.0], "Line 3": [None, float("nan")]}, missing="drop")
    assert str(e.value) == (
        'sheetfuncs: group "Line 3" has no numbers left after dropping its 2 missing values '
        "(NaN or None); give it values or leave it out"
    )
    with pytest.raises(InputError, match=r'dropping its 1 missing value \(NaN or None\);'):
        as_groups({"A": [1.0], "B": [None]}, missing="drop")


def test_missing_drop_still_refuses_infinity_and_text():
    with pytest.raises(InputError) as e:
        as_groups({"A": [1.0, float("nan"), float("inf")]}, missing="drop")
    assert str(e.value) == (
        'sheetfuncs: an infinite value at position 3 of group "A"; remove it or replace it with '
        "the measured value"
    )
    with pytest.raises(InputError, match="holds 'n/a' at position 2"):
        as_groups({"A": [1.0, "n/a"]}, missing="drop")


def test_the_missing_option_is_checked():
    with pytest.raises(InputError) as e:
        as_groups([[1.0], [2.0]], missing="skip")
    assert str(e.value) == (
        'sheetfuncs: missing must be "stop" (a NaN or None stops the analysis) or "drop" (NaN and '
        'None are left out and counted), not "skip"'
    )
    assert as_groups([[1.0], [2.0]], missing=" DROP ").dropped == (0, 0)


def test_a_groups_object_is_used_as_it_is_with_its_own_dropped_counts():
    g = as_groups({"A": [1.0, None], "B": [2.0]}, missing="drop")
    assert as_groups(g) is g and as_groups(g, missing="stop") is g
    m = as_groups(g, relabel={"B": "b"})
    assert m.labels == ("A", "b") and m.dropped == (1, 0)


def test_as_groups_relabel_merges_a_typo():
    g = as_groups({"Supplier B": [1.0, 2.0], "supplier B": [3.0]}, relabel={"supplier B": "Supplier B"})
    assert g.labels == ("Supplier B",) and arrays(g) == [[1.0, 2.0, 3.0]]


def test_groups_built_by_hand_check_their_dropped_counts():
    assert Groups(labels=("A",), arrays=(np.ones(2),)).dropped == (0,)
    assert Groups(labels=("A",), arrays=(np.ones(2),), dropped=(2,)).n_dropped == 2
    with pytest.raises(InputError) as e:
        Groups(labels=("A", "B"), arrays=(np.ones(2), np.ones(2)), dropped=(1,))
    assert str(e.value) == (
        "sheetfuncs: 1 dropped counts for 2 groups; give one count (0 or more) per group"
    )


def test_groups_built_by_hand_name_a_none_without_the_python_option():
    with pytest.raises(InputError) as e:
        Groups(labels=("A",), arrays=([1.0, None],))
    assert str(e.value) == (
        'sheetfuncs: a missing value (None) at position 2 of group "A"; remove it or replace it '
        "with the measured value"
    )


def test_regrouped_needs_one_label_per_group():
    g = as_groups({"A": [1.0], "B": [2.0]})
    with pytest.raises(InputError) as e:
        g.regrouped(["X"])
    assert str(e.value) == "sheetfuncs: 1 new labels for 2 groups; give one per group"
    assert g.case_notes == ()


def test_contiguous_float64_arrays_are_read_only_views_not_copies():
    # issue 13: the user's arrays are used as they are (common practice: numpy views)
    a = np.array([1.0, 2.0, 3.5])
    b = np.array([2.0, 4.0, 4.5])
    g = as_groups({"a": a, "b": b})
    assert np.shares_memory(g.arrays[0], a) and np.shares_memory(g.arrays[1], b)
    assert a.flags.writeable and not g.arrays[0].flags.writeable  # the caller's array untouched
    strided = np.arange(8.0)[::2]
    ints = np.array([1, 2, 3])
    g2 = as_groups([strided, ints])
    assert not np.shares_memory(g2.arrays[0], strided) and g2.arrays[0].flags.c_contiguous
    assert g2.arrays[1].dtype == np.float64
    with pytest.raises(InputError, match="an infinite value at position 2"):
        as_groups([np.array([1.0, np.inf]), b])


@pytest.mark.parametrize("where", [0, 8191, 8192, 3 * 8192 + 4, 3 * 8192 + 9])
@pytest.mark.parametrize("bad, what", [
    (np.nan, "NaN \\(not a number\\)"), (-np.inf, "an infinite value"), (np.inf, "an infinite value"),
])
def test_a_bad_value_is_found_in_long_arrays_wherever_it_is(where, bad, what):
    # common practice: NaN and infinity propagate through a sum of squares; positions cover the
    # first and last value of a run of 8192 and the shorter last run
    a = np.linspace(-5.0, 5.0, 3 * 8192 + 10)
    a[where] = bad
    with pytest.raises(InputError, match=f'{what} at position {where + 1} of group "Group 2"'):
        as_groups([np.ones(3), a])


def test_huge_finite_values_whose_squares_overflow_are_accepted():
    # common practice: 1e300 squared overflows a double, yet 1e300 is a finite number
    a = np.full(3 * 8192 + 1, 1e300)
    a[::2] = -1.7e308
    g = as_groups([a, [1.0, 2.0]])
    assert g.arrays[0] is not a and np.shares_memory(g.arrays[0], a)
