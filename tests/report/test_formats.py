"""Number formats that follow the data's precision, in cells and in text: values with the data's
decimals, means with two more, squares with 2D + 2, and figures too small for their format in
scientific notation, never as zeros.
"""

from __future__ import annotations

import numpy as np
import openpyxl
import pytest

from sheetfuncs import oneway
from sheetfuncs.report.formats import Precision, format_measure, spread_decimals

from tests.support.scenarios import findings_text, name_cell, write_in


def test_number_formats_follow_the_data_precision(demo, tmp_path):
    _, _, wb = demo  # demo values carry one decimal
    assert wb["Data"]["C2"].number_format == "0.0"
    assert wb["Groups"]["C5"].number_format == "0.000"  # mean: two more decimals
    assert name_cell(wb, "ss_between").number_format == "0.0000"  # squares: 2D + 2
    three = write_in(tmp_path, {"A": [1.125, 1.250, 1.375], "B": [1.5, 1.625, 1.75]})
    wb3 = openpyxl.load_workbook(three)
    assert wb3["Data"]["C2"].number_format == "0.000"
    assert wb3["Groups"]["C5"].number_format == "0.00000"


def _shown(value: float, fmt: str) -> str:
    """What a spreadsheet shows for ``value`` in the fixed or scientific format ``fmt``
    (common practice: 0.000 = three decimals, 0.000E+00 = four significant digits)."""
    if "E" in fmt:
        return f"{value:.{len(fmt.split('E')[0].split('.')[1])}E}"
    return f"{value:.{len(fmt.split('.')[1]) if '.' in fmt else 0}f}"


def _has_digits(text: str) -> bool:
    return any(ch in "123456789" for ch in text)


# invented: float-path measurements of about 1e-6 (not shortest decimals: formula results)
TINY_FLOAT = {f"Probe {i + 1}": (1e-6 + 4e-8 * np.random.default_rng(7 + i).standard_normal(7) + i * 3e-8).tolist()
              for i in range(3)}


# invented: exact-path readings with seven decimals; SS about 1e-13
TINY_EXACT = {"a": [0.0000012, 0.0000013, 0.0000011, 0.0000012], "b": [0.0000014, 0.0000013, 0.0000015, 0.0000014]}


@pytest.mark.parametrize("groups", [TINY_FLOAT, TINY_EXACT], ids=["float path", "exact path"])
def test_very_small_figures_never_show_as_zeros(tmp_path, groups):
    path = write_in(tmp_path, groups)
    wb = openpyxl.load_workbook(path)
    ws = wb["Tables"]
    start = next(r for r in range(1, 20) if ws.cell(r, 1).value == "Source")
    for r in range(start + 1, start + 4):
        for c in (3, 4):  # SS and MS
            cell = ws.cell(r, c)
            if isinstance(cell.value, float):
                assert _has_digits(_shown(cell.value, cell.number_format)), (cell.coordinate, cell.value, cell.number_format)
    g = wb["Groups"]
    for r in range(5, 5 + len(groups)):
        for c in (3, 4):  # mean and SD
            cell = g.cell(r, c)
            assert _has_digits(_shown(cell.value, cell.number_format)), (cell.coordinate, cell.value, cell.number_format)
    ow = oneway(groups)
    want = {"SS between": ow.ss_between, "SS within (residual)": ow.ss_within, "SS total": ow.ss_total,
            "MS between": ow.ms_between, "MS within": ow.ms_within}
    seen = 0
    for row in wb["Audit"].iter_rows(min_row=7, max_col=2):
        if row[0].value in want:  # the Audit's formula cells are formatted for the Python value
            assert _has_digits(_shown(want[row[0].value], row[1].number_format)), row[0].value
            seen += 1
    assert seen == 5
    text = findings_text(path)
    spread = text[text.index("a spread of "):].split()[3].rstrip(".")
    assert _has_digits(spread), spread
    assert "a spread of 0.000000." not in text


def test_decimals_from_the_spread_and_tiny_figures_in_text():
    # common practice: three significant digits of the spread; four decimals when no spread is
    # known; a figure too small for its decimals with four significant digits
    assert spread_decimals(0.0195) == 4 and spread_decimals(None) is None
    assert Precision(None).value == 4  # no spread known: four decimals
    assert Precision(6).square_format(7e-14) == "0.000E+00" and Precision(6).square_format(0.5) == "0." + "0" * 12
    assert format_measure(4.4e-8, 6) == "0.00000004400" and format_measure(0.25, 3) == "0.250"
    assert format_measure(0.0, 6) == "0.000000"
