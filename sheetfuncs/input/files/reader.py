"""Input readers: a range of cells from an ``.xlsx``/``.xlsm`` workbook or a ``.csv`` file.

The readers only fetch cells; every range then goes through
:func:`sheetfuncs.groups.groups_from_range`, so a file read here is cleaned by exactly the same
rules as a range handed to a worksheet function.

Workbooks
    Read with openpyxl in read-only mode with ``data_only=True``: the values the spreadsheet
    program saved, never the formulas; macros are neither run nor loaded (``keep_vba=False``).
    Before anything is parsed the zip directory is checked against a limit on the total
    uncompressed size (:data:`DEFAULT_SIZE_LIMIT`, 512 MB; raise it with ``size_limit``), and
    the prolog of every XML part is scanned for a document type declaration: a workbook never
    needs one, and it is how XML entity bombs are built. openpyxl itself parses through
    defusedxml when that package is installed (a dependency of sheetfuncs);
    :func:`openpyxl_uses_defusedxml` checks that it does. A formula cell that has no saved
    value (a file written by a program that does not calculate) is an error naming its
    address, never a blank. Encrypted workbooks, old binary ``.xls`` files and damaged files
    each get one line that says so.

CSV files
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
import math
import os
import re
import struct
import warnings
import zipfile
import zlib
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from decimal import Decimal, InvalidOperation
from pathlib import Path
from typing import Any

from ...errors import InputError
from ..cells import ERROR_TEXTS, RangeRef, a1_range, column_letters, parse_range
from ..groups import Groups, groups_from_range
from ..source import InputSource

__all__ = [
    "DEFAULT_SIZE_LIMIT",
    "WORKBOOK_SUFFIXES",
    "CSV_SUFFIXES",
    "CellBlock",
    "LoadedGroups",
    "read_cells",
    "read_groups",
    "csv_value",
    "detect_delimiter",
    "check_archive",
    "openpyxl_uses_defusedxml",
    "input_kind",
    "workbook_properties",
]

#: Default limit on the total uncompressed size of a workbook (and on the size of a CSV file).
DEFAULT_SIZE_LIMIT = 512 * 1024 * 1024
WORKBOOK_SUFFIXES = (".xlsx", ".xlsm", ".xltx", ".xltm")
CSV_SUFFIXES = (".csv", ".tsv", ".txt")
_DELIMITERS = ("\t", ";", ",")  # in order of preference when several fit
_DELIMITER_NAMES = {"\t": "tab", ";": "semicolon", ",": "comma"}

#: A progress callback: ``progress(stage, done, total)``; ``total`` 0 when unknown.
Progress = Callable[[str, int, int], None]

_CFB_MAGIC = b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1"
_ZIP_MAGIC = b"PK\x03\x04"
_ZIP_EMPTY = b"PK\x05\x06"
_ZIP_METHODS = (zipfile.ZIP_STORED, zipfile.ZIP_DEFLATED, zipfile.ZIP_BZIP2, zipfile.ZIP_LZMA)
_PROGRESS_STEP = 20_000  # cells between progress calls


# --------------------------------------------------------------------------------------------
# results


@dataclass(frozen=True)
class CellBlock:
    """A rectangular block of cells as read from a file.

    ``rows`` holds the saved cell values row by row (``None`` for blanks; numbers, text,
    logical values, error texts such as ``"#N/A"``, dates); ``source`` says where the block's
    top-left cell is, so that a 0-based ``(row, col)`` of the block has an address
    (``source.full_address(row, col)``). ``kind`` is ``"workbook"`` or ``"csv"``; ``ref`` the
    block's A1 reference (e.g. ``"A1:D9"``); ``delimiter`` the CSV field separator.
    """

    rows: tuple[tuple[Any, ...], ...]
    source: InputSource
    kind: str
    ref: str
    delimiter: str | None = None

    @property
    def n_rows(self) -> int:
        return len(self.rows)

    @property
    def n_cols(self) -> int:
        return max((len(r) for r in self.rows), default=0)

    @property
    def n_cells(self) -> int:
        return self.n_rows * self.n_cols


@dataclass(frozen=True)
class LoadedGroups:
    """Groups cleaned from a file's block of cells, with the block they came from."""

    groups: Groups
    block: CellBlock

    @property
    def source(self) -> InputSource:
        return self.block.source


# --------------------------------------------------------------------------------------------
# entry points


def input_kind(path: str | os.PathLike[str]) -> str:
    """``"workbook"`` or ``"csv"`` from the file name; an InputError for anything else."""
    p = Path(path)
    suffix = p.suffix.lower()
    if suffix in WORKBOOK_SUFFIXES:
        return "workbook"
    if suffix in CSV_SUFFIXES:
        return "csv"
    if suffix == ".xls":
        raise InputError(
            f"{p.name} is an old binary .xls workbook, which sheetfuncs does not "
            "read; save it as .xlsx (Excel Workbook) and try again"
        )
    if suffix in (".ods", ".numbers", ".xlsb"):
        raise InputError(
            f"{p.name} is a {suffix} file, which sheetfuncs does not read; save it "
            "as .xlsx or .csv and try again"
        )
    raise InputError(
        f"cannot tell what kind of file {p.name} is; give an .xlsx or .xlsm "
        "workbook or a .csv file"
    )


