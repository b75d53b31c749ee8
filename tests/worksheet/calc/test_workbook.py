"""Rewriting SF_ function names in a workbook's formulas between the Excel and the Calc form.

The workbooks are built with openpyxl (data invented for the tests) or saved by LibreOffice
without the sheetfuncs extension. "Only the names change" is checked without the module's own
scanner: the target's part, split at the names written, must equal the source's part outside
them byte for byte, and match the source's names without regard to case.
"""

from __future__ import annotations

import re
import zipfile
from pathlib import Path

import openpyxl
import pytest
from openpyxl.formatting.rule import FormulaRule
from openpyxl.workbook.defined_name import DefinedName
from openpyxl.worksheet.datavalidation import DataValidation
from openpyxl.worksheet.formula import ArrayFormula

from sheetfuncs.errors import InputError
from sheetfuncs.input.files.safety import CFB_MAGIC
from sheetfuncs.worksheet.calc import workbook
from sheetfuncs.worksheet.calc.names import stored_name
from sheetfuncs.worksheet.calc.workbook import Converted, PartChange, convert_workbook
from tests.support.libreoffice import convert, require_office
from tests.support.workbooks import patch_zip, sheet_xml

SHEET = "xl/worksheets/sheet1.xml"
BOOK = "xl/workbook.xml"
FORMULA_PARTS = (SHEET, BOOK)
#: Invented fill weights of three filling heads (grams), for the tests only.
ROWS = [["Head 1", "Head 2", "Head 3"], [501.2, 502.4, 500.9], [500.8, 503.1, 501.2],
        [501.5, 502.2, 500.7]]
STORED = re.compile(r"ORG\.SHEETFUNCS\.CALC\.FUNCTIONS\.SF[A-Z]+")
DISPLAY = re.compile(r"SF_[A-Z]+")


def make_book(path: Path, cells: dict[str, str], *, rules: bool = False) -> Path:
    """A sheet "Lines" with the invented data in A1:C4 and the given formula cells; with
    ``rules`` also a defined name, a conditional format, a data validation and an array formula,
    each calling SF_ functions."""
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "Lines"
    for row in ROWS:
        ws.append(row)
    for ref, formula in cells.items():
        ws[ref] = formula
    if rules:
        ws["E10"] = ArrayFormula("E10:J13", "=SF_TABLE(A1:C4)")
        wb.defined_names["pval"] = DefinedName("pval", attr_text="SF_P(Lines!$A$1:$C$4)")
        ws.conditional_formatting.add("A2:C4", FormulaRule(formula=["SF_P($A$1:$C$4)<0.05"]))
        dv = DataValidation(type="custom", formula1="SF_F($A$1:$C$4)>0")
        ws.add_data_validation(dv)
        dv.add("H1")
    wb.save(path)
    return path


def members(path: Path) -> list[tuple[str, bytes]]:
    with zipfile.ZipFile(path) as z:
        return [(i.filename, z.read(i)) for i in z.infolist()]


def assert_only_names_changed(before: bytes, after: bytes, written: re.Pattern[bytes],
                              was: dict[bytes, bytes]) -> int:
    """``after`` equals ``before`` outside the names ``written`` matches; each such name stands
    where ``before`` had ``was[name]`` (in any case). Returns how many names were compared."""
    pieces = re.split(b"(" + written.pattern + b")", after)
    pos = 0
    for i, piece in enumerate(pieces):
        if i % 2 == 0:
            assert before[pos:pos + len(piece)] == piece, f"bytes differ near offset {pos}"
            pos += len(piece)
        else:
            old = was[piece]
            assert before[pos:pos + len(old)].upper() == old, f"name differs at offset {pos}"
            pos += len(old)
    assert pos == len(before)
    return len(pieces) // 2


def to_calc_names() -> dict[bytes, bytes]:
    """Stored name → display name, as bytes, for every registry function."""
    to_calc, _ = workbook.name_maps()
    return {s.encode(): n.encode() for n, s in to_calc.items()}


# --------------------------------------------------------------------------------------------
# formula text


