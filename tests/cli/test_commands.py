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

from tests.support import nist
from sheetfuncs import oneway
from sheetfuncs.cli import (
    BIG_INPUT_CELLS, DEFAULT_DEMO_OUTPUT, Progress, csv_safe, json_ready, main,
)
from sheetfuncs.cli.output import cell_shown

ROOT = Path(__file__).resolve().parents[2]
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
    assert 'Ignored cells: C8 (text "retest")' in out  # as a spreadsheet user reads text
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
    assert code == 2 and out == ""
    assert "Traceback" not in err
    usage, line = err.splitlines()  # the command's usage, then one line that says what is wrong
    assert usage.startswith("usage: sheetfuncs")
    assert line.startswith("sheetfuncs: ") and line.endswith("--help)")


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
    p = Progress(None, tty)
    p.start(1, "big.csv")
    p("reading", 0, 1000)
    assert tty.getvalue() == ""
    p("reading", 0, BIG_INPUT_CELLS + 5)
    p("reading", BIG_INPUT_CELLS + 5, BIG_INPUT_CELLS + 5)
    p.finish()
    assert "big.csv: reading 100%" in tty.getvalue() and tty.getvalue().endswith("\n")
    plain = io.StringIO()
    q = Progress(None, plain)
    q.start(1, "big.csv")
    q("reading", 0, 10 * BIG_INPUT_CELLS)
    q.finish()
    assert plain.getvalue() == ""
    forced = io.StringIO()
    r = Progress(True, forced)
    r.start(1, "x.csv")
    r("writing", 3, 8)
    assert "sheetfuncs: x.csv: writing 37%" in forced.getvalue()
    off = _Tty()
    s = Progress(False, off, batch=3)
    s.start(1, "x.csv")
    s("reading", 0, 10 * BIG_INPUT_CELLS)
    assert off.getvalue() == ""


def test_demo_default_output_replaced_on_rerun(tmp_path, capsys, monkeypatch):
    monkeypatch.chdir(tmp_path)
    target = tmp_path / DEFAULT_DEMO_OUTPUT
    target.write_bytes(b"stale")
    code, out, err = run(["demo"], capsys)
    assert code == 0, err
    assert out.startswith(f"wrote {target.resolve()}")
    assert zipfile.is_zipfile(target)
    wb = openpyxl.load_workbook(target)
    assert "Findings" in wb.sheetnames and "Audit" in wb.sheetnames
    from sheetfuncs.input.demo import demo_groups

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


# --------------------------------------------------------------------------------------------
# demo: which existing files it may replace


def _plain_book(path: Path) -> Path:
    wb = openpyxl.Workbook()
    wb.active.append(["Supplier audit", 3])
    wb.save(path)
    return path


def test_demo_keeps_an_unrelated_workbook_unless_forced(tmp_path, capsys, monkeypatch):
    monkeypatch.chdir(tmp_path)
    other = _plain_book(tmp_path / "audit.xlsx")
    before = other.read_bytes()
    code, out, err = run(["demo", "-o", "audit.xlsx"], capsys)
    assert code == 1 and out == ""
    (line,) = err.splitlines()
    assert line == ("sheetfuncs: audit.xlsx already exists and is not a sheetfuncs demo report, "
                    "so it is kept; choose another name with -o, or add --force to replace it")
    assert other.read_bytes() == before
    code, out, err = run(["demo", "-o", "audit.xlsx", "--force"], capsys)
    assert code == 0 and err == ""
    assert "Findings" in openpyxl.load_workbook(other).sheetnames


def test_demo_keeps_text_and_other_reports_but_replaces_its_own(tmp_path, capsys, monkeypatch):
    monkeypatch.chdir(tmp_path)
    fake = tmp_path / "notes.xlsx"
    fake.write_text("Lot,Value\nA,1\n", encoding="utf-8")  # a CSV with a workbook's name
    code, _, err = run(["demo", "-o", "notes.xlsx"], capsys)
    assert code == 1 and "is not a sheetfuncs demo report" in err and err.count("\n") == 1
    assert fake.read_text(encoding="utf-8") == "Lot,Value\nA,1\n"
    # a sheetfuncs report of other data is not the demo's to replace
    src = small_csv(tmp_path)
    assert main(["report", str(src), "-o", "lots-report.xlsx"]) == 0
    before = (tmp_path / "lots-report.xlsx").read_bytes()
    capsys.readouterr()
    code, _, err = run(["demo", "-o", "lots-report.xlsx"], capsys)
    assert code == 1 and "is not a sheetfuncs demo report" in err
    assert (tmp_path / "lots-report.xlsx").read_bytes() == before
    # an earlier demo report under any name is replaced without --force
    assert main(["demo", "-o", "mine.xlsx"]) == 0
    (tmp_path / "mine.xlsx").write_bytes((tmp_path / "mine.xlsx").read_bytes())
    capsys.readouterr()
    code, _, err = run(["demo", "-o", "mine.xlsx"], capsys)
    assert code == 0 and err == ""
    # the default name is the demo's own, whatever it holds
    (tmp_path / DEFAULT_DEMO_OUTPUT).write_bytes(b"stale")
    assert main(["demo"]) == 0 and zipfile.is_zipfile(tmp_path / DEFAULT_DEMO_OUTPUT)


