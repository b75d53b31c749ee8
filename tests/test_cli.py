"""Tests of the command line (sheetfuncs.cli), in-process through main(argv) and as a subprocess.

Numeric checks name their source: NIST StRD certified values, Cohen (1988) power tables,
statsmodels as a reference library.
"""

from __future__ import annotations

import csv
import io
import json
import math
import os
import subprocess
import sys
import zipfile
from pathlib import Path

import openpyxl
import pytest

import nist
from sheetfuncs import cli, oneway
from sheetfuncs.cli import BIG_INPUT_CELLS, _Progress, csv_safe, json_ready, main

ROOT = Path(__file__).resolve().parents[1]
DEMO_BOOK = ROOT / "workbooks" / "demo.xlsx"


def write_csv(path: Path, rows: list[list[object]]) -> Path:
    with open(path, "w", newline="", encoding="utf-8") as fh:
        csv.writer(fh).writerows(rows)
    return path


def nist_csv(tmp_path: Path, name: str) -> Path:
    ds = nist.load(name)
    rows: list[list[object]] = [["Treatment", "Value"]]
    for label, texts in ds.text_values.items():
        rows += [[label, t] for t in texts]
    return write_csv(tmp_path / f"{name}.csv", rows)


def small_csv(tmp_path: Path, name: str = "lots.csv", shift: float = 0.0) -> Path:
    rows = [["Lot A", "Lot B", "Lot C"]]
    rows += [[1.2 + shift, 2.2, 3.1], [1.4, 2.1 + shift, 3.4], [1.1, 2.6, 3.3], [1.3, 2.4, 3.0]]
    return write_csv(tmp_path / name, rows)


def run(argv, capsys) -> tuple[int, str, str]:
    code = main(argv)
    out, err = capsys.readouterr()
    return code, out, err


def strict_json(text: str):
    def refuse(name):
        raise AssertionError(f"non-standard JSON constant {name}")

    return json.loads(text, parse_constant=refuse)


# --------------------------------------------------------------------------------------------
# table


def test_table_json_matches_nist_certified_values(tmp_path, capsys):
    # NIST StRD SmLs01 (certified values in the dataset header)
    path = nist_csv(tmp_path, "SmLs01")
    code, out, err = run(["table", str(path), "--layout", "long", "--json"], capsys)
    assert code == 0 and err == ""
    doc = strict_json(out)
    cert = nist.load("SmLs01").certified
    ow = doc["oneway"]
    assert ow["df_between"] == cert.df_between and ow["df_within"] == cert.df_within
    assert math.isclose(ow["f"], cert.f, rel_tol=1e-13)
    assert math.isclose(ow["ss_within"], cert.ss_within, rel_tol=1e-13)
    assert math.isclose(ow["r_squared"], cert.r_squared, rel_tol=1e-13)
    assert ow["exact"] is True
    assert ow["table"][0]["Source"] == "Factor" and ow["table"][1]["Source"] == "Residual"
    assert doc["checks"]["read"] in ("oneway", "welch", "kruskal")
    assert doc["checks"]["table"][0]["Check"] == "Read"
    assert [g["Group"] for g in doc["groups"]] == list(nist.load("SmLs01").groups)
    assert "engineering judgement" in doc["caution"]


def test_table_json_writes_infinity_as_inf(tmp_path, capsys):
    # zero within-group variation and different means: F = +inf, p = 0 (project guide)
    path = write_csv(tmp_path / "flat.csv", [["A", "B"], [1, 2], [1, 2], [1, 2]])
    code, out, err = run(["table", str(path), "--json"], capsys)
    assert code == 0, err
    assert "Infinity" not in out and "NaN" not in out
    doc = strict_json(out)
    assert doc["oneway"]["f"] == "inf" and doc["oneway"]["p"] == 0.0
    assert doc["oneway"]["table"][0]["F"] == "inf"


def test_table_csv_defuses_formula_like_text(tmp_path, capsys):
    rows = [["=HYPERLINK(\"x\")", "+B", "-C", "@D"]]
    rows += [[-1.5, -2.5, -3.5, -0.5], [-1.7, -2.1, -3.3, -0.9], [-1.2, -2.9, -3.1, -0.4]]
    path = write_csv(tmp_path / "inj.csv", rows)
    code, out, err = run(["table", str(path), "--csv", "--factor", "=1+1"], capsys)
    assert code == 0, err
    sections = out.strip("\n").split("\n\n")
    assert len(sections) == 3
    parsed = [list(csv.reader(io.StringIO(s))) for s in sections]
    assert parsed[0][0] == ["Source", "df", "SS", "MS", "F", "p"]
    assert parsed[0][1][0] == "'=1+1"
    groups = parsed[2]
    assert [r[0] for r in groups[1:]] == ["'=HYPERLINK(\"x\")", "'+B", "'-C", "'@D"]
    means = [float(r[2]) for r in groups[1:]]  # negative numbers are numbers, not text
    assert means[0] == pytest.approx(-1.4666666666666666, rel=1e-15)
    for section in parsed:
        for row in section:
            for cell in row:
                assert not cell.startswith(("=", "+", "@", "\t", "\r")), cell
                if cell.startswith("-"):
                    float(cell)  # only numbers may start with a minus sign


