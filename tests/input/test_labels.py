"""Tests of sheetfuncs.input.labels: labels as text, possible typos, and the label fixes
(``--merge-case``, ``--rename OLD=NEW``, Python ``relabel={...}``) without editing the data.

No check here needs an outside source: values are only carried and joined, never computed; the
rules are the project's own (issue 10, item 5; common practice for a QA analyst).
"""

from __future__ import annotations

import numpy as np
import pytest

from sheetfuncs import Groups, InputError, as_groups, groups_from_range
from sheetfuncs.input.groups import CellNote
from sheetfuncs.input.labels import case_notes, format_label, parse_rename, relabel


def arrays(g: Groups) -> list[list[float]]:
    return [a.tolist() for a in g.arrays]


SUPPLIERS = {"Supplier A": [1.0, 2.0], "Supplier B": [3.0, 4.0], "supplier B": [5.0]}


def test_format_label_shortest_numbers_trimmed_text():
    assert format_label(" Lot 7 ") == "Lot 7" and format_label(3.0) == "3" and format_label(True) == "TRUE"


def test_case_notes_name_each_set_of_labels_that_differ_only_in_case():
    assert case_notes(["Lot A", "lot a", "Lot B", "LOT A"]) == (
        'labels "Lot A", "lot a", "LOT A" differ only in case and are kept as separate groups; '
        "check for a typo",
    )
    assert case_notes(["A", "B"]) == ()


# -- merge_case --------------------------------------------------------------------------------


def test_merge_case_merges_into_the_first_spelling_and_the_typo_note_becomes_the_merge_note():
    g = as_groups(SUPPLIERS)
    assert g.notes == (
        'labels "Supplier B", "supplier B" differ only in case and are kept as separate groups; '
        "check for a typo",
    )
    m = relabel(g, merge_case=True)
    assert m.labels == ("Supplier A", "Supplier B")
    assert arrays(m) == [[1.0, 2.0], [3.0, 4.0, 5.0]]  # values joined in the order the groups came
    assert m.notes == ('label "supplier B" merged into "Supplier B" (they differ only in case)',)


def test_merge_case_surrounding_spaces_of_groups_built_by_hand():
    g = Groups(labels=("Zone 1", " zone 1 ", "Zone 1 "), arrays=(np.ones(2), np.ones(1), np.ones(3)))
    m = relabel(g, merge_case=True)
    assert m.labels == ("Zone 1",) and m.counts == (6,)
    assert m.notes == (
        'label " zone 1 " merged into "Zone 1" (they differ only in case and surrounding spaces)',
        'label "Zone 1 " merged into "Zone 1" (they differ only in surrounding spaces)',
    )


def test_labels_read_from_cells_are_trimmed_so_spaces_alone_never_make_two_groups():
    g = groups_from_range([["Lot", "g"], ["L1 ", 1.0], [" L1", 2.0], ["L1", 3.0]], layout="long")
    assert g.labels == ("L1",) and arrays(g) == [[1.0, 2.0, 3.0]]
    with pytest.raises(InputError, match='^sheetfuncs: the label "A" heads columns 1 and 2'):
        groups_from_range([["A ", " A"], [1.0, 2.0]])


def test_merge_case_without_case_variants_returns_the_groups_unchanged():
    g = as_groups({"A": [1.0], "B": [2.0]})
    assert relabel(g, merge_case=True) is g
    assert relabel(g) is g and relabel(g, rename={}) is g


# -- rename ------------------------------------------------------------------------------------


def test_rename_fixes_a_typo_by_merging_into_an_existing_label():
    m = relabel(as_groups(SUPPLIERS), rename={"supplier B": "Supplier B"})
    assert m.labels == ("Supplier A", "Supplier B")
    assert arrays(m) == [[1.0, 2.0], [3.0, 4.0, 5.0]]
    assert m.notes == (
        'label "supplier B" renamed to "Supplier B" (merged with the other values labelled '
        '"Supplier B")',
    )


def test_rename_to_a_new_label():
    m = relabel(as_groups({"L1": [1.0], "L2": [2.0]}), rename=["L1=Lot 1"])
    assert m.labels == ("Lot 1", "L2") and m.notes == ('label "L1" renamed to "Lot 1"',)


def test_renames_are_applied_once_not_chained():
    g = as_groups({"A": [1.0], "B": [2.0], "C": [3.0]})
    m = relabel(g, rename={"A": "B", "B": "C"})
    # A becomes B and B becomes C: B's values join C, A's do not travel on to C
    assert m.labels == ("B", "C") and arrays(m) == [[1.0], [2.0, 3.0]]
    swapped = relabel(g, rename=["A=B", "B=A"])
    assert swapped.labels == ("B", "A", "C") and arrays(swapped) == [[1.0], [2.0], [3.0]]


