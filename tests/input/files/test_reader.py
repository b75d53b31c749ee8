"""Tests of sheetfuncs.readers: workbooks and CSV files read as ranges.

Numeric checks name their source: the NIST StRD one-way datasets (certified values), or
"common practice" for how a spreadsheet reads typed text.
"""

from __future__ import annotations

import datetime as dt
import math
import subprocess
import sys
import zipfile
from pathlib import Path

import numpy as np
import openpyxl
import pytest

from tests.support import nist
from tests.support.workbooks import make_book, patch_zip, sheet_xml
from sheetfuncs import oneway
from sheetfuncs.input.demo import demo_groups, demo_rows
from sheetfuncs.errors import InputError
from sheetfuncs.input.files.reader import (
    DEFAULT_SIZE_LIMIT,
    csv_value,
    detect_delimiter,
    parse_range,
    read_cells,
    read_groups,
    workbook_properties,
)

ROOT = Path(__file__).resolve().parents[3]
DEMO_BOOK = ROOT / "workbooks" / "demo.xlsx"


def nist_long_rows(name: str) -> list[list[object]]:
    """A NIST StRD dataset as a long-layout range: header, then (treatment, value) rows."""
    ds = nist.load(name)
    rows: list[list[object]] = [["Treatment", "Value"]]
    for label, texts in ds.text_values.items():
        rows += [[label, float(t)] for t in texts]
    return rows


# --------------------------------------------------------------------------------------------
# the demo workbook


def test_committed_demo_workbook_holds_the_demo_data():
    block = read_cells(DEMO_BOOK)
    assert block.source.sheet == "Hardness"
    assert block.ref == "A1:D9"
    assert [list(r) for r in block.rows] == demo_rows()
    g = read_groups(DEMO_BOOK).groups
    d = demo_groups()
    assert g.labels == d.labels
    for a, b in zip(g.arrays, d.arrays):
        assert np.array_equal(a, b)
    # the text note typed into a data cell keeps its workbook address
    (note,) = g.cells
    assert read_groups(DEMO_BOOK).source.full_address(note.row, note.col) == "'Hardness'!C8"


def test_demo_workbook_generator_reproduces_the_data(tmp_path):
    out = tmp_path / "demo.xlsx"
    subprocess.run([sys.executable, str(ROOT / "tools" / "make_demo_workbook.py"), str(out)],
                   check=True, capture_output=True, timeout=60)
    assert [list(r) for r in read_cells(out).rows] == demo_rows()
    assert read_cells(out, sheet="About").rows[1][0].startswith("All numbers in this workbook are invented")


# --------------------------------------------------------------------------------------------
# certified data through both file kinds


@pytest.mark.parametrize("kind", ["xlsx", "csv"])
def test_nist_smls09_read_from_file_matches_certified_values(tmp_path, kind):
    # NIST StRD SmLs09 (certified values in the dataset header): 13-digit values.
    rows = nist_long_rows("SmLs09")
    if kind == "xlsx":
        path = make_book(tmp_path / "smls09.xlsx", {"Data": rows})
    else:
        path = tmp_path / "smls09.csv"
        ds = nist.load("SmLs09")
        lines = ["Treatment,Value"] + [
            f"{lab},{t}" for lab, texts in ds.text_values.items() for t in texts
        ]
        path.write_text("\n".join(lines) + "\n", encoding="utf-8")
    loaded = read_groups(path, layout="long")
    res = oneway(loaded.groups)
    cert = nist.load("SmLs09").certified
    assert res.exact
    assert res.df_between == cert.df_between and res.df_within == cert.df_within
    assert math.isclose(res.ss_between, cert.ss_between, rel_tol=1e-13)
    assert math.isclose(res.ss_within, cert.ss_within, rel_tol=1e-13)
    assert math.isclose(res.f, cert.f, rel_tol=1e-13)
    assert math.isclose(res.r_squared, cert.r_squared, rel_tol=1e-13)


