"""Tests of ``sheetfuncs report`` (sheetfuncs.cli.report): one report, a batch into a folder,
and where reports may go.

Numeric checks name their source: NIST StRD certified values.
"""

from __future__ import annotations

import math
import os

import openpyxl

from tests.support import nist
from tests.support.cli import defined_value, nist_csv, run, small_csv, write_csv


def test_report_of_nist_data_carries_the_certified_figures(tmp_path, capsys):
    # NIST StRD SmLs01 read from CSV by the command line, written by the report writer
    src = nist_csv(tmp_path, "SmLs01")
    out = tmp_path / "smls01-report.xlsx"
    code, stdout, err = run(["report", str(src), "-o", str(out), "--layout", "long",
                             "--factor", "Treatment", "--title", "SmLs01 check",
                             "--response", "Value"], capsys)
    assert code == 0, err
    assert stdout.strip() == f"wrote {out}"
    wb = openpyxl.load_workbook(out)
    cert = nist.load("SmLs01").certified
    f = defined_value(wb, "f_ratio")
    assert math.isclose(f, cert.f, rel_tol=1e-13)
    assert math.isclose(defined_value(wb, "ss_within"), cert.ss_within, rel_tol=1e-13)
    texts = {c.value for ws in wb.worksheets for row in ws.iter_rows() for c in row
             if isinstance(c.value, str)}
    assert any("SmLs01 check" in t for t in texts)
    assert any(os.path.basename(str(src)) in t for t in texts)  # the input is named


def test_report_with_control_and_method(tmp_path, capsys):
    src = small_csv(tmp_path)
    out = tmp_path / "r.xlsx"
    code, _, err = run(["report", str(src), "-o", str(out), "--control", "Lot A"], capsys)
    assert code == 0, err
    wb = openpyxl.load_workbook(out)
    texts = {c.value for ws in wb.worksheets for row in ws.iter_rows() for c in row
             if isinstance(c.value, str)}
    assert any("Dunnett" in t for t in texts)
    code, _, err = run(["report", str(src), "-o", str(tmp_path / "bad.xlsx"),
                        "--method", "no-such-method"], capsys)
    assert code == 1 and err.count("\n") == 1 and "Traceback" not in err
    assert not (tmp_path / "bad.xlsx").exists()


def test_batch_with_out_dir_keeps_going_after_a_bad_input(tmp_path, capsys):
    a = small_csv(tmp_path, "a.csv")
    b = small_csv(tmp_path, "b.csv", shift=0.5)
    bad = write_csv(tmp_path / "bad.csv", [["A"], [1], [2]])
    outdir = tmp_path / "reports"
    code, out, err = run(["report", str(a), str(bad), str(b), "--out-dir", str(outdir)], capsys)
    assert code == 1
    assert sorted(p.name for p in outdir.iterdir()) == ["a-report.xlsx", "b-report.xlsx"]
    assert out.splitlines() == [f"wrote {outdir / 'a-report.xlsx'}", f"wrote {outdir / 'b-report.xlsx'}"]
    read_a, line, read_b = err.splitlines()
    assert line.startswith("sheetfuncs: bad.csv: ") and "at least two groups" in line
    # quiet when stderr is not a terminal: the error line, and what was read from each report's input
    assert read_a == "a.csv: read A1:C5: 3 groups, 12 values (Lot A 4, Lot B 4, Lot C 4)"
    assert read_b.startswith("b.csv: read A1:C5: 3 groups")


def test_usage_errors_found_after_parsing(tmp_path, capsys):
    a, b = small_csv(tmp_path, "a.csv"), small_csv(tmp_path, "b.csv")
    code, _, err = run(["report", str(a), str(b), "-o", str(tmp_path / "r.xlsx")], capsys)
    assert code == 2 and "use --out-dir DIR for several inputs" in err
    code, _, err = run(["report", str(a), "-o", str(tmp_path / "r.csv")], capsys)
    assert code == 2 and "the report must be an .xlsx file" in err
    (tmp_path / "sub").mkdir()
    c = small_csv(tmp_path / "sub", "a.csv")
    code, _, err = run(["report", str(a), str(c), "--out-dir", str(tmp_path / "out")], capsys)
    assert code == 2 and "would both be written to" in err