def read_cells(
    path: str | os.PathLike[str],
    *,
    sheet: str | None = None,
    cell_range: str | None = None,
    decimal_comma: bool = False,
    delimiter: str | None = None,
    size_limit: int = DEFAULT_SIZE_LIMIT,
    progress: Progress | None = None,
) -> CellBlock:
    """Read a block of saved cell values from a workbook or a CSV file.

    ``sheet`` names the worksheet (default: the first worksheet; CSV files have none);
    ``cell_range`` is an A1 reference (``A1:F40``, ``B:E``, ``'Sheet 2'!B2:E30``) or, in a
    workbook, a defined name; without it the block is the sheet's used range (from its first
    to its last non-blank row and column). ``decimal_comma`` and ``delimiter`` apply to CSV
    files. ``size_limit`` is in bytes. ``progress(stage, done, total)`` is called while cells
    are read (``done`` and ``total`` count cells; ``total`` is 0 when unknown).
    """
    p = Path(path)
    if p.is_dir():
        raise InputError(f"{p} is a folder, not a file; give the file to read")
    kind = input_kind(p)
    if not p.exists():
        raise InputError(f"{p} does not exist; check the file name and folder")
    if size_limit is None or size_limit <= 0:
        raise InputError("the size limit must be a positive number of bytes")
    ref = parse_range(cell_range) if cell_range is not None and cell_range.strip() else None
    shown = cell_range.strip() if cell_range is not None and cell_range.strip() else None
    name = None
    if cell_range is not None and cell_range.strip() and ref is None:
        name = cell_range.strip()
    if ref is not None and ref.sheet is not None:
        if sheet is not None and sheet.strip().casefold() != ref.sheet.casefold():
            raise InputError(
                f'the range names sheet "{ref.sheet}" but the sheet option says '
                f'"{sheet}"; give the sheet once'
            )
        sheet = ref.sheet
    try:
        if kind == "workbook":
            return _read_workbook(p, sheet, ref, name, size_limit, progress, shown)
        if sheet is not None:
            raise InputError(
                f"{p.name} is a CSV file, which has no sheets; leave out the sheet"
            )
        if name is not None:
            raise InputError(
                f'"{name}" is not a range like A1:F40, and a CSV file has no '
                "defined names"
            )
        return _read_csv(p, ref, decimal_comma, delimiter, size_limit, progress, shown)
    except PermissionError:
        raise InputError(
            f"no permission to read {p}; check the file's access rights"
        ) from None
    except IsADirectoryError:
        raise InputError(f"{p} is a folder, not a file") from None


def read_groups(
    path: str | os.PathLike[str],
    *,
    layout: str = "wide",
    labels: Any = "auto",
    sheet: str | None = None,
    cell_range: str | None = None,
    decimal_comma: bool = False,
    delimiter: str | None = None,
    size_limit: int = DEFAULT_SIZE_LIMIT,
    progress: Progress | None = None,
) -> LoadedGroups:
    """Read a block (see :func:`read_cells`) and clean it with ``groups_from_range``.

    A cleaning error that points at cells gets the first cell's sheet address and the file
    name added, e.g. ``... (cell 'Lot data'!C7 of lots.xlsx)``.
    """
    block = read_cells(
        path, sheet=sheet, cell_range=cell_range, decimal_comma=decimal_comma,
        delimiter=delimiter, size_limit=size_limit, progress=progress,
    )
    if layout in ("wide", "long") and block.n_rows == 1 and all(
        isinstance(v, str) and v not in ERROR_TEXTS for v in block.rows[0] if not _blank(v)
    ):
        raise InputError(
            f"{_where(block)} holds only a row of labels and no values; check that "
            "it is the right file (or range) and that the data were saved"
        )
    try:
        groups = groups_from_range(block.rows, layout=layout, labels=labels)
    except InputError as e:
        if e.cells:
            r, c = e.cells[0]
            where = block.source.full_address(r, c)
            raise InputError(
                f"{e.reason} (cell {where} of {Path(path).name})", cells=e.cells
            ) from None
        msg = e.reason
        if Path(path).name not in msg:
            msg = f"{msg} (in {_where(block)})"
        raise InputError(msg, cells=e.cells) from None
    return LoadedGroups(groups=groups, block=block)


def _where(block: CellBlock) -> str:
    name = Path(block.source.path or "").name
    if block.source.sheet:
        return f"{block.ref} of sheet \"{block.source.sheet}\" in {name}"
    return f"{block.ref} of {name}" if block.ref else name