def test_nist_atmwtag_csv_with_decimal_comma_and_semicolons(tmp_path):
    # NIST StRD AtmWtAg (certified values): the same numbers written the European way.
    ds = nist.load("AtmWtAg")
    lines = ["Instrument;Value"] + [
        f"{lab};{t.replace('.', ',')}" for lab, texts in ds.text_values.items() for t in texts
    ]
    path = tmp_path / "atmwtag.csv"
    path.write_bytes(("\ufeff" + "\r\n".join(lines)).encode("utf-8"))  # with a BOM, CRLF
    loaded = read_groups(path, layout="long", decimal_comma=True)
    assert loaded.block.delimiter == ";"
    res = oneway(loaded.groups)
    assert math.isclose(res.f, ds.certified.f, rel_tol=1e-12)
    assert math.isclose(res.ss_within, ds.certified.ss_within, rel_tol=1e-12)


# --------------------------------------------------------------------------------------------
# ranges and sheets


@pytest.mark.parametrize(
    "text, expect",
    [
        ("A1:F40", (1, 1, 40, 6, None)),
        ("$B$2:$E$30", (2, 2, 30, 5, None)),
        ("F40:A1", (1, 1, 40, 6, None)),
        ("C5", (5, 3, 5, 3, None)),
        ("B:E", (1, 2, None, 5, None)),
        ("2:40", (2, 1, 40, None, None)),
        ("'Lot data'!A1:B3", (1, 1, 3, 2, "Lot data")),
        ("'It''s'!A1:B3", (1, 1, 3, 2, "It's")),
        ("Sheet2!XFD1048576", (1048576, 16384, 1048576, 16384, "Sheet2")),
    ],
)
def test_parse_range(text, expect):
    r = parse_range(text)
    assert (r.min_row, r.min_col, r.max_row, r.max_col, r.sheet) == expect


def test_parse_range_outside_the_sheet_and_names():
    with pytest.raises(InputError, match="outside a sheet"):
        parse_range("A1:A1048577")
    with pytest.raises(InputError, match="outside a sheet"):
        parse_range("XFE1")
    assert parse_range("LotData") is None


def _lots(tmp_path):
    rows = [["Lot A", "Lot B", "Lot C"], [1.2, 2.2, 3.1], [1.4, 2.1, "n/a"], [1.1, 2.6, 3.3]]
    return make_book(tmp_path / "lots.xlsx", {"Notes": [["see other sheet"]], "Lot data": rows},
                     at="C3")


def test_used_range_is_trimmed_and_addresses_are_the_sheets(tmp_path):
    path = _lots(tmp_path)
    loaded = read_groups(path, sheet="Lot data")
    assert loaded.block.ref == "C3:E6"
    assert (loaded.source.first_row, loaded.source.first_col) == (3, 3)
    assert loaded.groups.labels == ("Lot A", "Lot B", "Lot C")
    (note,) = loaded.groups.cells
    assert loaded.source.full_address(note.row, note.col) == "'Lot data'!E5"


def test_sheet_names_match_case_insensitively_and_in_the_range(tmp_path):
    path = _lots(tmp_path)
    assert read_cells(path, sheet="lot DATA").source.sheet == "Lot data"
    block = read_cells(path, cell_range="'Lot data'!D3:E6")
    assert block.source.sheet == "Lot data" and block.rows[0] == ("Lot B", "Lot C")
    with pytest.raises(InputError, match="give the sheet once"):
        read_cells(path, sheet="Notes", cell_range="'Lot data'!D3:E6")


def test_first_worksheet_is_the_default(tmp_path):
    path = _lots(tmp_path)
    assert read_cells(path).rows == (("see other sheet",),)


