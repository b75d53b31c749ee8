"""Tests of sheetfuncs.input.ranges: groups_from_range and groups_from_long, the range rules of
the engineering guide.

The rules follow the host spreadsheet's own statistics functions (common practice): numbers
count, blanks are ignored, text and logical values in a referenced range are ignored (and
recorded), an error value anywhere stops the analysis and is named with its position (unless
``errors="missing"`` reads it as a missing value, recorded with its position).
"""

from __future__ import annotations

import datetime as dt
import decimal

import numpy as np
import pytest

from sheetfuncs import Groups, InputError, groups_from_long, groups_from_range
from sheetfuncs.input.cells import ERROR_TEXTS

COM_NA = -2146826246      # 0x800A0000 + 2042 (#N/A), as xlwings may pass it unconverted
COM_SPILL = -2146826243   # 0x800A0000 + 2045 (#SPILL!)


def arrays(g: Groups) -> list[list[float]]:
    return [a.tolist() for a in g.arrays]


def notes(g: Groups) -> list[tuple]:
    return [(c.row, c.col, c.kind, c.value, c.action) for c in g.cells]


# -- layouts -----------------------------------------------------------------------------------


def test_wide_layout_with_labels_in_the_first_row():
    g = groups_from_range([["Head 1", "Head 2"], [1.0, 2.0], [3.0, 4.0], [5.0, None]])
    assert g.labels == ("Head 1", "Head 2")
    assert arrays(g) == [[1.0, 3.0, 5.0], [2.0, 4.0]]
    assert g.layout == "wide" and g.label_source == "range"
    assert g.counts == (3, 2) and g.n_total == 5 and g.k == 2


def test_rowwise_layout_with_labels_in_the_first_column():
    g = groups_from_range([["Zone A", 1.0, 2.0, 3.0], ["Zone B", 4.0, 5.0, None]], layout="rowwise")
    assert g.labels == ("Zone A", "Zone B")
    assert arrays(g) == [[1.0, 2.0, 3.0], [4.0, 5.0]]
    assert g.layout == "rowwise"


def test_long_layout_labels_in_order_of_first_appearance():
    g = groups_from_range(
        [["Lot", "Value"], ["L2", 1.0], ["L1", 2.0], ["L2", 3.0], ["L3", 4.0], ["L1", 5.0]],
        layout="long",
    )
    assert g.labels == ("L2", "L1", "L3")
    assert arrays(g) == [[1.0, 3.0], [2.0, 5.0], [4.0]]
    assert g.layout == "long"


def test_layout_names_are_case_and_space_insensitive():
    rows = [["A", "B"], [1.0, 2.0], [3.0, 4.0]]
    assert groups_from_range(rows, layout=" Wide ").labels == ("A", "B")
    assert groups_from_range(rows, layout=None).labels == ("A", "B")


# -- labels argument ---------------------------------------------------------------------------


def test_labels_auto_numbers_in_first_row_are_data():
    g = groups_from_range([[1.0, 2.0], [3.0, 4.0]])
    assert g.labels == ("Group 1", "Group 2")
    assert arrays(g) == [[1.0, 3.0], [2.0, 4.0]]
    assert g.label_source == "default"


def test_labels_auto_needs_every_nonblank_heading_to_be_text():
    # one numeric heading: the first row is data, and the text heading is ignored and recorded
    g = groups_from_range([["A", 7.0], [1.0, 2.0], [3.0, 4.0]])
    assert g.labels == ("Group 1", "Group 2")
    assert arrays(g) == [[1.0, 3.0], [7.0, 2.0, 4.0]]
    assert notes(g) == [(0, 0, "text", "A", "ignored")]


def test_labels_true_lot_numbers_become_labels():
    g = groups_from_range([[1, 2, 3.0], [10.5, 11.5, 12.5], [10.7, 11.1, 12.9]], labels=True)
    assert g.labels == ("1", "2", "3")
    assert arrays(g) == [[10.5, 10.7], [11.5, 11.1], [12.5, 12.9]]


