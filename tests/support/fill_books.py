"""Templates and data files of the tests' own for filling (invented numbers, scenario: filling
heads of a packaging line and lots of a calibration material).

:func:`line_template` is a wide block under the defined name ``Measurements`` (``'Line
data'!$A$4:$D$20``, labels in its first row) with a table over it, ``SF_P`` in E2, ``SF_TABLE`` as
an array formula over F4:K7, a decision cell, a ROUND of the p-value, an INDEX into the table,
a comment, data validation on the block and a second sheet with a COUNT of the block.
:func:`as_xlsm` turns it into a macro workbook with a ``vbaProject.bin`` part.
:func:`lots_template` has another layout: the block ``LotReadings`` on a sheet of its own,
results on another sheet.
"""

from __future__ import annotations

import re
import zipfile
from pathlib import Path

import openpyxl
from openpyxl.comments import Comment
from openpyxl.workbook.defined_name import DefinedName
from openpyxl.worksheet.datavalidation import DataValidation
from openpyxl.worksheet.formula import ArrayFormula
from openpyxl.worksheet.table import Table

__all__ = ["DECISION", "line_template", "as_xlsm", "lots_template", "data_book", "VBA_BYTES"]

DECISION = '=IF(ISNUMBER(E2),IF(E2<0.05,"means differ","no difference shown"),"check the data")'
#: Stands in for a macro project: the filler must copy it byte for byte.
VBA_BYTES = bytes(range(256)) * 8


def line_template(path: Path) -> Path:
    """The packaging-line template (invented example data in the block)."""
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "Line data"
    ws["A1"] = "Fill weight by head (invented example data)"
    ws["A4"], ws["B4"], ws["C4"], ws["D4"] = "Head 1", "Head 2", "Head 3", "Head 4"
    for i, row in enumerate([(250.1, 249.8, 250.4, 250.0), (250.3, 249.9, 250.6, 250.2),
                             (249.9, 250.0, 250.5, 249.9)], start=5):
        for j, v in enumerate(row, start=1):
            ws.cell(i, j, v)
    wb.defined_names["Measurements"] = DefinedName("Measurements", attr_text="'Line data'!$A$4:$D$20")
    ws.add_table(Table(displayName="MeasurementsTable", ref="A4:D20"))
    ws["E1"] = "p"
    ws["E2"] = "=SF_P(Measurements)"
    ws["F2"] = "=ROUND(E2,4)"
    ws["G2"] = DECISION
    ws["F4"] = ArrayFormula("F4:K7", "=SF_TABLE(Measurements)")
    ws["M4"] = "=INDEX(F4:K7,2,5)"
    ws["M5"] = '=IF(AND(ISNUMBER(M4),M4>1),"F above 1","F at most 1")&" for "&A4'
    ws["E2"].comment = Comment("p-value of the one-way table", "tests")
    dv = DataValidation(type="decimal", operator="between", formula1="0", formula2="1000")
    ws.add_data_validation(dv)
    dv.add("A5:D20")
    other = wb.create_sheet("Notes")
    other["A1"] = "Values entered"
    other["B1"] = "=COUNT(Measurements)"
    other["A3"] = "Statistics support but do not replace engineering judgement."
    wb.save(path)
    return path


def as_xlsm(src: Path, dst: Path) -> Path:
    """``src`` as a macro workbook: a ``xl/vbaProject.bin`` part, its relationship and types."""
    with zipfile.ZipFile(src) as zin, zipfile.ZipFile(dst, "w", zipfile.ZIP_DEFLATED) as out:
        for info in zin.infolist():
            data = zin.read(info)
            if info.filename == "[Content_Types].xml":
                text = data.decode()
                text = text.replace(
                    "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml",
                    "application/vnd.ms-excel.sheet.macroEnabled.main+xml")
                text = text.replace("</Types>", '<Default Extension="bin" ContentType='
                                    '"application/vnd.ms-office.vbaProject"/></Types>')
                data = text.encode()
            elif info.filename == "xl/_rels/workbook.xml.rels":
                data = re.sub(rb"</Relationships>", b'<Relationship Id="rIdVba" Type="http://schemas'
                              b'.microsoft.com/office/2006/relationships/vbaProject" Target='
                              b'"vbaProject.bin"/></Relationships>', data)
            out.writestr(info, data)
        out.writestr("xl/vbaProject.bin", VBA_BYTES)
    return dst


def lots_template(path: Path) -> Path:
    """Another layout: block ``LotReadings`` at 'Lot entry'!C3:H15, results on 'Summary'."""
    wb = openpyxl.Workbook()
    summary = wb.active
    summary.title = "Summary"
    entry = wb.create_sheet("Lot entry")
    entry["C2"] = "Reference material lots (invented example data)"
    for j, lot in enumerate(["L1", "L2", "L3"], start=3):
        entry.cell(3, j, lot)
        for i, v in enumerate([5.01, 5.03, 4.99], start=4):
            entry.cell(i, j, v + 0.01 * j)
    wb.defined_names["LotReadings"] = DefinedName("LotReadings", attr_text="'Lot entry'!$C$3:$H$15")
    summary["A1"] = "p"
    summary["B1"] = "=SF_P(LotReadings)"
    summary["B2"] = '=IF(ISNUMBER(B1),IF(B1<0.05,"lots differ","no difference shown"),"check the data")'
    summary["A4"] = ArrayFormula("A4:F7", "=SF_TABLE(LotReadings)")
    wb.save(path)
    return path


def data_book(path: Path, rows: list[list[object]], sheet: str = "Readings") -> Path:
    """A data file: one sheet with ``rows`` from A1 (labels first)."""
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = sheet
    for row in rows:
        ws.append(row)
    wb.save(path)
    return path