@pytest.mark.parametrize("text, expected", [
    ("SF_P(A1:C3)", "ORG.SHEETFUNCS.CALC.FUNCTIONS.SFP(A1:C3)"),
    ("sf_p(A1:C3)", "ORG.SHEETFUNCS.CALC.FUNCTIONS.SFP(A1:C3)"),
    ("1+Sf_Table(A1:C3)", "1+ORG.SHEETFUNCS.CALC.FUNCTIONS.SFTABLE(A1:C3)"),
    ("SF_P(A1:C3,&quot;wide&quot;)", "ORG.SHEETFUNCS.CALC.FUNCTIONS.SFP(A1:C3,&quot;wide&quot;)"),
    ('IF(ISNUMBER(SF_P(A1:C3)),SF_F(A1:C3),"")',
     'IF(ISNUMBER(ORG.SHEETFUNCS.CALC.FUNCTIONS.SFP(A1:C3)),'
     'ORG.SHEETFUNCS.CALC.FUNCTIONS.SFF(A1:C3),"")'),
])
def test_calls_are_rewritten_to_the_calc_form(text, expected):
    new, tally = workbook.rewrite_formula(text, "calc")
    assert new == expected
    assert sum(tally.rewritten.values()) == expected.count("ORG.")


@pytest.mark.parametrize("text", [
    '"SF_P(A1)"',                         # a string literal
    '"say ""SF_P(A1)"" here"',            # with an escaped quote
    "&quot;SF_P(A1)&quot;",               # a string as XML escapes it
    "&quot;a&quot;&quot;SF_P(&quot;",     # ... with an escaped quote
    "'SF_P data'!A1",                     # a quoted sheet name
    "SUM('SF_P(x'!A1:A3)",                # a quoted sheet name with a parenthesis
    "&apos;SF_P(x&apos;!A1",              # a quoted sheet name as XML may escape it
    "XSF_P(A1)", "SF_PX(A1)",             # other names
    "SF_P",                               # a name, not a call
    "SF_P (A1)",                          # a space: the intersection operator, not a call
    "Plan[SF_P(]",                        # a table column
    "Plan[[#This Row],[SF_P(]]",
    "SUM(A1:A3)",
])
def test_text_that_is_not_a_call_stays(text):
    new, tally = workbook.rewrite_formula(text, "calc")
    assert new == text
    assert not tally.rewritten


def test_unknown_and_qualified_names_are_left_and_counted():
    text = "SF_FOO(A1)+MY.SF_P(A1)+_xludf.SF_F(A1)+[1]!SF_P(A1)+sf_foo(B1)"
    new, tally = workbook.rewrite_formula(text, "calc")
    assert new == text
    assert tally.unknown == {"SF_FOO": 2}
    assert tally.qualified == {"MY.SF_P": 1, "_XLUDF.SF_F": 1, "!SF_P": 1}


def test_calls_are_rewritten_to_the_excel_form():
    text = ("ORG.SHEETFUNCS.CALC.FUNCTIONS.SFP(A1:C3)+org.sheetfuncs.calc.functions.sftable(A1)"
            "+ORG.SHEETFUNCS.CALC.FUNCTIONS.SFNEW(A1)+SF_F(A1)+&quot;ORG.SHEETFUNCS.CALC."
            "FUNCTIONS.SFP(&quot;")
    new, tally = workbook.rewrite_formula(text, "excel")
    assert new == ("SF_P(A1:C3)+SF_TABLE(A1)+ORG.SHEETFUNCS.CALC.FUNCTIONS.SFNEW(A1)+SF_F(A1)"
                   "+&quot;ORG.SHEETFUNCS.CALC.FUNCTIONS.SFP(&quot;")
    assert tally.rewritten == {"SF_P": 1, "SF_TABLE": 1}
    assert tally.already == 1
    assert tally.unknown == {"ORG.SHEETFUNCS.CALC.FUNCTIONS.SFNEW": 1}


