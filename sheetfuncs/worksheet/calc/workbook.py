"""Moving a workbook between Excel and LibreOffice Calc: the SF_ function names in its formulas.

Excel with xlwings stores a call as the display name (``SF_P(A1:C7)``); Calc stores the add-in's
programmatic name (``ORG.SHEETFUNCS.CALC.FUNCTIONS.SFP(A1:C7)``, see :mod:`.names`), and neither
program reads the other's form. :func:`convert_workbook` copies an ``.xlsx``/``.xlsm`` and rewrites
only those names; every other byte of the file stays as it was.

What is rewritten, by the part's content type in ``[Content_Types].xml``:

* worksheets: cell formulas ``<f>`` (also the ``<xm:f>`` of extension lists), conditional
  formatting ``<formula>``, data validation ``<formula1>``/``<formula2>``;
* the workbook part: defined names ``<definedName>``;
* tables: calculated columns ``<calculatedColumnFormula>`` and ``<totalsRowFormula>``.

Charts (their ``<c:f>`` hold references, not calls), pivot caches and macro sheets are copied as
they are. In formula text a name is rewritten only where it is a whole name followed by ``(``:
never inside a string literal (``"..."``, also written ``&quot;...&quot;``), a quoted sheet name
(``'SF_P data'!A1``) or brackets (``Table1[SF_P]``); never when qualified (``MY.SF_P(``,
``_xludf.SF_P(``) or called through another workbook (``[1]!SF_P(``): those are counted and left.
Names are matched without regard to case and written in the canonical form (``SF_P`` or the
upper-case stored name). Names the registry does not know are counted and left as written.
"""

from __future__ import annotations

import os
import re
import shutil
import tempfile
import zipfile
import zlib
from collections import Counter
from dataclasses import dataclass
from pathlib import Path
from typing import Callable, Iterable, TypeVar
from xml.etree import ElementTree

from ...errors import InputError
from ...input import same_file
from ...input.files import DEFAULT_SIZE_LIMIT, check_archive, member_header
from ..functions import REGISTRY
from .names import SERVICE, stored_name

__all__ = [
    "TARGETS", "PartChange", "Converted", "Tally", "convert_workbook", "rewrite_formula",
    "rewrite_part", "name_maps",
]

_T = TypeVar("_T")

#: The two forms a workbook can be converted to.
TARGETS = ("calc", "excel")

#: The elements that hold formula text, by kind of part.
_TAGS = {
    "worksheet": ("formula1", "formula2", "formula", "f"),
    "workbook": ("definedName",),
    "table": ("calculatedColumnFormula", "totalsRowFormula"),
}

#: The workbook part's content type → the file names Excel accepts for it.
_BOOK_KINDS = {
    "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml": (".xlsx",),
    "application/vnd.ms-excel.sheet.macroEnabled.main+xml": (".xlsm",),
    "application/vnd.openxmlformats-officedocument.spreadsheetml.template.main+xml": (".xltx",),
    "application/vnd.ms-excel.template.macroEnabled.main+xml": (".xltm",),
}
_BINARY_BOOK = "application/vnd.ms-excel.sheet.binary.macroEnabled.main"
_WORKSHEET = "application/vnd.openxmlformats-officedocument.spreadsheetml.worksheet+xml"
_TABLE = "application/vnd.openxmlformats-officedocument.spreadsheetml.table+xml"

#: A quote and an apostrophe as formula text in XML may write them.
_Q = r"""(?:"|&quot;|&\#0*34;|&\#[xX]0*22;)"""
_A = r"""(?:'|&apos;|&\#0*39;|&\#[xX]0*27;)"""
#: The pieces of formula text: strings, quoted sheet names, brackets (skipped) and names.
_TOKENS = re.compile(
    rf"""(?=["'&\[\w\\])  # a quick first look: nothing else can start a piece
    (?:{_Q}.*?{_Q} | {_Q}.*
       | {_A}.*?{_A} | {_A}.*
       | \[(?:{_A}.|[^\[\]]|\[(?:{_A}.|[^\[\]])*\])*\]
       | (?<![\w.?\\])(?P<name>(?:[^\W\d]|\\)[\w.?\\]*)(?=\()
       )""",
    re.X | re.S,
)
#: Formula text worth scanning holds one of these (any case).
_MARKER = re.compile(r"sf_|sheetfuncs\.", re.I)
_MARKER_BYTES = re.compile(rb"sf_|sheetfuncs\.", re.I)
_UTF16_BOMS = (b"\xff\xfe", b"\xfe\xff")