# --------------------------------------------------------------------------------------------
# workbook safety checks


def openpyxl_uses_defusedxml() -> bool:
    """True when openpyxl parses workbook XML through defusedxml (it does when installed)."""
    try:
        import openpyxl.xml as ox
        import openpyxl.xml.functions as oxf
    except Exception:  # pragma: no cover - openpyxl is a dependency
        return False
    return bool(getattr(ox, "DEFUSEDXML", False)) and "defusedxml" in getattr(
        oxf.iterparse, "__module__", ""
    )


def _mb(n: int) -> str:
    if n >= 1024**3:
        return f"{n / 1024**3:.1f} GB"
    if n >= 1024**2:
        return f"{n / 1024**2:.0f} MB"
    return f"{n / 1024:.0f} kB" if n >= 1024 else f"{n} bytes"


def _limit_hint(size_limit: int, needed: int) -> str:
    mb = max(int(math.ceil(needed / 1024**2)), 1)
    return f"if you trust the file, raise the limit (command line: --size-limit {mb})"


def _bomb_message(name: str, part: str) -> str:
    return (
        f"{name} contains an XML document type declaration (in {part}), which "
        "workbooks never need and XML entity bombs use; refusing to read it: re-save the "
        "workbook from a spreadsheet program you trust"
    )


def check_archive(path: str | os.PathLike[str], size_limit: int = DEFAULT_SIZE_LIMIT) -> None:
    """Check a workbook's zip container before anything in it is parsed.

    Raises :class:`InputError` when the file is encrypted, an old binary workbook, not a zip
    archive, a damaged one, when the zip directory says the parts would unpack to more than
    ``size_limit`` bytes, or when any XML part starts with a document type declaration.
    """
    p = Path(path)
    with open(p, "rb") as fh:
        head = fh.read(8)
    if head[:8] == _CFB_MAGIC:
        if _cfb_is_encrypted(p):
            raise InputError(
                f"{p.name} is encrypted (password-protected); remove the password "
                "in a spreadsheet program (save a copy without one) and read that copy"
            )
        raise InputError(
            f"{p.name} is in the old binary .xls format, not .xlsx; save it as "
            ".xlsx (Excel Workbook) and try again"
        )
    if head[:4] not in (_ZIP_MAGIC, _ZIP_EMPTY):
        what = "is empty" if not head else "is not an .xlsx workbook (not a zip archive)"
        if head and _looks_like_text(p):
            what += "; it looks like text: if it is CSV data, give it a .csv name"
        raise InputError(f"{p.name} {what}; check that it is the right file")
    try:
        with zipfile.ZipFile(p) as zf:
            infos = zf.infolist()
            total = sum(i.file_size for i in infos)
            if total > size_limit:
                raise InputError(
                    f"{p.name} would unpack to {_mb(total)}, more than the "
                    f"{_mb(size_limit)} limit for workbooks; {_limit_hint(size_limit, total)}"
                )
            if any(i.flag_bits & 0x1 for i in infos):
                raise InputError(
                    f"{p.name} is an encrypted zip archive; remove the password "
                    "and read the copy"
                )
            odd = [i for i in infos if i.compress_type not in _ZIP_METHODS]
            if odd:
                raise InputError(
                    f"{p.name} uses a zip compression method that cannot be read "
                    f"(part {odd[0].filename}); re-save it from a spreadsheet program as .xlsx"
                )
            names = {i.filename for i in infos}
            if "[Content_Types].xml" not in names:
                raise InputError(
                    f"{p.name} is a zip archive but not a workbook (no "
                    "[Content_Types].xml); check that it is the right file"
                )
            for info in infos:  # every part: a relationship may point at any name
                if not info.is_dir() and _has_doctype(zf, info):
                    raise InputError(_bomb_message(p.name, info.filename))
    except zipfile.BadZipFile as e:
        raise InputError(
            f"{p.name} is damaged and cannot be read as a workbook ({e}); "
            "re-save or re-export it"
        ) from None
    except (zipfile.LargeZipFile, EOFError, OSError, zlib.error) as e:
        if isinstance(e, (PermissionError, IsADirectoryError)):
            raise
        raise InputError(
            f"{p.name} cannot be read as a workbook ({e}); re-save or re-export it"
        ) from None


def _looks_like_text(p: Path) -> bool:
    with open(p, "rb") as fh:
        chunk = fh.read(4096)
    if b"\x00" in chunk:
        return False
    try:
        chunk.decode("utf-8")
    except UnicodeDecodeError as e:
        return e.start > len(chunk) - 4  # cut inside a character at the end
    return True


_PROLOG_CHUNK = 16 * 1024
_PROLOG_MAX = 1024 * 1024


