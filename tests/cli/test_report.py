"""Tests of ``sheetfuncs report`` (sheetfuncs.cli.report): one report, a batch into a folder,
and where reports may go.

Numeric checks name their source: NIST StRD certified values.
"""

from __future__ import annotations

import json

import math
import os
import shlex
import sys

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


def test_three_thousand_groups_are_answered_in_one_line(tmp_path):
    # invented: 3,000 lots of two values each, in a wide CSV
    from tests.support.measure import measure_cli

    header = ",".join(f"Lot {i}" for i in range(1, 3001))
    rows = [",".join(f"{5 + (i % 7) / 100 + j / 10:.2f}" for i in range(3000)) for j in range(2)]
    src = tmp_path / "lots.csv"
    src.write_text("\n".join([header, *rows]) + "\n")
    got = measure_cli("report", str(src), "-o", "r.xlsx", cwd=tmp_path)
    assert got.code == 1 and got.out == ""
    assert got.err == (
        "sheetfuncs: lots.csv: the data have 3,000 groups, more than the 100 a report takes (its "
        "comparisons grow with the square of the number of groups); give --max-groups 3000 "
        "(Python: max_groups=3000) to write it anyway, or use sheetfuncs table\n"
    )
    assert got.seconds < 30 and got.peak_mb < 1024  # the bound for hostile inputs
    assert not (tmp_path / "r.xlsx").exists()
    table = measure_cli("table", str(src), "--json", cwd=tmp_path)  # no comparisons: quick
    assert table.code == 0, table.err
    assert table.seconds < 30 and table.peak_mb < 1024
    doc = json.loads(table.out)
    assert doc["pairwise"]["available"] is False and doc["letters"]["available"] is False
    assert doc["pairwise"]["reason"].startswith(
        "not computed: 3,000 groups, more than the 100 whose pairwise comparisons table --json holds")


def test_max_groups_option_and_its_default(tmp_path, capsys):
    from sheetfuncs.cli.parser import REPORT_MAX_GROUPS
    from sheetfuncs.report import DEFAULT_MAX_GROUPS

    assert REPORT_MAX_GROUPS == DEFAULT_MAX_GROUPS  # the help text states the writer's default
    src = small_csv(tmp_path)  # three groups
    code, _, err = run(["report", str(src), "-o", str(tmp_path / "r.xlsx"), "--max-groups",
                        "2"], capsys)
    assert code == 1 and err.startswith("sheetfuncs: lots.csv: the data have 3 groups, more than the 2 ")
    code, _, err = run(["report", str(src), "-o", str(tmp_path / "r.xlsx"), "--max-groups",
                        "3"], capsys)
    assert code == 0, err


def test_report_that_appears_during_the_run_is_kept(tmp_path, capsys, monkeypatch):
    from tests.support.race import appear_while_writing

    src = small_csv(tmp_path)
    out = tmp_path / "r.xlsx"
    appear_while_writing(monkeypatch, out, b"the other run's report")  # a second run, say
    code, stdout, err = run(["report", str(src), "-o", str(out)], capsys)
    assert code == 1 and stdout == ""
    assert err == (
        f"sheetfuncs: lots.csv: {str(out)!r} appeared while the report was being written and is kept; "
        "use --force (force=True) to replace it, or choose another name\n"
    )
    assert out.read_bytes() == b"the other run's report"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["lots.csv", "r.xlsx"]
    code, stdout, err = run(["report", str(src), "-o", str(out), "--force"], capsys)
    assert code == 0 and stdout == f"wrote {out}\n"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["lots.csv", "r.xlsx"]


def test_report_records_the_command_line_the_reading_options_and_the_paper(tmp_path, capsys, monkeypatch):
    inp = small_csv(tmp_path)
    out = tmp_path / "r.xlsx"
    argv = ["report", str(inp), "-o", str(out), "--paper", "letter", "--layout", "wide"]
    monkeypatch.setattr(sys, "argv", ["sheetfuncs", *argv])
    code, _, err = run(argv, capsys)
    assert code == 0, err
    wb = openpyxl.load_workbook(out)
    about = {r[0]: r[1] for r in wb["About"].iter_rows(values_only=True) if r[0]}
    assert about["Written by"] == shlex.join(["sheetfuncs", *argv])
    assert "layout='wide'" in about["Reading options"] and "labels='auto'" in about["Reading options"]
    assert about["Paper"] == "Letter"
    assert {ws.page_setup.paperSize for ws in wb.worksheets} == {1}  # letter (ECMA-376 code)
    code, _, err = run(["report", str(inp), "-o", str(tmp_path / "s.xlsx"), "--paper", "legal"], capsys)
    assert code == 2 and "argument --paper: invalid choice: 'legal' (choose from 'a4', 'letter')" in err