# --------------------------------------------------------------------------------------------
# results


@dataclass(frozen=True)
class PartChange:
    """What was rewritten in one part of the file."""

    #: The zip member, e.g. ``xl/worksheets/sheet1.xml``.
    part: str
    #: Formulas (cell formulas, defined names, rules) whose text changed.
    formulas: int
    #: Function names rewritten (a formula may hold several).
    calls: int


@dataclass(frozen=True)
class Converted:
    """The outcome of :func:`convert_workbook`.

    ``names`` counts the calls rewritten per function (display names, sorted); ``already`` the
    calls that were in the target form before; ``unknown`` the calls in either form whose name
    the registry does not know (as written, upper-cased); ``qualified`` the known names called
    with a prefix or through another workbook (``_xludf.SF_P``, ``[1]!SF_P``), left as written;
    ``notes`` anything else left alone, one line each.
    """

    source: Path
    target: Path
    to: str
    parts: tuple[PartChange, ...]
    names: tuple[tuple[str, int], ...]
    already: int
    unknown: tuple[tuple[str, int], ...]
    qualified: tuple[tuple[str, int], ...]
    notes: tuple[str, ...]

    @property
    def formulas(self) -> int:
        """Formulas changed, all parts together."""
        return sum(p.formulas for p in self.parts)

    @property
    def calls(self) -> int:
        """Function names rewritten, all parts together."""
        return sum(p.calls for p in self.parts)

    def lines(self) -> tuple[str, ...]:
        """The outcome as a person reads it, one line each."""
        form = "the LibreOffice Calc form" if self.to == "calc" else "the Excel form"
        if self.calls:
            head = (f"{self.target.name}: {self.formulas} formula(s) rewritten to {form} "
                    f"({self.calls} call(s) in {len(self.parts)} part(s))")
        else:
            head = (f"{self.target.name}: nothing to rewrite (no SF_ function call in the other "
                    "form); the file was copied unchanged")
        out = [head]
        if self.names:
            out.append("functions: " + ", ".join(f"{n} {c}" for n, c in self.names))
        if self.already:
            out.append(f"{self.already} call(s) were already in {form} and were left as they were")
        if self.unknown:
            out.append("left as written, not functions of this sheetfuncs version: "
                       + ", ".join(f"{n} ({c})" for n, c in self.unknown))
        if self.qualified:
            out.append("left as written, called with a prefix or through another workbook: "
                       + ", ".join(f"{n} ({c})" for n, c in self.qualified))
        out.extend(self.notes)
        return tuple(out)


@dataclass(frozen=True)
class Tally:
    """Counts of one formula or part: calls rewritten per function (display name), calls
    already in the target form, unknown names and qualified calls (as in :class:`Converted`)."""

    rewritten: Counter[str]
    already: int
    unknown: Counter[str]
    qualified: Counter[str]


def _empty_tally() -> Tally:
    return Tally(Counter(), 0, Counter(), Counter())


class _Counts:
    """Running counts while the formulas of a part are scanned; :meth:`frozen` gives the
    result. (One per call of :func:`rewrite_part`: adding a counter per formula is slow.)"""

    def __init__(self) -> None:
        self.rewritten: Counter[str] = Counter()
        self.unknown: Counter[str] = Counter()
        self.qualified: Counter[str] = Counter()
        self.already = 0

    def frozen(self) -> Tally:
        return Tally(self.rewritten, self.already, self.unknown, self.qualified)


def _add(a: Tally, b: Tally) -> Tally:
    return Tally(a.rewritten + b.rewritten, a.already + b.already,
                  a.unknown + b.unknown, a.qualified + b.qualified)


# --------------------------------------------------------------------------------------------
# formula text


def name_maps(names: Iterable[str] | None = None) -> tuple[dict[str, str], dict[str, str]]:
    """``(to_calc, to_excel)``: upper-case display name → stored name, and back.

    ``names`` defaults to the registry's functions.
    """
    display = [n.upper() for n in (REGISTRY if names is None else names)]
    to_calc = {n: stored_name(n) for n in display}
    return to_calc, {s: n for n, s in to_calc.items()}


