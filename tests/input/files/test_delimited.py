"""Tests of sheetfuncs.input.files.delimited: CSV files, their separators and the number grammar.

Numeric checks name their source: the NIST StRD one-way datasets (certified values), or
"common practice" for how a spreadsheet reads typed text.
"""

from __future__ import annotations

import datetime as dt
import math

import pytest
from hypothesis import given, strategies as st

from tests.support import nist
from sheetfuncs import oneway
from sheetfuncs.errors import InputError
from sheetfuncs.input.files.delimited import csv_value, detect_delimiter
from sheetfuncs.input.files.reader import read_cells, read_groups
from sheetfuncs.input.files.safety import DEFAULT_SIZE_LIMIT


# --------------------------------------------------------------------------------------------
# fields read like typed text


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


# --------------------------------------------------------------------------------------------
# properties (hypothesis; derandomized in conftest)

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
# separators and files


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
    with pytest.raises(InputError) as ei:
        read_cells(p)
    assert str(ei.value) == (
        'sheetfuncs: "1,5" at A2 of eu.csv is a number with a decimal comma; give '
        "--decimal-comma (Python: decimal_comma=True) to read such numbers"
    )
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


def test_csv_range_and_size_limit(tmp_path):
    p = tmp_path / "r.csv"
    p.write_text("title,,\nA,B,C\n1,2,3\n4,5,6\n")
    block = read_cells(p, cell_range="A2:B4")
    assert block.rows == (("A", "B"), (1.0, 2.0), (4.0, 5.0))
    assert block.source.first_row == 2
    with pytest.raises(InputError, match=r"more than the 10 bytes limit.*--size-limit"):
        read_cells(p, size_limit=10)
    assert DEFAULT_SIZE_LIMIT == 512 * 1024 * 1024


def test_empty_csv_range_is_named_as_given(tmp_path):
    csv_path = tmp_path / "lots.csv"
    csv_path.write_text("A,B\n1,2\n3,4\n", encoding="utf-8")
    with pytest.raises(InputError) as ei:
        read_cells(csv_path, cell_range="D:D")
    assert "the range D:D of lots.csv holds no values" in str(ei.value)
    assert "D1" not in str(ei.value)


# --------------------------------------------------------------------------------------------
# certified data written the European way


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
