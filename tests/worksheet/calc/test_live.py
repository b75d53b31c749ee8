"""The SF_ functions in a real LibreOffice Calc (headless), with the extension built from this
checkout: every registry example against the Python call, the wizard's texts against the
registry, recalculation, error cells, messages, tables as array formulas, saving and reloading
as .ods and .xlsx, and workbooks moving between Excel's and Calc's formula form.

The reference is the Python call through the harness, which tests/worksheet/test_xlwings_real.py
checks against xlwings' own code: numbers equal to a relative 1e-15 (issue 11), text equal.
Each LibreOffice start costs about a second, so one job runs many steps.
"""

from __future__ import annotations

import zipfile
from pathlib import Path

import openpyxl
import pytest
from openpyxl.worksheet.formula import ArrayFormula

from sheetfuncs.cli.commands import main
from sheetfuncs.udfs import REGISTRY
from sheetfuncs.worksheet import harness
from sheetfuncs.worksheet.calc.check import Example, compare, example_job, examples
from sheetfuncs.worksheet.calc.names import stored_name
from sheetfuncs.worksheet.calc.office import run_job
from sheetfuncs.worksheet.functions import EXAMPLE_SHEET

@pytest.fixture(scope="module")
def calc(calc_office):
    return calc_office


@pytest.fixture(scope="module")
def live(calc, tmp_path_factory):
    """One Calc run: every example, the wizard, the extra checks, and the saved files."""
    office, profile = calc
    out = tmp_path_factory.mktemp("calc-live")
    chosen = examples()
    steps = example_job(chosen) + [{"op": "wizard", "key": "wizard"}]
    steps += [
        {"op": "sheet", "name": "extra", "index": 0},
        {"op": "cells", "at": "A1", "rows": [list(r) for r in EXAMPLE_SHEET]},
        {"op": "formula", "at": "F1", "formula": "=SF_P(A1:C7)"},
        {"op": "formula", "at": "F2", "formula": "=SF_P(A1:C9)"},
        {"op": "formula", "at": "F3", "formula": "=SF_P(A1:C7;\"long\")"},
        {"op": "array", "at": "F5:G6", "formula": "=SF_TABLE(A1:C7;\"sideways\")"},
        {"op": "formula", "at": "F8", "formula": "=SF_F(A1:C7;;TRUE())"},
        {"op": "formula", "at": "F9", "formula": "=SF_P(A1:A10)"},
        {"op": "formula", "at": "B9", "formula": "=NA()"},
        {"op": "formula", "at": "A10", "formula": "=DATE(2026;12;3)"},
        {"op": "recalc"},
        {"op": "read", "at": "F1:F9", "key": "before"},
        {"op": "value", "at": "A2", "value": 1.62},
        {"op": "read", "at": "F1", "key": "after"},
        {"op": "formula", "at": "B9", "formula": "=SQRT(-1)"},
        {"op": "read", "at": "F2", "key": "calc_error"},
        {"op": "save", "path": str(out / "saved.ods"), "filter": "calc8"},
        {"op": "save", "path": str(out / "saved.xlsx"), "filter": "Calc MS Excel 2007 XML"},
    ]
    return chosen, run_job(office, steps, profile), out


def test_every_registry_example_equals_the_python_call(live) -> None:
    chosen, read, _ = live
    problems = [p for ex in chosen for p in compare(ex, read[ex.name])]
    assert len(chosen) == len(REGISTRY)
    assert problems == []
    cells = sum(ex.shape[0] * ex.shape[1] for ex in chosen)
    print(f"\n{len(chosen)} registry examples computed in headless Calc ({cells} cells) equal the Python call")


def test_the_comparison_can_fail() -> None:
    ex = Example("SF_P", EXAMPLE_SHEET, "=SF_P(A1:C7)", 0.5)
    assert compare(ex, {"values": [[0.5 * (1 + 3e-15)]], "errors": [[0]]})
    assert compare(ex, {"values": [[0.5]], "errors": [[504]]}) == ["SF_P row 1 column 1: Calc shows Err:504, Python 0.5"]
    assert compare(ex, {"values": [[0.5 * (1 + 1e-16)]], "errors": [[0]]}) == []


def test_wizard_texts_equal_the_registry(live) -> None:
    _, read, _ = live
    wizard = read["wizard"]
    assert sorted(wizard) == sorted(REGISTRY)
    for name, rec in REGISTRY.items():
        shown = wizard[name]
        assert shown["description"] == rec.description, name
        assert [a[0] for a in shown["arguments"]] == [a.name for a in rec.args], name
        assert [a[1] for a in shown["arguments"]] == [a.dialog_text for a in rec.args], name


def test_recalculation_after_a_data_cell_changes(live) -> None:
    _, read, _ = live
    sheet = [list(r) for r in EXAMPLE_SHEET]
    sheet[1][0] = 1.62
    assert read["before"]["values"][0][0] == harness.call("SF_P", [list(r) for r in EXAMPLE_SHEET])
    assert read["after"]["values"][0][0] == harness.call("SF_P", sheet)
    assert read["after"]["values"][0][0] != read["before"]["values"][0][0]