def rewrite_formula(text: str, to: str, maps: tuple[dict[str, str], dict[str, str]] | None = None,
                    ) -> tuple[str, Tally]:
    """Rewrite the SF_ function names in one formula's text (as it stands in the XML, escapes
    included) to the ``to`` form; return the new text and what was counted."""
    counts = _Counts()
    new = _rewrite_into(text, to, maps if maps is not None else name_maps(), counts)
    return new, counts.frozen()


def _rewrite_into(text: str, to: str, maps: tuple[dict[str, str], dict[str, str]],
                  counts: _Counts) -> str:
    """:func:`rewrite_formula`, adding to ``counts``."""
    to_calc, to_excel = maps
    wanted, other = (to_calc, to_excel) if to == "calc" else (to_excel, to_calc)
    stored_prefix = SERVICE.upper() + "."
    pieces: list[str] = []
    done = 0
    for m in _TOKENS.finditer(text):
        found = m.group("name")
        if found is None:
            continue
        name = found.upper()
        hit = wanted.get(name)
        if hit is not None and not (m.start() and text[m.start() - 1] == "!"):
            pieces += [text[done:m.start()], hit]
            done = m.end()
            counts.rewritten[to_excel.get(name, name)] += 1
        elif hit is not None:
            counts.qualified["!" + name] += 1
        elif "SF_" not in name and "SHEETFUNCS." not in name:
            continue  # any other function: the common case, kept fast
        elif name in other:
            counts.already += 1
        elif name.startswith("SF_") or name.startswith(stored_prefix):
            counts.unknown[name] += 1
        elif "." in name and _qualifies(name, to_calc, to_excel):
            counts.qualified[name] += 1
    if not pieces:
        return text
    pieces.append(text[done:])
    return "".join(pieces)


def _qualifies(name: str, to_calc: dict[str, str], to_excel: dict[str, str]) -> bool:
    """Whether a dotted name ends in a known function name (``_XLUDF.SF_P``)."""
    tail = name.rsplit(".", 1)[1]
    if tail in to_calc:
        return True
    return any(name.endswith("." + s) for s in to_excel)


def _element_pattern(tags: tuple[str, ...]) -> re.Pattern[str]:
    """Comments, CDATA and processing instructions (skipped), and elements ``tags`` whose
    content is plain text (group ``text``), with or without a namespace prefix."""
    names = "|".join(tags)
    return re.compile(
        r"<!--.*?-->|<!\[CDATA\[.*?\]\]>|<\?.*?\?>"
        rf"|(?P<open><(?:[\w.-]+:)?(?P<tag>{names})"
        r"""(?:\s+[^\s=>/]+\s*=\s*(?:"[^"]*"|'[^']*'))*\s*>)"""
        r"(?P<text>[^<]*)(?P<close></(?:[\w.-]+:)?(?P=tag)\s*>)",
        re.S,
    )


def rewrite_part(xml: str, kind: str, to: str, maps: tuple[dict[str, str], dict[str, str]],
                 ) -> tuple[str, int, Tally]:
    """Rewrite the formulas in one XML part of kind ``kind`` (``worksheet``, ``workbook``,
    ``table``): the new text, the number of formulas changed, the counts."""
    counts = _Counts()
    changed = 0

    def one(m: re.Match[str]) -> str:
        nonlocal changed
        text = m.group("text")
        if text is None or not _MARKER.search(text):
            return m.group(0)
        new = _rewrite_into(text, to, maps, counts)
        if new == text:
            return m.group(0)
        changed += 1
        return m.group("open") + new + m.group("close")

    new = _element_pattern(_TAGS[kind]).sub(one, xml)
    return new, changed, counts.frozen()


# --------------------------------------------------------------------------------------------
# the file