def test_every_registry_name_maps_both_ways():
    to_calc, to_excel = workbook.name_maps()
    assert len(to_calc) == len(to_excel) == 33  # the registry's 33 functions (docs/functions.md)
    for name, stored in to_calc.items():
        assert stored == stored_name(name)
        assert workbook.rewrite_formula(f"{name}(A1)", "calc")[0] == f"{stored}(A1)"
        assert workbook.rewrite_formula(f"{stored}(A1)", "excel")[0] == f"{name}(A1)"


def test_comments_cdata_and_elements_with_children_are_not_rewritten():
    xml = ("<x><!-- <f>SF_P(A1)</f> --><f>SF_P(A1)</f><f t=\"shared\" si=\"0\"/>"
           "<x14:formula1><xm:f>SF_P(A1)</xm:f></x14:formula1><f><![CDATA[SF_P(A1)]]></f>"
           "<fx>SF_P(A1)</fx></x>")
    maps = workbook.name_maps()
    new, changed, tally = workbook.rewrite_part(xml, "worksheet", "calc", maps)
    s = "ORG.SHEETFUNCS.CALC.FUNCTIONS.SFP(A1)"
    assert new == ("<x><!-- <f>SF_P(A1)</f> --><f>" + s + "</f><f t=\"shared\" si=\"0\"/>"
                   "<x14:formula1><xm:f>" + s + "</xm:f></x14:formula1>"
                   "<f><![CDATA[SF_P(A1)]]></f><fx>SF_P(A1)</fx></x>")
    assert changed == 2 and tally.rewritten == {"SF_P": 2}


# --------------------------------------------------------------------------------------------
# files


def test_a_workbook_goes_to_calc_with_only_the_names_changed(tmp_path):
    src = make_book(tmp_path / "fill.xlsx", {
        "E1": "=SF_P(A1:C4)", "E2": "=sf_f(A1:C4)*2", "E3": '=SUM(A2:A4)&"SF_P("',
        "E4": "=SF_FOO(A1:C4)", "E5": "=XSF_P(A1)",
    }, rules=True)
    res = convert_workbook(src, tmp_path / "fill-calc.xlsx", to="calc")
    assert isinstance(res, Converted)
    assert res.parts == (PartChange(SHEET, 5, 5), PartChange(BOOK, 1, 1))
    assert (res.formulas, res.calls) == (6, 6)
    assert res.names == (("SF_F", 2), ("SF_P", 3), ("SF_TABLE", 1))
    assert res.unknown == (("SF_FOO", 1),) and res.qualified == () and res.already == 0
    before, after = dict(members(src)), dict(members(res.target))
    assert [n for n, _ in members(src)] == [n for n, _ in members(res.target)]
    for name, data in before.items():
        if name not in FORMULA_PARTS:
            assert after[name] == data, name
    compared = sum(assert_only_names_changed(before[p], after[p], re.compile(STORED.pattern.encode()),
                                             to_calc_names()) for p in FORMULA_PARTS)
    assert compared == 6
    xml = sheet_xml(res.target)
    assert '<f t="array" ref="E10:J13">ORG.SHEETFUNCS.CALC.FUNCTIONS.SFTABLE(A1:C4)</f>' in xml
    assert "<formula>ORG.SHEETFUNCS.CALC.FUNCTIONS.SFP($A$1:$C$4)&lt;0.05</formula>" in xml
    assert "<formula1>ORG.SHEETFUNCS.CALC.FUNCTIONS.SFF($A$1:$C$4)&gt;0</formula1>" in xml
    assert "SF_FOO(A1:C4)" in xml and "XSF_P(A1)" in xml and '"SF_P("' in xml


def test_round_trip_gives_back_every_part_byte_for_byte(tmp_path):
    src = make_book(tmp_path / "fill.xlsx", {"E1": "=SF_P(A1:C4)", "E2": "=SF_WELCH(A1:C4)"},
                    rules=True)
    calc = convert_workbook(src, tmp_path / "calc.xlsx", to="calc")
    back = convert_workbook(calc.target, tmp_path / "back.xlsx", to="excel")
    assert back.calls == calc.calls == 6
    assert back.names == calc.names
    assert members(back.target) == members(src)
    with zipfile.ZipFile(src) as a, zipfile.ZipFile(back.target) as b:
        for x, y in zip(a.infolist(), b.infolist()):
            assert (x.filename, x.date_time, x.compress_type, x.external_attr) == \
                   (y.filename, y.date_time, y.compress_type, y.external_attr)


