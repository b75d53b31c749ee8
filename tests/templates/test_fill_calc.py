"""The same numbers everywhere: each ready template filled headless with the tests' own data
(invented), its stored values compared with the Python call and with headless Calc's
recalculation of the same file, with the extension built from this checkout.

The stored SF_ values are the Python call (the filler computes them through the harness, which
tests/worksheet/test_xlwings_real.py checks against xlwings' own code); here every stored cell
of every SF_ area and every decision cell is set beside what Calc shows after recalculating the
Calc form of the filled file: numbers within 1e-12 relative (issue 12), text equal, blank cells
blank, #N/A where an area is larger than its result, logicals as Calc's 1 or 0.
"""

from __future__ import annotations

import math
from pathlib import Path
from typing import Any

import openpyxl
import pytest

from sheetfuncs.cli.commands import main
from sheetfuncs.templates import KINDS, fill_template, write_template
from sheetfuncs.worksheet.calc.office import run_job
from sheetfuncs.worksheet.calc.workbook import convert_workbook

#: The tests' own data for each kind (invented), as CSV text.
DATA = {
    "compare-groups": "Line A,Line B,Line C\n20.1,21.4,19.8\n20.4,21.0,19.5\n19.9,21.7,20.0\n"
                      "20.2,21.2,19.7\n20.6,,19.9\n",
    "lot-homogeneity": "101,102,103,104\n5.02,5.11,4.97,5.05\n5.04,5.09,4.99,5.08\n"
                       "5.01,5.13,4.96,5.06\n",
    "study-plan": "Old,New,Trial\n12.1,12.6,12.2\n11.8,12.9,12.4\n12.3,12.5,12.0\n12.0,12.8,12.3\n",
    "summary-compare": "Group,n,Mean,SD\nSupplier 1,8,3.41,0.12\nSupplier 2,9,3.52,0.10\n"
                       "Supplier 3,7,3.38,0.15\n",
}
RELATIVE = 1e-12


@pytest.fixture(scope="module")
def calc(calc_office):
    return calc_office


def _stored(path: Path, ref: str) -> list[list[Any]]:
    sheet, cells = ref.rsplit("!", 1)
    ws = openpyxl.load_workbook(path, data_only=True)[sheet.strip("'")]
    block = ws[cells]
    rows = block if isinstance(block, tuple) else ((block,),)
    return [[c.value for c in (row if isinstance(row, tuple) else (row,))] for row in rows]


def _same(stored: Any, shown: Any, error: int) -> bool:
    if stored == "#N/A":
        return error == 32767
    if error:
        return False
    if isinstance(stored, bool):
        return shown == float(stored)
    if isinstance(stored, (int, float)) and isinstance(shown, float):
        return math.isclose(stored, shown, rel_tol=RELATIVE, abs_tol=0.0)
    if stored in (None, ""):
        return shown in (None, "")
    return stored == shown


@pytest.fixture(scope="module")
def filled(tmp_path_factory):
    folder = tmp_path_factory.mktemp("filled")
    out = {}
    for kind in KINDS:
        template = write_template(kind, folder / f"{kind}.xlsx").path
        data = folder / f"{kind}.csv"
        data.write_text(DATA[kind], encoding="utf-8")
        target = folder / f"{kind}-filled.xlsx"
        done = fill_template(template, data, target)
        calc_form = folder / f"{kind}-calc.xlsx"
        convert_workbook(target, calc_form, to="calc")
        out[kind] = (done, target, calc_form)
    return out