def test_csv_safe_and_json_ready():
    assert csv_safe("=1+2") == "'=1+2" and csv_safe("\tx") == "'\tx" and csv_safe("\rx") == "'\rx"
    assert csv_safe("plain") == "plain" and csv_safe(-1.25) == "-1.25"
    assert csv_safe(math.inf) == "inf" and csv_safe(math.nan) == "nan" and csv_safe(None) == ""
    assert csv_safe(0.1 + 0.2) == "0.30000000000000004"  # shortest round-trip repr
    assert json_ready({"a": (math.inf, -math.inf, math.nan, 1)}) == {"a": ["inf", "-inf", None, 1]}


def test_table_text_output(tmp_path, capsys):
    code, out, err = run(["table", str(DEMO_BOOK)], capsys)
    assert code == 0 and err == ""
    lines = out.splitlines()
    assert lines[0].startswith('One-way analysis of variance (demo.xlsx, A1:D9 of sheet "Hardness")')
    assert any(line.split()[:2] == ["Source", "df"] for line in lines)
    assert any(line.startswith("Residual") for line in lines)
    assert any(line.startswith("Checks (alpha = 0.05); read:") for line in lines)
    assert "Ignored cells: C8 (text 'retest')" in out
    assert "engineering judgement" in out


# --------------------------------------------------------------------------------------------
# plan


def test_plan_matches_cohens_table_and_statsmodels(capsys):
    # Cohen (1988), Table 8.4.4: u = 3 (k = 4), f = 0.25, alpha = 0.05, power 0.80 -> n = 45
    code, out, err = run(["plan", "--groups", "4", "--effect", "0.25"], capsys)
    assert code == 0 and err == ""
    assert "Values per group: 45 (total 180)" in out
    from statsmodels.stats.power import FTestAnovaPower

    ref = FTestAnovaPower().power(effect_size=0.25, nobs=180, alpha=0.05, k_groups=4)
    achieved = float(out.split("Achieved power: ")[1].split()[0])
    assert achieved == pytest.approx(ref, abs=5e-5)
    assert achieved >= 0.8
    ref_44 = FTestAnovaPower().power(effect_size=0.25, nobs=176, alpha=0.05, k_groups=4)
    assert ref_44 < 0.8  # 44 per group would fall short (statsmodels)


def test_plan_input_problems(capsys):
    code, out, err = run(["plan", "--groups", "1", "--effect", "0.25"], capsys)
    assert code == 1 and out == ""
    assert err.startswith("sheetfuncs: ") and err.count("\n") == 1
    code, _, err = run(["plan", "--groups", "3", "--effect", "0.25", "--power", "1.5"], capsys)
    assert code == 1 and err.count("\n") == 1


# --------------------------------------------------------------------------------------------
# exit codes


@pytest.mark.parametrize(
    "argv",
    [
        [],
        ["bogus"],
        ["table"],
        ["table", "x.csv", "--json", "--csv"],
        ["report", "x.csv"],
        ["report", "x.csv", "-o", "a.xlsx", "--out-dir", "d"],
        ["plan", "--groups", "three", "--effect", "0.25"],
        ["table", "x.csv", "--layout", "diagonal"],
        ["table", "x.csv", "--size-limit", "-5"],
    ],
)
def test_usage_errors_exit_2(argv, capsys):
    code, out, err = run(argv, capsys)
    assert code == 2
    assert "usage: sheetfuncs" in err and "Traceback" not in err


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


@pytest.mark.parametrize(
    "argv_tail, fragment",
    [
        (["missing.csv"], "missing.csv does not exist"),
        (["one.csv"], "at least two groups are needed"),
        (["lots.csv", "--alpha", "2"], "alpha must lie strictly between 0 and 1"),
        (["lots.csv", "--sheet", "S"], "has no sheets"),
        (["lots.csv", "--range", "A1:B99999999"], "A1:B99999999"),
    ],
)
def test_input_problems_exit_1_with_one_line(tmp_path, capsys, argv_tail, fragment):
    small_csv(tmp_path)
    write_csv(tmp_path / "one.csv", [["A"], [1], [2], [3]])
    argv = ["table", str(tmp_path / argv_tail[0]), *argv_tail[1:]]
    code, out, err = run(argv, capsys)
    assert code == 1 and out == ""
    assert err.startswith("sheetfuncs: ") and err.count("\n") == 1
    assert fragment in err and "Traceback" not in err


def test_version(capsys):
    code, out, _ = run(["--version"], capsys)
    from sheetfuncs import __version__

    assert code == 0 and out.strip() == f"sheetfuncs {__version__}"


# --------------------------------------------------------------------------------------------
# report and demo


