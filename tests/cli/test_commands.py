"""Tests of the command line's entry (sheetfuncs.cli.commands): every input problem is one line on
stderr with exit code 1, the console script and ``python -m sheetfuncs`` run ``main``."""

from __future__ import annotations

import os
import signal
import subprocess
import sys
import time
import tomllib
from importlib import import_module
from pathlib import Path

import pytest

from sheetfuncs.cli import build_parser
from sheetfuncs.cli import commands
from sheetfuncs.cli.commands import COMMANDS
from tests.support.cli import DEMO_BOOK, ROOT, problem_files, run, small_csv, strict_json, write_csv


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


@pytest.mark.parametrize(
    "argv, fragment",
    [
        (["table", "folder"], "folder is a folder, not a file"),
        (["table", "fake.xlsx"], "fake.xlsx is a text (CSV) file, not a workbook; rename it to .csv"),
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
        (["report", "lots.csv", "-o", "folder"], "-o folder names a folder; give -o a file name "
         "ending in .xlsx, or give --out-dir folder to write the report into that folder"),
        (["report", "lots.csv", "-o", "r.pdf"], "must be an .xlsx file"),
        (["report", "lots.csv", "-o", "out/"], "-o out/ names a folder; give -o a file name "
         "ending in .xlsx, or give --out-dir out/ to write the report into that folder"),
        (["table", "lots.xlsx", "--range", "D:D"], 'the range D:D of sheet "Lots" in lots.xlsx is empty'),
        (["table", "lots.csv", "--range", "F2:G9"], "the range F2:G9 of lots.csv holds no values"),
    ],
)
def test_each_input_problem_gives_one_line(tmp_path, capsys, monkeypatch, argv, fragment):
    monkeypatch.chdir(tmp_path)
    problem_files(tmp_path)
    code, out, err = run(argv, capsys)
    lines = err.splitlines()
    if fragment == "must be an .xlsx file" or "out/" in fragment:
        assert code == 2 and len(lines) == 2 and fragment in lines[1]
        return
    assert code == 1 and out == "", err
    assert len(lines) == 1 and lines[0].startswith("sheetfuncs: ") and "Traceback" not in err
    assert fragment in lines[0]
    assert not (tmp_path / "r.xlsx").exists()


def test_every_command_of_the_parser_has_a_runner():
    help_text = build_parser().format_help()
    section = help_text.split("commands:\n")[1].splitlines()[1:]  # after the COMMAND line
    listed = [line.split()[0] for line in section
              if line.startswith("    ") and not line.startswith("     ")]  # not wrapped help
    assert listed == list(COMMANDS) == ["report", "demo", "table", "plan", "template", "fill", "calc"]


def test_a_file_system_error_is_one_line(tmp_path, capsys, monkeypatch):
    def refuse(args):
        raise PermissionError(13, "Permission denied", str(tmp_path / "locked.xlsx"))

    monkeypatch.setattr(commands, "COMMANDS", {**COMMANDS, "plan": refuse})
    code, out, err = run(["plan", "--groups", "3", "--effect", "0.25"], capsys)
    assert code == 1 and out == ""
    assert err == f"sheetfuncs: {tmp_path / 'locked.xlsx'}: Permission denied\n"


# --------------------------------------------------------------------------------------------
# the console script and python -m sheetfuncs


def test_console_script_runs_main(monkeypatch):
    meta = tomllib.loads((ROOT / "pyproject.toml").read_text(encoding="utf-8"))
    module, name = meta["project"]["scripts"]["sheetfuncs"].split(":")
    script = getattr(import_module(module), name)
    import sheetfuncs.cli

    monkeypatch.setattr(sheetfuncs.cli, "main", lambda: 42)
    assert script() == 42  # the script loads the command line, then runs its main


def test_ctrl_c_while_the_command_line_loads_is_one_line(tmp_path):
    # an interrupt raised while the command line is still being imported
    code = (
        "import builtins, sys\n"
        "real = builtins.__import__\n"
        "def imp(name, *a, **k):\n"
        "    if name == 'cli' or name.endswith('.cli'):\n"
        "        raise KeyboardInterrupt\n"
        "    return real(name, *a, **k)\n"
        "builtins.__import__ = imp\n"
        "from sheetfuncs.__main__ import run\n"
        "sys.exit(run())\n"
    )
    env = dict(os.environ, PYTHONPATH=str(ROOT))
    done = subprocess.run([sys.executable, "-c", code], cwd=tmp_path, env=env, capture_output=True,
                          text=True, timeout=60)
    assert (done.returncode, done.stdout, done.stderr) == (130, "", "sheetfuncs: interrupted\n")