def test_every_kind_filled_equals_calc_recalculating_it(calc, filled) -> None:
    office, profile = calc
    steps: list[dict[str, Any]] = []
    for kind, (done, _, calc_form) in filled.items():
        steps.append({"op": "load", "path": str(calc_form)})
        steps.append({"op": "recalc"})
        for i, ref in enumerate(done.computed + done.dependents):
            sheet, cells = ref.rsplit("!", 1)
            steps.append({"op": "read", "sheet": sheet.strip("'"), "at": cells, "key": f"{kind} {i}"})
        steps.append({"op": "close"})
    read = run_job(office, steps, profile)
    compared, problems = 0, []
    for kind, (done, target, _) in filled.items():
        assert done.computed and done.dependents, kind
        for i, ref in enumerate(done.computed + done.dependents):
            shown = read[f"{kind} {i}"]
            for r, row in enumerate(_stored(target, ref)):
                for c, value in enumerate(row):
                    compared += 1
                    if not _same(value, shown["values"][r][c], shown["errors"][r][c]):
                        problems.append(f"{kind} {ref} [{r},{c}]: stored {value!r}, Calc "
                                        f"{shown['values'][r][c]!r} (error {shown['errors'][r][c]})")
    assert problems == []
    print(f"\n{compared} stored cells of {len(filled)} filled templates equal headless Calc's recalculation")


def test_decisions_hold_values(filled) -> None:
    for kind, (done, target, _) in filled.items():
        for ref in done.dependents:
            values = [v for row in _stored(target, ref) for v in row]
            assert all(v is not None for v in values), f"{kind} {ref}: no stored value"


def test_the_comparison_can_fail() -> None:
    assert not _same(0.5, 0.5 * (1 + 1e-11), 0)
    assert not _same("#N/A", None, 0)
    assert not _same("means differ", "no difference shown", 0)
    assert _same(None, "", 0) and _same(True, 1.0, 0)


def test_fill_on_the_command_line(filled, tmp_path, capsys) -> None:
    template = tmp_path / "t.xlsx"
    write_template("compare-groups", template)
    data = tmp_path / "d.csv"
    data.write_text(DATA["compare-groups"], encoding="utf-8")
    assert main(["fill", str(template), "--data", str(data), "-o", str(tmp_path / "o.xlsx")]) == 0
    assert "wrote" in capsys.readouterr().out
    too_many = tmp_path / "wide.csv"
    too_many.write_text(",".join(f"G{i}" for i in range(9)) + "\n" + ",".join("1" for _ in range(9)) + "\n"
                        + ",".join("2" for _ in range(9)) + "\n", encoding="utf-8")
    out = tmp_path / "o2.xlsx"
    assert main(["fill", str(template), "--data", str(too_many), "-o", str(out)]) == 1
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and "do not fit the block Measurements" in err[0]
    assert not out.exists()


def test_fill_without_a_data_block_is_one_line(tmp_path, capsys) -> None:
    book = openpyxl.Workbook()
    book.active["A1"] = "=SF_P(B2:D9)"
    template = tmp_path / "plain.xlsx"
    book.save(template)
    data = tmp_path / "d.csv"
    data.write_text(DATA["compare-groups"], encoding="utf-8")
    out = tmp_path / "o.xlsx"
    assert main(["fill", str(template), "--data", str(data), "-o", str(out)]) == 1
    err = capsys.readouterr().err.strip().splitlines()
    assert err == ["sheetfuncs: plain.xlsx has no data block (no defined name that refers to a range "
                   "of cells); name the data-entry range and retry, or give --into"]
    assert not out.exists()


def test_stored_one_way_table_equals_the_python_call(filled) -> None:
    """The compare-groups record's one-way table against sheetfuncs.oneway on the same data
    (the Python call)."""
    import sheetfuncs as sf

    _, target, _ = filled["compare-groups"]
    rows = list(openpyxl.load_workbook(target, data_only=True)["Record"].iter_rows(values_only=True))
    at = next(i for i, r in enumerate(rows) if "Source" in r)
    col = rows[at].index("Source")
    factor = rows[at + 1][col:col + 6]
    columns = list(zip(*[line.split(",") for line in DATA["compare-groups"].splitlines()]))
    groups = {c[0]: [float(v) for v in c[1:] if v] for c in columns}
    result = sf.oneway(groups)
    assert factor[1] == result.df_between
    assert math.isclose(factor[4], result.f, rel_tol=RELATIVE)
    assert math.isclose(factor[5], result.p, rel_tol=RELATIVE)