def _has_doctype(zf: zipfile.ZipFile, info: zipfile.ZipInfo) -> bool:
    """Whether the XML part's prolog (before the root element) holds ``<!DOCTYPE``."""
    with zf.open(info) as fh:
        raw = fh.read(_PROLOG_CHUNK)
        if raw[:2] in (b"\xff\xfe", b"\xfe\xff"):
            dec = codecs.getincrementaldecoder("utf-16")(errors="replace")
        else:
            dec = codecs.getincrementaldecoder("utf-8")(errors="replace")
        buf = dec.decode(raw)
        pos = 0
        while True:
            state, pos = _scan_prolog(buf, pos)
            if state == "doctype":
                return True
            if state == "root":
                return False
            more = fh.read(_PROLOG_CHUNK)
            if not more or len(buf) - pos > _PROLOG_MAX:
                return False  # beyond any real prolog: defusedxml still guards the parse
            buf = buf[pos:] + dec.decode(more)
            pos = 0


def _scan_prolog(buf: str, pos: int) -> tuple[str, int]:
    """Walk the prolog: ``("doctype"|"root"|"more", position)``."""
    n = len(buf)
    while True:
        while pos < n and buf[pos] in " \t\r\n\ufeff":
            pos += 1
        if pos >= n:
            return "more", pos
        if buf[pos] != "<":
            return "root", pos  # not XML markup: let the parser report it
        if buf.startswith("<?", pos):
            end = buf.find("?>", pos + 2)
            if end < 0:
                return "more", pos
            pos = end + 2
        elif buf.startswith("<!--", pos):
            end = buf.find("-->", pos + 4)
            if end < 0:
                return "more", pos
            pos = end + 3
        elif buf.startswith("<!", pos):
            if n - pos < 9:
                return "more", pos
            if buf[pos + 2:pos + 9].upper() == "DOCTYPE" or "ENTITY" in buf[pos:pos + 9].upper():
                return "doctype", pos
            return "root", pos
        else:
            return "root", pos


def _cfb_is_encrypted(p: Path) -> bool:
    """Whether a compound (OLE) file holds an encrypted OOXML package.

    An encrypted ``.xlsx`` is a compound file with the streams ``EncryptionInfo`` and
    ``EncryptedPackage`` ([MS-OFFCRYPTO] 2.3.4.1; container format [MS-CFB]). The directory is
    walked through the FAT; if the file is too damaged for that, its bytes are searched for the
    UTF-16 stream name.
    """
    try:
        names = _cfb_names(p)
        return "EncryptedPackage" in names or "EncryptionInfo" in names
    except (ValueError, struct.error, IndexError, OSError):
        with open(p, "rb") as fh:
            data = fh.read(64 * 1024 * 1024)
        return "EncryptedPackage".encode("utf-16-le") in data


def _cfb_names(p: Path) -> set[str]:
    """Names of the directory entries of a compound file ([MS-CFB] 2.2, 2.6)."""
    with open(p, "rb") as fh:
        data = fh.read()
    if len(data) < 512:
        raise ValueError("short header")
    shift = struct.unpack_from("<H", data, 0x1E)[0]
    if shift not in (9, 12):
        raise ValueError("sector size")
    size = 1 << shift
    n_fat = struct.unpack_from("<I", data, 0x2C)[0]
    first_dir = struct.unpack_from("<I", data, 0x30)[0]
    first_difat, n_difat = struct.unpack_from("<II", data, 0x44)
    difat = list(struct.unpack_from("<109I", data, 0x4C))

    def sector(i: int) -> bytes:
        off = (i + 1) * size
        if off + size > len(data):
            raise ValueError("sector outside file")
        return data[off:off + size]

    nxt, seen = first_difat, 0
    while nxt < 0xFFFFFFFA and seen < n_difat:
        block = sector(nxt)
        vals = struct.unpack(f"<{size // 4}I", block)
        difat.extend(vals[:-1])
        nxt, seen = vals[-1], seen + 1
    fat: list[int] = []
    for s in difat[:n_fat]:
        if s >= 0xFFFFFFFA:
            break
        fat.extend(struct.unpack(f"<{size // 4}I", sector(s)))
    names: set[str] = set()
    cur, guard = first_dir, 0
    while cur < 0xFFFFFFFA:
        block = sector(cur)
        for off in range(0, size, 128):
            nlen = struct.unpack_from("<H", block, off + 64)[0]
            if 2 <= nlen <= 64:
                names.add(block[off:off + nlen - 2].decode("utf-16-le", "replace"))
        cur = fat[cur]
        guard += 1
        if guard > len(fat) + 1:
            raise ValueError("directory chain loops")
    return names


# --------------------------------------------------------------------------------------------
# document properties