def test_demo_help_says_what_it_replaces(capsys):
    assert main(["demo", "--help"]) == 0
    text = " ".join(capsys.readouterr().out.split())
    assert "--force" in text and "not a sheetfuncs demo report" in text
    assert DEFAULT_DEMO_OUTPUT in text and "earlier demo report" in text


# --------------------------------------------------------------------------------------------
# values that start with a minus sign


@pytest.mark.parametrize("option", ["--title", "--factor", "--response", "--unit"])
def test_dash_values_are_documented_and_hinted(tmp_path, capsys, option):
    src = small_csv(tmp_path)
    assert main(["report", "--help"]) == 0
    helptext = " ".join(capsys.readouterr().out.split())
    assert f'for a value that starts with "-", write {option}=-2+3' in helptext
    code, out, err = run(["report", str(src), "-o", str(tmp_path / "r.xlsx"), option, "-2+3"],
                         capsys)
    assert code == 2 and out == ""
    assert f"write {option}=VALUE (e.g. {option}=-2+3)" in err.splitlines()[-1]
    assert not (tmp_path / "r.xlsx").exists()


def test_dash_value_with_equals_sign_is_taken(tmp_path, capsys):
    src = small_csv(tmp_path)
    out = tmp_path / "r.xlsx"
    code, _, err = run(["report", str(src), "-o", str(out), "--title=-2+3", "--unit=-dB"], capsys)
    assert code == 0, err
    from sheetfuncs.input.files.reader import workbook_properties

    assert "-2+3" in workbook_properties(out)["title"]


# --------------------------------------------------------------------------------------------
# the text output shows cells as a spreadsheet user reads them


def test_cell_shown_like_a_spreadsheet():
    assert cell_shown("text", "retest") == 'text "retest"'
    assert cell_shown("text", 'say "hi"') == 'text "say ""hi"""'  # quotes doubled
    assert cell_shown("logical", True) == "logical value TRUE"
    assert cell_shown("text", "x" * 60).endswith('…"')


def test_table_text_names_ignored_cells_with_quotes(tmp_path, capsys):
    path = write_csv(tmp_path / "q.csv", [["A", "B"], [1, 2], ["n/a", 3], [1.5, "TRUE"], [2, 4]])
    code, out, err = run(["table", str(path)], capsys)
    assert code == 0, err
    assert 'Ignored cells: A3 (text "n/a"), B4 (logical value TRUE)' in out
    assert "'n/a'" not in out


# --------------------------------------------------------------------------------------------
# every input problem: one line on stderr, exit 1; usage problems: exit 2


def _cases(tmp_path: Path) -> dict[str, Path]:
    small_csv(tmp_path)
    (tmp_path / "folder").mkdir()
    (tmp_path / "fake.xlsx").write_text("A,B\n1,2\n3,4\n", encoding="utf-8")
    (tmp_path / "header.csv").write_text("Lot A,Lot B,Lot C\n", encoding="utf-8")
    write_csv(tmp_path / "one.csv", [["A"], [1], [2], [3]])
    book = tmp_path / "lots.xlsx"
    wb = openpyxl.Workbook()
    wb.active.title = "Lots"
    for row in [["A", "B"], [1, 2], [3, 4], [5, 7]]:
        wb.active.append(row)
    wb.save(book)
    return {}