@pytest.mark.parametrize("flag", [True, "TRUE", "true", 1, "yes"])
def test_labels_true_spellings(flag):
    assert groups_from_range([[5, 6], [1.0, 2.0], [3.0, 4.0]], labels=flag).labels == ("5", "6")


@pytest.mark.parametrize("flag", [False, "FALSE", "false", 0, "no"])
def test_labels_false_every_cell_is_data(flag):
    g = groups_from_range([["A", "B"], [1.0, 2.0], [3.0, 4.0]], labels=flag)
    assert g.labels == ("Group 1", "Group 2")
    assert arrays(g) == [[1.0, 3.0], [2.0, 4.0]]
    assert notes(g) == [(0, 0, "text", "A", "ignored"), (0, 1, "text", "B", "ignored")]


@pytest.mark.parametrize("flag", ["auto", "", None, " AUTO "])
def test_labels_auto_spellings(flag):
    assert groups_from_range([["A", "B"], [1.0, 2.0]], labels=flag).labels == ("A", "B")


def test_numeric_labels_are_shown_in_shortest_form():
    g = groups_from_range([[3.0, 2.5, decimal.Decimal("7.50"), 1e20], [1.0, 2.0, 3.0, 4.0],
                           [2.0, 3.0, 4.0, 5.0]], labels=True)
    assert g.labels == ("3", "2.5", "7.5", "1e+20")


def test_labels_are_trimmed_and_compared_case_sensitively():
    g = groups_from_range([["  Oven ", "oven", "OVEN\t"], [1.0, 2.0, 3.0], [4.0, 5.0, 6.0]])
    assert g.labels == ("Oven", "oven", "OVEN")
    assert len(g.notes) == 1
    assert '"Oven", "oven", "OVEN"' in g.notes[0] and "differ only in case" in g.notes[0]


def test_labels_that_trim_to_the_same_text_are_a_duplicate():
    with pytest.raises(InputError, match='^sheetfuncs: the label "A" heads columns 1 and 2; '):
        groups_from_range([["A", " A "], [1.0, 2.0], [3.0, 4.0]])


def test_missing_heading_gets_a_default_name():
    g = groups_from_range([["A", None, "C"], [1.0, 2.0, 3.0], [4.0, 5.0, 6.0]])
    assert g.labels == ("A", "Group 2", "C")


def test_dates_in_label_positions_are_iso_dates():
    g = groups_from_range(
        [[dt.datetime(2024, 3, 1), dt.date(2024, 3, 2), dt.datetime(2024, 3, 3, 14, 30)],
         [1.0, 2.0, 3.0], [4.0, 5.0, 6.0]],
        labels=True,
    )
    assert g.labels == ("2024-03-01", "2024-03-02", "2024-03-03 14:30:00")


def test_logical_labels_with_labels_true():
    g = groups_from_range([[True, False], [1.0, 2.0], [3.0, 4.0]], labels=True)
    assert g.labels == ("TRUE", "FALSE")


# -- cell kinds --------------------------------------------------------------------------------


def test_text_and_logical_cells_are_ignored_and_recorded_with_position():
    g = groups_from_range([["A", "B"], [1.0, "n/a"], [True, 2.0], [3.0, "  "], [False, 4.0]])
    assert arrays(g) == [[1.0, 3.0], [2.0, 4.0]]
    assert notes(g) == [
        (1, 1, "text", "n/a", "ignored"),
        (2, 0, "logical", True, "ignored"),
        (3, 1, "text", "  ", "ignored"),
        (4, 0, "logical", False, "ignored"),
    ]
    assert g.ignored_count() == 4
    assert g.ignored_count("text") == 2 and g.ignored_count("logical") == 2
    assert g.cells[0].position == "row 2, column 2"


