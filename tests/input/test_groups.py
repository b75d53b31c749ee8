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