def test_explicit_range_keeps_its_top_left_corner(tmp_path):
    path = _lots(tmp_path)
    block = read_cells(path, sheet="Lot data", cell_range="B2:E6")
    assert block.source.first_row == 2 and block.source.first_col == 2
    assert block.rows[0] == (None, None, None, None)  # the host would hand over this row too
    assert block.rows[1] == (None, "Lot A", "Lot B", "Lot C")
    # whole columns: trailing blank rows are not materialised
    block = read_cells(path, sheet="Lot data", cell_range="D:E")
    assert block.ref == "D1:E6"


def test_defined_name_as_range(tmp_path):
    path = _lots(tmp_path)
    wb = openpyxl.load_workbook(path)
    wb.defined_names["LotTable"] = openpyxl.workbook.defined_name.DefinedName(
        "LotTable", attr_text="'Lot data'!$C$3:$E$6"
    )
    wb.save(path)
    loaded = read_groups(path, cell_range="LotTable")
    assert loaded.source.sheet == "Lot data"
    assert loaded.groups.labels == ("Lot A", "Lot B", "Lot C")
    with pytest.raises(InputError, match="neither a range like A1:F40 nor a name"):
        read_cells(path, cell_range="NoSuchName")


def test_cleaning_errors_get_the_sheet_address(tmp_path):
    rows = [["A", "B"], [1.0, 2.0], [1.5, "#N/A"], [1.2, 2.5]]
    path = make_book(tmp_path / "err.xlsx", {"Run 1": rows}, at="B2")
    with pytest.raises(InputError) as ei:
        read_groups(path)
    msg = str(ei.value)
    assert msg.startswith("sheetfuncs: the data hold the error #N/A")
    assert "'Run 1'!C4 of err.xlsx" in msg


def test_logical_values_dates_and_durations_in_a_workbook(tmp_path):
    rows = [["A", "B"], [1.0, 2.0], [True, 2.5], [1.2, 2.1]]
    path = make_book(tmp_path / "logical.xlsx", {"S": rows})
    g = read_groups(path).groups
    assert g.counts == (2, 3) and g.cells[0].kind == "logical"
    path = make_book(tmp_path / "date.xlsx", {"S": [["A", "B"], [1.0, dt.datetime(2024, 3, 5)],
                                                   [1.1, 2.0], [1.3, 2.2]]})
    with pytest.raises(InputError, match=r"dates are not measurements.*'S'!B2 of date\.xlsx"):
        read_groups(path)
    path = make_book(tmp_path / "dur.xlsx", {"S": [["A", "B"], [1.0, dt.timedelta(minutes=5)],
                                                  [1.1, 2.0]]})
    with pytest.raises(InputError, match=r"duration \(time\) value at 'S'!B2"):
        read_cells(path)


def test_formula_with_saved_value_reads_the_value(tmp_path):
    src = make_book(tmp_path / "f.xlsx", {"S": [["A", "B"], [1.0, 2.0], [1.5, "=A2+1"],
                                               [1.2, '=""']]})
    xml = sheet_xml(src)
    assert "<f>A2+1</f><v />" in xml
    # a spreadsheet program saves the values: 2.5 for the formula, "" (text) for =""
    xml = xml.replace("<f>A2+1</f><v />", "<f>A2+1</f><v>2.5</v>")
    xml = xml.replace('<c r="B4"><f>""</f><v />', '<c r="B4" t="str"><f>""</f><v></v>')
    path = patch_zip(src, tmp_path / "saved.xlsx", {"xl/worksheets/sheet1.xml": xml.encode()})
    block = read_cells(path)
    assert block.rows[2] == (1.5, 2.5)
    assert block.rows[3] == (1.2, None)  # an empty-text result is a blank, not an error
    g = read_groups(path).groups
    assert g.counts == (3, 2)


