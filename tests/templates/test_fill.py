"""Filling templates headless: stored values, kept formulas, untouched parts, one-line refusals.

Expected SF_ values are "the Python call through the harness" (sheetfuncs.worksheet.harness.call
on the block as written); the decision and ROUND values follow the spreadsheet definitions of
IF/ISNUMBER/ROUND ("common practice"). Data are invented.
"""

from __future__ import annotations

import math
import re
import zipfile
from pathlib import Path

import openpyxl
import pytest

from sheetfuncs.errors import InputError
from sheetfuncs.templates.fill import fill_batch, fill_template, keep_stored_values
from sheetfuncs.worksheet.harness import call
from tests.support.fill_books import (
    DECISION, VBA_BYTES, as_xlsm, data_book, line_template, lots_template,
)
from tests.support.libreoffice import convert, require_office

LINE_ROWS = [["Head A", "Head B", "Head C"],
             [250.2, 251.0, 249.6], [250.4, 251.3, 249.9], [250.1, 250.8, 249.7],
             [250.3, 251.1, None]]
SHEET = "xl/worksheets/sheet1.xml"


def close(a: float, b: float) -> bool:
    return math.isclose(a, b, rel_tol=1e-12, abs_tol=0.0)


def block_grid(rows: list[list[object]], n_rows: int, n_cols: int) -> list[list[object]]:
    grid = [[None] * n_cols for _ in range(n_rows)]
    for i, row in enumerate(rows):
        for j, v in enumerate(row):
            grid[i][j] = v
    return grid


@pytest.fixture()
def line(tmp_path: Path) -> tuple[Path, Path, Path]:
    tpl = line_template(tmp_path / "line.xlsx")
    data = data_book(tmp_path / "heads.xlsx", LINE_ROWS)
    return tpl, data, tmp_path / "filled.xlsx"


def test_sf_cells_hold_the_python_call_through_the_harness(line: tuple[Path, Path, Path]) -> None:
    tpl, data, out = line
    done = fill_template(tpl, data, out)
    ws = openpyxl.load_workbook(out, data_only=True)["Line data"]
    grid = block_grid(LINE_ROWS, 17, 4)
    p = call("SF_P", grid)  # the Python call through the harness
    assert close(ws["E2"].value, p)
    table = call("SF_TABLE", grid)  # the Python call through the harness
    for i, row in enumerate(table):
        for j, v in enumerate(row):
            got = ws.cell(4 + i, 6 + j).value
            assert close(got, v) if isinstance(v, float) else (got or "") == v, (i, j, got, v)
    assert done.block == "'Line data'!$A$4:$D$20" and done.name == "Measurements"
    assert done.computed == ("'Line data'!E2", "'Line data'!F4:K7")
    assert done.cells_written == 17 * 4


def test_decision_round_index_and_count_hold_values(line: tuple[Path, Path, Path]) -> None:
    tpl, data, out = line
    done = fill_template(tpl, data, out)
    wb = openpyxl.load_workbook(out, data_only=True)
    ws = wb["Line data"]
    p = ws["E2"].value
    assert ws["F2"].value == round(p, 4)  # ROUND: common practice
    assert ws["G2"].value == ("means differ" if p < 0.05 else "no difference shown")
    f_value = call("SF_TABLE", block_grid(LINE_ROWS, 17, 4))[1][4]  # the Python call through the harness
    assert close(ws["M4"].value, f_value)
    assert ws["M5"].value == ("F above 1" if f_value > 1 else "F at most 1") + " for Head A"
    assert wb["Notes"]["B1"].value == 11  # COUNT of the eleven invented numbers: common practice
    assert "'Line data'!G2" in done.dependents and "'Notes'!B1" in done.dependents