def convert_workbook(source: str | os.PathLike[str], target: str | os.PathLike[str], *, to: str,
                     size_limit: int = DEFAULT_SIZE_LIMIT) -> Converted:
    """Copy workbook ``source`` to ``target``, rewriting the SF_ function names in its formulas
    to the ``to`` form: ``"calc"`` (LibreOffice Calc with the sheetfuncs extension) or
    ``"excel"`` (Excel with xlwings).

    Every zip member keeps its name, order and content except the formula text of the parts
    listed in the module docstring, where only the names change. The target is written to a
    temporary file beside it and renamed, so that a failure never leaves half a file. Raises
    :class:`InputError` (one line) for a missing or unreadable source, a file that is not an
    ``.xlsx``/``.xlsm`` workbook, an encrypted one, one larger than ``size_limit`` unpacked, a
    target that is the source or has the wrong file name.
    """
    if to not in TARGETS:
        raise InputError(f'to must be "calc" or "excel", not {to!r}')
    src, dst = Path(source), Path(target)
    kinds, book_type = _check_source(src, size_limit)
    _check_target(src, dst, book_type)
    maps = name_maps()
    with zipfile.ZipFile(src) as zin:
        changes, tally, notes = _write_atomic(
            src, dst, lambda out: _copy_members(zin, out, kinds, to, maps))
    return Converted(
        source=src, target=dst, to=to, parts=changes,
        names=tuple(sorted(tally.rewritten.items())), already=tally.already,
        unknown=tuple(sorted(tally.unknown.items())),
        qualified=tuple(sorted(tally.qualified.items())), notes=notes,
    )


def _check_source(src: Path, size_limit: int) -> tuple[dict[str, str], str]:
    """Refuse a source that cannot be converted; return the formula parts' kinds (by lower-case
    member name) and the workbook part's content type."""
    if not src.exists():
        raise InputError(f"{src} not found; check the path and the file name")
    if src.is_dir():
        raise InputError(f"{src} is a folder, not a workbook; give the .xlsx file inside it")
    try:
        _refuse_opendocument(src)
        check_archive(src, size_limit)
    except PermissionError as e:
        raise InputError(f"cannot read {src} ({e.strerror}); check the file's permissions") from None
    try:
        with zipfile.ZipFile(src) as zf:
            types = zf.read("[Content_Types].xml")
            members = [i.filename for i in zf.infolist()]
        return _part_kinds(src, types, members)
    except (zipfile.BadZipFile, zlib.error, EOFError, ElementTree.ParseError, KeyError) as e:
        raise InputError(
            f"{src.name} is damaged and cannot be converted ({type(e).__name__}: "
            f"{str(e)[:100]}); open it in a spreadsheet program and save it as .xlsx again"
        ) from None


def _refuse_opendocument(src: Path) -> None:
    """An OpenDocument spreadsheet (``.ods``) is a zip too: say what to do with it."""
    try:
        with zipfile.ZipFile(src) as zf:
            mime = zf.read("mimetype")[:80] if "mimetype" in zf.namelist() else b""
    except (zipfile.BadZipFile, OSError, zlib.error, EOFError, RuntimeError, NotImplementedError):
        return  # not a readable zip: check_archive says what it is
    if mime.startswith(b"application/vnd.oasis.opendocument"):
        raise InputError(
            f"{src.name} is an OpenDocument file (.ods), which holds Calc's own formula form; "
            "open it in LibreOffice Calc and save it as .xlsx (Excel 2007-365), then convert that"
        )


def _part_kinds(src: Path, types: bytes, members: list[str]) -> tuple[dict[str, str], str]:
    """The formula parts' kinds by lower-case member name, from ``[Content_Types].xml``, and
    the workbook part's content type."""
    root = ElementTree.fromstring(types)
    defaults: dict[str, str] = {}
    overrides: dict[str, str] = {}
    for el in root:
        if el.tag.endswith("}Default") or el.tag == "Default":
            defaults[el.get("Extension", "").lower()] = el.get("ContentType", "")
        elif el.tag.endswith("}Override") or el.tag == "Override":
            overrides[el.get("PartName", "").lstrip("/").lower()] = el.get("ContentType", "")
    kinds: dict[str, str] = {}
    book_type = ""
    for name in members:
        key = name.lower()
        ctype = overrides.get(key) or defaults.get(key.rsplit(".", 1)[-1], "")
        if ctype in _BOOK_KINDS:
            kinds[key], book_type = "workbook", ctype
        elif ctype == _WORKSHEET:
            kinds[key] = "worksheet"
        elif ctype == _TABLE:
            kinds[key] = "table"
        elif ctype.startswith(_BINARY_BOOK):
            raise InputError(
                f"{src.name} is a binary workbook (.xlsb), whose formulas are not text; "
                "save it as .xlsx (Excel Workbook) or .xlsm and convert that"
            )
    if not book_type:
        raise InputError(
            f"{src.name} is an Office file but not a workbook (no workbook part); "
            "check that it is the right file"
        )
    return kinds, book_type