def test_excel_form_only_changes_the_names(tmp_path):
    src = make_book(tmp_path / "fill.xlsx", {"E1": "=SF_P(A1:C4)"}, rules=True)
    calc = convert_workbook(src, tmp_path / "calc.xlsx", to="calc")
    back = convert_workbook(calc.target, tmp_path / "back.xlsx", to="excel")
    was = {n: s for s, n in to_calc_names().items()}
    before, after = dict(members(calc.target)), dict(members(back.target))
    compared = sum(assert_only_names_changed(before[p], after[p],
                                             re.compile(DISPLAY.pattern.encode()), was)
                   for p in FORMULA_PARTS)
    assert compared == back.calls == 5


def test_lower_case_names_come_back_canonical(tmp_path):
    src = make_book(tmp_path / "low.xlsx", {"E1": "=sf_p(A1:C4)", "E2": "=Sf_Table(A1:C4)"})
    calc = convert_workbook(src, tmp_path / "calc.xlsx", to="calc")
    back = convert_workbook(calc.target, tmp_path / "back.xlsx", to="excel")
    xml = sheet_xml(back.target)
    assert "<f>SF_P(A1:C4)</f>" in xml and "<f>SF_TABLE(A1:C4)</f>" in xml


def test_a_file_already_in_the_target_form_is_copied_and_said(tmp_path):
    src = make_book(tmp_path / "fill.xlsx", {"E1": "=SF_P(A1:C4)", "E2": "=SUM(A2:A4)"})
    res = convert_workbook(src, tmp_path / "same.xlsx", to="excel")
    assert (res.calls, res.formulas, res.parts, res.already) == (0, 0, (), 1)
    assert members(res.target) == members(src)
    assert res.lines() == (
        "same.xlsx: nothing to rewrite (no SF_ function call in the other form); the file was "
        "copied unchanged",
        "1 call(s) were already in the Excel form and were left as they were",
    )


def test_nothing_to_rewrite_is_not_an_error(tmp_path):
    src = make_book(tmp_path / "plain.xlsx", {"E1": "=SUM(A2:A4)"})
    res = convert_workbook(src, tmp_path / "out.xlsx", to="calc")
    assert (res.calls, res.parts, res.names, res.notes) == (0, (), (), ())
    assert members(res.target) == members(src)


def test_the_summary_lines(tmp_path):
    src = make_book(tmp_path / "fill.xlsx", {
        "E1": "=SF_P(A1:C4)+SF_P(A1:B4)", "E2": "=SF_FOO(A1)", "E3": "=_xludf.SF_F(A1:C4)",
        "E4": "=ORG.SHEETFUNCS.CALC.FUNCTIONS.SFF(A1:C4)"})
    res = convert_workbook(src, tmp_path / "fill-calc.xlsx", to="calc")
    assert res.lines() == (
        "fill-calc.xlsx: 1 formula(s) rewritten to the LibreOffice Calc form (2 call(s) in 1 part(s))",
        "functions: SF_P 2",
        "1 call(s) were already in the LibreOffice Calc form and were left as they were",
        "left as written, not functions of this sheetfuncs version: SF_FOO (1)",
        "left as written, called with a prefix or through another workbook: _XLUDF.SF_F (1)",
    )