def test_message_result_makes_the_decision_say_check_the_data(tmp_path: Path) -> None:
    tpl = line_template(tmp_path / "line.xlsx")
    same = [["Head A", "Head B"], [2.0, 2.0], [2.0, 2.0]]  # all values equal: no F to give
    data = data_book(tmp_path / "same.xlsx", same)
    out = tmp_path / "filled.xlsx"
    fill_template(tpl, data, out)
    ws = openpyxl.load_workbook(out, data_only=True)["Line data"]
    expected = call("SF_P", block_grid(same, 17, 4))  # the Python call through the harness
    assert ws["E2"].value == expected and expected.startswith("sheetfuncs: ")
    assert ws["G2"].value == "check the data"


def test_formulas_are_kept(line: tuple[Path, Path, Path]) -> None:
    tpl, data, out = line
    fill_template(tpl, data, out)
    before = openpyxl.load_workbook(tpl)
    after = openpyxl.load_workbook(out)
    for ws in before.worksheets:
        for row in ws.iter_rows():
            for c in row:
                if c.data_type == "f":
                    new = after[ws.title][c.coordinate].value
                    old = c.value
                    assert getattr(new, "text", new) == getattr(old, "text", old), c.coordinate
    assert after["Line data"]["G2"].value == DECISION
    assert after["Line data"]["F4"].value.ref == "F4:K7"


def members(path: Path) -> list[tuple[str, bytes]]:
    with zipfile.ZipFile(path) as z:
        return [(i.filename, z.read(i)) for i in z.infolist()]


def test_every_other_member_is_byte_identical_and_in_order(line: tuple[Path, Path, Path]) -> None:
    tpl, data, out = line
    fill_template(tpl, data, out)
    old, new = members(tpl), members(out)
    assert [n for n, _ in old] == [n for n, _ in new]
    changed = {n for (n, a), (_, b) in zip(old, new) if a != b}
    assert changed == {SHEET, "xl/worksheets/sheet2.xml", "xl/tables/table1.xml", "xl/workbook.xml"}
    # the workbook part changes in its calculation settings only (the stored values are shown)
    book_old, book_new = dict(old)["xl/workbook.xml"].decode(), dict(new)["xl/workbook.xml"].decode()
    calc = re.compile(r"<calcPr\b[^>]*?/?>")
    assert calc.sub("", book_old) == calc.sub("", book_new)
    assert 'fullCalcOnLoad="1"' in calc.search(book_old).group(0)
    assert calc.search(book_new).group(0) == '<calcPr calcId="191029" />'


def test_calculation_settings_ask_for_the_stored_values() -> None:
    # fullCalcOnLoad makes a program recalculate on opening; an old calcId makes Excel do so
    # (ECMA-376 Part 1, 18.2.2 calcPr; common practice for the engine id)
    assert keep_stored_values('<w><calcPr calcId="124519" fullCalcOnLoad="1"/></w>') == '<w><calcPr calcId="191029"/></w>'
    assert keep_stored_values('<calcPr calcId="191029"/>') == '<calcPr calcId="191029"/>'
    assert keep_stored_values('<calcPr calcId="999999" fullCalcOnLoad="true"/>') == '<calcPr calcId="999999"/>'
    assert keep_stored_values("<workbook><sheets/></workbook>") == "<workbook><sheets/></workbook>"


def cell_pieces(xml: str, skip: set[str]) -> tuple[str, list[str]]:
    """The text outside sheetData, and every row's attributes and cell elements not in skip."""
    m = re.search(r"<sheetData>(.*)</sheetData>", xml, re.S)
    assert m
    outside = xml[:m.start()] + xml[m.end():]
    pieces = []
    for row in re.finditer(r"<row\b([^>]*?)(?:/>|>(.*?)</row>)", m.group(1), re.S):
        pieces.append(row.group(1).rstrip("/ "))
        for c in re.finditer(r"<c\b[^>]*?(?:/>|>.*?</c>)", row.group(2) or "", re.S):
            if re.search(r'\br="([A-Z]+\d+)"', c.group(0)).group(1) not in skip:
                pieces.append(c.group(0))
    return outside, [p for p in pieces if p]