_CORE_REL = "http://schemas.openxmlformats.org/package/2006/relationships/metadata/core-properties"
_CORE_FIELDS = {
    "{http://purl.org/dc/elements/1.1/}creator": "creator",
    "{http://purl.org/dc/elements/1.1/}title": "title",
    "{http://purl.org/dc/elements/1.1/}subject": "subject",
    "{http://purl.org/dc/elements/1.1/}description": "description",
    "{http://schemas.openxmlformats.org/package/2006/metadata/core-properties}keywords": "keywords",
    "{http://schemas.openxmlformats.org/package/2006/metadata/core-properties}category": "category",
}
_CORE_MAX = 1024 * 1024  # a core-properties part is a few hundred bytes


def workbook_properties(
    path: str | os.PathLike[str], size_limit: int = DEFAULT_SIZE_LIMIT
) -> dict[str, str]:
    """The core document properties of a workbook (``creator``, ``title``, ``subject``,
    ``description``, ``keywords``, ``category``; only those present).

    The file passes :func:`check_archive` first (size limit, no document type declaration), and
    the properties part (found through the package relationships, ECMA-376 Part 2, with
    ``docProps/core.xml`` as the usual name) is parsed with defusedxml. Raises
    :class:`InputError` when the file is not a readable workbook; a workbook without a
    properties part gives an empty dict.
    """
    from defusedxml import ElementTree as SafeET
    from defusedxml import DefusedXmlException

    p = Path(path)
    if p.is_dir():
        raise InputError(f"{p} is a folder, not a workbook")
    check_archive(p, size_limit)
    try:
        with zipfile.ZipFile(p) as zf:
            names = set(zf.namelist())
            part = "docProps/core.xml"
            if "_rels/.rels" in names and zf.getinfo("_rels/.rels").file_size <= _CORE_MAX:
                rels = SafeET.fromstring(zf.read("_rels/.rels"))
                for rel in rels:
                    if rel.get("Type") == _CORE_REL and rel.get("Target"):
                        part = rel.get("Target", "").lstrip("/")
                        break
            if part not in names or zf.getinfo(part).file_size > _CORE_MAX:
                return {}
            root = SafeET.fromstring(zf.read(part))
    except (DefusedXmlException, SafeET.ParseError, zipfile.BadZipFile, KeyError, OSError,
            zlib.error, EOFError) as e:
        if isinstance(e, PermissionError):
            raise InputError(
                f"no permission to read {p}; check the file's access rights"
            ) from None
        raise _damaged(p.name, e) from None
    out: dict[str, str] = {}
    for child in root:
        key = _CORE_FIELDS.get(child.tag)
        if key is not None:
            out[key] = (child.text or "").strip()
    return out


# --------------------------------------------------------------------------------------------
# workbooks


def _defused_error(e: BaseException) -> bool:
    try:
        from defusedxml import DefusedXmlException
    except Exception:  # pragma: no cover
        return False
    seen = 0
    cur: BaseException | None = e
    while cur is not None and seen < 20:  # openpyxl may wrap it in a ValueError
        if isinstance(cur, DefusedXmlException):
            return True
        cur = cur.__cause__ or cur.__context__
        seen += 1
    return False


def _damaged(name: str, e: BaseException) -> InputError:
    reason = str(e).strip().splitlines()[0] if str(e).strip() else type(e).__name__
    if len(reason) > 120:
        reason = reason[:117] + "..."
    return InputError(
        f"{name} is damaged or not a workbook sheetfuncs can read ({reason}); "
        "re-save it from a spreadsheet program as .xlsx"
    )


def _open_workbook(p: Path, data_only: bool):
    import openpyxl

    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        try:
            return openpyxl.load_workbook(
                p, read_only=True, data_only=data_only, keep_vba=False, keep_links=False
            )
        except InputError:
            raise
        except Exception as e:
            if _defused_error(e):
                raise InputError(_bomb_message(p.name, "a workbook part")) from None
            raise _damaged(p.name, e) from None


def _sheet_list(names: Sequence[str]) -> str:
    shown = ", ".join(f'"{n}"' for n in names[:12])
    return shown + (f" and {len(names) - 12} more" if len(names) > 12 else "")


def _pick_sheet(wb, p: Path, sheet: str | None):
    worksheets = list(wb.worksheets)
    if sheet is None:
        if not worksheets:
            raise InputError(f"{p.name} has no worksheets (only chart sheets)")
        return worksheets[0]
    want = sheet.strip()
    if len(want) >= 2 and want[0] == want[-1] == "'":
        want = want[1:-1].replace("''", "'")
    by_name = {ws.title: ws for ws in worksheets}
    if want in by_name:
        return by_name[want]
    folded = [ws for ws in worksheets if ws.title.casefold() == want.casefold()]
    if len(folded) == 1:
        return folded[0]
    if want in wb.sheetnames:
        raise InputError(
            f'"{want}" in {p.name} is a chart sheet, not a worksheet; choose a '
            f"sheet with data: {_sheet_list([ws.title for ws in worksheets])}"
        )
    raise InputError(
        f'{p.name} has no sheet named "{want}"; its sheets are '
        f"{_sheet_list([ws.title for ws in worksheets])}"
    )