def test_table_columns_and_extension_formulas_are_rewritten(tmp_path):
    src = make_book(tmp_path / "fill.xlsx", {"E1": "=SUM(A2:A4)"})
    table = ('<?xml version="1.0" encoding="UTF-8"?>\n<table xmlns="http://schemas.openxmlformats'
             '.org/spreadsheetml/2006/main" id="1" name="Plan" ref="A1:D4"><tableColumns count="1">'
             '<tableColumn id="1" name="p"><calculatedColumnFormula>SF_P(Plan[[#This Row],'
             '[SF_P(]])</calculatedColumnFormula></tableColumn></tableColumns></table>')
    with zipfile.ZipFile(src) as z:
        types = z.read("[Content_Types].xml").decode()
        sheet = z.read(SHEET).decode()
    types = types.replace("</Types>", '<Override PartName="/xl/tables/table1.xml" ContentType="'
                          'application/vnd.openxmlformats-officedocument.spreadsheetml.table+xml"'
                          '/></Types>')
    ext = ('<extLst><ext uri="{x}"><x14:dataValidations><x14:dataValidation><x14:formula1>'
           '<xm:f>sf_p(Lines!$A$1:$C$4)</xm:f></x14:formula1></x14:dataValidation>'
           '</x14:dataValidations></ext></extLst></worksheet>')
    patched = patch_zip(src, tmp_path / "plan.xlsx", {
        "[Content_Types].xml": types.encode(), "xl/tables/table1.xml": table.encode(),
        SHEET: sheet.replace("</worksheet>", ext).encode()})
    res = convert_workbook(patched, tmp_path / "plan-calc.xlsx", to="calc")
    assert res.parts == (PartChange(SHEET, 1, 1), PartChange("xl/tables/table1.xml", 1, 1))
    with zipfile.ZipFile(res.target) as z:
        assert ("<calculatedColumnFormula>ORG.SHEETFUNCS.CALC.FUNCTIONS.SFP(Plan[[#This Row],"
                "[SF_P(]])</calculatedColumnFormula>") in z.read("xl/tables/table1.xml").decode()
        assert "<xm:f>ORG.SHEETFUNCS.CALC.FUNCTIONS.SFP(Lines!$A$1:$C$4)</xm:f>" in \
            z.read(SHEET).decode()


def test_parts_that_are_not_utf8_or_hold_cdata_are_noted(tmp_path):
    src = make_book(tmp_path / "fill.xlsx", {"E1": "=SF_P(A1:C4)"})
    sheet = sheet_xml(src)
    odd = patch_zip(src, tmp_path / "utf16.xlsx", {SHEET: sheet.encode("utf-16")})
    res = convert_workbook(odd, tmp_path / "out.xlsx", to="calc")
    assert res.calls == 0
    assert res.notes == (f"{SHEET} is not UTF-8 text and was copied unchanged (its formulas were "
                         "not read)",)
    assert members(res.target) == members(odd)
    cdata = patch_zip(src, tmp_path / "cdata.xlsx", {SHEET: sheet.replace(
        "</sheetData>", '</sheetData><!-- x --><foo><![CDATA[SF_P(A1)]]></foo>').encode()})
    res = convert_workbook(cdata, tmp_path / "out2.xlsx", to="calc")
    assert res.calls == 1
    assert res.notes == (f"{SHEET} holds CDATA sections; formulas inside them were left as written",)


def test_a_macro_workbook_keeps_its_kind(tmp_path):
    src = make_book(tmp_path / "fill.xlsx", {"E1": "=SF_P(A1:C4)"})
    with zipfile.ZipFile(src) as z:
        types = z.read("[Content_Types].xml").decode()
    macro = types.replace("application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main"
                          "+xml", "application/vnd.ms-excel.sheet.macroEnabled.main+xml")
    assert macro != types
    xlsm = patch_zip(src, tmp_path / "fill.xlsm", {"[Content_Types].xml": macro.encode()})
    with pytest.raises(InputError) as ei:
        convert_workbook(xlsm, tmp_path / "out.xlsx", to="calc")
    assert str(ei.value) == (
        "sheetfuncs: fill.xlsm holds macros, so the target needs a .xlsm name, not 'out.xlsx' "
        "(Excel refuses a file whose name does not match its content)")
    assert not (tmp_path / "out.xlsx").exists()
    assert convert_workbook(xlsm, tmp_path / "OUT.XLSM", to="calc").calls == 1
    with pytest.raises(InputError, match=r"^sheetfuncs: fill\.xlsx holds no macros, so the "
                                         r"target needs a \.xlsx name, not 'out\.xlsm'"):
        convert_workbook(src, tmp_path / "out.xlsm", to="calc")


