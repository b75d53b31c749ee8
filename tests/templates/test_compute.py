"""SF_ cells computed with the core: values are the Python call through the harness."""

from __future__ import annotations

import math
from pathlib import Path

import openpyxl
import pytest
from openpyxl.worksheet.formula import ArrayFormula

from sheetfuncs.errors import InputError
from sheetfuncs.templates.cells import ErrorValue
from sheetfuncs.templates.compute import compute_sf_cells
from sheetfuncs.worksheet.harness import call

ROWS = [["Zone 1", "Zone 2"], [81.2, 83.0], [81.9, 82.6], [81.5, 83.4]]  # invented oven readings


def book(path: Path, extra: dict[str, object]) -> Path:
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "Oven"
    for row in ROWS:
        ws.append(row)
    ws["E1"] = 0.01
    for ref, v in extra.items():
        ws[ref] = v
    wb.save(path)
    return path


def test_scalar_array_and_chained_sf_cells(tmp_path: Path) -> None:
    path = book(tmp_path / "b.xlsx", {"D1": "=SF_P(A1:B4)", "D2": "=SF_P(Zones,,E1)",
                                      "G1": ArrayFormula("G1:M5", "=SF_TABLE(A1:B4)")})
    computed, formulas = compute_sf_cells(path, {"ZONES": "Oven!$A$1:$B$4"})
    cells = dict(computed.cells)
    assert math.isclose(cells[("Oven", "D1")], call("SF_P", ROWS), rel_tol=1e-12)  # the Python call through the harness
    assert cells[("Oven", "D2")] == call("SF_P", ROWS, None, 0.01)  # the Python call through the harness
    table = call("SF_TABLE", ROWS)  # the Python call through the harness
    assert cells[("Oven", "H2")] == table[1][1] and cells[("Oven", "M1")] == ErrorValue("#N/A")
    assert cells[("Oven", "G5")] == ErrorValue("#N/A")
    assert len(formulas) == 3 and all(f.sf for f in formulas)


def test_unresolvable_and_unknown_calls_are_one_line(tmp_path: Path) -> None:
    path = book(tmp_path / "b.xlsx", {"D1": "=SF_NOPE(A1:B4)"})
    with pytest.raises(InputError, match=r"'Oven'!D1 calls SF_NOPE, which is not a function of this"):
        compute_sf_cells(path, {})
    path = book(tmp_path / "c.xlsx", {"D1": "=SF_P(A1:B4,,F1)", "F1": "=E1/2"})
    with pytest.raises(InputError, match=r"refers to 'Oven'!F1, which holds another formula \(=E1/2\)"):
        compute_sf_cells(path, {})
