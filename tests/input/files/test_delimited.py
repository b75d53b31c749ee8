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


# --------------------------------------------------------------------------------------------
# quotes that are never closed, and lines with too many fields


def _csv_error(tmp_path, text: str, **kw) -> str:
    p = tmp_path / "q.csv"
    p.write_text(text, encoding="utf-8")
    with pytest.raises(InputError) as ei:
        read_cells(p, **kw)
    return str(ei.value)


def test_quote_never_closed_names_its_line(tmp_path):
    # invented: 40 values after a stray quote would otherwise become one text cell
    body = "".join(f"{5 + i / 100:.2f},{6 + i / 100:.2f}\n" for i in range(20))
    text = 'Line A,Line B\n5.10,"6.10\n' + body
    assert _csv_error(tmp_path, text) == (
        'sheetfuncs: the quote (") opened on line 2 of q.csv is never closed, so the rest of '
        "the file would be one text field; close or remove it and try again"
    )
    # a quoted field over two lines before it does not shift the count
    text = 'A,B\n"two\nlines",1\n2,"3\n4,5\n'
    assert "opened on line 4 of q.csv is never closed" in _csv_error(tmp_path, text)
    # a doubled quote inside a quoted field is not its end
    assert "opened on line 2 of q.csv" in _csv_error(tmp_path, 'A,B\n1,"a""\n5,6\n')


def test_long_open_quote_is_named_too(tmp_path):
    text = "A,B\n1,2\n3,\"4" + "x" * 200_000 + "\n5,6\n"
    assert _csv_error(tmp_path, text) == (
        'sheetfuncs: the quote (") opened on line 3 of q.csv is not closed within 131,072 '
        "characters; close or remove it and try again"
    )


def test_closed_quotes_and_quotes_inside_text_still_read(tmp_path):
    p = tmp_path / "ok.csv"
    p.write_text('Lot,Note\n"A, first",5" pipe\n"B ""x""",\'q\n', encoding="utf-8")
    assert read_cells(p).rows == (("Lot", "Note"), ("A, first", '5" pipe'), ('B "x"', "'q"))


@pytest.mark.parametrize("quoted", [False, True])
def test_line_with_too_many_fields(tmp_path, quoted):
    q = '"' if quoted else ""
    rows = ["A,B,C", "1,2,3", ",".join(f"{q}{i}{q}" for i in range(10)), "4,5,6"]
    assert _csv_error(tmp_path, "\n".join(rows) + "\n", max_fields=5) == (
        "sheetfuncs: line 3 of q.csv has more than 5 fields, the limit for one line; check "
        "its separators and line ends, or give --max-fields N (Python: max_fields=N) to read it"
    )
    p = tmp_path / "q.csv"
    assert read_cells(p, max_fields=10).n_cols == 10
    # separators inside quotes are not fields
    p.write_text('A,B\n"1,2,3,4,5,6",7\n', encoding="utf-8")
    assert read_cells(p, max_fields=2).rows[1] == ("1,2,3,4,5,6", 7.0)
    with pytest.raises(InputError) as ei:
        read_cells(p, max_fields=0)
    assert ei.value.reason == "the limit on fields must be a whole number of at least 1, not 0"


def test_fifty_megabytes_on_one_line_is_answered_in_one_line(tmp_path):
    # the case: 12.5 million fields on one line; the bound is the (30 s, 1 GB)
    from tests.support.measure import measure_cli

    p = tmp_path / "one.csv"
    with open(p, "w", encoding="utf-8") as fh:
        chunk = ",".join(f"{i % 10}.{i % 7}" for i in range(1_000_000))
        for _ in range(12):
            fh.write(chunk + ",")
        fh.write(",".join("5.0" for _ in range(500_000)) + "\n")
    assert p.stat().st_size >= 50_000_000  # 12.5 million fields of four bytes with their commas
    got = measure_cli("table", str(p), cwd=tmp_path)
    assert got.code == 1 and got.out == ""
    assert got.err == (
        "sheetfuncs: line 1 of one.csv has more than 16,384 fields, the limit for one line; "
        "check its separators and line ends, or give --max-fields N (Python: max_fields=N) to "
        "read it\n"
    )
    assert got.seconds < 30 and got.peak_mb < 1024


def test_a_range_far_wider_than_the_file_is_refused_before_it_is_padded(tmp_path):
    # common practice: a range over every column of a sheet must not build 16,384 cells per row
    p = tmp_path / "x.csv"
    p.write_text("A,B\n" + "".join(f"{i},{i + 1}\n" for i in range(2000)))
    with pytest.raises(InputError) as e:
        read_groups(p, cell_range="A1:XFD3000")
    assert e.value.reason == (
        "the range A1:XFD3000 of x.csv spans 32,784,384 cells, more than the limit of 20,000,000; "
        "give a smaller --range or raise --max-cells"
    )
    with pytest.raises(InputError, match="spans 20,010 cells, more than the limit of 20,000;"):
        read_groups(p, cell_range="A1:J3000", max_cells=20_000)
    assert read_groups(p, cell_range="A1:J3000", max_cells=20_010).groups.counts == (2000, 2000)
