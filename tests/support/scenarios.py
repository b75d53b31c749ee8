"""Invented scenarios (numbers made up for the tests) shared by the report tests, and the
helpers that read a written report back."""

from __future__ import annotations

from pathlib import Path
from typing import Any

import openpyxl

from sheetfuncs.report import write_report

# Invented scenarios for the Findings text (numbers made up for these tests).
CLEAR = {  # fill weight (g) of three filling lines; line B runs heavy
    "Line A": [50.1, 50.3, 49.8, 50.0, 50.2, 49.9],
    "Line B": [52.0, 52.3, 51.8, 52.1, 51.9, 52.2],
    "Line C": [50.0, 50.2, 49.9, 50.1, 50.3, 49.8],
}
NONE = {  # assay of three lots of a reference material; no lot effect
    "Lot 1": [10.1, 9.9, 10.0, 10.2, 9.8, 10.0],
    "Lot 2": [10.0, 10.1, 9.9, 10.0, 10.2, 9.8],
    "Lot 3": [9.9, 10.0, 10.1, 9.8, 10.1, 10.0],
}
UNEQUAL = {  # bore diameter (mm) from three suppliers; supplier 3 is far more variable
    "Supplier 1": [20.0, 20.1, 19.9, 20.0, 20.1, 19.9, 20.0, 20.1],
    "Supplier 2": [20.3, 20.2, 20.4, 20.3, 20.2, 20.4, 20.3, 20.2],
    "Supplier 3": [18.0, 22.5, 19.0, 23.0, 17.5, 21.0, 24.0, 16.0],
}


# invented: three groups that are the same seven values in different orders (SS between = 0);
# their centred mean is not a double, so a host's SUM/n and SUMIF/COUNT can differ in the last
# bit (LibreOffice recalculates SS between as about 1e-33)
_SEVEN = [5.9, 5.2, 5.5, 4.9, 5.8, 4.1, 5.3]
EQUAL_MEANS = {f"Head {i + 1}": _SEVEN[i:] + _SEVEN[:i] for i in range(3)}

# invented: cure time (min) of three ovens, each with one slow outlier -> non-normal residuals in
# small groups: the checks read Kruskal–Wallis alongside the F test, and here the two disagree
OVENS = {"Oven 1": [5.1, 5.2, 5.0, 5.3, 5.1, 5.2, 5.0, 7.9],
         "Oven 2": [5.6, 5.5, 5.7, 5.6, 5.4, 5.5, 5.7, 8.3],
         "Oven 3": [5.2, 5.1, 5.3, 5.2, 5.0, 5.3, 5.1, 8.0]}
# invented: no variation within groups, so F is infinite (written as the text "infinite"); the
# group "c" has one value, so its SD is undefined
INFINITE = {"a": [1.0, 1.0, 1.0], "b": [2.0, 2.0, 2.0], "c": [3.0]}


# ---------------------------------------------------------------------------------------------
# reading a written report back

#: The workbook-level names a report defines for its key figures (each has an "audit_" twin).
NAMES = ("ss_between", "ss_within", "df_between", "df_within", "f_ratio", "p_value")


def write_in(folder: Path, groups: Any, name: str = "r.xlsx", **kw: Any) -> Path:
    """A report of ``groups`` written as ``folder / name`` (options as for write_report)."""
    return write_report(groups, folder / name, **kw)


def cells_text(ws: Any) -> str:
    """Every non-empty cell of a worksheet as text, one per line."""
    return "\n".join(str(c.value) for row in ws.iter_rows() for c in row if c.value is not None)


def name_cell(wb: Any, name: str) -> Any:
    """The cell a workbook-level name points at."""
    (sheet, coord), = list(wb.defined_names[name].destinations)
    return wb[sheet][coord.replace("$", "")]


def findings_text(path: Path) -> str:
    """The text of a written report's Findings sheet."""
    return cells_text(openpyxl.load_workbook(path)["Findings"])