def test_positions_in_the_rowwise_layout_refer_to_the_range_as_given():
    g = groups_from_range([["A", 1.0, "x", 2.0], ["B", 3.0, 4.0, True]], layout="rowwise")
    assert notes(g) == [(0, 2, "text", "x", "ignored"), (1, 3, "logical", True, "ignored")]


def test_blank_cells_none_and_empty_string_are_ignored_silently():
    g = groups_from_range([["A", "B"], [None, 2.0], ["", 3.0], [1.0, None], [4.0, ""]])
    assert arrays(g) == [[1.0, 4.0], [2.0, 3.0]]
    assert g.cells == ()


def test_bool_is_a_logical_not_a_number():
    # bool is a subclass of int in Python; the host treats TRUE/FALSE in a range as logical
    g = groups_from_range([["A", "B"], [True, 1], [2.0, 3.0]])
    assert arrays(g) == [[2.0], [1.0, 3.0]]
    assert notes(g) == [(1, 0, "logical", True, "ignored")]


def test_plain_ints_and_decimals_are_numbers():
    g = groups_from_range([["A", "B"], [5, decimal.Decimal("1.25")], [np.int64(7), np.float32(2.5)],
                           [-2146826301, -2146826199]])
    assert arrays(g) == [[5.0, 7.0, -2146826301.0], [1.25, 2.5, -2146826199.0]]


@pytest.mark.parametrize("err", sorted(ERROR_TEXTS))
def test_every_error_text_in_the_data_is_an_error_with_its_position(err):
    with pytest.raises(InputError) as e:
        groups_from_range([["A", "B"], [1.0, 2.0], [3.0, err]])
    assert str(e.value) == (
        f"sheetfuncs: the data hold the error {err} at row 3, column 2 of the range; "
        "fix or clear that cell"
    )
    assert e.value.cells == ((2, 1),)


@pytest.mark.parametrize("code, name", [(COM_NA, "#N/A"), (COM_SPILL, "#SPILL!"),
                                        (-2146826281, "#DIV/0!"), (-2146826300, "with code -2146826300")])
def test_com_error_codes_are_errors(code, name):
    with pytest.raises(InputError, match=f"^sheetfuncs: the data hold the error {name} at row 2, column 1"):
        groups_from_range([["A", "B"], [code, 2.0], [3.0, 4.0]])


def test_several_errors_name_the_first_and_count_the_rest():
    with pytest.raises(InputError) as e:
        groups_from_range([["A", "B"], [1.0, "#N/A"], ["#REF!", 2.0], [3.0, "#N/A"]])
    assert "the error #N/A at row 2, column 2" in str(e.value)
    assert "(and 2 more)" in str(e.value)
    assert e.value.cells == ((1, 1), (2, 0), (3, 1))


def test_error_in_the_label_row_is_an_error():
    with pytest.raises(InputError, match="the error #NAME\\? at row 1, column 2"):
        groups_from_range([["A", "#NAME?"], [1.0, 2.0]])


def test_error_in_the_label_row_as_com_code():
    with pytest.raises(InputError, match="the error #N/A at row 1, column 1"):
        groups_from_range([[COM_NA, "B"], [1.0, 2.0]], labels=True)


@pytest.mark.parametrize("when", [dt.datetime(2024, 5, 1, 8, 0), dt.date(2024, 5, 1), dt.time(8, 30)])
def test_dates_in_data_positions_are_errors(when):
    with pytest.raises(InputError) as e:
        groups_from_range([["A", "B"], [1.0, when], [3.0, 4.0]])
    assert str(e.value) == (
        "sheetfuncs: a date at row 2, column 2 of the range: dates are not measurements; "
        "clear the cell, or format it as a number"
    )


def test_nan_and_infinity_in_a_range_are_errors_with_position():
    with pytest.raises(InputError, match=r"^sheetfuncs: NaN \(not a number\) at row 3, column 1 of the range"):
        groups_from_range([["A", "B"], [1.0, 2.0], [float("nan"), 4.0]])
    with pytest.raises(InputError, match="^sheetfuncs: an infinite value at row 2, column 2 of the range"):
        groups_from_range([["A", "B"], [1.0, float("-inf")], [3.0, 4.0]])


