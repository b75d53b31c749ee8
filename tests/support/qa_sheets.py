"""A corpus of realistic QA sheets for block detection, each with the reading it must give.

Every scenario and every number here is invented for these tests (fill weights by filling head,
casting hardness by moulding line, tensile strength by supplier, ...). Formula cells get their
saved values the way a spreadsheet program saves them (``<f>...</f><v>...</v>``): openpyxl writes
formulas without values, so :func:`save_with_values` patches the sheet XML after saving.
"""

from __future__ import annotations

import csv
import re
import statistics
import zipfile
from collections.abc import Callable
from dataclasses import dataclass, field
from pathlib import Path

import openpyxl
from openpyxl.worksheet.table import Table

__all__ = ["CASES", "Case", "build", "save_with_values"]

HEADS = ["Head 1", "Head 2", "Head 3", "Head 4"]
#: Invented fill weights (g), 12 tablets per filling head.
FILL = [[round(250.0 + 0.1 * ((7 * i + 3 * j) % 11) + 0.3 * j, 1) for j in range(4)] for i in range(12)]
#: Invented casting hardness (HRC) by moulding line, 8 castings per line.
HARD = [[round(42.0 + 0.2 * ((5 * i + 2 * j) % 7) + 0.5 * j, 1) for j in range(3)] for i in range(8)]
LINES = ["Line A", "Line B", "Line C"]


@dataclass(frozen=True)
class Case:
    """One sheet: how to write it, and the reading it must give (``groups`` label -> values,
    the ``block`` read, the kinds of cells left out), or the ``error`` line it must stop with."""

    name: str
    write: Callable[[Path], Path]
    groups: dict[str, list[float]] = field(default_factory=dict)
    block: str = ""
    kinds: frozenset[str] = frozenset()
    error: str = ""
    note: str = ""
    layout: str = "wide"


def columns(rows: list[list[float]], labels: list[str]) -> dict[str, list[float]]:
    return {lab: [r[j] for r in rows] for j, lab in enumerate(labels)}


def save_with_values(wb: openpyxl.Workbook, path: Path, values: dict[str, dict[str, float]]) -> Path:
    """Save ``wb`` with each formula cell holding its saved value (``values[sheet][coord]``)."""
    wb.save(path)
    parts = {}
    with zipfile.ZipFile(path) as z:
        names = z.namelist()
        for i, ws in enumerate(wb.worksheets, start=1):
            member = f"xl/worksheets/sheet{i}.xml"
            xml = z.read(member).decode("utf-8")
            for coord, v in values.get(ws.title, {}).items():
                xml, n = re.subn(rf'(<c r="{coord}"[^>]*>)(<f>[^<]*</f>)<v\s*/>',
                                 rf"\g<1>\g<2><v>{v!r}</v>", xml)
                assert n == 1, f"no formula at {coord}"
            parts[member] = xml.encode("utf-8")
        data = {n: parts.get(n) or z.read(n) for n in names}
    with zipfile.ZipFile(path, "w", zipfile.ZIP_DEFLATED) as z:
        for n in names:
            z.writestr(n, data[n])
    return path


def _book(rows: list[list[object]], title: str = "Data", at: int = 1) -> tuple[openpyxl.Workbook, object]:
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = title
    for i, row in enumerate(rows):
        for j, v in enumerate(row):
            if v is not None:
                ws.cell(row=at + i, column=1 + j, value=v)
    return wb, ws


def _mean(xs: list[float]) -> float:
    return round(statistics.fmean(xs), 6)


