"""Traceability and print set-up of a report (sheetfuncs/report/trace.py): the About sheet's
input path, size and SHA-256, the report identifier, and every sheet's paper, fit, header and
footer as saved (read back with openpyxl). Data are invented."""

from __future__ import annotations

import hashlib
import re

import numpy as np
import openpyxl
import pytest

from sheetfuncs import InputError, as_groups
from sheetfuncs.input import read_groups
from sheetfuncs.report import write_report
from sheetfuncs.report.trace import check_paper, file_digest, report_identifier, values_digest

from tests.support.cli import write_csv
from tests.support.scenarios import CLEAR
from tests.support.workbooks import make_book

# invented: three lots of a calibration material, one lot per column
ROWS = [["Lot A", "Lot B", "Lot C"], [10.1, 10.4, 9.9], [10.3, 10.6, 10.0], [10.2, 10.5, 10.1],
        [10.0, 10.7, 9.8]]


def _about(path) -> dict[str, object]:
    ws = openpyxl.load_workbook(path)["About"]
    return {r[0]: r[1] for r in ws.iter_rows(min_row=4, max_col=2, values_only=True) if r[0] and r[0] != "•"}


def _report(tmp_path, inp, name="r.xlsx", **kw):
    loaded = read_groups(inp)
    return write_report(loaded, tmp_path / name, **kw)


@pytest.mark.parametrize("kind", ["csv", "xlsx"])
def test_about_sha256_equals_hashlib_of_the_input_file(tmp_path, kind):
    if kind == "csv":
        inp = write_csv(tmp_path / "lots.csv", ROWS)
    else:
        inp = make_book(tmp_path / "lots.xlsx", {"Lots": ROWS}, at="B3")
    about = _about(_report(tmp_path, inp))
    data = inp.read_bytes()
    assert about["Input file SHA-256"] == hashlib.sha256(data).hexdigest()  # hashlib (reference library)
    assert about["Input file size (bytes)"] == len(data)
    assert about["Input file (absolute path)"] == str(inp.resolve())
    assert about["Range read"] == ("A1:C5" if kind == "csv" else "'Lots'!B3:D7")
    assert re.fullmatch(r"[0-9a-f]{12}", about["Report identifier"])
    assert "Data fingerprint (SHA-256)" not in about  # the file's SHA-256 is the fingerprint
    assert about["Written by"].startswith("write_report(...) called from Python with alpha=0.05")
    assert re.fullmatch(r"\d{4}-\d\d-\d\d \d\d:\d\d:\d\d UTC", about["Written (UTC)"])
    for lib in ("numpy", "scipy", "openpyxl", "sheetfuncs"):
        assert about[f"{lib} version"], lib


def test_file_digest_streams_a_file_larger_than_one_piece(tmp_path):
    p = tmp_path / "big.bin"
    data = bytes(range(256)) * 9000  # 2.3 MB: three pieces of 1 MiB
    p.write_bytes(data)
    assert file_digest(p) == (len(data), hashlib.sha256(data).hexdigest())  # hashlib (reference library)


def test_identifier_is_stable_and_changes_with_an_option_the_data_or_the_version(tmp_path):
    inp = write_csv(tmp_path / "lots.csv", ROWS)
    first = _about(_report(tmp_path, inp, "a.xlsx"))["Report identifier"]
    again = _about(_report(tmp_path, inp, "b.xlsx", paper="letter"))["Report identifier"]
    other = _about(_report(tmp_path, inp, "c.xlsx", alpha=0.01))["Report identifier"]
    assert first == again  # same input, options and version; the paper does not enter it
    assert other != first
    ROWS2 = [row[:] for row in ROWS]
    ROWS2[1][0] = 10.2
    changed = _about(_report(tmp_path, write_csv(tmp_path / "lots2.csv", ROWS2), "d.xlsx"))
    assert changed["Report identifier"] != first
    assert report_identifier("ab", {"alpha": "0.05"}, "1.0") != report_identifier("ab", {"alpha": "0.05"}, "1.1")


def test_identifier_of_data_passed_from_python_hashes_the_values(tmp_path):
    a = _about(write_report(CLEAR, tmp_path / "a.xlsx"))
    b = _about(write_report(CLEAR, tmp_path / "b.xlsx"))
    assert a["Report identifier"] == b["Report identifier"]
    g = as_groups(CLEAR)
    assert a["Data fingerprint (SHA-256)"] == values_digest(g.labels, g.arrays)
    moved = {k: [v + 0.1 for v in vals] for k, vals in CLEAR.items()}
    assert _about(write_report(moved, tmp_path / "c.xlsx"))["Report identifier"] != a["Report identifier"]
    # the values as doubles: the same numbers from a list or an array give the same fingerprint
    assert values_digest(["x"], [np.array([1.5, 2.0])]) == values_digest(["x"], [[1.5, 2.0]])


def test_command_line_and_reading_options_are_shown(tmp_path):
    inp = write_csv(tmp_path / "lots.csv", ROWS)
    argv = ["sheetfuncs", "report", str(inp), "-o", "out file.xlsx"]
    about = _about(_report(tmp_path, inp, command=argv, reading_options={"layout": "wide", "sheet": None}))
    assert about["Written by"] == f"sheetfuncs report {inp} -o 'out file.xlsx'"
    assert about["Reading options"] == "layout='wide', sheet=None"
    assert _about(_report(tmp_path, inp, "p.xlsx"))["Reading options"] == "none recorded"
    with pytest.raises(InputError, match=r"^sheetfuncs: command must be the command line as a list"):
        _report(tmp_path, inp, "q.xlsx", command="sheetfuncs report")
    with pytest.raises(InputError, match=r"^sheetfuncs: reading_options must be a mapping"):
        _report(tmp_path, inp, "q.xlsx", reading_options=["wide"])


@pytest.mark.parametrize("paper, code", [("a4", 9), ("letter", 1), ("Letter", 1)])
def test_every_sheet_has_the_paper_fit_header_and_footer(tmp_path, paper, code):
    path = write_report(CLEAR, tmp_path / "r.xlsx", title="Fill weight & line", paper=paper)
    wb = openpyxl.load_workbook(path)
    ident = _about(path)["Report identifier"]
    for ws in wb.worksheets:
        ps = ws.page_setup
        assert (int(ps.paperSize), ps.fitToWidth, ps.fitToHeight) == (code, 1, 0), ws.title  # ECMA-376 codes
        assert ws.sheet_properties.pageSetUpPr.fitToPage, ws.title
        assert ws.oddHeader.left.text == "Fill weight && line", ws.title  # & doubled: not a code
        assert ws.oddHeader.right.text == f"Report {ident}", ws.title
        assert ws.oddFooter.center.text == "page &P of &N", ws.title
    chart = wb["Chart"]
    assert chart.print_area == "'Chart'!$A$1:$G$41"  # the charts and notes; the chart data (row 42 on) do not print
    assert chart.cell(42, 1).value.startswith("Chart data")


def test_a_paper_that_is_not_known_is_refused_before_anything_is_written(tmp_path):
    with pytest.raises(InputError, match=r"^sheetfuncs: the paper must be a4 or letter, not 'legal'$"):
        write_report(CLEAR, tmp_path / "r.xlsx", paper="legal")
    assert not (tmp_path / "r.xlsx").exists()
    assert check_paper(" A4 ") == "a4"