def test_unsupported_objects_are_rejected_with_position():
    with pytest.raises(InputError, match="^sheetfuncs: unsupported cell value .* at row 2, column 1"):
        groups_from_range([["A", "B"], [object(), 2.0], [3.0, 4.0]])


# -- blank lines and empty groups --------------------------------------------------------------


def test_entirely_blank_columns_are_ignored():
    g = groups_from_range([["A", None, "B", None], [1.0, None, 2.0, ""], [3.0, None, 4.0, None]])
    assert g.labels == ("A", "B")
    assert arrays(g) == [[1.0, 3.0], [2.0, 4.0]]


def test_entirely_blank_rows_are_ignored_in_rowwise_layout():
    g = groups_from_range([[None, None, None], ["A", 1.0, 2.0], ["", None, ""], ["B", 3.0, 4.0]],
                          layout="rowwise")
    assert g.labels == ("A", "B")


def test_default_names_follow_the_order_after_blank_columns_are_dropped():
    g = groups_from_range([[1.0, None, 2.0], [3.0, None, 4.0]])
    assert g.labels == ("Group 1", "Group 2")


def test_labelled_group_with_no_numbers_is_an_error():
    with pytest.raises(InputError) as e:
        groups_from_range([["Head 1", "Head 3"], [1.0, None], [2.0, "n/a"]])
    assert str(e.value) == (
        'sheetfuncs: group "Head 3" has no numbers; enter its values or leave it out of the range'
    )


def test_unlabelled_column_with_only_text_is_an_error():
    with pytest.raises(InputError, match="^sheetfuncs: column 2 of the range has no numbers, only text"):
        groups_from_range([[1.0, "x"], [2.0, "y"]])


def test_empty_range_and_range_without_numbers():
    with pytest.raises(InputError, match="^sheetfuncs: the range is empty"):
        groups_from_range([])
    with pytest.raises(InputError, match="^sheetfuncs: the range holds no numbers"):
        groups_from_range([[None, None], [None, ""]])


def test_ragged_rows_are_padded_with_blanks():
    g = groups_from_range([["A", "B"], [1.0], [2.0, 3.0], [4.0, 5.0]])
    assert arrays(g) == [[1.0, 2.0, 4.0], [3.0, 5.0]]


def test_numpy_object_range():
    cells = np.array([["A", "B"], [1.0, 2.0], [3.0, None]], dtype=object)
    g = groups_from_range(cells)
    assert arrays(g) == [[1.0, 3.0], [2.0]]


def test_arrays_are_read_only_float64():
    g = groups_from_range([["A", "B"], [1, 2], [3, 4]])
    assert all(a.dtype == np.float64 and not a.flags.writeable for a in g.arrays)


# -- long layout -------------------------------------------------------------------------------


def test_long_layout_header_only_when_the_value_cell_is_text():
    # value cell is a number: the first row is data, even if the label cell looks like a heading
    g = groups_from_range([["Lot", 9.0], ["L1", 1.0], ["Lot", 2.0]], layout="long")
    assert g.labels == ("Lot", "L1")
    assert arrays(g) == [[9.0, 2.0], [1.0]]
    # value cell is text: header row
    g = groups_from_range([[None, "Reading"], ["L1", 1.0], ["L2", 2.0]], layout="long")
    assert g.labels == ("L1", "L2")


def test_long_layout_numeric_and_date_labels():
    g = groups_from_range([[1, 10.0], [2.0, 11.0], [dt.date(2024, 1, 5), 12.0], [1.0, 13.0]],
                          layout="long")
    assert g.labels == ("1", "2", "2024-01-05")
    assert arrays(g) == [[10.0, 13.0], [11.0], [12.0]]


