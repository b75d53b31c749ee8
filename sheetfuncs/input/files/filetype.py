"""What kind of file an input is: judged by its first bytes, not by its name.

A zip archive with a workbook's parts is read as a workbook whatever its name (a workbook
renamed ``.xls`` gets a note); a compound (OLE) file goes to the workbook checks, which tell an
old binary ``.xls`` from an encrypted ``.xlsx`` ([MS-CFB], [MS-OFFCRYPTO]); an OpenDocument
spreadsheet (a zip whose ``mimetype`` member names ``application/vnd.oasis.opendocument``) and a
binary ``.xlsb`` workbook (``xl/workbook.bin``) are refused with what to do; a text file named
like a workbook is refused with its own message. A file that does not exist is judged by its
name, so that the messages about it stay the ones a name deserves.
"""

from __future__ import annotations

import zipfile
from pathlib import Path

from ...errors import InputError
from .safety import CFB_MAGIC, ZIP_EMPTY, ZIP_MAGIC, looks_like_text

__all__ = ["WORKBOOK_SUFFIXES", "CSV_SUFFIXES", "file_type", "kind_by_name"]

WORKBOOK_SUFFIXES = (".xlsx", ".xlsm", ".xltx", ".xltm")
CSV_SUFFIXES = (".csv", ".tsv", ".txt")
_OTHER_SUFFIXES = (".ods", ".numbers", ".xlsb")
_HEAD = 4096
_MIMETYPE_MAX = 256


def kind_by_name(p: Path) -> str:
    """``"workbook"`` or ``"csv"`` from the file name; an InputError for anything else."""
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
    if suffix in _OTHER_SUFFIXES:
        raise InputError(
            f"{p.name} is a {suffix} file, which sheetfuncs does not read; save it "
            "as .xlsx or .csv and try again"
        )
    raise InputError(
        f"cannot tell what kind of file {p.name} is; give an .xlsx or .xlsm "
        "workbook or a .csv file"
    )


def file_type(p: Path) -> tuple[str, tuple[str, ...]]:
    """``(kind, notes)``: ``"workbook"`` or ``"csv"`` from the file's first bytes (from its
    name when it cannot be opened), and a note when the name says otherwise."""
    try:
        with open(p, "rb") as fh:
            head = fh.read(_HEAD)
    except OSError:  # missing, a folder, no permission: the caller says which
        return kind_by_name(p), ()
    if not head:
        raise InputError(f"{p.name} is empty (0 bytes); check that it is the right file")
    if head[:4] in (ZIP_MAGIC, ZIP_EMPTY):
        return _zip_kind(p)
    if head[:8] == CFB_MAGIC:
        return "workbook", ()  # the workbook checks tell old binary from encrypted
    suffix = p.suffix.lower()
    if suffix in CSV_SUFFIXES or not _is_text(head):
        return kind_by_name(p), ()
    if suffix in WORKBOOK_SUFFIXES or suffix in (".xls", *_OTHER_SUFFIXES):
        if head.lstrip(b"\xef\xbb\xbf \t\r\n")[:1] == b"<":
            raise InputError(
                f"{p.name} is a web page or XML file, not a workbook; open it in a "
                "spreadsheet program and save it as .xlsx"
            )
        raise InputError(
            f"{p.name} is a text (CSV) file, not a workbook; rename it to .csv"
        )
    return kind_by_name(p), ()


def _zip_kind(p: Path) -> tuple[str, tuple[str, ...]]:
    """A zip archive: a workbook (with a note when its name says otherwise), or a refusal."""
    suffix = p.suffix.lower()
    try:
        with zipfile.ZipFile(p) as zf:
            names = set(zf.namelist())
            mimetype = b""
            if "mimetype" in names and zf.getinfo("mimetype").file_size <= _MIMETYPE_MAX:
                mimetype = zf.read("mimetype")
    except (zipfile.BadZipFile, OSError, EOFError, ValueError, NotImplementedError):
        return "workbook", ()  # the workbook checks say what is wrong with the archive
    if mimetype.startswith(b"application/vnd.oasis.opendocument"):
        raise InputError(
            f"{p.name} is an OpenDocument spreadsheet (.ods), which sheetfuncs does not "
            "read; save it as .xlsx (or .csv) and try again"
        )
    if "xl/workbook.bin" in names:
        raise InputError(
            f"{p.name} is a binary .xlsb workbook, which sheetfuncs does not read; save "
            "it as .xlsx and try again"
        )
    if "[Content_Types].xml" not in names and suffix in _OTHER_SUFFIXES:
        return kind_by_name(p), ()
    if suffix in WORKBOOK_SUFFIXES:
        return "workbook", ()
    named = f"named {suffix}" if suffix else "with no suffix in its name"
    return "workbook", (f"{p.name} is an .xlsx workbook {named}; read as .xlsx",)


def _is_text(head: bytes) -> bool:
    """Whether the first bytes look like text: UTF-8 (or UTF-16 with a byte-order mark)."""
    return head.startswith((b"\xff\xfe", b"\xfe\xff")) or looks_like_text(head)
