"""The in-memory sheet: numbers stay numbers, infinity and NaN become words with a note, text is
always text, and sheet names are quoted where a reference needs it."""

from __future__ import annotations

import math

from sheetfuncs.report.grid import INFINITE_NOTE, UNDEFINED_NOTE, Formula, Grid, Style, quote_sheet, safe_text


def test_put_keeps_numbers_and_words_the_rest():
    g = Grid("T")
    g.put(1, 1, 3, Style(num="0"))
    g.put(1, 2, math.inf, Style(num="0.00"))
    g.put(1, 3, math.nan)
    g.put(1, 4, Formula("=A1+1"))
    assert g.cells[(1, 1)].value == 3 and g.cells[(1, 1)].style.num == "0"
    inf = g.cells[(1, 2)]
    assert (inf.value, inf.comment, inf.style.num, inf.style.halign) == ("infinite", INFINITE_NOTE, None, "right")
    assert (g.cells[(1, 3)].value, g.cells[(1, 3)].comment) == ("undefined", UNDEFINED_NOTE)
    assert g.cells[(1, 4)].value == Formula("=A1+1")
    assert g.max_row == 1


def test_sheet_names_in_references():
    # common practice (the A1 reference grammar): quote names with spaces or that look like a cell
    assert quote_sheet("Data") == "Data"
    assert quote_sheet("Data 2") == "'Data 2'" and quote_sheet("AB12") == "'AB12'"
    assert quote_sheet("Lot's data") == "'Lot''s data'"
    assert Grid("Data 2").ref(5, 3) == "'Data 2'!$C$5"


def test_text_longer_than_a_cell_is_cut_saying_so():
    s = safe_text("x" * 40_000)
    assert len(s) == 32767 and s.endswith("(cut: the text has 40,000 characters)")