def test_error_cells_are_named_not_hidden(live) -> None:
    _, read, _ = live
    values = [row[0] for row in read["before"]["values"]]
    assert values[1] == "sheetfuncs: the data hold the error #N/A at row 9, column 2 of the range; fix or clear that cell"
    assert read["calc_error"]["values"][0][0] == (
        "sheetfuncs: the data hold the error Err:502 at row 9, column 2 of the range; fix or clear that cell")


def test_messages_and_options_arrive_as_in_excel(live) -> None:
    _, read, _ = live
    values = [row[0] for row in read["before"]["values"]]
    data = [list(r) for r in EXAMPLE_SHEET]
    assert values[2] == harness.call("SF_P", data, "long")  # a message, one line
    assert harness.is_message(values[2])
    assert values[4] == harness.call("SF_TABLE", data, "sideways")  # a table function's message
    assert values[7] == harness.call("SF_F", data, harness.MISSING, True)  # TRUE() is 1 in Calc
    assert values[8].startswith("sheetfuncs: a date at row 10, column 1 of the range")


def _reload(calc, path: Path, at: str = "AA1:AF4", sheet: str = "SF_TABLE") -> dict:
    office, profile = calc
    steps = [{"op": "load", "path": str(path)}, {"op": "recalc"},
             {"op": "read", "sheet": sheet, "at": at, "key": "table"},
             {"op": "read", "sheet": "SF_P", "at": "AA1", "key": "p"}]
    return run_job(office, steps, profile)


@pytest.mark.parametrize("kind", ["ods", "xlsx"])
def test_saved_files_reload_and_recalculate(calc, live, kind) -> None:
    chosen, _, out = live
    read = _reload(calc, out / f"saved.{kind}")
    by_name = {ex.name: ex for ex in chosen}
    assert compare(by_name["SF_TABLE"], read["table"]) == []
    assert compare(by_name["SF_P"], read["p"]) == []
    assert read["p"]["formulas"][0][0] == "=" + stored_name("SF_P") + "(A1:C7)"


def test_an_excel_workbook_calculates_in_calc_after_convert(calc, tmp_path) -> None:
    """An .xlsx as Excel with xlwings saves it (plain SF_ names, a table as an array formula)."""
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "Torque"
    for row in EXAMPLE_SHEET:
        ws.append(list(row))
    ws["F1"] = "=SF_P(A1:C7)"
    ws["F3"] = ArrayFormula("F3:K6", "=SF_TABLE(A1:C7)")
    excel = tmp_path / "from-excel.xlsx"
    wb.save(excel)
    office, profile = calc
    plain = run_job(office, [{"op": "load", "path": str(excel)}, {"op": "recalc"},
                             {"op": "read", "at": "F1", "key": "p"}], profile)
    assert plain["p"]["errors"][0][0] == 525  # #NAME?: Calc 7.4 does not map plain SF_ names
    for argv in (["calc", "convert", str(excel), "-o", str(tmp_path / "for-calc.xlsx"), "--to", "calc"],):
        assert main(argv) == 0
    read = run_job(office, [{"op": "load", "path": str(tmp_path / "for-calc.xlsx")}, {"op": "recalc"},
                            {"op": "read", "at": "F1", "key": "p"},
                            {"op": "read", "at": "F3:K6", "key": "table"}], profile)
    data = [list(r) for r in EXAMPLE_SHEET]
    assert read["p"]["values"][0][0] == harness.call("SF_P", data)
    ex = Example("SF_TABLE", EXAMPLE_SHEET, "", harness.call("SF_TABLE", data))
    assert compare(ex, read["table"]) == []


def test_a_calc_workbook_goes_back_to_the_excel_form(live, tmp_path) -> None:
    _, _, out = live
    back = tmp_path / "for-excel.xlsx"
    assert main(["calc", "convert", str(out / "saved.xlsx"), "-o", str(back), "--to", "excel"]) == 0
    with zipfile.ZipFile(out / "saved.xlsx") as src, zipfile.ZipFile(back) as dst:
        texts = [dst.read(n).decode() for n in dst.namelist() if n.startswith("xl/worksheets/sheet")]
        assert [n for n in src.namelist()] == dst.namelist()
    joined = "".join(texts)
    assert "ORG.SHEETFUNCS" not in joined
    assert ">SF_P(A1:C7)</f>" in joined
    assert 'SF_TABLE(A1:C7,,,&quot;Capping head&quot;)</f>' in joined or \
        "SF_TABLE(A1:C7,,,\"Capping head\")</f>" in joined


def test_calc_check_passes(calc, capsys) -> None:
    _, profile = calc
    assert main(["calc", "check", "--profile", str(profile)]) == 0
    said = capsys.readouterr().out
    assert "SF_P(A1:C7): 1 cell in Calc, equal to the Python call" in said
    assert "check passed" in said