def _check_target(src: Path, dst: Path, book_type: str) -> None:
    """Refuse a target that is the source, a folder, in a missing folder or wrongly named."""
    if same_file(src, dst):
        raise InputError(
            f"the target {dst.name} is the source itself; give another file name "
            "(the source is never overwritten)"
        )
    if dst.is_dir():
        raise InputError(f"the target {dst} is a folder; give a file name such as {src.name}")
    if not dst.parent.is_dir():
        raise InputError(
            f"the target's folder {dst.parent} does not exist; create it or choose another"
        )
    allowed = _BOOK_KINDS[book_type]
    if dst.suffix.lower() not in allowed:
        macros = "holds macros" if "macroEnabled" in book_type else "holds no macros"
        raise InputError(
            f"{src.name} {macros}, so the target needs a {allowed[0]} name, not "
            f"{dst.name!r} (Excel refuses a file whose name does not match its content)"
        )


def _write_atomic(src: Path, dst: Path, write: Callable[[zipfile.ZipFile], _T]) -> _T:
    """Run ``write`` on a zip file beside ``dst``, then rename it to ``dst``; on any failure
    remove the temporary file and leave ``dst`` as it was."""
    try:
        fd, tmp_name = tempfile.mkstemp(prefix=f".{dst.name}.", suffix=".tmp", dir=dst.parent)
    except OSError as e:
        raise _write_error(dst, e) from None
    tmp = Path(tmp_name)
    try:
        with os.fdopen(fd, "wb") as fh, zipfile.ZipFile(fh, "w") as out:
            result = write(out)
        shutil.copymode(dst if dst.exists() else src, tmp)
        os.replace(tmp, dst)
    except BaseException as e:
        tmp.unlink(missing_ok=True)
        if isinstance(e, OSError):
            raise _write_error(dst, e) from None
        raise
    return result


def _write_error(dst: Path, e: OSError) -> InputError:
    return InputError(
        f"cannot write {dst} ({e.strerror or e}); check the folder's permissions and the free "
        "space, or choose another target (nothing was written)"
    )


def _copy_members(zin: zipfile.ZipFile, out: zipfile.ZipFile, kinds: dict[str, str], to: str,
                  maps: tuple[dict[str, str], dict[str, str]],
                  ) -> tuple[tuple[PartChange, ...], Tally, tuple[str, ...]]:
    """Copy every member of ``zin`` to ``out`` in order, rewriting the formula parts."""
    changes: list[PartChange] = []
    notes: list[str] = []
    total = _empty_tally()
    out.comment = zin.comment
    for info in zin.infolist():
        data = _read_member(zin, info)
        kind = kinds.get(info.filename.lower())
        if kind is not None and (data[:2] in _UTF16_BOMS or _MARKER_BYTES.search(data)):
            data, change, tally, note = _convert_part(info.filename, data, kind, to, maps)
            total = _add(total, tally)
            changes += [change] if change.calls else []
            notes += [note] if note else []
        out.writestr(member_header(info), data)
    return tuple(changes), total, tuple(notes)


def _read_member(zin: zipfile.ZipFile, info: zipfile.ZipInfo) -> bytes:
    try:
        return zin.read(info)
    except (zipfile.BadZipFile, zlib.error, EOFError) as e:
        raise InputError(
            f"{Path(str(zin.filename)).name} is damaged (part {info.filename}: {e}); "
            "open it in a spreadsheet program and save it as .xlsx again"
        ) from None


def _convert_part(name: str, data: bytes, kind: str, to: str,
                  maps: tuple[dict[str, str], dict[str, str]],
                  ) -> tuple[bytes, PartChange, Tally, str]:
    """One formula part: its new bytes, what changed, the counts and a note (or ``""``)."""
    try:
        xml = data.decode("utf-8")
    except UnicodeDecodeError:
        note = f"{name} is not UTF-8 text and was copied unchanged (its formulas were not read)"
        return data, PartChange(name, 0, 0), _empty_tally(), note
    new, changed, tally = rewrite_part(xml, kind, to, maps)
    note = ""
    if "<![CDATA[" in xml:
        note = f"{name} holds CDATA sections; formulas inside them were left as written"
    calls = sum(tally.rewritten.values())
    return (new.encode("utf-8") if calls else data), PartChange(name, changed, calls), tally, note
