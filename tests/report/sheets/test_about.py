"""The About sheet: where the data came from, the options, the arithmetic and the published
source of every method used."""

from __future__ import annotations

import openpyxl

from sheetfuncs.input.source import InputSource

from tests.support.scenarios import CLEAR, cells_text, write_in


def _items(ws) -> dict[str, object]:
    return {r[0]: r[1] for r in ws.iter_rows(min_row=4, max_col=2, values_only=True) if r[0] and r[0] != "•"}


def test_about_names_the_input_file_sheet_and_first_cell(demo):
    _, _, wb = demo  # read from 'Lot data'!B3 of zones.xlsx, with the control "Zone 1"
    items = _items(wb["About"])
    assert items["Input file (absolute path)"].endswith("zones.xlsx")
    assert items["Input file (absolute path)"].startswith("/")  # absolute (common practice: POSIX)
    assert items["Sheet"] == "Lot data" and items["First cell of the range"] == "B3"
    assert items["Control group (Dunnett)"] == "Zone 1"
    assert "Dunnett, C. W. (1955)" in cells_text(wb["About"])


def test_about_without_a_file_says_so_and_lists_only_the_methods_used(tmp_path):
    for name, source in (("python.xlsx", None), ("no-path.xlsx", InputSource(path=None, sheet="Demo"))):
        ws = openpyxl.load_workbook(write_in(tmp_path, CLEAR, name, source=source))["About"]
        items = _items(ws)
        assert items["Source"].startswith("data passed from Python (no file)")
        assert "Input file (absolute path)" not in items and "Input file SHA-256" not in items
        assert items.get("Sheet") == (None if source is None else "Demo")  # the Data sheet's addresses
        assert len(items["Data fingerprint (SHA-256)"]) == 64
        assert items["Control group (Dunnett)"] == "none"
        # CLEAR's values carry one decimal (common practice: the decimals as typed)
        assert items["Arithmetic"].startswith("decimal-exact path") and "carry 1 decimal)" in items["Arithmetic"]
        text = cells_text(ws)
        assert "Tukey, J. W. (1953)" in text and "Dunnett, C. W." not in text
        assert "Validate this tool under your organisation's software-validation procedure" in text