def _defined_range(wb, p: Path, name: str) -> RangeRef:
    dn = None
    try:
        dn = wb.defined_names.get(name)
        if dn is None:
            for key, val in wb.defined_names.items():
                if key.casefold() == name.casefold():
                    dn = val
                    break
    except Exception:  # unusual defined-name tables: treat as absent
        dn = None
    if dn is None:
        raise InputError(
            f'"{name}" is neither a range like A1:F40 nor a name defined in '
            f"{p.name}; check the range"
        )
    try:
        dests = list(dn.destinations)
    except Exception:
        dests = []
    if len(dests) != 1:
        raise InputError(
            f'the name "{name}" in {p.name} does not refer to one block of cells; '
            "give the range as A1:F40"
        )
    sheet_name, cells = dests[0]
    ref = parse_range(cells)
    if ref is None:
        raise InputError(f'cannot read the cells "{cells}" that "{name}" refers to')
    return RangeRef(ref.min_row, ref.min_col, ref.max_row, ref.max_col,
                    sheet_name.replace("''", "'"))


def _read_workbook(
    p: Path,
    sheet: str | None,
    ref: RangeRef | None,
    name: str | None,
    size_limit: int,
    progress: Progress | None,
    shown: str | None = None,
) -> CellBlock:
    if not openpyxl_uses_defusedxml():
        raise InputError(
            "openpyxl is not parsing through defusedxml (is the environment "
            "variable OPENPYXL_DEFUSEDXML set to False?); unset it so that workbooks are read "
            "safely"
        )
    check_archive(p, size_limit)
    wb = _open_workbook(p, data_only=True)
    try:
        if name is not None:
            ref = _defined_range(wb, p, name)
            if sheet is not None and sheet.strip().casefold() != (ref.sheet or "").casefold():
                raise InputError(
                    f'the name "{name}" refers to sheet "{ref.sheet}", not '
                    f'"{sheet}"; leave out the sheet or give an A1 range'
                )
            sheet = ref.sheet
        ws = _pick_sheet(wb, p, sheet)
        known = ws.max_row, ws.max_column
        try:
            rows, suspects, first_row, first_col = _sheet_rows(ws, ref, known, progress, p.name)
        except InputError:
            raise
        except Exception as e:
            if _defused_error(e):
                raise InputError(_bomb_message(p.name, f'sheet "{ws.title}"')) from None
            raise _damaged(p.name, e) from None
        title = ws.title
    finally:
        wb.close()
    source = InputSource(path=str(p), sheet=title, first_row=first_row, first_col=first_col)
    if not rows:
        if ref is None:
            raise InputError(
                f'sheet "{title}" of {p.name} is empty; choose the sheet that holds '
                "the data"
                + (" (--sheet)" if len(wb.sheetnames) > 1 else "")
            )
        if name is not None:
            what = f'the name "{name}" ({_sheet_prefix(title)}{ref.a1()})'
        elif shown is not None and ref.sheet is not None:
            what = f"the range {shown}"
        else:
            what = f'the range {shown or ref.a1()} of sheet "{title}"'
        raise InputError(f"{what} in {p.name} is empty; check the range")
    if suspects:
        _check_formulas(p, title, suspects, source)
    width = max(len(r) for r in rows)
    block_ref = a1_range(first_row, first_col, first_row + len(rows) - 1, first_col + width - 1)
    return CellBlock(rows=tuple(rows), source=source, kind="workbook", ref=block_ref)


def _sheet_rows(ws, ref: RangeRef | None, known, progress: Progress | None, file_name: str):
    """Rows of saved values, trimmed; cells that exist but hold nothing (possible formulas)."""
    from openpyxl.cell.read_only import EmptyCell

    ws.reset_dimensions()  # dimension records are often wrong: read what is there
    r1 = ref.min_row if ref else 1
    c1 = ref.min_col if ref else 1
    r2 = ref.max_row if ref else None
    c2 = ref.max_col if ref else None
    known_rows, known_cols = known
    total = 0
    if known_rows and known_cols:
        total = (min(known_rows, r2 or known_rows) - r1 + 1) * (
            min(known_cols, c2 or known_cols) - c1 + 1
        )
        total = max(total, 0)
    rows: list[tuple[Any, ...]] = []
    suspects: list[tuple[int, int]] = []  # 1-based sheet (row, col)
    done = next_report = 0
    if progress is not None:
        progress("reading", 0, total)
    r = r1 - 1
    for cells in ws.iter_rows(min_row=r1, max_row=None, min_col=c1, max_col=c2):
        r += 1
        if r2 is not None and r > r2:
            break
        vals = [cell.value for cell in cells]
        types = set(map(type, vals))
        if _NONE in types:  # cells that exist but hold nothing may be unsaved formulas
            for j, v in enumerate(vals):
                if v is None:
                    cell = cells[j]
                    if not isinstance(cell, EmptyCell) and cell.data_type not in _TEXT_TYPES:
                        suspects.append((r, c1 + j))
        if _dt.timedelta in types:
            j = next(j for j, v in enumerate(vals) if isinstance(v, _dt.timedelta))
            raise InputError(
                f"a duration (time) value at {_addr(ws.title, r, c1 + j)} of "
                f"{file_name}; durations are not read as measurements: convert them to "
                "numbers (e.g. minutes) in the sheet"
            )
        if int in types:  # whole numbers saved without a decimal point: the same doubles
            vals = [float(v) if type(v) is int and abs(v) <= _EXACT_INT else v for v in vals]
        rows.append(tuple(vals))
        done += len(vals)
        if progress is not None and done >= next_report:
            progress("reading", done, total)
            next_report = done + _PROGRESS_STEP
    if progress is not None:
        progress("reading", done, max(total, done))
    return _trim(rows, r1, c1, ref, suspects)


