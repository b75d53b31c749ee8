"""Writing the ready templates: one kind to a file, or every kind into a folder.

The output is deterministic, so that a comparison with a stored copy tells whether the copy is
current: the workbook properties carry fixed dates (:data:`FIXED_TIME`, created and modified),
and the archive is repacked with every member dated :data:`FIXED_TIME` in the order openpyxl
wrote them. Two writes with the same versions of sheetfuncs and openpyxl give the same bytes;
:func:`template_parts` gives the uncompressed parts, which compare equal also where another
zlib compresses differently.

``host="calc"`` writes the Excel form and converts it with
:func:`sheetfuncs.worksheet.calc.workbook.convert_workbook`, which rewrites only the names of
the SF_ functions in the formulas.
"""

from __future__ import annotations

import datetime as dt
import io
import os
import re
import tempfile
import zipfile
from dataclasses import dataclass
from pathlib import Path

from openpyxl import Workbook
from openpyxl.workbook.defined_name import DefinedName

from ..errors import InputError
from ..worksheet.calc.workbook import convert_workbook
from .kinds import DATA_SHEET, KIND_SPECS, KINDS, RECORD_SHEET, Kind, write_data_sheet
from .layout import ArrayArea, Page, setup_print

__all__ = ["FIXED_TIME", "HOSTS", "WrittenTemplate", "write_template", "write_all",
           "template_parts", "build_workbook"]

#: The date every template carries (workbook properties and archive members).
FIXED_TIME = dt.datetime(2026, 1, 1, 0, 0, 0)
#: The hosts a template can be written for.
HOSTS = ("excel", "calc")
_MODIFIED = re.compile(rb"(<dcterms:modified[^>]*>)[^<]*(</dcterms:modified>)")


@dataclass(frozen=True)
class WrittenTemplate:
    """What :func:`write_template` wrote.

    ``block_name`` and ``block_ref`` are the data block's defined name and its absolute range,
    ``table_name`` the spreadsheet table over the same range, ``cells_block`` whether the block
    holds cells copied as they are; ``arrays`` every array formula (sheet, area, formula in the
    Excel form); ``decisions`` the addresses of the decision cells on the record sheet.
    """

    kind: str
    path: Path
    host: str
    record_sheet: str
    data_sheet: str
    block_name: str
    block_ref: str
    table_name: str
    cells_block: bool
    arrays: tuple[ArrayArea, ...]
    decisions: tuple[str, ...]


def build_workbook(kind: Kind) -> tuple[Workbook, Page, str]:
    """The workbook of one kind in memory: the record page (what it wrote) and the block's
    absolute range."""
    wb = Workbook()
    record = wb.active
    record.title = RECORD_SHEET
    data = wb.create_sheet(DATA_SHEET)
    data_page = Page(data)
    block_ref = write_data_sheet(data_page, kind)
    page = Page(record)
    kind.build(page, kind.block)
    for name, ref in page.names.items():
        wb.defined_names[name] = DefinedName(name, attr_text=ref)
    setup_print(record, f"{kind.title} (sheetfuncs template)", 11, landscape=True)
    setup_print(data, f"{kind.title}: data entry", 1 + max(len(kind.block.header), 7),
                landscape=False)
    wb.properties.creator = "sheetfuncs"
    wb.properties.lastModifiedBy = "sheetfuncs"
    wb.properties.title = f"{kind.title} (sheetfuncs template)"
    wb.properties.created = FIXED_TIME
    wb.properties.modified = FIXED_TIME
    return wb, page, block_ref