# --------------------------------------------------------------------------------------------
# refusals


def refusal(source: Path, target: Path, **kw: object) -> str:
    with pytest.raises(InputError) as ei:
        convert_workbook(source, target, to=kw.pop("to", "calc"), **kw)  # type: ignore[arg-type]
    assert not target.exists() or target == source or target.is_dir()
    return str(ei.value)


def test_refusals_of_the_source(tmp_path):
    out = tmp_path / "out.xlsx"
    assert refusal(tmp_path / "none.xlsx", out) == (
        f"sheetfuncs: {tmp_path / 'none.xlsx'} not found; check the path and the file name")
    assert refusal(tmp_path, out) == (
        f"sheetfuncs: {tmp_path} is a folder, not a workbook; give the .xlsx file inside it")
    ods = tmp_path / "plan.ods"
    with zipfile.ZipFile(ods, "w") as z:
        z.writestr("mimetype", "application/vnd.oasis.opendocument.spreadsheet")
        z.writestr("content.xml", "<office:document-content/>")
    assert refusal(ods, out) == (
        "sheetfuncs: plan.ods is an OpenDocument file (.ods), which holds Calc's own formula "
        "form; open it in LibreOffice Calc and save it as .xlsx (Excel 2007-365), then convert that")
    xls = tmp_path / "old.xls"
    xls.write_bytes(CFB_MAGIC + bytes(600))
    assert refusal(xls, out) == (
        "sheetfuncs: old.xls is an old binary .xls workbook, which sheetfuncs does not read; "
        "save it as .xlsx (Excel Workbook) and try again")
    text = tmp_path / "notes.xlsx"
    text.write_text("Head 1,Head 2\n1,2\n")
    assert refusal(text, out).startswith("sheetfuncs: notes.xlsx is not an .xlsx workbook")
    docx = tmp_path / "memo.xlsx"
    with zipfile.ZipFile(docx, "w") as z:
        z.writestr("[Content_Types].xml", '<Types xmlns="http://schemas.openxmlformats.org/'
                   'package/2006/content-types"><Default Extension="xml" ContentType="application'
                   '/xml"/></Types>')
    assert refusal(docx, out) == ("sheetfuncs: memo.xlsx is an Office file but not a workbook "
                                  "(no workbook part); check that it is the right file")


def test_an_encrypted_workbook_is_refused(tmp_path):
    # reference library: msoffcrypto-tool encrypts as [MS-OFFCRYPTO] (agile encryption)
    from msoffcrypto.format.ooxml import OOXMLFile

    plain = make_book(tmp_path / "plain.xlsx", {"E1": "=SF_P(A1:C4)"})
    locked = tmp_path / "locked.xlsx"
    with open(plain, "rb") as fh, open(locked, "wb") as out:
        OOXMLFile(fh).encrypt("a password", out)
    assert refusal(locked, tmp_path / "out.xlsx").startswith(
        "sheetfuncs: locked.xlsx is encrypted (password-protected); remove the password")


def test_refusals_of_the_target_and_the_options(tmp_path):
    src = make_book(tmp_path / "fill.xlsx", {"E1": "=SF_P(A1:C4)"})
    before = src.read_bytes()
    assert refusal(src, src) == ("sheetfuncs: the target fill.xlsx is the source itself; give "
                                 "another file name (the source is never overwritten)")
    assert refusal(src, tmp_path / "." / "fill.xlsx").startswith("sheetfuncs: the target fill.xlsx is the source")
    assert refusal(src, tmp_path / "no" / "out.xlsx") == (
        f"sheetfuncs: the target's folder {tmp_path / 'no'} does not exist; create it or choose "
        "another")
    (tmp_path / "d.xlsx").mkdir()
    assert refusal(src, tmp_path / "d.xlsx") == (
        f"sheetfuncs: the target {tmp_path / 'd.xlsx'} is a folder; give a file name such as "
        "fill.xlsx")
    assert refusal(src, tmp_path / "out.xlsx", to="ods") == (
        "sheetfuncs: to must be \"calc\" or \"excel\", not 'ods'")
    assert src.read_bytes() == before