_NONE = type(None)
_TEXT_TYPES = ("s", "str", "inlineStr")
_EXACT_INT = 2**53


def _sheet_prefix(title: str) -> str:
    """``'Lot data'!``: a sheet name as it precedes a reference (quoted, as in addresses)."""
    return "'" + title.replace("'", "''") + "'!"


def _addr(sheet: str | None, row: int, col: int) -> str:
    return InputSource(sheet=sheet).full_address(row - 1, col - 1)


def _blank(v: Any) -> bool:
    return v is None or (isinstance(v, str) and v == "")


def _row_span(row: tuple[Any, ...]) -> tuple[int, int] | None:
    """First and last non-blank positions of a row, ``None`` when it is all blank."""
    n = len(row)
    if n == 0:
        return None
    if not _blank(row[0]) and not _blank(row[-1]):
        return 0, n - 1
    first = next((j for j, v in enumerate(row) if not _blank(v)), None)
    if first is None:
        return None
    last = next(j for j in range(n - 1, -1, -1) if not _blank(row[j]))
    return first, last


def _trim(rows: list[tuple[Any, ...]], r1: int, c1: int, ref: RangeRef | None, suspects):
    """Drop blank margins (all four sides for the used range; trailing only for a range).

    Returns ``(rows, suspects inside, first row, first column)`` (sheet numbers, 1-based).
    """
    width = max((len(r) for r in rows), default=0)
    if ref is not None and ref.max_col is not None:
        width = max(width, ref.max_col - ref.min_col + 1)
    spans = {i: sp for i, row in enumerate(rows) if (sp := _row_span(row)) is not None}
    for r, c in suspects:
        i, j = r - r1, c - c1
        lo, hi = spans.get(i, (j, j))
        spans[i] = (min(lo, j), max(hi, j))
    if not spans:
        return [], [], r1, c1
    if ref is None:
        top, bottom = min(spans), max(spans)
        left = min(sp[0] for sp in spans.values())
        right = max(sp[1] for sp in spans.values())
    else:
        top, left = 0, 0
        bottom = max(spans)
        right = width - 1 if ref.max_col is not None else max(sp[1] for sp in spans.values())
    out = []
    full = right - left + 1
    for row in rows[top:bottom + 1]:
        if left or len(row) != full:
            row = row[left:right + 1]
            if len(row) < full:
                row = row + (None,) * (full - len(row))
        out.append(row)
    inside = [
        (r, c) for r, c in suspects
        if r1 + top <= r <= r1 + bottom and c1 + left <= c <= c1 + right
    ]
    return out, inside, r1 + top, c1 + left


def _check_formulas(p: Path, title: str, suspects: list[tuple[int, int]], source: InputSource):
    """Cells that exist but have no saved value: are they formulas? Then stop with an error."""
    from openpyxl.worksheet.formula import ArrayFormula, DataTableFormula

    want = set(suspects)
    lo = min(r for r, _ in suspects)
    hi = max(r for r, _ in suspects)
    c_lo = min(c for _, c in suspects)
    c_hi = max(c for _, c in suspects)
    wb = _open_workbook(p, data_only=False)
    found: list[tuple[int, int]] = []
    try:
        ws = wb[title]
        ws.reset_dimensions()
        r = lo - 1
        for cells in ws.iter_rows(min_row=lo, max_row=None, min_col=c_lo, max_col=c_hi):
            r += 1
            if r > hi:
                break
            for j, cell in enumerate(cells):
                if (r, c_lo + j) not in want:
                    continue
                v = getattr(cell, "value", None)
                if isinstance(v, (ArrayFormula, DataTableFormula)) or (
                    isinstance(v, str) and v.startswith("=")
                ):
                    found.append((r, c_lo + j))
    except InputError:
        raise
    except Exception as e:
        raise _damaged(p.name, e) from None
    finally:
        wb.close()
    if found:
        first = found[0]
        more = f" (and {len(found) - 1} more)" if len(found) > 1 else ""
        where = _addr(title, *first)
        raise InputError(
            f"the formula in {where} of {p.name} has no saved value{more}; the file "
            "was saved by a program that does not calculate: open it in a spreadsheet program "
            "and save it, or paste the values, then try again",
            cells=tuple((r - source.first_row, c - source.first_col) for r, c in found),
        )