def test_long_layout_text_value_is_ignored_and_recorded():
    g = groups_from_range([["L1", 1.0], ["L2", 2.0], ["L1", "bad"], ["L2", True], ["L1", 3.0]],
                          layout="long")
    assert arrays(g) == [[1.0, 3.0], [2.0]]
    # each non-blank cell left out is recorded: the text (or logical) value, and its label
    assert notes(g) == [
        (2, 0, "label-only", "L1", "ignored"), (2, 1, "text", "bad", "ignored"),
        (3, 0, "label-only", "L2", "ignored"), (3, 1, "logical", True, "ignored"),
    ]


def test_long_layout_errors_and_missing_labels():
    with pytest.raises(InputError, match="the error #VALUE! at row 2, column 2"):
        groups_from_range([["L1", 1.0], ["L2", "#VALUE!"]], layout="long")
    with pytest.raises(InputError, match="the error #N/A at row 2, column 1"):
        groups_from_range([["L1", 1.0], ["#N/A", 2.0]], layout="long")
    with pytest.raises(InputError, match="a date at row 1, column 2"):
        groups_from_range([["L1", dt.date(2024, 1, 1)]], layout="long")


def test_long_layout_needs_two_columns():
    with pytest.raises(InputError) as e:
        groups_from_range([["L1", 1.0, 2.0]], layout="long")
    assert str(e.value) == (
        "sheetfuncs: the long layout needs exactly two columns (group label, value); "
        "the range has 3: give only the label and value columns (command line: --range, "
        "e.g. --range A1:B40)"
    )


def test_long_layout_label_with_only_text_values_is_an_error():
    with pytest.raises(InputError, match='^sheetfuncs: group "L2" has no numbers'):
        groups_from_range([["L1", 1.0], ["L2", "n/a"], ["L1", 2.0]], layout="long")


def test_long_layout_case_only_label_differences_are_noted():
    g = groups_from_range([["Lot A", 1.0], ["lot a", 2.0], ["Lot A", 3.0]], layout="long")
    assert g.labels == ("Lot A", "lot a")
    assert len(g.notes) == 1


def test_groups_from_long_parallel_columns():
    g = groups_from_long(["B", "A", "B", " A"], [1.0, 2.0, 3.0, 4.0])
    assert g.labels == ("B", "A")
    assert arrays(g) == [[1.0, 3.0], [2.0, 4.0]]


def test_groups_from_long_length_mismatch_names_both_lengths():
    with pytest.raises(InputError) as e:
        groups_from_long(["A", "B", "A"], [1.0, 2.0])
    assert str(e.value) == (
        "sheetfuncs: the label column has 3 entries but the value column has 2; "
        "give one label per value"
    )


# -- errors="missing" --------------------------------------------------------------------------


def test_errors_missing_reads_error_cells_as_missing_values_with_their_position():
    g = groups_from_range(
        [["Head 1", "Head 2"], [1.0, "#N/A"], [COM_NA, 2.0], [3.0, "#DIV/0!"], [4.0, 5.0]],
        errors="missing",
    )
    assert arrays(g) == [[1.0, 3.0, 4.0], [2.0, 5.0]]
    assert notes(g) == [
        (1, 1, "error", "#N/A", "missing"), (2, 0, "error", "#N/A", "missing"),
        (3, 1, "error", "#DIV/0!", "missing"),
    ]
    assert g.dropped == (1, 2)


def test_errors_missing_rowwise_counts_per_row():
    g = groups_from_range([["Zone A", 1.0, "#VALUE!", 2.0], ["Zone B", COM_SPILL, 3.0, 4.0]],
                          layout="rowwise", errors="missing")
    assert arrays(g) == [[1.0, 2.0], [3.0, 4.0]] and g.dropped == (1, 1)
    assert notes(g) == [(0, 2, "error", "#VALUE!", "missing"), (1, 1, "error", "#SPILL!", "missing")]


