"""CSV files: decoding, the field separator, and each field read the way a spreadsheet reads typed text.

Comma, semicolon or tab separated (detected, or given); UTF-8 with or without a byte-order
mark (UTF-16 with a byte-order mark is also read). Each field is read the way a spreadsheet
reads typed text (:func:`csv_value`): numbers (sign, exponent, percent, currency sign,
accounting parentheses, thousands separators when a decimal separator makes them
unambiguous), ``TRUE``/``FALSE``, error texts such as ``#N/A``, ISO dates; everything else
is text. A decimal comma is read only on request (``decimal_comma=True``); a field that
could be read two ways (``1,234``) or that uses the other decimal separator is an error
that says what to do, so no number is ever misread silently.
"""

from __future__ import annotations

import codecs
import csv
import datetime as _dt
import io
import re
from decimal import Decimal, InvalidOperation
from pathlib import Path
from typing import Any

from ...errors import InputError
from ..cells import RangeRef, column_letters, is_error_text
from ..source import InputSource
from .block import PROGRESS_STEP, CellBlock, Progress, cell_block, trim_rows
from .records import RecordLines, TooManyFields
from .safety import CFB_MAGIC, ZIP_EMPTY, ZIP_MAGIC, check_file_size
from .sheetcells import check_area

__all__ = ["csv_value", "detect_delimiter", "read_delimited"]

_DELIMITERS = ("\t", ";", ",")  # in order of preference when several fit
_DELIMITER_BY_NAME = {"tab": "\t", "semicolon": ";", "comma": ","}


# --------------------------------------------------------------------------------------------
# reading a file


def read_delimited(
    p: Path,
    ref: RangeRef | None,
    decimal_comma: bool,
    delimiter: str | None,
    size_limit: int,
    progress: Progress | None,
    shown: str | None = None,
    max_fields: int | None = None,
    max_cells: int | None = None,
) -> CellBlock:
    """The block of a CSV file's fields (all of it, or the range ``ref``), trimmed.

    ``shown`` is the range as the user gave it, for messages; ``max_fields`` limits the fields
    of one record, ``max_cells`` the block's area (``None``: no limit). See
    :func:`.reader.read_cells`.
    """
    if max_fields is not None and (isinstance(max_fields, bool) or not isinstance(max_fields, int)
                                   or max_fields < 1):
        raise InputError(
            f"the limit on fields must be a whole number of at least 1, not {max_fields!r}"
        )
    check_file_size(p, size_limit)
    text = _decode(p, p.read_bytes())
    if text.strip() == "":
        raise InputError(f"{p.name} is empty; check that it is the right file")
    delimiter = _field_separator(text, delimiter)
    # with a decimal comma and comma separators, numbers must be quoted; the field rules apply
    rows = _read_records(p, text, delimiter, ref, decimal_comma, progress, max_fields)
    r1 = ref.min_row if ref else 1
    c1 = ref.min_col if ref else 1
    if max_cells is not None and rows:  # before the rows are padded to the block's width
        width = max(map(len, rows))
        if ref is not None and ref.max_col is not None:
            width = max(width, ref.max_col - ref.min_col + 1)
        what = f"the range {shown or ref.a1()} of {p.name}" if ref else p.name
        check_area(what, len(rows), width, max_cells)
    trimmed, _, fr, fc = trim_rows(rows, r1, c1, ref, [])
    if not trimmed:
        what = f"the range {shown or ref.a1()} of {p.name}" if ref else p.name
        raise InputError(f"{what} holds no values; check the file and the range")
    source = InputSource(path=str(p), sheet=None, first_row=fr, first_col=fc)
    return cell_block(trimmed, source, "csv", delimiter)


def _field_separator(text: str, delimiter: str | None) -> str:
    """The separator given (a character, or its name), or the one detected in ``text``."""
    if delimiter is None:
        return detect_delimiter(text)
    if delimiter in _DELIMITERS:
        return delimiter
    if delimiter.lower() in _DELIMITER_BY_NAME:
        return _DELIMITER_BY_NAME[delimiter.lower()]
    raise InputError(
        f"the CSV field separator must be comma, semicolon or tab, not "
        f"{delimiter!r}"
    )