def write_template(kind: str, target: str | os.PathLike[str], *, host: str = "excel") -> WrittenTemplate:
    """Writes the ready template ``kind`` (one of :data:`~sheetfuncs.templates.kinds.KINDS`)
    to ``target`` (``.xlsx``), with formulas in the form of ``host`` ("excel" or "calc")."""
    if kind not in KIND_SPECS:
        raise InputError(f"there is no template kind {kind!r}; choose one of {', '.join(KINDS)}")
    if host not in HOSTS:
        raise InputError(f"a template is written for excel or calc, not {host!r}")
    dst = Path(target)
    if dst.suffix.lower() != ".xlsx":
        raise InputError(f"a template is written as .xlsx; give a name ending .xlsx, not {dst.name}")
    spec = KIND_SPECS[kind]
    wb, page, block_ref = build_workbook(spec)
    packed = _pack(wb)
    if host == "calc":
        _write_converted(packed, dst)
    else:
        _write_atomic(packed, dst)
    return WrittenTemplate(kind, dst, host, RECORD_SHEET, DATA_SHEET, spec.block.name, block_ref,
                           spec.block.table, spec.block.cells, tuple(page.arrays),
                           tuple(page.decisions))


def write_all(folder: str | os.PathLike[str], *, host: str = "excel") -> tuple[WrittenTemplate, ...]:
    """Writes every kind into ``folder`` (created if needed) as ``<kind>.xlsx``."""
    out = Path(folder)
    try:
        out.mkdir(parents=True, exist_ok=True)
    except OSError as e:
        raise InputError(f"cannot make the folder {out} ({e.strerror}); give a folder you can write to")
    return tuple(write_template(k, out / f"{k}.xlsx", host=host) for k in KINDS)


def template_parts(path: str | os.PathLike[str]) -> dict[str, bytes]:
    """Every part of a workbook file, uncompressed, by name (for comparing two files)."""
    with zipfile.ZipFile(path) as z:
        return {info.filename: z.read(info) for info in z.infolist()}


def _pack(wb: Workbook) -> bytes:
    """The workbook as deterministic bytes: openpyxl's parts in its order, every member dated
    :data:`FIXED_TIME`, the modified date in the core properties fixed too (openpyxl's save
    sets it to the time of saving)."""
    raw = io.BytesIO()
    wb.save(raw)
    fixed = FIXED_TIME.strftime("%Y-%m-%dT%H:%M:%SZ").encode()
    out = io.BytesIO()
    with zipfile.ZipFile(raw) as zin, zipfile.ZipFile(out, "w", zipfile.ZIP_DEFLATED) as zout:
        for info in zin.infolist():
            data = zin.read(info)
            if info.filename == "docProps/core.xml":
                data = _MODIFIED.sub(rb"\g<1>" + fixed + rb"\g<2>", data)
            member = zipfile.ZipInfo(info.filename, date_time=FIXED_TIME.timetuple()[:6])
            member.compress_type = zipfile.ZIP_DEFLATED
            member.external_attr = 0o600 << 16
            zout.writestr(member, data)
    return out.getvalue()


def _write_atomic(data: bytes, dst: Path) -> None:
    """Writes ``data`` to a temporary file beside ``dst``, then renames it."""
    try:
        fd, tmp = tempfile.mkstemp(prefix=".sheetfuncs-", suffix=".xlsx", dir=dst.parent or ".")
    except OSError as e:
        raise InputError(f"cannot write into {dst.parent} ({e.strerror}); give a folder you can write to")
    try:
        with os.fdopen(fd, "wb") as f:
            f.write(data)
        os.chmod(tmp, 0o644)  # mkstemp makes 0600; a template is an ordinary file
        os.replace(tmp, dst)
    except OSError as e:
        Path(tmp).unlink(missing_ok=True)
        raise InputError(f"cannot write {dst} ({e.strerror}); check the name and the folder")


def _write_converted(data: bytes, dst: Path) -> None:
    """The Calc form: the Excel form written beside ``dst``, converted into ``dst``."""
    with tempfile.TemporaryDirectory(prefix="sheetfuncs-") as tmp:
        excel = Path(tmp) / dst.name
        excel.write_bytes(data)
        convert_workbook(excel, dst, to="calc")