def test_a_zip_bomb_is_refused_by_the_readers_limit(tmp_path):
    src = make_book(tmp_path / "fill.xlsx", {"E1": "=SF_P(A1:C4)"})
    msg = refusal(src, tmp_path / "out.xlsx", size_limit=1000)
    assert re.fullmatch(r"sheetfuncs: fill\.xlsx would unpack to \d+ kB, more than the 1000 bytes "
                        r"limit for workbooks; if you trust the file, raise the limit "
                        r"\(command line: --size-limit 1\)", msg), msg
    bomb = patch_zip(src, tmp_path / "dtd.xlsx", {SHEET: b'<?xml version="1.0"?><!DOCTYPE x ['
                                                  b'<!ENTITY a "SF_P(">]><x>&a;</x>'})
    assert refusal(bomb, tmp_path / "out.xlsx").startswith(
        "sheetfuncs: dtd.xlsx contains an XML document type declaration (in xl/worksheets/sheet1.xml)")


def test_a_damaged_part_leaves_no_target_and_no_temporary_file(tmp_path):
    src = make_book(tmp_path / "fill.xlsx", {"E1": "=SF_P(A1:C4)"})
    big = patch_zip(src, tmp_path / "big.xlsx", {"xl/media/notes.txt": b"invented notes " * 9000})
    data = bytearray(big.read_bytes())
    # a wrong CRC-32 in the central directory of the last part (larger than the safety scan
    # reads): found only when the whole part is read, after the sheet was rewritten
    at = re.search(rb"PK\x01\x02.{42}xl/media/notes\.txt", bytes(data), re.S).start()
    data[at + 16:at + 20] = bytes(4)
    bad = tmp_path / "bad.xlsx"
    bad.write_bytes(bytes(data))
    old = tmp_path / "out.xlsx"
    old.write_bytes(b"an earlier file")
    with pytest.raises(InputError, match=r"^sheetfuncs: bad\.xlsx is damaged \(part xl/media/notes\.txt: Bad CRC-32"):
        convert_workbook(bad, old, to="calc")
    assert old.read_bytes() == b"an earlier file"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["bad.xlsx", "big.xlsx", "fill.xlsx", "out.xlsx"]


def test_a_failed_write_says_so_and_leaves_nothing(tmp_path, monkeypatch):
    src = make_book(tmp_path / "fill.xlsx", {"E1": "=SF_P(A1:C4)"})

    def full(a: object, b: object) -> None:
        raise OSError(28, "No space left on device")

    monkeypatch.setattr(workbook.os, "replace", full)
    with pytest.raises(InputError) as ei:
        convert_workbook(src, tmp_path / "out.xlsx", to="calc")
    assert str(ei.value) == (
        f"sheetfuncs: cannot write {tmp_path / 'out.xlsx'} (No space left on device); check the "
        "folder's permissions and the free space, or choose another target (nothing was written)")
    assert [p.name for p in tmp_path.iterdir()] == ["fill.xlsx"]


def test_the_target_replaces_an_earlier_file_and_keeps_its_mode(tmp_path):
    src = make_book(tmp_path / "fill.xlsx", {"E1": "=SF_P(A1:C4)"})
    out = tmp_path / "out.xlsx"
    out.write_bytes(b"old")
    out.chmod(0o640)
    convert_workbook(src, out, to="calc")
    assert out.stat().st_mode & 0o777 == 0o640
    assert "ORG.SHEETFUNCS.CALC.FUNCTIONS.SFP" in sheet_xml(out)


# --------------------------------------------------------------------------------------------
# files saved by LibreOffice (without the sheetfuncs extension)