def test_xlsm_reads_saved_values(tmp_path):
    src = make_book(tmp_path / "m.xlsx", {"S": [["A", "B"], [1.0, 2.0], [1.5, 2.5]]})
    ct = zipfile.ZipFile(src).read("[Content_Types].xml").decode()
    ct = ct.replace("application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml",
                    "application/vnd.ms-excel.sheet.macroEnabled.main+xml")
    path = patch_zip(src, tmp_path / "m.xlsm", {"[Content_Types].xml": ct.encode(),
                                                "xl/vbaProject.bin": b"\xd0\xcf\x11\xe0fake"})
    assert read_groups(path).groups.counts == (2, 2)


def test_progress_is_reported_in_cells(tmp_path):
    path = make_book(tmp_path / "p.xlsx", {"S": [["A", "B"]] + [[float(i), i + 0.5] for i in range(50)]})
    calls = []
    read_cells(path, progress=lambda stage, done, total: calls.append((stage, done, total)))
    assert calls[0] == ("reading", 0, 102)
    assert calls[-1] == ("reading", 102, 102)
    csvp = tmp_path / "p.csv"
    csvp.write_text("A,B\n" + "".join(f"{i},{i + 0.5}\n" for i in range(50)))
    calls.clear()
    read_cells(csvp, progress=lambda *a: calls.append(a))
    assert calls and calls[-1][1] == calls[-1][2]


# --------------------------------------------------------------------------------------------
# CSV


@pytest.mark.parametrize(
    "text, expect",
    [  # how a spreadsheet reads typed text (common practice)
        ("12", 12.0), (" 12 ", 12.0), ("-1.5", -1.5), ("+3", 3.0), ("007", 7.0),
        (".5", 0.5), ("5.", 5.0), ("1e-3", 0.001), ("1.5E+3", 1500.0),
        ("12.5%", 0.125), ("(12.5)", -12.5), ("$1,234.50", 1234.5), ("12 €", 12.0),
        ("TRUE", True), ("false", False), ("#N/A", "#N/A"), ("#DIV/0!", "#DIV/0!"),
        ("", None), ("   ", None),
        ("2024-03-05", dt.datetime(2024, 3, 5)),
        ("2024-03-05 14:30:15", dt.datetime(2024, 3, 5, 14, 30, 15)),
        # text stays text: nothing is ever evaluated or given a non-spreadsheet meaning
        ("=1+2", "=1+2"), ("+A", "+A"), ("-", "-"), ("@x", "@x"), ("inf", "inf"),
        ("nan", "nan"), ("1_000", "1_000"), ("0x10", "0x10"), ("12 kg", "12 kg"),
        ("2024-13-45", "2024-13-45"),
    ],
)
def test_csv_value_reads_like_a_spreadsheet(text, expect):
    got = csv_value(text)
    assert got == expect and type(got) is type(expect)


def test_csv_value_keeps_the_shortest_decimal():
    # 0.1 + 0.2 typed as text is the double nearest 0.3 (common practice: correctly rounded).
    assert csv_value("0.3") == 0.3
    assert csv_value("12.3%") == 0.123  # percent moves the decimal point, no binary product
    assert csv_value("1,5", decimal_comma=True) == 1.5
    assert csv_value("1.234,5", decimal_comma=True) == 1234.5
    assert csv_value("-0,25 €", decimal_comma=True) == -0.25


@pytest.mark.parametrize(
    "text, comma, why",
    [("1,234", False, "grouping"), ("1,5", False, "comma-in-point"),
     ("1.234", True, "comma"), ("1.5", True, "point-in-comma")],
)
def test_csv_value_refuses_numbers_that_read_two_ways(text, comma, why):
    with pytest.raises(ValueError, match=why):
        csv_value(text, decimal_comma=comma)


@pytest.mark.parametrize(
    "text, delim",
    [
        ("A,B,C\n1,2,3\n4,5,6\n", ","),
        ("A;B;C\n1,5;2,5;3\n4;5;6\n", ";"),
        ("A\tB\n1.5\t2\n", "\t"),
        ('"x, y";B\n"1";2\n', ";"),
        ("A,B\n\"note; with semicolon\",2\n3,4\n", ","),
        ("A\n1\n2\n", ","),
    ],
)
def test_detect_delimiter(text, delim):
    assert detect_delimiter(text) == delim


