"""docs/functions.md and its generator (sheetfuncs.worksheet.docs): in sync with the registry,
every function with an example on invented data, the command line, example references.

The numbers in the examples are invented; their outputs come from the functions themselves,
called through the harness.
"""

from __future__ import annotations

import subprocess
import sys

import pytest

from sheetfuncs.worksheet import docs
from sheetfuncs.worksheet.functions import REGISTRY
from sheetfuncs.worksheet.registry import Ref


def test_docs_are_in_sync() -> None:
    current = docs.DOCS_PATH.read_text(encoding="utf-8")
    assert current == docs.markdown(), "run: python -m sheetfuncs.worksheet.docs --markdown > docs/functions.md"


def test_docs_cover_every_function_with_an_invented_example() -> None:
    text = docs.DOCS_PATH.read_text(encoding="utf-8")
    for name, rec in REGISTRY.items():
        assert f"\n## {name}\n" in text
        assert f"`{rec.example_formula}`" in text
        assert "nvented" in rec.example.note or rec.example.shared or not any(
            isinstance(a, Ref) for a in rec.example.args
        )
    assert "ISNUMBER(" in text and "greater than any number" in text


def test_check_command(tmp_path, capsys) -> None:
    stale = tmp_path / "functions.md"
    stale.write_text("# old\n", encoding="utf-8")
    assert docs.main(["--check", str(stale)]) == 1
    assert "out of date" in capsys.readouterr().err
    stale.write_text(docs.markdown(), encoding="utf-8")
    assert docs.main(["--check", str(stale)]) == 0
    assert docs.main(["--markdown"]) == 0
    assert capsys.readouterr().out.endswith(docs.markdown())


def test_the_documented_command_runs(tmp_path) -> None:
    # the command the page names for itself, run as a user runs it
    stale = tmp_path / "functions.md"
    stale.write_text("# old\n", encoding="utf-8")
    cmd = [sys.executable, "-m", "sheetfuncs.worksheet.docs", "--check", str(stale)]
    root = str(docs.DOCS_PATH.parent.parent)
    out = subprocess.run(cmd, capture_output=True, text=True, cwd=root)
    assert out.returncode == 1
    assert "run: python -m sheetfuncs.worksheet.docs --markdown >" in out.stderr
    out = subprocess.run(cmd[:3] + ["--check"], capture_output=True, text=True, cwd=root)
    assert out.returncode == 0 and "is up to date" in out.stdout


def test_resolve_example_references() -> None:
    assert docs.resolve(Ref("B2:C3"), ((1, 2, 3), (4, 5, 6), (7, 8, 9))) == [[5, 6], [8, 9]]
    assert docs.resolve(Ref("A3"), ((1,), (2,), (3,))) == [[3]]
    # beyond the cells laid out: blank, as on a sheet
    assert docs.resolve(Ref("B1:C2"), ((1, 2),)) == [[2, None], [None, None]]
    for bad in ("Head A", "A:C", "2:3", "'Lot data'!A1:B2"):
        with pytest.raises(ValueError):
            docs.resolve(Ref(bad), ((1, 2),))