def tablets(folder: Path) -> Path:
    """The issue's worksheet: title, note, header in row 3, Sample 1-12, Mean and SD formulas."""
    rows: list[list[object]] = [["Tablet fill weight, line 2 (invented data)"],
                                ["Operator note: heads checked after the 10:00 stop"],
                                ["Sample"] + HEADS]
    rows += [[i + 1] + r for i, r in enumerate(FILL)]
    rows += [["Mean"] + [f"=AVERAGE({c}4:{c}15)" for c in "BCDE"],
             ["SD"] + [f"=STDEV({c}4:{c}15)" for c in "BCDE"]]
    wb, _ = _book(rows, "Fill weights")
    cols = columns(FILL, HEADS)
    vals = {f"{c}16": _mean(cols[h]) for c, h in zip("BCDE", HEADS)}
    vals |= {f"{c}17": round(statistics.stdev(cols[h]), 6) for c, h in zip("BCDE", HEADS)}
    return save_with_values(wb, folder / "tablets.xlsx", {"Fill weights": vals})


def units_row(folder: Path) -> Path:
    rows: list[list[object]] = [["Casting hardness by moulding line (invented data)"], LINES,
                                ["HRC", "HRC", "HRC"]] + [list(r) for r in HARD]
    rows += [[None], ["Checked by: ____"], ["Approved by: ____"]]
    wb, _ = _book(rows, "Hardness")
    wb.save(folder / "units.xlsx")
    return folder / "units.xlsx"


def signoff_under(folder: Path) -> Path:
    rows: list[list[object]] = [LINES] + [list(r) for r in HARD] + [["Checked by:", "J. Doe"]]
    wb, _ = _book(rows, "Hardness")
    wb.save(folder / "signoff.xlsx")
    return folder / "signoff.xlsx"


def stacked(folder: Path) -> Path:
    week2 = [[v + 0.4 for v in r] for r in HARD]
    rows: list[list[object]] = [["This week"], LINES] + [list(r) for r in HARD] + [[None],
                                ["Last week"], LINES] + week2
    wb, _ = _book(rows, "Hardness")
    wb.save(folder / "stacked.xlsx")
    return folder / "stacked.xlsx"


def side_by_side(folder: Path) -> Path:
    cols = columns(HARD, LINES)
    rows: list[list[object]] = [LINES + [None, "Line", "Mean"]]
    for i, r in enumerate(HARD):
        extra = [None, LINES[i], _mean(cols[LINES[i]])] if i < 3 else []
        rows.append(list(r) + extra)
    wb, _ = _book(rows, "Hardness")
    wb.save(folder / "beside.xlsx")
    return folder / "beside.xlsx"


def lot_headers(folder: Path, lots: tuple[float, ...] = (1001, 1002, 1003), name: str = "lots") -> Path:
    rows: list[list[object]] = [["Potency (%) by lot, invented"], list(lots)]
    rows += [[round(5.0 + 0.1 * ((i + j) % 4), 2) for j in range(3)] for i in range(6)]
    wb, _ = _book(rows, "Lots")
    wb.save(folder / f"{name}.xlsx")
    return folder / f"{name}.xlsx"


#: Invented tensile strength (MPa) by supplier, long layout; one row has no value.
TENSILE = [("Supplier A", 412.0, ""), ("Supplier B", 405.5, "re-test"), ("Supplier A", 409.0, ""),
           ("Supplier C", 398.0, ""), ("Supplier B", None, "specimen broke in grip"),
           ("Supplier C", 401.5, ""), ("Supplier A", 415.5, ""), ("Supplier B", 407.0, ""),
           ("Supplier C", 396.5, "")]


def long_comments(folder: Path) -> Path:
    rows: list[list[object]] = [["Tensile strength by supplier (invented)"],
                                ["Specimen", "Supplier", "Strength", "Comment"]]
    rows += [[i + 1, lab, v, com or None] for i, (lab, v, com) in enumerate(TENSILE)]
    wb, _ = _book(rows, "Tensile")
    wb.save(folder / "tensile.xlsx")
    return folder / "tensile.xlsx"


def defined_table(folder: Path) -> Path:
    rows: list[list[object]] = [["Fill weights (invented)"], [None], HEADS] + [list(r) for r in FILL]
    wb, ws = _book(rows, "Fill")
    ws.add_table(Table(displayName="FillWeights", ref="A3:D15"))
    wb.save(folder / "table.xlsx")
    return folder / "table.xlsx"