def test_csv_file_reading(tmp_path):
    p = tmp_path / "lots.csv"
    p.write_text('Lot A,"Lot, B",=1+2\n1.2,2.2,3.1\n1.4,"2.1",n/a\n1.1,2.6,3.3\n,,\n',
                 encoding="utf-8")
    loaded = read_groups(p)
    assert loaded.groups.labels == ("Lot A", "Lot, B", "=1+2")
    assert loaded.groups.counts == (3, 3, 2)
    assert loaded.block.ref == "A1:C4"
    (note,) = loaded.groups.cells
    assert loaded.source.full_address(note.row, note.col) == "C3"


def test_csv_utf16_with_bom_and_tabs(tmp_path):
    p = tmp_path / "u16.csv"
    p.write_bytes("Zone 1\tZone 2\n61,2\t60,8\n60,7\t61,5\n".encode("utf-16"))
    g = read_groups(p, decimal_comma=True).groups
    assert g.counts == (2, 2) and g.arrays[0][0] == 61.2


def test_csv_messages(tmp_path):
    p = tmp_path / "eu.csv"
    p.write_text("A;B\n1,5;2,5\n1,7;2,9\n")
    with pytest.raises(InputError, match=r'"1,5" at A2 of eu\.csv is a number with a decimal comma; add --decimal-comma'):
        read_cells(p)
    p = tmp_path / "latin1.csv"
    p.write_bytes("Bühne,B\n1,2\n".encode("latin-1"))
    with pytest.raises(InputError, match=r"latin1\.csv is not UTF-8 text \(byte 0xFC at offset 1\)"):
        read_cells(p)
    p = tmp_path / "empty.csv"
    p.write_text("\n\n")
    with pytest.raises(InputError, match=r"empty\.csv is empty"):
        read_cells(p)
    p = tmp_path / "blank.csv"
    p.write_text(",,\n,,\n")
    with pytest.raises(InputError, match=r"blank\.csv holds no values"):
        read_cells(p)
    with pytest.raises(InputError, match="has no sheets"):
        read_cells(tmp_path / "eu.csv", sheet="S")
    with pytest.raises(InputError, match="does not exist"):
        read_cells(tmp_path / "missing.csv")
    with pytest.raises(InputError, match=r"old binary \.xls workbook"):
        read_cells(tmp_path / "old.xls")
    with pytest.raises(InputError, match="cannot tell what kind of file"):
        read_cells(tmp_path / "data.json")


def test_csv_range_and_size_limit(tmp_path):
    p = tmp_path / "r.csv"
    p.write_text("title,,\nA,B,C\n1,2,3\n4,5,6\n")
    block = read_cells(p, cell_range="A2:B4")
    assert block.rows == (("A", "B"), (1.0, 2.0), (4.0, 5.0))
    assert block.source.first_row == 2
    with pytest.raises(InputError, match=r"more than the 10 bytes limit.*--size-limit"):
        read_cells(p, size_limit=10)
    assert DEFAULT_SIZE_LIMIT == 512 * 1024 * 1024


# --------------------------------------------------------------------------------------------
# properties (hypothesis; derandomized in conftest)

from hypothesis import given, strategies as st  # noqa: E402

_finite = st.floats(allow_nan=False, allow_infinity=False, width=64)


@given(_finite)
def test_csv_value_round_trips_shortest_reprs(x):
    # a double's shortest repr reads back as the same double (common practice)
    assert csv_value(repr(x)) == x
    assert csv_value(repr(x).replace(".", ","), decimal_comma=True) == x


