"""Tests of sheetfuncs.input.files.reader: the entry points, read_cells and read_groups.

Numeric checks name their source: the NIST StRD one-way datasets (certified values).
"""

from __future__ import annotations

import math
import os
import subprocess
import sys
from pathlib import Path

import numpy as np
import pytest

from tests.support import nist
from tests.support.workbooks import lots_book, make_book
from sheetfuncs import oneway
from sheetfuncs.input.demo import demo_groups, demo_rows
from sheetfuncs.errors import InputError
from sheetfuncs.input.files.reader import read_cells, read_groups, same_file

ROOT = Path(__file__).resolve().parents[3]
DEMO_BOOK = ROOT / "workbooks" / "demo.xlsx"


def nist_long_rows(name: str) -> list[list[object]]:
    """A NIST StRD dataset as a long-layout range: header, then (treatment, value) rows."""
    ds = nist.load(name)
    rows: list[list[object]] = [["Treatment", "Value"]]
    for label, texts in ds.text_values.items():
        rows += [[label, float(t)] for t in texts]
    return rows


# --------------------------------------------------------------------------------------------
# the demo workbook


def test_committed_demo_workbook_holds_the_demo_data():
    block = read_cells(DEMO_BOOK)
    assert block.source.sheet == "Hardness"
    assert block.ref == "A1:D9"
    assert [list(r) for r in block.rows] == demo_rows()
    g = read_groups(DEMO_BOOK).groups
    d = demo_groups()
    assert g.labels == d.labels
    for a, b in zip(g.arrays, d.arrays):
        assert np.array_equal(a, b)
    # the text note typed into a data cell keeps its workbook address
    (note,) = g.cells
    assert read_groups(DEMO_BOOK).source.full_address(note.row, note.col) == "'Hardness'!C8"


def test_demo_workbook_generator_reproduces_the_data(tmp_path):
    out = tmp_path / "demo.xlsx"
    subprocess.run([sys.executable, str(ROOT / "tools" / "make_demo_workbook.py"), str(out)],
                   check=True, capture_output=True, timeout=60)
    assert [list(r) for r in read_cells(out).rows] == demo_rows()
    assert read_cells(out, sheet="About").rows[1][0].startswith("All numbers in this workbook are invented")


# --------------------------------------------------------------------------------------------
# certified data through both file kinds


@pytest.mark.parametrize("kind", ["xlsx", "csv"])
def test_nist_smls09_read_from_file_matches_certified_values(tmp_path, kind):
    # NIST StRD SmLs09 (certified values in the dataset header): 13-digit values.
    rows = nist_long_rows("SmLs09")
    if kind == "xlsx":
        path = make_book(tmp_path / "smls09.xlsx", {"Data": rows})
    else:
        path = tmp_path / "smls09.csv"
        ds = nist.load("SmLs09")
        lines = ["Treatment,Value"] + [
            f"{lab},{t}" for lab, texts in ds.text_values.items() for t in texts
        ]
        path.write_text("\n".join(lines) + "\n", encoding="utf-8")
    loaded = read_groups(path, layout="long")
    res = oneway(loaded.groups)
    cert = nist.load("SmLs09").certified
    assert res.exact
    assert res.df_between == cert.df_between and res.df_within == cert.df_within
    assert math.isclose(res.ss_between, cert.ss_between, rel_tol=1e-13)
    assert math.isclose(res.ss_within, cert.ss_within, rel_tol=1e-13)
    assert math.isclose(res.f, cert.f, rel_tol=1e-13)
    assert math.isclose(res.r_squared, cert.r_squared, rel_tol=1e-13)


# --------------------------------------------------------------------------------------------
# arguments, sheets and addresses


def test_sheet_names_match_case_insensitively_and_in_the_range(tmp_path):
    path = lots_book(tmp_path)
    assert read_cells(path, sheet="lot DATA").source.sheet == "Lot data"
    block = read_cells(path, cell_range="'Lot data'!D3:E6")
    assert block.source.sheet == "Lot data" and block.rows[0] == ("Lot B", "Lot C")
    with pytest.raises(InputError, match="give the sheet once"):
        read_cells(path, sheet="Notes", cell_range="'Lot data'!D3:E6")


def test_cleaning_errors_get_the_sheet_address(tmp_path):
    rows = [["A", "B"], [1.0, 2.0], [1.5, "#N/A"], [1.2, 2.5]]
    path = make_book(tmp_path / "err.xlsx", {"Run 1": rows}, at="B2")
    with pytest.raises(InputError) as ei:
        read_groups(path)
    msg = str(ei.value)
    assert msg.startswith("sheetfuncs: the data hold the error #N/A")
    assert "'Run 1'!C4 of err.xlsx" in msg