def test_written_sheet_part_changes_only_in_the_written_cells(line: tuple[Path, Path, Path]) -> None:
    tpl, data, out = line
    fill_template(tpl, data, out)
    old, new = dict(members(tpl))[SHEET].decode(), dict(members(out))[SHEET].decode()
    written = {f"{col}{r}" for col in "ABCD" for r in range(4, 21)}
    written |= {"E2", "F2", "G2", "M4", "M5"} | {f"{col}{r}" for col in "FGHIJK" for r in range(4, 8)}
    o_out, o_cells = cell_pieces(old, written)
    n_out, n_cells = cell_pieces(new, written)
    assert o_out == n_out
    new_rows = {f' r="{r}"' for r in range(8, 21)}  # rows the template did not have
    assert [p for p in n_cells if p not in new_rows] == o_cells
    assert '<c r="A5" t="inlineStr">' not in new and '<c r="A5"><v>250.2</v></c>' in new
    assert '<c r="A4" s=' in new or '<c r="A4" t="inlineStr"><is><t>Head A</t></is></c>' in new


def test_table_columns_follow_the_labels(line: tuple[Path, Path, Path]) -> None:
    tpl, data, out = line
    fill_template(tpl, data, out)
    table = dict(members(out))["xl/tables/table1.xml"].decode()
    names = re.findall(r'<tableColumn [^>]*name="([^"]*)"', table)
    assert names == ["Head A", "Head B", "Head C", "Head 4"]


def assert_refused(tmp_path: Path, fn, text: str) -> None:
    before = sorted(p.name for p in tmp_path.iterdir())
    with pytest.raises(InputError) as e:
        fn()
    message = str(e.value)
    assert "\n" not in message and text in message, message
    assert message.startswith("sheetfuncs: ")
    assert sorted(p.name for p in tmp_path.iterdir()) == before


def test_too_many_values_or_groups_are_refused_and_nothing_is_written(tmp_path: Path) -> None:
    tpl = line_template(tmp_path / "line.xlsx")
    tall = data_book(tmp_path / "tall.xlsx", [["A", "B"]] + [[250.0 + 0.1 * (i % 5), 251.0 + 0.2 * (i % 3)] for i in range(17)])
    wide = data_book(tmp_path / "wide.xlsx", [["A", "B", "C", "D", "E"], [1.0, 2.0, 3.0, 4.0, 5.0],
                                              [1.5, 2.5, 3.5, 4.5, 5.5]])
    out = tmp_path / "filled.xlsx"
    assert_refused(tmp_path, lambda: fill_template(tpl, tall, out),
                   "do not fit the block Measurements (4 columns, 16 rows below the labels); use a "
                   "template with a larger block or fewer data (nothing was written)")
    assert_refused(tmp_path, lambda: fill_template(tpl, wide, out), "(5 groups, up to 2 values each)")


def test_no_block_or_two_blocks_are_refused(tmp_path: Path) -> None:
    plain = tmp_path / "plain.xlsx"
    wb = openpyxl.Workbook()
    wb.active["A1"] = "=SF_P(A2:B9)"
    wb.save(plain)
    data = data_book(tmp_path / "d.xlsx", LINE_ROWS)
    out = tmp_path / "filled.xlsx"
    assert_refused(tmp_path, lambda: fill_template(plain, data, out), "has no data block")
    two = line_template(tmp_path / "two.xlsx")
    wb = openpyxl.load_workbook(two)
    wb.defined_names["Spare"] = openpyxl.workbook.defined_name.DefinedName(
        "Spare", attr_text="'Notes'!$A$5:$C$9")
    wb.save(two)
    assert_refused(tmp_path, lambda: fill_template(two, data, out),
                   "2 possible data blocks: Measurements ('Line data'!$A$4:$D$20), Spare")
    done = fill_template(two, data, out, into="MeasurementsTable")
    assert done.name == "Measurements"