def _read_records(
    p: Path,
    text: str,
    delimiter: str,
    ref: RangeRef | None,
    decimal_comma: bool,
    progress: Progress | None,
    max_fields: int | None = None,
) -> list[tuple[Any, ...]]:
    """The records of the range (every record without one), each field read by :func:`csv_value`.

    The lines reach the parser through :class:`RecordLines`, which stops a record with more
    than ``max_fields`` fields before it is built and notices a quote that is never closed."""
    r1 = ref.min_row if ref else 1
    c1 = ref.min_col if ref else 1
    r2 = ref.max_row if ref else None
    c2 = ref.max_col if ref else None
    lines = text.count("\n") + 1
    rows: list[tuple[Any, ...]] = []
    step = max(PROGRESS_STEP // 4, 1)
    feed = RecordLines(text, delimiter, max_fields)
    reader: Any = None
    r = 0
    width = 0  # fields per record, from the first one read: progress counts cells
    try:
        reader = csv.reader(feed, delimiter=delimiter)
        for rec in reader:
            feed.fresh = True  # the next line handed to the parser starts a record
            r += 1
            if r < r1:
                continue
            if r2 is not None and r > r2:
                break
            fields = rec[c1 - 1:c2] if c2 is not None else rec[c1 - 1:]
            if not width and progress is not None:
                width = max(len(fields), 1)
                progress("reading", 0, lines * width)
            rows.append(_record_values(p, fields, r, c1, decimal_comma))
            if progress is not None and r % step == 0:
                progress("reading", min(reader.line_num, lines) * width, lines * width)
    except csv.Error as e:
        raise InputError(_parse_message(p, feed, reader, e)) from None
    except TooManyFields as e:
        raise InputError(
            f"line {e.line} of {p.name} has more than {e.limit:,} fields, the limit for one "
            "line; check its separators and line ends, or give --max-fields N (Python: "
            "max_fields=N) to read it"
        ) from None
    if feed.ended_inside:
        raise InputError(
            f'the quote (") opened on line {feed.open_quote_line() or feed.line_of(feed.start)} '
            f"of {p.name} is never closed, so the rest of the file would be one text field; "
            "close or remove it and try again"
        )
    if progress is not None:
        progress("reading", lines * max(width, 1), lines * max(width, 1))
    return rows


def _parse_message(p: Path, feed: RecordLines, reader: Any, e: csv.Error) -> str:
    """What to say when the parser stops: a quote left open, or the parser's own reason."""
    opened = feed.open_quote_line()
    if opened is not None:
        return (
            f'the quote (") opened on line {opened} of {p.name} is not closed within '
            f"{csv.field_size_limit():,} characters; close or remove it and try again"
        )
    line = reader.line_num if reader is not None else 1
    return f"{p.name} is not well-formed CSV near line {line} ({e}); check its quotes"


def _record_values(
    p: Path, fields: list[str], r: int, c1: int, decimal_comma: bool
) -> tuple[Any, ...]:
    """The values of record ``r``'s fields (the first in column ``c1``)."""
    vals = []
    for j, field in enumerate(fields):
        try:
            vals.append(csv_value(field, decimal_comma))
        except _Ambiguous as e:
            where = f"{column_letters(c1 + j)}{r}"
            raise InputError(_ambiguity_message(p, where, field.strip(), e.why)) from None
    return tuple(vals)


# --------------------------------------------------------------------------------------------
# text and separators


def _decode(p: Path, data: bytes) -> str:
    if data.startswith(codecs.BOM_UTF8):
        enc, body = "utf-8", data[3:]
    elif data.startswith((codecs.BOM_UTF16_LE, codecs.BOM_UTF16_BE)):
        enc, body = "utf-16", data
    else:
        enc, body = "utf-8", data
    if enc == "utf-8" and body[:4] in (ZIP_MAGIC, ZIP_EMPTY):
        raise InputError(
            f"{p.name} is a zip archive (perhaps a workbook), not CSV text; give "
            "it an .xlsx name"
        )
    if enc == "utf-8" and body[:8] == CFB_MAGIC:
        raise InputError(
            f"{p.name} is a binary workbook, not CSV text; save it as .xlsx or as "
            "CSV UTF-8"
        )
    try:
        text = body.decode(enc)
    except UnicodeDecodeError as e:
        raise InputError(
            f"{p.name} is not UTF-8 text (byte 0x{body[e.start]:02X} at offset "
            f"{e.start}); save it as \"CSV UTF-8\" and try again"
        ) from None
    if "\x00" in text:
        raise InputError(
            f"{p.name} holds NUL bytes, so it is not CSV text; check that it is the "
            "right file"
        )
    return text


def detect_delimiter(text: str, max_records: int = 50) -> str:
    """The field separator of CSV text: tab, semicolon or comma.

    Each candidate splits the first ``max_records`` non-blank records (quotes respected); the
    one that gives two or more fields in the most records wins, ties going to tab, then
    semicolon (which files with decimal commas use), then comma. A single column gives comma.
    """
    sample = text[: 256 * 1024]
    if len(text) > len(sample):
        cut = sample.rfind("\n")
        if cut > 0:
            sample = sample[:cut]
    best, best_score = ",", 0.0
    for d in _DELIMITERS:
        counts = []
        try:
            for rec in csv.reader(io.StringIO(sample, newline=""), delimiter=d):
                if not rec or all(f.strip() == "" for f in rec):
                    continue
                counts.append(len(rec))
                if len(counts) >= max_records:
                    break
        except csv.Error:
            continue
        if not counts:
            continue
        score = sum(1 for c in counts if c >= 2) / len(counts)
        if score > best_score:
            best, best_score = d, score
    return best


# --------------------------------------------------------------------------------------------
# the number grammar


_CURRENCY = "$€£¥"


def _number_re(dec: str, grp: str) -> re.Pattern[str]:
    d, g = re.escape(dec), re.escape(grp)
    body = rf"(?:\d{{1,3}}(?:{g}\d{{3}})+{d}\d*|\d+(?:{d}\d*)?|{d}\d+)"
    return re.compile(rf"^{body}(?:[eE][+-]?\d+)?$")


_NUM_POINT = _number_re(".", ",")
_NUM_COMMA = _number_re(",", ".")
_AMBIG_POINT = re.compile(r"^\d{1,3}(?:,\d{3})+$")       # 1,234: thousands or decimals?
_AMBIG_COMMA = re.compile(r"^\d{1,3}(?:\.\d{3})+$")      # 1.234 with decimal comma
_OTHER_POINT = re.compile(r"^(?:\d+,\d+|,\d+)(?:[eE][+-]?\d+)?$")   # decimal comma number
_OTHER_COMMA = re.compile(r"^(?:\d+\.\d+|\.\d+)(?:[eE][+-]?\d+)?$")  # decimal point number
_PLAIN_NUMBER = re.compile(r"-?[0-9]+(?:\.[0-9]+)?(?:[eE][+-]?[0-9]+)?\Z")
_ISO_DATE = re.compile(
    r"^(\d{4})-(\d{2})-(\d{2})(?:[ T](\d{2}):(\d{2})(?::(\d{2})(?:\.(\d{1,6}))?)?)?$"
)


class _Ambiguous(ValueError):
    def __init__(self, why: str) -> None:
        super().__init__(why)
        self.why = why


def _strip_number_dressing(s: str) -> tuple[str, bool, bool] | None:
    """Remove sign, parentheses, currency and percent: ``(core, negative, percent)``."""
    neg = False
    if len(s) >= 3 and s[0] == "(" and s[-1] == ")":
        neg, s = True, s[1:-1].strip()
    pct = False
    if s.endswith("%"):
        pct, s = True, s[:-1].rstrip()
    if s and s[0] in "+-":
        if neg:
            return None
        neg, s = s[0] == "-", s[1:].lstrip()
    if s and s[0] in _CURRENCY:
        s = s[1:].lstrip()
    elif s and s[-1] in _CURRENCY:
        s = s[:-1].rstrip()
    if s and s[0] in "+-" and not neg:
        neg, s = s[0] == "-", s[1:].lstrip()
    if not s or not s[0] in "0123456789.,":
        return None
    return s, neg, pct


def _parse_number(s: str, decimal_comma: bool) -> float | None:
    """A spreadsheet-typed number, ``None`` for text; :class:`_Ambiguous` when unclear."""
    parts = _strip_number_dressing(s)
    if parts is None:
        return None
    core, neg, pct = parts
    if decimal_comma:
        if _AMBIG_COMMA.match(core):
            raise _Ambiguous("comma")
        if _NUM_COMMA.match(core):
            digits = core.replace(".", "").replace(",", ".")
        elif _OTHER_COMMA.match(core):
            raise _Ambiguous("point-in-comma")
        else:
            return None
    else:
        if _NUM_POINT.match(core):
            digits = core.replace(",", "")
        elif _AMBIG_POINT.match(core):
            raise _Ambiguous("grouping")
        elif _OTHER_POINT.match(core):
            raise _Ambiguous("comma-in-point")
        else:
            return None
    try:
        dec = Decimal(digits)
    except InvalidOperation:
        return None
    if pct:
        dec = dec.scaleb(-2)
    if neg:
        dec = -dec
    value = float(dec)
    return value


def csv_value(text: str, decimal_comma: bool = False) -> Any:
    """A CSV field as a spreadsheet would read typed text.

    Blank (or only spaces) -> ``None``; ``TRUE``/``FALSE`` (any case) -> ``bool``; an error text
    (``#N/A``, ``#DIV/0!`` ...) -> that text, which the range rules treat as an error; a number
    -> ``float``; an ISO date ``2024-03-05`` (with optional time) -> ``datetime``; anything else
    -> the text unchanged (a field like ``=1+2`` stays text: nothing is ever evaluated).
    Raises ``ValueError`` for a number that could be read two ways.
    """
    if not decimal_comma and _PLAIN_NUMBER.match(text):
        return float(text)  # the common case; float() rounds correctly, as Decimal would
    s = text.strip()
    if s == "":
        return None
    if is_error_text(s):
        return s
    up = s.upper()
    if up == "TRUE":
        return True
    if up == "FALSE":
        return False
    if s[0] in "0123456789+-.,($€£¥":
        num = _parse_number(s, decimal_comma)
        if num is not None:
            return num
        m = _ISO_DATE.match(s)
        if m:
            try:
                parts = [int(x) if x else 0 for x in m.groups()[:6]]
                frac = m.group(7)
                micro = int((frac or "0").ljust(6, "0"))
                return _dt.datetime(*parts, micro)
            except ValueError:
                return text
    return text


def _ambiguity_message(p: Path, where: str, field: str, why: str) -> str:
    if why == "grouping":
        return (
            f'"{field}" at {where} of {p.name} could be a thousands separator or a '
            "decimal comma; write the numbers without thousands separators, or add "
            "--decimal-comma if the comma is the decimal separator"
        )
    if why == "comma-in-point":
        return (
            f'"{field}" at {where} of {p.name} is a number with a decimal comma; '
            "give --decimal-comma (Python: decimal_comma=True) to read such numbers"
        )
    if why == "comma":
        return (
            f'"{field}" at {where} of {p.name} could be a thousands separator or a '
            "decimal point; write the numbers without thousands separators"
        )
    return (
        f'"{field}" at {where} of {p.name} uses a decimal point, but a decimal '
        "comma was asked for; leave out --decimal-comma, or make the file consistent"
    )