# --------------------------------------------------------------------------------------------
# CSV


def _decode(p: Path, data: bytes) -> str:
    if data.startswith(codecs.BOM_UTF8):
        enc, body = "utf-8", data[3:]
    elif data.startswith((codecs.BOM_UTF16_LE, codecs.BOM_UTF16_BE)):
        enc, body = "utf-16", data
    else:
        enc, body = "utf-8", data
    if enc == "utf-8" and body[:4] in (_ZIP_MAGIC, _ZIP_EMPTY):
        raise InputError(
            f"{p.name} is a zip archive (perhaps a workbook), not CSV text; give "
            "it an .xlsx name"
        )
    if enc == "utf-8" and body[:8] == _CFB_MAGIC:
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
    if s in ERROR_TEXTS:
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
            "add --decimal-comma (decimal_comma=True) to read such numbers"
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


def _read_csv(
    p: Path,
    ref: RangeRef | None,
    decimal_comma: bool,
    delimiter: str | None,
    size_limit: int,
    progress: Progress | None,
    shown: str | None = None,
) -> CellBlock:
    size = p.stat().st_size
    if size > size_limit:
        raise InputError(
            f"{p.name} is {_mb(size)}, more than the {_mb(size_limit)} limit for "
            f"inputs; {_limit_hint(size_limit, size)}"
        )
    data = p.read_bytes()
    text = _decode(p, data)
    del data
    if text.strip() == "":
        raise InputError(f"{p.name} is empty; check that it is the right file")
    if delimiter is None:
        delimiter = detect_delimiter(text)
    elif delimiter not in _DELIMITERS:
        names = {"tab": "\t", "semicolon": ";", "comma": ","}
        if delimiter.lower() in names:
            delimiter = names[delimiter.lower()]
        else:
            raise InputError(
                f"the CSV field separator must be comma, semicolon or tab, not "
                f"{delimiter!r}"
            )
    if decimal_comma and delimiter == ",":
        pass  # numbers must then be quoted; the field rules below still apply
    r1 = ref.min_row if ref else 1
    c1 = ref.min_col if ref else 1
    r2 = ref.max_row if ref else None
    c2 = ref.max_col if ref else None
    lines = text.count("\n") + 1
    rows: list[tuple[Any, ...]] = []
    step = max(_PROGRESS_STEP // 4, 1)
    reader = csv.reader(io.StringIO(text, newline=""), delimiter=delimiter)
    r = 0
    width = 0  # fields per record, from the first one read: progress counts cells
    try:
        for rec in reader:
            r += 1
            if r < r1:
                continue
            if r2 is not None and r > r2:
                break
            fields = rec[c1 - 1:c2] if c2 is not None else rec[c1 - 1:]
            if not width and progress is not None:
                width = max(len(fields), 1)
                progress("reading", 0, lines * width)
            vals = []
            for j, field in enumerate(fields):
                try:
                    vals.append(csv_value(field, decimal_comma))
                except _Ambiguous as e:
                    where = f"{column_letters(c1 + j)}{r}"
                    raise InputError(_ambiguity_message(p, where, field.strip(), e.why)) from None
            rows.append(tuple(vals))
            if progress is not None and r % step == 0:
                progress("reading", min(reader.line_num, lines) * width, lines * width)
    except csv.Error as e:
        raise InputError(
            f"{p.name} is not well-formed CSV near line {reader.line_num} ({e}); "
            "check its quotes"
        ) from None
    if progress is not None:
        progress("reading", lines * max(width, 1), lines * max(width, 1))
    suspects: list[tuple[int, int]] = []
    if ref is None:
        trimmed, _, fr, fc = _trim(rows, r1, c1, None, suspects)
    else:
        trimmed, _, fr, fc = _trim(rows, r1, c1, ref, suspects)
    if not trimmed:
        what = f"the range {shown or ref.a1()} of {p.name}" if ref else p.name
        raise InputError(f"{what} holds no values; check the file and the range")
    source = InputSource(path=str(p), sheet=None, first_row=fr, first_col=fc)
    width = max(len(x) for x in trimmed)
    block_ref = a1_range(fr, fc, fr + len(trimmed) - 1, fc + width - 1)
    return CellBlock(rows=tuple(trimmed), source=source, kind="csv", ref=block_ref,
                     delimiter=delimiter)
