"""Checks that run before anything in an input file is parsed, and the messages they give.

* Size: a workbook's zip directory says how large its parts would unpack; a CSV file's size is
  its own. Either is checked against a limit (:data:`DEFAULT_SIZE_LIMIT`, 512 MB).
* XML: the prolog of every part of a workbook is scanned for a document type declaration
  (``<!DOCTYPE``, ``<!ENTITY``): a workbook never needs one, and it is how XML entity bombs are
  built. openpyxl itself parses through defusedxml when that package is installed;
  :func:`openpyxl_uses_defusedxml` checks that it does.
* Containers: an encrypted ``.xlsx`` and an old binary ``.xls`` are both compound files
  ([MS-CFB]); the encrypted one holds the streams ``EncryptionInfo`` and ``EncryptedPackage``
  ([MS-OFFCRYPTO] 2.3.4.1). Zip archives that are encrypted, use an unknown compression method,
  are damaged or are not workbooks each get one line that says so.
"""

from __future__ import annotations

import codecs
import math
import os
import struct
import zipfile
import zlib
from pathlib import Path

from ...errors import InputError

__all__ = [
    "DEFAULT_SIZE_LIMIT", "CFB_MAGIC", "ZIP_MAGIC", "ZIP_EMPTY",
    "check_archive", "check_file_size", "openpyxl_uses_defusedxml", "defusedxml_refused",
    "size_text", "limit_hint", "bomb_message", "damaged_error", "looks_like_text",
    "member_header",
]

#: Default limit on the total uncompressed size of a workbook (and on the size of a CSV file).
DEFAULT_SIZE_LIMIT = 512 * 1024 * 1024

#: The first bytes of a compound (OLE) file: an old binary workbook or an encrypted one.
CFB_MAGIC = b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1"
#: The first bytes of a zip archive, and of an empty one.
ZIP_MAGIC = b"PK\x03\x04"
ZIP_EMPTY = b"PK\x05\x06"
_ZIP_METHODS = (zipfile.ZIP_STORED, zipfile.ZIP_DEFLATED, zipfile.ZIP_BZIP2, zipfile.ZIP_LZMA)


# --------------------------------------------------------------------------------------------
# messages


def size_text(n: int) -> str:
    """A size in bytes as a person reads it: ``600 MB``, ``1.5 GB``, ``12 kB``, ``10 bytes``."""
    if n >= 1024**3:
        return f"{n / 1024**3:.1f} GB"
    if n >= 1024**2:
        return f"{n / 1024**2:.0f} MB"
    return f"{n / 1024:.0f} kB" if n >= 1024 else f"{n} bytes"


def limit_hint(needed: int) -> str:
    """How to raise the size limit far enough for ``needed`` bytes."""
    mb = max(int(math.ceil(needed / 1024**2)), 1)
    return f"if you trust the file, raise the limit (command line: --size-limit {mb})"


def bomb_message(name: str, part: str) -> str:
    """The refusal of a workbook ``name`` whose ``part`` holds a document type declaration."""
    return (
        f"{name} contains an XML document type declaration (in {part}), which "
        "workbooks never need and XML entity bombs use; refusing to read it: re-save the "
        "workbook from a spreadsheet program you trust"
    )


def damaged_error(name: str, e: BaseException) -> InputError:
    """The error for a workbook ``name`` that could not be parsed (``e`` says why)."""
    reason = str(e).strip().splitlines()[0] if str(e).strip() else type(e).__name__
    if len(reason) > 120:
        reason = reason[:117] + "..."
    return InputError(
        f"{name} is damaged or not a workbook sheetfuncs can read ({reason}); "
        "re-save it from a spreadsheet program as .xlsx"
    )


# --------------------------------------------------------------------------------------------
# defusedxml


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


def defusedxml_refused(e: BaseException) -> bool:
    """Whether ``e`` (or an exception it was raised from) is defusedxml refusing a part."""
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


# --------------------------------------------------------------------------------------------
# size


def check_file_size(p: Path, size_limit: int) -> None:
    """Refuse a file (read whole, as a CSV file is) larger than ``size_limit`` bytes."""
    size = p.stat().st_size
    if size > size_limit:
        raise InputError(
            f"{p.name} is {size_text(size)}, more than the {size_text(size_limit)} limit for "
            f"inputs; {limit_hint(size)}"
        )


# --------------------------------------------------------------------------------------------
# the zip container of a workbook


def check_archive(path: str | os.PathLike[str], size_limit: int = DEFAULT_SIZE_LIMIT) -> None:
    """Check a workbook's zip container before anything in it is parsed.

    Raises :class:`InputError` when the file is encrypted, an old binary workbook, not a zip
    archive, a damaged one, when the zip directory says the parts would unpack to more than
    ``size_limit`` bytes, or when any XML part starts with a document type declaration.
    """
    p = Path(path)
    with open(p, "rb") as fh:
        head = fh.read(8)
    _check_head(p, head)
    try:
        with zipfile.ZipFile(p) as zf:
            _check_directory(p, zf, size_limit)
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


def _check_head(p: Path, head: bytes) -> None:
    """Refuse a compound file (encrypted or old binary) and anything that is not a zip archive."""
    if head[:8] == CFB_MAGIC:
        if _cfb_is_encrypted(p):
            raise InputError(
                f"{p.name} is encrypted (password-protected); remove the password "
                "in a spreadsheet program (save a copy without one) and read that copy"
            )
        named = "" if p.suffix.lower() == ".xls" else " (whatever its name says)"
        raise InputError(
            f"{p.name} is an old binary .xls workbook{named}, which sheetfuncs does not "
            "read; save it as .xlsx (Excel Workbook) and try again"
        )
    if head[:4] not in (ZIP_MAGIC, ZIP_EMPTY):
        what = "is empty" if not head else "is not an .xlsx workbook (not a zip archive)"
        if head and _looks_like_text(p):
            what += "; it looks like text: if it is CSV data, give it a .csv name"
        raise InputError(f"{p.name} {what}; check that it is the right file")


def _check_directory(p: Path, zf: zipfile.ZipFile, size_limit: int) -> None:
    """The zip directory: size, encryption, compression methods, a workbook's parts, no DTD."""
    infos = zf.infolist()
    total = sum(i.file_size for i in infos)
    if total > size_limit:
        raise InputError(
            f"{p.name} would unpack to {size_text(total)}, more than the "
            f"{size_text(size_limit)} limit for workbooks; {limit_hint(total)}"
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
            raise InputError(bomb_message(p.name, info.filename))


def _looks_like_text(p: Path) -> bool:
    with open(p, "rb") as fh:
        return looks_like_text(fh.read(4096))


def looks_like_text(chunk: bytes) -> bool:
    """Whether the first bytes of a file look like UTF-8 text (no NUL bytes)."""
    if b"\x00" in chunk:
        return False
    try:
        chunk.decode("utf-8")
    except UnicodeDecodeError as e:
        return e.start > len(chunk) - 4  # cut inside a character at the end
    return True


# --------------------------------------------------------------------------------------------
# document type declarations in XML parts

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


# --------------------------------------------------------------------------------------------
# compound (OLE) files


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


def member_header(info: zipfile.ZipInfo) -> zipfile.ZipInfo:
    """A zip member's header for a copy of the archive: same name, time, compression,
    attributes and comment (the size and checksum are set when the member is written)."""
    copy = zipfile.ZipInfo(info.filename, info.date_time)
    for name in ("compress_type", "external_attr", "internal_attr", "create_system", "comment"):
        setattr(copy, name, getattr(info, name))
    return copy