def test_import_sheetfuncs_loads_no_numerics(tmp_path):
    # the public names are loaded on first use, so the command line starts (and can be
    # interrupted) before numpy and scipy load
    code = ("import sys, sheetfuncs; assert 'numpy' not in sys.modules and 'scipy' not in sys.modules; "
            "print(sheetfuncs.oneway({'A': [1, 2], 'B': [3, 5]}).df_within, 'numpy' in sys.modules)")
    env = dict(os.environ, PYTHONPATH=str(ROOT))
    done = subprocess.run([sys.executable, "-c", code], cwd=tmp_path, env=env, capture_output=True,
                          text=True, timeout=60)
    assert (done.returncode, done.stdout) == (0, "2 True\n"), done.stderr


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
# the last guard and Ctrl-C (issue 10)


def _broken(args):
    raise OverflowError("intermediate overflow in fsum")


def test_an_unforeseen_error_is_one_line_asking_for_a_report(capsys, monkeypatch):
    monkeypatch.delenv("SHEETFUNCS_DEBUG", raising=False)
    monkeypatch.setattr(commands, "COMMANDS", {**COMMANDS, "plan": _broken})
    code, out, err = run(["plan", "--groups", "3", "--effect", "0.25"], capsys)
    assert code == commands.EXIT_BUG == 3 and out == ""
    assert err == (
        "sheetfuncs: plan stopped on an unexpected error (OverflowError); please report it as a "
        "bug with the command line and the input file (set SHEETFUNCS_DEBUG=1 to see the details)\n"
    )


def test_sheetfuncs_debug_shows_the_traceback(capsys, monkeypatch):
    monkeypatch.setenv("SHEETFUNCS_DEBUG", "1")
    monkeypatch.setattr(commands, "COMMANDS", {**COMMANDS, "plan": _broken})
    code, _, err = run(["plan", "--groups", "3", "--effect", "0.25"], capsys)
    assert code == 3
    assert err.startswith("Traceback (most recent call last):")
    assert "OverflowError: intermediate overflow in fsum" in err
    assert err.splitlines()[-1].startswith("sheetfuncs: plan stopped on an unexpected error")


def test_an_interrupt_in_process_is_one_line(capsys, monkeypatch):
    def interrupted(args):
        raise KeyboardInterrupt

    monkeypatch.setattr(commands, "COMMANDS", {**COMMANDS, "plan": interrupted})
    hook = sys.unraisablehook
    code, out, err = run(["plan", "--groups", "3", "--effect", "0.25"], capsys)
    assert (code, out, err) == (130, "", "sheetfuncs: interrupted\n")
    assert sys.unraisablehook is hook  # the hook silenced during the clean-up is restored


def test_ctrl_c_during_a_report_prints_one_line_and_leaves_no_file(tmp_path):
    # 200,000 invented values (4 columns), long enough to interrupt while the report is written
    src = tmp_path / "big.csv"
    with open(src, "w", encoding="utf-8") as fh:
        fh.write("A,B,C,D\n")
        for i in range(50_000):
            fh.write(f"{10 + i % 7 * 0.1:.1f},{11 + i % 5 * 0.1:.1f},{9 + i % 3 * 0.1:.1f},{10.5 + i % 11 * 0.01:.2f}\n")
    out_dir = tmp_path / "out"
    out_dir.mkdir()
    env = dict(os.environ, PYTHONPATH=str(ROOT))
    proc = subprocess.Popen(
        [sys.executable, "-m", "sheetfuncs", "report", str(src), "-o", str(out_dir / "r.xlsx")],
        cwd=tmp_path, env=env, stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True,
    )
    # wait until the writer has started (its temporary file appears), then about a second more
    deadline = time.monotonic() + 120
    while not any(out_dir.iterdir()) and proc.poll() is None and time.monotonic() < deadline:
        time.sleep(0.05)
    time.sleep(1.0)
    assert proc.poll() is None, "the report finished before it could be interrupted"
    proc.send_signal(signal.SIGINT)
    out, err = proc.communicate(timeout=120)
    assert proc.returncode == 130
    assert err.splitlines() == ["sheetfuncs: interrupted"], err[:2000]
    assert list(out_dir.iterdir()) == []  # no report, no temporary file