@given(st.floats(min_value=-1e9, max_value=1e9, allow_nan=False))
def test_csv_value_reads_grouped_and_percent_forms(x):
    # a thousands separator next to a decimal point is unambiguous; percent moves the point
    grouped = f"{x:,.3f}"
    assert csv_value(grouped) == float(f"{x:.3f}")
    assert csv_value(f"{x:.3f}%") == float(f"{x:.3f}e-2")  # one rounding, like typed 0.xx
    eu = grouped.replace(",", "_").replace(".", ",").replace("_", ".")
    assert csv_value(eu, decimal_comma=True) == float(f"{x:.3f}")


# --------------------------------------------------------------------------------------------
# empty ranges are named as the user gave them


def test_range_reference_written_back_as_the_host_writes_it():
    assert parse_range("B:B").a1() == "B:B"
    assert parse_range("$B:$E").a1() == "B:E"
    assert parse_range("2:40").a1() == "2:40"
    assert parse_range("C5").a1() == "C5"
    assert parse_range("B2:E30").a1() == "B2:E30"
    assert parse_range("B:E").a1(last_row=9) == "B1:E9"


def test_empty_range_is_named_as_given(tmp_path):
    book = make_book(tmp_path / "lots.xlsx", {"Lot data": [["A", "B"], [1.0, 2.0], [3.0, 4.0]]})
    with pytest.raises(InputError) as ei:
        read_cells(book, cell_range="D:D")
    assert str(ei.value) == ('sheetfuncs: the range D:D of sheet "Lot data" in lots.xlsx is '
                             "empty; check the range")
    with pytest.raises(InputError, match=r"the range \$F\$2:\$G\$9 of sheet"):
        read_cells(book, cell_range="$F$2:$G$9")
    with pytest.raises(InputError) as ei:
        read_cells(book, cell_range="'Lot data'!7:9")
    assert str(ei.value).startswith("sheetfuncs: the range 'Lot data'!7:9 in lots.xlsx is empty")
    wb = openpyxl.load_workbook(book)
    wb.defined_names["Spare"] = openpyxl.workbook.defined_name.DefinedName(
        "Spare", attr_text="'Lot data'!$H$1:$H$20")
    wb.save(book)
    with pytest.raises(InputError, match=r"""the name "Spare" \('Lot data'!H1:H20\) in lots"""):
        read_cells(book, cell_range="Spare")
    csv_path = tmp_path / "lots.csv"
    csv_path.write_text("A,B\n1,2\n3,4\n", encoding="utf-8")
    with pytest.raises(InputError) as ei:
        read_cells(csv_path, cell_range="D:D")
    assert "the range D:D of lots.csv holds no values" in str(ei.value)
    assert "D1" not in str(ei.value)


def test_header_only_csv_and_folders_without_suffix(tmp_path):
    p = tmp_path / "header.csv"
    p.write_text("Lot A,Lot B\n", encoding="utf-8")
    with pytest.raises(InputError, match="holds only a row of labels and no values"):
        read_groups(p)
    (tmp_path / "exports").mkdir()
    with pytest.raises(InputError, match="exports is a folder, not a file"):
        read_cells(tmp_path / "exports")


# --------------------------------------------------------------------------------------------
# document properties


def test_workbook_properties(tmp_path):
    wb = openpyxl.Workbook()
    wb.properties.creator = "QA lab"
    wb.properties.title = "Lot release"
    wb.properties.keywords = "lots; release"
    path = tmp_path / "p.xlsx"
    wb.save(path)
    props = workbook_properties(path)
    assert props["creator"] == "QA lab" and props["title"] == "Lot release"
    assert props["keywords"] == "lots; release"
    bare = patch_zip(path, tmp_path / "bare.xlsx", {"docProps/core.xml": None})
    assert workbook_properties(bare) == {}
    text = tmp_path / "text.xlsx"
    text.write_text("A,B\n1,2\n", encoding="utf-8")
    with pytest.raises(InputError, match="not an .xlsx workbook"):
        workbook_properties(text)
    with pytest.raises(InputError, match="more than the"):
        workbook_properties(path, size_limit=100)