def test_a_file_saved_by_libreoffice(tmp_path):
    require_office()
    src = make_book(tmp_path / "mixed.xlsx", {"E1": "=SF_P(A1:C4)", "E2": '=SUM(A2:C4)&"SF_P("',
                                              "E3": "=AVERAGE(A2:A4)"}, rules=True)
    saved = convert(src, "xlsx", tmp_path / "lo")
    # LibreOffice without the extension keeps an unknown name, lower-cased (sf_p), and writes
    # strings with &quot;
    lo_xml = sheet_xml(saved)
    assert "sf_p(A1:C4)" in lo_xml and "&quot;SF_P(&quot;" in lo_xml
    res = convert_workbook(saved, tmp_path / "calc.xlsx", to="calc")
    assert (res.calls, res.names) == (5, (("SF_F", 1), ("SF_P", 3), ("SF_TABLE", 1)))
    assert res.parts == (PartChange(BOOK, 1, 1), PartChange(SHEET, 4, 4))  # LibreOffice's order
    xml = sheet_xml(res.target)
    assert "ORG.SHEETFUNCS.CALC.FUNCTIONS.SFP(A1:C4)" in xml
    assert "SUM(A2:C4)&amp;&quot;SF_P(&quot;" in xml and "AVERAGE(A2:A4)" in xml
    before, after = dict(members(saved)), dict(members(res.target))
    assert list(before) == list(after)
    for name in before:
        if name not in FORMULA_PARTS:
            assert after[name] == before[name], name
    for p in FORMULA_PARTS:
        assert_only_names_changed(before[p], after[p], re.compile(STORED.pattern.encode()),
                                  to_calc_names())


def test_plain_formulas_saved_by_libreoffice_are_untouched(tmp_path):
    require_office()
    src = make_book(tmp_path / "plain.xlsx", {"E1": "=SUM(A2:C4)", "E2": '="SF_P("&A1'})
    saved = convert(src, "xlsx", tmp_path / "lo")
    for to in ("calc", "excel"):
        res = convert_workbook(saved, tmp_path / f"{to}.xlsx", to=to)
        assert (res.calls, res.parts) == (0, ())
        assert members(res.target) == members(saved)


def test_formulas_as_calc_writes_them_come_back_in_the_excel_form(tmp_path):
    # the form LibreOffice 7.4 with the extension writes (measured with the prototype; see
    # sheetfuncs.worksheet.calc.names), put into a file LibreOffice saved
    require_office()
    src = make_book(tmp_path / "calc.xlsx", {"E1": "=SUM(A2:C4)", "E2": "=SUM(A2:C4)"})
    saved = convert(src, "xlsx", tmp_path / "lo")
    xml = sheet_xml(saved)
    cells = re.findall(r'<f aca="false">SUM\(A2:C4\)</f>', xml)
    assert len(cells) == 2
    xml = xml.replace(cells[0], '<f aca="false">ORG.SHEETFUNCS.CALC.FUNCTIONS.SFP(A1:C4,'
                      '&quot;wide&quot;)</f>', 1)
    xml = xml.replace(cells[1], '<f aca="false" t="array" ref="E2:F3">'
                      'ORG.SHEETFUNCS.CALC.FUNCTIONS.SFTABLE(A1:C4)</f>', 1)
    patched = patch_zip(saved, tmp_path / "from-calc.xlsx", {SHEET: xml.encode()})
    res = convert_workbook(patched, tmp_path / "for-excel.xlsx", to="excel")
    assert (res.calls, res.names) == (2, (("SF_P", 1), ("SF_TABLE", 1)))
    out = sheet_xml(res.target)
    assert '<f aca="false">SF_P(A1:C4,&quot;wide&quot;)</f>' in out
    assert '<f aca="false" t="array" ref="E2:F3">SF_TABLE(A1:C4)</f>' in out
    assert out.replace("SF_P(", "ORG.SHEETFUNCS.CALC.FUNCTIONS.SFP(").replace(
        "SF_TABLE(", "ORG.SHEETFUNCS.CALC.FUNCTIONS.SFTABLE(") == xml
