"""Tests of progress on stderr (sheetfuncs.cli.progress): on a terminal for batches and big
inputs, quiet elsewhere unless asked, never with --no-progress."""

from __future__ import annotations

import io
import sys

from sheetfuncs.cli import BIG_INPUT_CELLS, Progress, main
from tests.support.cli import Tty, small_csv


def test_batch_progress_on_a_terminal_and_when_asked(tmp_path, capsys, monkeypatch):
    a, b = small_csv(tmp_path, "a.csv"), small_csv(tmp_path, "b.csv", shift=0.5)
    fake = Tty()
    monkeypatch.setattr(sys, "stderr", fake)
    assert main(["report", str(a), str(b), "--out-dir", str(tmp_path / "o1")]) == 0
    shown = fake.getvalue()
    assert "[1/2] a.csv" in shown and "[2/2] b.csv" in shown
    monkeypatch.undo()
    capsys.readouterr()
    # not a terminal: quiet unless --progress, then plain lines
    assert main(["report", str(a), str(b), "--out-dir", str(tmp_path / "o2")]) == 0
    assert [x.split(":")[0] for x in capsys.readouterr().err.splitlines()] == ["a.csv", "b.csv"]
    assert main(["report", str(a), str(b), "--out-dir", str(tmp_path / "o3"), "--progress"]) == 0
    err = capsys.readouterr().err
    assert "sheetfuncs: [1/2] a.csv: starting" in err and "\r" not in err
    assert main(["report", str(a), "-o", str(tmp_path / "one.xlsx"), "--no-progress"]) == 0
    assert capsys.readouterr().err.startswith("a.csv: read A1:C5: 3 groups")  # what was read, only


def test_progress_turns_on_for_big_inputs_only_on_a_terminal():
    tty = Tty()
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
    off = Tty()
    s = Progress(False, off, batch=3)
    s.start(1, "x.csv")
    s("reading", 0, 10 * BIG_INPUT_CELLS)
    assert off.getvalue() == ""