def merged_title(folder: Path) -> Path:
    rows: list[list[object]] = [["Casting hardness, week 12 (invented)"], LINES] + [list(r) for r in HARD]
    wb, ws = _book(rows, "Hardness")
    ws.merge_cells("A1:C1")
    wb.save(folder / "merged.xlsx")
    return folder / "merged.xlsx"


def merged_header(folder: Path) -> Path:
    rows: list[list[object]] = [["Line A", None, "Line B"]] + [list(r) for r in HARD]
    wb, ws = _book(rows, "Hardness")
    ws.merge_cells("A1:B1")
    wb.save(folder / "merged_header.xlsx")
    return folder / "merged_header.xlsx"


def hidden_row(folder: Path) -> Path:
    rows: list[list[object]] = [LINES] + [list(r) for r in HARD]
    wb, ws = _book(rows, "Hardness")
    ws.row_dimensions[4].hidden = True
    wb.save(folder / "hidden.xlsx")
    return folder / "hidden.xlsx"


def far_cell(folder: Path) -> Path:
    rows: list[list[object]] = [LINES] + [list(r) for r in HARD]
    wb, ws = _book(rows, "Hardness")
    ws["XFD1048576"] = 1.0
    wb.save(folder / "far.xlsx")
    return folder / "far.xlsx"


#: Invented widths (inches) on two gauges.
INCHES = [[0.5 + 0.01 * ((i * 3 + j) % 5) for j in range(2)] for i in range(6)]


def converted(folder: Path) -> Path:
    """Widths in inches, and a third column converted to millimetres by a formula."""
    inches = INCHES
    rows: list[list[object]] = [["Gauge A", "Gauge B", "Gauge C (mm)"]]
    rows += [r + [f"=A{i + 2}*25.4"] for i, r in enumerate(inches)]
    wb, _ = _book(rows, "Widths")
    return save_with_values(wb, folder / "converted.xlsx",
                            {"Widths": {f"C{i + 2}": round(r[0] * 25.4, 6) for i, r in enumerate(inches)}})


def partial_header(folder: Path) -> Path:
    rows: list[list[object]] = [["Line A", None, "Line C"]] + [list(r) for r in HARD]
    wb, _ = _book(rows, "Hardness")
    wb.save(folder / "partial.xlsx")
    return folder / "partial.xlsx"


def looks_long(folder: Path) -> Path:
    rows: list[list[object]] = [["Line", "Hardness"]] + [[LINES[i % 3], HARD[i][0]] for i in range(8)]
    wb, _ = _book(rows, "Hardness")
    wb.save(folder / "looks_long.xlsx")
    return folder / "looks_long.xlsx"


def gap_row(folder: Path) -> Path:
    """A skipped sample: a blank row in the middle of the data."""
    rows: list[list[object]] = [LINES] + [list(r) for r in HARD[:4]] + [[None]] + [list(r) for r in HARD[4:]]
    wb, _ = _book(rows, "Hardness")
    wb.save(folder / "gap.xlsx")
    return folder / "gap.xlsx"


def header_apart(folder: Path) -> Path:
    """The labels, a blank row, then the numbers."""
    rows: list[list[object]] = [LINES, [None]] + [list(r) for r in HARD]
    wb, _ = _book(rows, "Hardness")
    wb.save(folder / "apart.xlsx")
    return folder / "apart.xlsx"


def dated_signoff(folder: Path) -> Path:
    """A sign-off line with its date under the table, after a blank row."""
    rows: list[list[object]] = [LINES] + [list(r) for r in HARD] + [[None], ["Checked by:", "J. Doe", 46356.0]]
    wb, _ = _book(rows, "Hardness")
    wb.save(folder / "dated_signoff.xlsx")
    return folder / "dated_signoff.xlsx"


def text_numbers(folder: Path) -> Path:
    """One line's hardness typed as text (an import gone wrong): leaving the column out would
    drop a group without a word."""
    rows: list[list[object]] = [LINES] + [[a, b, str(c)] for a, b, c in HARD]
    wb, _ = _book(rows, "Hardness")
    wb.save(folder / "text_numbers.xlsx")
    return folder / "text_numbers.xlsx"