def test_errors_stop_is_still_the_default():
    with pytest.raises(InputError) as e:
        groups_from_range([["A", "B"], [1.0, "#N/A"], [2.0, 3.0]])
    assert str(e.value) == (
        "sheetfuncs: the data hold the error #N/A at row 2, column 2 of the range; fix or clear "
        "that cell"
    )


def test_errors_option_is_checked():
    with pytest.raises(InputError) as e:
        groups_from_range([["A", "B"], [1.0, 2.0]], errors="skip")
    assert str(e.value) == (
        'sheetfuncs: errors must be "stop" (an error cell stops the reading) or "missing" (error '
        'cells are missing values), not "skip"'
    )


def test_errors_missing_still_stops_on_dates_and_nan():
    with pytest.raises(InputError, match="^sheetfuncs: a date at row 2, column 2"):
        groups_from_range([["A", "B"], [1.0, dt.date(2024, 1, 1)], [2.0, 3.0]], errors="missing")
    with pytest.raises(InputError, match=r"^sheetfuncs: NaN \(not a number\) at row 2, column 1"):
        groups_from_range([["A", "B"], [float("nan"), "#N/A"], [2.0, 3.0]], errors="missing")


@pytest.mark.parametrize("layout, cells, where", [
    ("wide", [["A", "#N/A", "C"], [1.0, 2.0, 3.0], [4.0, 5.0, 6.0]], "row 1, column 2 of the range is the error #N/A; a group cannot be reported without its label: fix that cell, or leave its column"),
    ("rowwise", [["A", 1.0, 2.0], [COM_NA, 3.0, 4.0]], "row 2, column 1 of the range is the error #N/A; a group cannot be reported without its label: fix that cell, or leave its row"),
])
def test_errors_missing_an_error_in_the_label_line_still_stops(layout, cells, where):
    with pytest.raises(InputError) as e:
        groups_from_range(cells, layout=layout, errors="missing")
    assert str(e.value) == f"sheetfuncs: the group label at {where} out of the range"
    assert len(e.value.cells) == 1


def test_errors_missing_label_errors_count_the_rest():
    with pytest.raises(InputError) as e:
        groups_from_range([["#REF!", "B", "#N/A"], [1.0, 2.0, 3.0]], labels=True, errors="missing")
    assert "is the error #REF! (and 1 more); a group" in str(e.value)
    assert e.value.cells == ((0, 0), (0, 2))


def test_errors_missing_first_row_of_numbers_and_errors_is_data():
    # labels="auto": the non-error cells of the first row are numbers, so the row is data
    g = groups_from_range([[1.0, "#N/A"], [2.0, 3.0], [4.0, 5.0]], errors="missing")
    assert g.labels == ("Group 1", "Group 2") and arrays(g) == [[1.0, 2.0, 4.0], [3.0, 5.0]]
    assert notes(g) == [(0, 1, "error", "#N/A", "missing")]
    g = groups_from_range([["#N/A", "x"], [2.0, 3.0]], labels=False, errors="missing")
    assert arrays(g) == [[2.0], [3.0]] and g.dropped == (1, 0)


def test_errors_missing_a_group_of_errors_only_has_no_numbers():
    with pytest.raises(InputError) as e:
        groups_from_range([["A", "B"], [1.0, "#N/A"], [2.0, "#N/A"]], errors="missing")
    assert str(e.value) == (
        'sheetfuncs: group "B" has no numbers (its 2 error cells were read as missing); enter '
        "its values or leave it out of the range"
    )
    with pytest.raises(InputError, match=r"its 1 error cell was read as missing\)"):
        groups_from_range([["A", "B"], [1.0, "#N/A"], [2.0, None]], errors="missing")
    with pytest.raises(InputError) as e:
        groups_from_range([[1.0, "#N/A"], [2.0, "x"]], errors="missing")
    assert str(e.value) == (
        "sheetfuncs: column 2 of the range has no numbers, only text, logical or missing values; "
        "clear it or leave it out of the range"
    )