@pytest.mark.parametrize(
    "argv, fragment",
    [
        (["table", "folder"], "folder is a folder, not a file"),
        (["table", "fake.xlsx"], "fake.xlsx is not an .xlsx workbook"),
        (["table", "header.csv"], "holds only a row of labels and no values"),
        (["table", "one.csv"], 'at least two groups are needed to compare means, got 1 (only "A")'),
        (["table", "lots.csv", "--alpha", "5"], "alpha must lie strictly between 0 and 1"),
        (["report", "lots.csv", "-o", "r.xlsx", "--alpha", "5"], "alpha must lie strictly"),
        (["report", "lots.csv", "-o", "r.xlsx", "--method", "foo"], "unknown comparison method"),
        (["report", "lots.csv", "-o", "r.xlsx", "--control", "Lot Z"],
         'the control "Lot Z" is not one of the groups'),
        (["report", "lots.xlsx", "-o", "r.xlsx", "--sheet", "Nope"],
         'lots.xlsx has no sheet named "Nope"; its sheets are "Lots"'),
        (["table", "lots.xlsx", "--sheet", "Nope"], 'has no sheet named "Nope"'),
        (["report", "lots.xlsx", "-o", "lots.xlsx"], "would overwrite the input"),
        (["report", "lots.xlsx", "-o", "./lots.xlsx", "--force"], "would overwrite the input"),
        (["report", "lots.csv", "-o", "nowhere/r.xlsx"], "the folder nowhere does not exist"),
        (["report", "lots.csv", "-o", "folder"], "must be an .xlsx file"),
        (["table", "lots.xlsx", "--range", "D:D"], 'the range D:D of sheet "Lots" in lots.xlsx is empty'),
        (["table", "lots.csv", "--range", "F2:G9"], "the range F2:G9 of lots.csv holds no values"),
    ],
)
def test_each_input_problem_gives_one_line(tmp_path, capsys, monkeypatch, argv, fragment):
    monkeypatch.chdir(tmp_path)
    _cases(tmp_path)
    code, out, err = run(argv, capsys)
    lines = err.splitlines()
    if fragment == "must be an .xlsx file":
        assert code == 2 and len(lines) == 2 and fragment in lines[1]
        return
    assert code == 1 and out == "", err
    assert len(lines) == 1 and lines[0].startswith("sheetfuncs: ") and "Traceback" not in err
    assert fragment in lines[0]
    assert not (tmp_path / "r.xlsx").exists()


@pytest.mark.parametrize(
    "argv, fragment",
    [
        (["report", "lots.csv", "one.csv", "-o", "r.xlsx"], "use --out-dir DIR for several inputs"),
        (["table", "lots.csv", "one.csv"], "table reads one input"),
        (["table", "lots.csv", "--alpha", "abc"], 'argument --alpha: must be a number, not "abc"'),
        (["plan", "--groups", "three", "--effect", "0.25"], "must be a whole number"),
        (["table", "lots.csv", "--bogus"], "unrecognized arguments: --bogus"),
        (["demo", "-o", "demo.csv"], 'the report must be an .xlsx file, not "demo.csv"'),
    ],
)
def test_usage_problems_give_usage_and_one_line(tmp_path, capsys, monkeypatch, argv, fragment):
    monkeypatch.chdir(tmp_path)
    _cases(tmp_path)
    code, out, err = run(argv, capsys)
    assert code == 2 and out == ""
    usage, line = err.splitlines()
    assert usage.startswith(f"usage: sheetfuncs {argv[0]} ")
    assert line.startswith(f"sheetfuncs: {argv[0]}: ") and fragment in line
    assert not (tmp_path / "r.xlsx").exists()


def test_report_inputs_may_follow_the_options(tmp_path, capsys, monkeypatch):
    monkeypatch.chdir(tmp_path)
    a, b = small_csv(tmp_path, "a.csv"), small_csv(tmp_path, "b.csv", shift=0.5)
    code, out, err = run(["report", a.name, "--out-dir", "made/here", b.name], capsys)
    assert code == 0, err
    assert sorted(p.name for p in (tmp_path / "made" / "here").iterdir()) == [
        "a-report.xlsx", "b-report.xlsx"]  # --out-dir is created when missing
    assert out.splitlines() == [f"wrote {Path('made', 'here', f'{x.stem}-report.xlsx')}"
                                for x in (a, b)]  # in the order given


def test_help_reads_well(capsys):
    assert main(["--help"]) == 0
    top = capsys.readouterr().out
    assert "commands:" in top and "positional arguments" not in top
    assert "sheetfuncs demo" in top and "Exit codes" in top
    for cmd in ("report", "demo", "table", "plan"):
        assert main([cmd, "--help"]) == 0
        text = capsys.readouterr().out
        assert text.startswith(f"usage: sheetfuncs {cmd} ")
        assert "positional arguments" not in text and "show this help and exit" in text
    assert main(["report", "--help"]) == 0
    text = " ".join(capsys.readouterr().out.split())
    for default in ("(default 0.05)", "(default tukey)", "(default Factor)", "(default Response)",
                    "(default 512)", "(default: the first worksheet)"):
        assert default in text, default