def test_xlsm_keeps_its_macros(line: tuple[Path, Path, Path], tmp_path: Path) -> None:
    tpl, data, _ = line
    xlsm = as_xlsm(tpl, tmp_path / "line.xlsm")
    out = tmp_path / "filled.xlsm"
    fill_template(xlsm, data, out)
    got = dict(members(out))
    assert got["xl/vbaProject.bin"] == VBA_BYTES
    assert got["[Content_Types].xml"] == dict(members(xlsm))["[Content_Types].xml"]
    assert_refused(tmp_path, lambda: fill_template(xlsm, data, tmp_path / "x.xlsx"),
                   "needs the template's ending .xlsm")


def test_another_layout_fills_the_block_on_its_own_sheet(tmp_path: Path) -> None:
    tpl = lots_template(tmp_path / "lots.xlsx")
    rows = [["Lot 7", "Lot 8"], [5.02, 5.11], [5.04, 5.09], [5.01, 5.12]]
    data = data_book(tmp_path / "lots-data.xlsx", rows)
    out = tmp_path / "filled.xlsx"
    done = fill_template(tpl, data, out)
    wb = openpyxl.load_workbook(out, data_only=True)
    grid = block_grid(rows, 13, 6)
    p = call("SF_P", grid)  # the Python call through the harness
    assert done.block == "'Lot entry'!$C$3:$H$15"
    assert close(wb["Summary"]["B1"].value, p)
    assert wb["Summary"]["B2"].value == ("lots differ" if p < 0.05 else "no difference shown")
    assert wb["Lot entry"]["E3"].value is None and wb["Lot entry"]["C3"].value == "Lot 7"
    assert wb["Summary"]["A4"].value == "Source"


def test_batch_fills_one_workbook_per_file_with_progress(tmp_path: Path) -> None:
    tpl = line_template(tmp_path / "line.xlsx")
    first = data_book(tmp_path / "day1.xlsx", LINE_ROWS)
    second = data_book(tmp_path / "day2.xlsx", [["A", "B"], [1.0, 2.0], [1.1, 2.4]])
    third = data_book(tmp_path / "day3.xlsx", [list("ABCDE"), [1.0, 2.0, 3.0, 4.0, 5.0]])
    folder = tmp_path / "out"
    folder.mkdir()
    seen: list[tuple[int, int, str]] = []
    batch = fill_batch(tpl, [first, second, third], folder,
                       progress=lambda done, total, p: seen.append((done, total, p.name)))
    assert [f.target.name for f in batch.filled] == ["day1.xlsx", "day2.xlsx"]
    assert [(p.name, "do not fit" in m) for p, m in batch.failed] == [("day3.xlsx", True)]
    assert seen == [(0, 3, "day1.xlsx"), (1, 3, "day2.xlsx"), (2, 3, "day3.xlsx"), (3, 3, "day3.xlsx")]
    assert sorted(p.name for p in folder.iterdir()) == ["day1.xlsx", "day2.xlsx"]


def test_libreoffice_opens_the_output_and_shows_the_stored_values(
        line: tuple[Path, Path, Path], tmp_path: Path) -> None:
    """Without the extension LibreOffice 7.4 does not recalculate an xlsx on load by default
    (its setting "never recalculate" for Excel 2007 and newer files): it shows the stored values."""
    require_office()
    tpl, data, out = line
    fill_template(tpl, data, out)
    csv = convert(out, "csv", tmp_path / "lo").read_text(encoding="utf-8")
    stored = openpyxl.load_workbook(out, data_only=True)["Line data"]
    line2 = csv.splitlines()[1].split(",")
    assert float(line2[4]) == pytest.approx(stored["E2"].value, rel=1e-9)  # the CSV rounds the display
    assert line2[6].strip('"') == stored["G2"].value
    assert csv.splitlines()[3].split(",")[:3] == ["Head A", "Head B", "Head C"]