def test_errors_missing_gives_the_same_groups_as_the_cleaned_range():
    dirty = [["L1", "L2", "L3"], [1.2, "#N/A", 3.1], ["#DIV/0!", 2.2, 3.3], [1.4, 2.6, COM_NA]]
    clean = [["L1", "L2", "L3"], [1.2, None, 3.1], [None, 2.2, 3.3], [1.4, 2.6, None]]
    a, b = groups_from_range(dirty, errors="missing"), groups_from_range(clean)
    assert a.labels == b.labels and arrays(a) == arrays(b)
    assert a.dropped == (1, 1, 1) and b.dropped == (0, 0, 0)


# -- long layout: label-only and unlabelled rows, errors="missing" -----------------------------


def test_long_layout_label_without_value_is_recorded_at_its_label_cell():
    g = groups_from_range([["Lot", "g"], ["L1", 1.0], ["L2", None], ["L2", 2.0], ["L1", ""]],
                          layout="long")
    assert arrays(g) == [[1.0], [2.0]]
    assert notes(g) == [(2, 0, "label-only", "L2", "ignored"), (4, 0, "label-only", "L1", "ignored")]


def test_long_layout_value_without_label_is_recorded_for_files_and_an_error_in_a_cell():
    rows = [["L1", 1.0], [None, 2.0], ["  ", 3.0], ["L1", 4.0]]
    g = groups_from_range(rows, layout="long", unlabelled="log")  # as read_groups reads a file
    assert arrays(g) == [[1.0, 4.0]]
    assert notes(g) == [(1, 1, "unlabelled", 2.0, "ignored"), (2, 1, "unlabelled", 3.0, "ignored")]
    with pytest.raises(InputError) as e:  # a worksheet function has no log to show it in
        groups_from_range(rows, layout="long")
    assert e.value.reason == (
        "the value at row 2, column 2 of the range has no group label; fill in its label (first "
        "column) or clear the value"
    )
    with pytest.raises(InputError, match="no group label"):
        groups_from_long(["L1", None], [1.0, 2.0])


def test_long_layout_a_label_with_only_label_only_rows_has_no_numbers():
    with pytest.raises(InputError) as e:
        groups_from_range([["L1", 1.0], ["L2", None], ["L1", 2.0], ["L2", None]], layout="long")
    assert str(e.value) == (
        'sheetfuncs: group "L2" has no numbers; enter its values or leave it out of the range'
    )


def test_long_layout_errors_missing():
    g = groups_from_range(
        [["Lot", "g"], ["L1", 1.0], ["L1", "#N/A"], ["L2", 2.0], ["#REF!", 3.0], [COM_NA, "#N/A"]],
        layout="long", errors="missing",
    )
    assert g.labels == ("L1", "L2") and arrays(g) == [[1.0], [2.0]] and g.dropped == (1, 0)
    assert notes(g) == [
        (2, 0, "label-only", "L1", "ignored"), (2, 1, "error", "#N/A", "missing"),
        (4, 0, "error", "#REF!", "missing"), (4, 1, "unlabelled", 3.0, "ignored"),
        (5, 0, "error", "#N/A", "missing"), (5, 1, "error", "#N/A", "missing"),
    ]


def test_long_layout_errors_missing_a_label_with_only_errors_has_no_numbers():
    with pytest.raises(InputError) as e:
        groups_from_range([["L1", 1.0], ["L2", "#N/A"], ["L1", 2.0]], layout="long", errors="missing")
    assert str(e.value) == (
        'sheetfuncs: group "L2" has no numbers (its 1 error cell was read as missing); enter its '
        "values or leave it out of the range"
    )


def test_groups_from_long_takes_errors_too():
    g = groups_from_long(["A", "A", "B"], [1.0, "#N/A", 2.0], errors="missing")
    assert arrays(g) == [[1.0], [2.0]] and g.dropped == (1, 0)
    with pytest.raises(InputError, match="the error #N/A at row 2, column 2"):
        groups_from_long(["A", "A", "B"], [1.0, "#N/A", 2.0])