def test_progress_is_reported_in_cells(tmp_path):
    path = make_book(tmp_path / "p.xlsx", {"S": [["A", "B"]] + [[float(i), i + 0.5] for i in range(50)]})
    calls = []
    read_cells(path, progress=lambda stage, done, total: calls.append((stage, done, total)))
    assert calls[0] == ("reading", 0, 102)
    assert calls[-1] == ("reading", 102, 102)
    csvp = tmp_path / "p.csv"
    csvp.write_text("A,B\n" + "".join(f"{i},{i + 0.5}\n" for i in range(50)))
    calls.clear()
    read_cells(csvp, progress=lambda *a: calls.append(a))
    assert calls and calls[-1][1] == calls[-1][2]


def test_header_only_csv_and_folders_without_suffix(tmp_path):
    p = tmp_path / "header.csv"
    p.write_text("Lot A,Lot B\n", encoding="utf-8")
    with pytest.raises(InputError, match="holds only a row of labels and no values"):
        read_groups(p)
    (tmp_path / "exports").mkdir()
    with pytest.raises(InputError, match="exports is a folder, not a file"):
        read_cells(tmp_path / "exports")


def test_file_kind_and_argument_messages(tmp_path):
    p = tmp_path / "eu.csv"
    p.write_text("A;B\n1,5;2,5\n1,7;2,9\n")
    with pytest.raises(InputError, match="has no sheets"):
        read_cells(tmp_path / "eu.csv", sheet="S")
    with pytest.raises(InputError, match="does not exist"):
        read_cells(tmp_path / "missing.csv")
    with pytest.raises(InputError, match=r"old binary \.xls workbook"):
        read_cells(tmp_path / "old.xls")
    with pytest.raises(InputError, match="cannot tell what kind of file"):
        read_cells(tmp_path / "data.json")


def test_same_file_under_two_names(tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    (tmp_path / "lots.xlsx").write_bytes(b"x")
    assert same_file(Path("lots.xlsx"), tmp_path / "sub" / ".." / "lots.xlsx")
    assert same_file(Path("new.xlsx"), Path("./new.xlsx"))  # neither exists yet
    assert not same_file(Path("lots.xlsx"), Path("other.xlsx"))
    os.link(tmp_path / "lots.xlsx", tmp_path / "hard.xlsx")
    assert same_file(Path("hard.xlsx"), Path("lots.xlsx"))  # one file on disk


# --------------------------------------------------------------------------------------------
# missing values and label fixes through a workbook


def na_book(tmp_path: Path) -> Path:
    """Invented fill weights of three heads on sheet "Fill", block B2:D6, with two #N/A cells
    and a case-only typo in a label."""
    rows = [["Head 1", "Head 2", "head 2"], [50.2, 50.9, 50.7], ["#N/A", 50.8, 51.0],
            [50.4, "#N/A", 50.6], [50.1, 50.7, None]]
    return make_book(tmp_path / "fill.xlsx", {"Fill": rows}, at="B2")


def test_read_groups_errors_missing_reads_na_as_missing_values(tmp_path):
    path = na_book(tmp_path)
    loaded = read_groups(path, cell_range="B2:D6", errors="missing")
    g = loaded.groups
    assert g.labels == ("Head 1", "Head 2", "head 2")
    assert [a.tolist() for a in g.arrays] == [[50.2, 50.4, 50.1], [50.9, 50.8, 50.7], [50.7, 51.0, 50.6]]
    assert g.dropped == (1, 1, 0)
    r = loaded.reading
    assert r.missing == 2 and r.balanced
    assert [(x.ref, x.reason, x.kind) for x in r.left_out] == [
        ("B4", "error value, read as a missing value", "missing"),
        ("C5", "error value, read as a missing value", "missing"),
    ]


def test_read_groups_errors_stop_names_the_na_cell(tmp_path):
    with pytest.raises(InputError) as ei:
        read_groups(na_book(tmp_path), cell_range="B2:D6")
    assert str(ei.value) == (
        "sheetfuncs: the data hold the error #N/A at row 3, column 1 of the range (and 1 more); "
        "fix or clear that cell (cell 'Fill'!B4 of fill.xlsx); or, to read error cells as "
        'missing values, give --errors missing (Python: errors="missing")'
    )


def test_read_groups_merge_case_and_rename(tmp_path):
    path = na_book(tmp_path)
    merged = read_groups(path, cell_range="B2:D6", errors="missing", merge_case=True)
    assert merged.groups.labels == ("Head 1", "Head 2") and merged.groups.counts == (3, 6)
    assert merged.groups.dropped == (1, 1)
    assert merged.reading.notes == ('label "head 2" merged into "Head 2" (they differ only in case)',)
    renamed = read_groups(path, cell_range="B2:D6", errors="missing", rename=["head 2=Head 3"])
    assert renamed.groups.labels == ("Head 1", "Head 2", "Head 3")
    assert renamed.reading.notes == ('label "head 2" renamed to "Head 3"',)