def replicate_columns(folder: Path) -> Path:
    """Assay of three lots, one row per lot, columns headed Rep 1-3: the rows are the groups."""
    rows: list[list[object]] = [["Lot", "Rep 1", "Rep 2", "Rep 3"], ["L1", 98.1, 98.4, 97.9],
                                ["L2", 99.0, 98.8, 99.2], ["L3", 98.5, 98.2, 98.6]]
    wb, _ = _book(rows, "Assay")
    wb.save(folder / "replicates.xlsx")
    return folder / "replicates.xlsx"


def counted_first(folder: Path) -> Path:
    """Defect counts per panel on two lines; line 1's counts happen to run 5, 6, 7, ...: sample
    numbers or measurements?"""
    rows: list[list[object]] = [["Line 1", "Line 2"]] + [[5 + i, 6.0 + i % 3] for i in range(6)]
    wb, _ = _book(rows, "Defects")
    wb.save(folder / "counted.xlsx")
    return folder / "counted.xlsx"


def write_csv(path: Path, rows: list[list[object]]) -> Path:
    with open(path, "w", newline="", encoding="utf-8") as fh:
        csv.writer(fh).writerows(rows)
    return path


def tablets_csv(folder: Path) -> Path:
    cols = columns(FILL, HEADS)
    rows: list[list[object]] = [["Tablet fill weight, line 2 (invented data)"], [], ["Sample"] + HEADS]
    rows += [[i + 1] + r for i, r in enumerate(FILL)]
    rows += [["Mean"] + [_mean(cols[h]) for h in HEADS]]
    return write_csv(folder / "tablets.csv", rows)


def units_csv(folder: Path) -> Path:
    rows: list[list[object]] = [LINES, ["(HRC)", "(HRC)", "(HRC)"]] + [list(r) for r in HARD]
    return write_csv(folder / "units.csv", rows)


def stacked_csv(folder: Path) -> Path:
    rows: list[list[object]] = [LINES] + [list(r) for r in HARD] + [[]] + [LINES] + [list(r) for r in HARD]
    return write_csv(folder / "stacked.csv", rows)


_HARD = columns(HARD, LINES)
_FILL = columns(FILL, HEADS)
_TENSILE: dict[str, list[float]] = {}
for _lab, _v, _ in TENSILE:
    _TENSILE.setdefault(_lab, [])
    if _v is not None:
        _TENSILE[_lab].append(_v)

