"""Helpers for the command-line tests (tests/cli): input files, running ``main`` in-process,
strict JSON, a stream that says it is a terminal, and reading a report's defined names.

The CSV files hold invented numbers (lots of a material, made up for these tests).
"""

from __future__ import annotations

import csv
import io
import json
from pathlib import Path
from typing import Any

import openpyxl

from sheetfuncs.cli import main
from tests.support import nist

ROOT = Path(__file__).resolve().parents[2]
DEMO_BOOK = ROOT / "workbooks" / "demo.xlsx"


def write_csv(path: Path, rows: list[list[object]]) -> Path:
    with open(path, "w", newline="", encoding="utf-8") as fh:
        csv.writer(fh).writerows(rows)
    return path


def nist_csv(tmp_path: Path, name: str) -> Path:
    """A NIST StRD one-way dataset as a long-layout CSV file (Treatment, Value)."""
    ds = nist.load(name)
    rows: list[list[object]] = [["Treatment", "Value"]]
    for label, texts in ds.text_values.items():
        rows += [[label, t] for t in texts]
    return write_csv(tmp_path / f"{name}.csv", rows)


def small_csv(tmp_path: Path, name: str = "lots.csv", shift: float = 0.0) -> Path:
    """Three lots of four invented values, one lot per column."""
    rows = [["Lot A", "Lot B", "Lot C"]]
    rows += [[1.2 + shift, 2.2, 3.1], [1.4, 2.1 + shift, 3.4], [1.1, 2.6, 3.3], [1.3, 2.4, 3.0]]
    return write_csv(tmp_path / name, rows)


def run(argv: list[str], capsys: Any) -> tuple[int, str, str]:
    """``main(argv)`` in-process: the exit code, stdout and stderr."""
    code = main(argv)
    out, err = capsys.readouterr()
    return code, out, err


def strict_json(text: str) -> Any:
    """Parse JSON, refusing the non-standard constants ``Infinity``, ``-Infinity`` and ``NaN``."""
    def refuse(name: str) -> None:
        raise AssertionError(f"non-standard JSON constant {name}")

    return json.loads(text, parse_constant=refuse)


class Tty(io.StringIO):
    """A text stream that says it is a terminal."""

    def isatty(self) -> bool:
        return True


def defined_value(wb: openpyxl.Workbook, name: str) -> Any:
    """The value of the cell a workbook-level defined name points at."""
    dn = wb.defined_names[name]
    ((sheet, ref),) = list(dn.destinations)
    return wb[sheet][ref.replace("$", "")].value


def problem_files(tmp_path: Path) -> None:
    """Inputs with one problem each (and a good CSV and workbook) in ``tmp_path``: a folder,
    a text file named .xlsx, a CSV with labels only, a CSV with one group, and ``lots.xlsx``
    with a sheet ``Lots``."""
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