def _defined_value(wb, name: str):
    dn = wb.defined_names[name]
    ((sheet, ref),) = list(dn.destinations)
    return wb[sheet][ref.replace("$", "")].value


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
    f = _defined_value(wb, "f_ratio")
    assert math.isclose(f, cert.f, rel_tol=1e-13)
    assert math.isclose(_defined_value(wb, "ss_within"), cert.ss_within, rel_tol=1e-13)
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
    (line,) = err.splitlines()
    assert line.startswith("sheetfuncs: bad.csv: ") and "at least two groups" in line
    # quiet when stderr is not a terminal: nothing but the one error line


class _Tty(io.StringIO):
    def isatty(self) -> bool:
        return True


def test_batch_progress_on_a_terminal_and_when_asked(tmp_path, capsys, monkeypatch):
    a, b = small_csv(tmp_path, "a.csv"), small_csv(tmp_path, "b.csv", shift=0.5)
    fake = _Tty()
    monkeypatch.setattr(sys, "stderr", fake)
    assert main(["report", str(a), str(b), "--out-dir", str(tmp_path / "o1")]) == 0
    shown = fake.getvalue()
    assert "[1/2] a.csv" in shown and "[2/2] b.csv" in shown
    monkeypatch.undo()
    capsys.readouterr()
    # not a terminal: quiet unless --progress, then plain lines
    assert main(["report", str(a), str(b), "--out-dir", str(tmp_path / "o2")]) == 0
    assert capsys.readouterr().err == ""
    assert main(["report", str(a), str(b), "--out-dir", str(tmp_path / "o3"), "--progress"]) == 0
    err = capsys.readouterr().err
    assert "sheetfuncs: [1/2] a.csv: starting" in err and "\r" not in err
    assert main(["report", str(a), "-o", str(tmp_path / "one.xlsx"), "--no-progress"]) == 0
    assert capsys.readouterr().err == ""


def test_progress_turns_on_for_big_inputs_only_on_a_terminal():
    tty = _Tty()
    p = _Progress(None, tty)
    p.start(1, "big.csv")
    p("reading", 0, 1000)
    assert tty.getvalue() == ""
    p("reading", 0, BIG_INPUT_CELLS + 5)
    p("reading", BIG_INPUT_CELLS + 5, BIG_INPUT_CELLS + 5)
    p.finish()
    assert "big.csv: reading 100%" in tty.getvalue() and tty.getvalue().endswith("\n")
    plain = io.StringIO()
    q = _Progress(None, plain)
    q.start(1, "big.csv")
    q("reading", 0, 10 * BIG_INPUT_CELLS)
    q.finish()
    assert plain.getvalue() == ""
    forced = io.StringIO()
    r = _Progress(True, forced)
    r.start(1, "x.csv")
    r("writing", 3, 8)
    assert "sheetfuncs: x.csv: writing 37%" in forced.getvalue()
    off = _Tty()
    s = _Progress(False, off, batch=3)
    s.start(1, "x.csv")
    s("reading", 0, 10 * BIG_INPUT_CELLS)
    assert off.getvalue() == ""


def test_demo_default_output_replaced_on_rerun(tmp_path, capsys, monkeypatch):
    monkeypatch.chdir(tmp_path)
    target = tmp_path / cli.DEFAULT_DEMO_OUTPUT
    target.write_bytes(b"stale")
    code, out, err = run(["demo"], capsys)
    assert code == 0, err
    assert out.startswith(f"wrote {target.resolve()}")
    assert zipfile.is_zipfile(target)
    wb = openpyxl.load_workbook(target)
    assert "Findings" in wb.sheetnames and "Audit" in wb.sheetnames
    from sheetfuncs.demo import demo_groups

    assert math.isclose(_defined_value(wb, "f_ratio"), oneway(demo_groups()).f, rel_tol=1e-15)
    code, out, err = run(["demo", "-o", "demo.xlsx"], capsys)
    assert code == 0 and (tmp_path / "demo.xlsx").exists()
    code, out, err = run(["demo", "-o", "demo.xlsx"], capsys)  # a rerun replaces it
    assert code == 0 and err == ""


# --------------------------------------------------------------------------------------------
# as a subprocess: python -m sheetfuncs


def _py(*args: str, cwd: Path) -> subprocess.CompletedProcess:
    env = dict(os.environ, PYTHONPATH=str(ROOT))
    return subprocess.run([sys.executable, "-m", "sheetfuncs", *args], cwd=cwd, env=env,
                          capture_output=True, text=True, timeout=120)


def test_python_dash_m_sheetfuncs(tmp_path):
    done = _py("table", str(DEMO_BOOK), "--json", cwd=tmp_path)
    assert done.returncode == 0, done.stderr
    assert strict_json(done.stdout)["input"]["range"] == "A1:D9"
    bad = _py("table", "missing.csv", cwd=tmp_path)
    assert bad.returncode == 1 and bad.stdout == ""
    assert bad.stderr.count("\n") == 1 and "Traceback" not in bad.stderr
    usage = _py(cwd=tmp_path)
    assert usage.returncode == 2 and "usage: sheetfuncs" in usage.stderr