CASES = [
    Case("tablets", tablets, _FILL, "B3:E15", frozenset({"title", "identifier", "summary"})),
    Case("units row and sign-off block", units_row, _HARD, "A2:C11", frozenset({"title", "units", "signoff"})),
    Case("sign-off under the table", signoff_under, _HARD, "A1:C9", frozenset({"signoff"})),
    Case("two stacked blocks", stacked, error='sheet "Hardness" holds two tables of the same shape, '
         "'Hardness'!A1:C10 and 'Hardness'!A12:C21, and it is not clear which to read; give --range "
         "'Hardness'!A1:C10 or --range 'Hardness'!A12:C21"),
    Case("summary table beside", side_by_side, _HARD, "A1:C9", frozenset({"other-block"}),
         note="another block at 'Hardness'!E1:F4 was not read"),
    Case("numeric lot headers", lot_headers,
         {str(lot): [round(5.0 + 0.1 * ((i + j) % 4), 2) for i in range(6)] for j, lot in enumerate((1001, 1002, 1003))},
         "A2:C8", frozenset({"title"}), note="read as group labels (--labels no reads it as data)"),
    Case("lot headers, some near", lambda f: lot_headers(f, (1001, 5, 6), "lots_mixed"),
         error="the first row of numbers 'Lots'!A2:C2 holds whole numbers, some far from the values "
         "below them (lot numbers?) and some not; give --labels yes (they are labels) or --labels no "
         "(they are data)"),
    Case("long layout with comments", long_comments, _TENSILE, "B2:C11",
         frozenset({"title", "identifier", "comment"}), layout="long"),
    Case("spreadsheet table", defined_table, _FILL, "A3:D15", frozenset({"title"})),
    Case("merged title", merged_title, _HARD, "A2:C10", frozenset({"title"})),
    Case("merged header cells", merged_header,
         error="the row above the numbers, 'Hardness'!A1:C1, has labels over some columns of numbers "
         "but not over others (B1); give --labels yes or --labels no, or a --range that holds the table"),
    Case("hidden row", hidden_row, _HARD, "A1:C9", frozenset(),
         note="row 4 of 'Hardness' is hidden and read as data"),
    Case("far cell", far_cell, _HARD, "A1:C9", frozenset({"other-block"})),
    Case("unit conversion formula", converted,
         {"Gauge A": [r[0] for r in INCHES], "Gauge B": [r[1] for r in INCHES],
          "Gauge C (mm)": [round(r[0] * 25.4, 6) for r in INCHES]}, "A1:C7", frozenset(), note="computed by formulas"),
    Case("partial header", partial_header,
         error="the row above the numbers, 'Hardness'!A1:C1, has labels over some columns of numbers "
         "but not over others (B1); give --labels yes or --labels no, or a --range that holds the table"),
    Case("looks like the long layout", looks_long,
         error="'Hardness'!A1:B9 looks like the long layout (a column of group labels beside a column "
         "of numbers); give --layout long"),
    Case("a blank row inside the data", gap_row,
         error="'Hardness'!A7:C10 under the table 'Hardness'!A1:C5 holds numbers in the same columns "
               "after a blank row; if they belong to the table give --range 'Hardness'!A1:C10, if not "
               "give --range 'Hardness'!A1:C5"),
    Case("labels apart from the numbers", header_apart,
         error="the labels in 'Hardness'!A1:C1 are separated from the numbers in 'Hardness'!A3:C10 by "
               "a blank row; give --range 'Hardness'!A1:C10 to read them together (blank rows are "
               "skipped)"),
    Case("numbers stored as text", text_numbers,
         error="the column 'Hardness'!C1:C9 (\"Line C\") holds numbers stored as text, which a "
               "spreadsheet's own functions skip; convert them to numbers in the sheet (or give a "
               "--range without that column)"),
    Case("replicate columns, a lot per row", replicate_columns,
         error="the columns headed 'Assay'!B1:D1 look like replicates, and column A holds a label "
               "for each row: if each row is a group, give --layout rowwise; if each column is, give "
               "--range 'Assay'!B1:D4"),
    Case("replicate columns read rowwise", replicate_columns,
         {"L1": [98.1, 98.4, 97.9], "L2": [99.0, 98.8, 99.2], "L3": [98.5, 98.2, 98.6]}, "A2:D4",
         frozenset(), layout="rowwise"),
    Case("a group whose values run 5, 6, 7", counted_first,
         error='column A ("Line 1") holds the consecutive whole numbers 5 to 10: if they number the '
               "rows give --range 'Defects'!B1:B7, if they are measurements give --range "
               "'Defects'!A1:B7"),
    Case("sign-off with a date under the table", dated_signoff, _HARD, "A1:C9", frozenset({"signoff"})),
    Case("tablets as CSV", tablets_csv, _FILL, "B3:E15", frozenset({"title", "identifier", "summary"})),
    Case("units row as CSV", units_csv, _HARD, "A1:C10", frozenset({"units"})),
    Case("stacked blocks as CSV", stacked_csv, error="stacked.csv holds two tables of the same shape, "
         "A1:C9 and A11:C19, and it is not clear which to read; give --range A1:C9 or --range A11:C19"),
]


def build(folder: Path) -> list[tuple[Case, Path]]:
    """Every case written into ``folder``."""
    return [(case, case.write(folder)) for case in CASES]