def test_two_labels_renamed_to_one_new_label_are_merged():
    m = relabel(as_groups({"x1": [1.0], "y": [2.0], "x2": [3.0]}), rename={"x1": "X", "x2": "X"})
    assert m.labels == ("X", "y") and arrays(m) == [[1.0, 3.0], [2.0]]
    assert len(m.notes) == 2 and all("merged with the other values" in n for n in m.notes)


def test_rename_then_merge_case():
    g = as_groups({"Lot A": [1.0], "lot b": [2.0], "LOT B": [3.0], "old": [4.0]})
    m = relabel(g, merge_case=True, rename={"old": "Lot B"})
    assert m.labels == ("Lot A", "lot b")
    assert arrays(m) == [[1.0], [2.0, 3.0, 4.0]]
    assert m.notes == (
        'label "old" renamed to "Lot B"',
        'label "LOT B" merged into "lot b" (they differ only in case)',
        'label "Lot B" merged into "lot b" (they differ only in case)',
    )


def test_identity_rename_is_not_noted():
    g = as_groups({"A": [1.0], "B": [2.0]})
    assert relabel(g, rename={"A": "A"}) is g


def test_relabel_keeps_the_cells_log_layout_and_label_source():
    g = groups_from_range([["L1", "L2"], [1.0, "n/a"], [2.0, 3.0]])
    m = relabel(g, rename={"L2": "Lot 2"})
    assert m.cells == g.cells == (CellNote(1, 1, "text", "n/a", "ignored"),)
    assert m.layout == "wide" and m.label_source == "range"


def test_relabel_adds_dropped_counts_and_remakes_their_note():
    g = as_groups({"a": [1.0, None], "A": [np.nan, 2.0, None], "B": [3.0]}, missing="drop")
    assert g.dropped == (1, 2, 0)
    assert g.notes[-1] == '3 missing values (NaN or None) dropped: "a" 1, "A" 2'
    m = relabel(g, merge_case=True)
    assert m.dropped == (3, 0)
    assert m.notes == (
        'label "A" merged into "a" (they differ only in case)',
        '3 missing values (NaN or None) dropped: "a" 3',
    )


# -- messages ----------------------------------------------------------------------------------


def test_renaming_a_label_that_no_group_has_lists_the_labels():
    g = as_groups({"Supplier A": [1.0], "Supplier B": [2.0]})
    with pytest.raises(InputError) as e:
        relabel(g, rename={"Supplier C": "X"})
    assert str(e.value) == (
        'sheetfuncs: no group is labelled "Supplier C", so it cannot be renamed; the labels are '
        '"Supplier A", "Supplier B"'
    )
    with pytest.raises(InputError) as e:
        relabel(g, rename={"supplier b": "X"})
    assert str(e.value) == (
        'sheetfuncs: no group is labelled "supplier b" (labels are compared with their case: '
        '"Supplier B" differs), so it cannot be renamed; the labels are "Supplier A", "Supplier B"'
    )


def test_the_list_of_labels_in_a_message_is_cut_after_twelve():
    g = as_groups({f"L{i}": [float(i)] for i in range(20)})
    with pytest.raises(InputError) as e:
        relabel(g, rename={"M": "N"})
    assert str(e.value).endswith('"L10", "L11" and 8 more')


@pytest.mark.parametrize("text", ["supplier B", "=Supplier B", "supplier B=", " = "])
def test_a_rename_that_is_not_old_equals_new_says_how_to_write_it(text):
    with pytest.raises(InputError) as e:
        parse_rename([text])
    assert str(e.value) == (
        f'sheetfuncs: cannot read the rename "{text}"; write it as OLD=NEW, e.g. '
        '--rename "supplier B=Supplier B"'
    )


def test_rename_text_is_split_at_its_first_equals_sign_and_trimmed():
    assert parse_rename(["pH = pH=7 ", "A=B"]) == {"pH": "pH=7", "A": "B"}
    assert parse_rename("A=B") == {"A": "B"} and parse_rename(None) == {}
    assert parse_rename({3.0: " Lot 3 "}) == {"3": "Lot 3"}


def test_a_label_renamed_twice_is_an_error():
    with pytest.raises(InputError) as e:
        parse_rename(["A=B", "A=C"])
    assert str(e.value) == 'sheetfuncs: the label "A" is renamed twice ("B" and "C"); give it one new label'
    assert parse_rename(["A=B", "A=B"]) == {"A": "B"}


def test_an_empty_label_in_a_mapping_is_an_error():
    with pytest.raises(InputError) as e:
        parse_rename({"A": ""})
    assert str(e.value) == 'sheetfuncs: cannot rename "A" to "": a label cannot be empty; give both labels'


def test_renames_of_another_type_are_an_error():
    with pytest.raises(InputError) as e:
        parse_rename(5)
    assert str(e.value) == (
        'sheetfuncs: the renames must be a mapping of old label to new label, e.g. '
        '{"supplier B": "Supplier B"}, not int'
    )
