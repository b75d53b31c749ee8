"""The Calc extension (``.oxt``), generated from the registry of the worksheet functions.

An extension is a zip that LibreOffice's ``unopkg`` installs. Ours holds

* ``types.rdb``: the UNO interface with one method per worksheet function, written as IDL here
  (:func:`idl_text`) and compiled by the SDK's ``unoidl-write`` at build time;
* ``sheetfuncs_calc.py``: the component (the module :mod:`.component`, with a settings line
  in front naming the Python environment that holds sheetfuncs);
* ``CalcAddIns.xcu``: what the function wizard shows: display names (``SF_P``), descriptions,
  argument names and help, the category (:func:`addins_xcu`);
* ``description.xml`` and ``META-INF/manifest.xml``.

Argument types. A measurement range (``data``) is declared as a cell range
(``com.sun.star.table.XCellRange``): Calc then calls the function even when the range holds an
error cell, so that the cell can show which error is where, and the component sees each cell's
number format (a logical or a date is a number in Calc). Calc refuses an inline array there
(the cell shows Err:504). Every other argument is ``any``: a value, a range of values, an inline
array such as ``{1;-0.5;-0.5}``, or nothing (an argument left out arrives as ``None``). The
first parameter of each method is the calling document, which Calc fills in itself and the
wizard does not show. A function that returns a table is declared to return rows of values
(``sequence< sequence< any > >``): Calc refuses rows handed back through ``any``.
"""

from __future__ import annotations

import io
import shutil
import subprocess
import tempfile
import zipfile
from collections.abc import Iterable, Mapping
from dataclasses import dataclass
from pathlib import Path
from xml.sax.saxutils import escape, quoteattr

from ...errors import InputError
from ..functions import REGISTRY
from ..registry import Function
from .names import MODULE, SERVICE, argument_name, method_name

__all__ = [
    "CATEGORY", "EXTENSION_ID", "COMPONENT_FILE", "Built", "cell_range_argument", "idl_text",
    "addins_xcu", "description_xml", "manifest_xml", "component_text", "find_sdk_tool",
    "compile_idl", "build_extension",
]

#: The wizard's category for the functions (Calc's own category for add-in functions).
CATEGORY = "Add-In"
#: The extension's identifier for LibreOffice's extension manager.
EXTENSION_ID = "org.sheetfuncs.calc"
#: The component's file name inside the extension.
COMPONENT_FILE = "sheetfuncs_calc.py"
#: The arguments read as cell ranges (measurements); every other argument is ``any``.
_CELL_RANGE_ARGS = frozenset({"data"})
_CALLER = "com::sun::star::beans::XPropertySet"
_RANGE = "com::sun::star::table::XCellRange"


@dataclass(frozen=True)
class Built:
    """An extension written to ``path``: its functions and the Python environment it uses."""

    path: Path
    functions: tuple[str, ...]
    site_dirs: tuple[str, ...]
    size: int


def cell_range_argument(name: str) -> bool:
    """Is the argument read as a cell range (so that error cells can be named)?"""
    return name in _CELL_RANGE_ARGS


def idl_text(registry: Mapping[str, Function] = REGISTRY) -> str:
    """The UNO interface of the extension, one method per worksheet function."""
    lines = []
    for rec in registry.values():
        params = [f"[in] {_CALLER} document"] + [
            f"[in] {_RANGE if cell_range_argument(a.name) else 'any'} {argument_name(a.name)}"
            for a in rec.args
        ]
        returns = "sequence< sequence< any > >" if rec.result == "table" else "any"
        lines.append(f"        {returns} {method_name(rec.name)}({', '.join(params)});")
    head, tail = "", ""
    for part in MODULE.split("."):
        head += f"module {part} {{ "
        tail += "}; "
    return (
        f"{head}\n    interface XFunctions : com::sun::star::uno::XInterface {{\n"
        + "\n".join(lines) + f"\n    }};\n{tail.strip()}\n"
    )


def _prop(name: str, value: str, localized: bool = True) -> str:
    lang = ' xml:lang="en-US"' if localized else ""
    return f'<prop oor:name="{name}"><value{lang}>{escape(value)}</value></prop>'


def _function_node(rec: Function) -> str:
    params = "".join(
        f'<node oor:name={quoteattr(argument_name(a.name))} oor:op="replace">'
        f'{_prop("DisplayName", a.name)}{_prop("Description", a.dialog_text)}</node>'
        for a in rec.args
    )
    return (
        f'<node oor:name={quoteattr(method_name(rec.name))} oor:op="replace">'
        f'{_prop("DisplayName", rec.name)}{_prop("Description", rec.description)}'
        f'{_prop("Category", CATEGORY, localized=False)}'
        f'{_prop("CompatibilityName", rec.name)}'
        f'<node oor:name="Parameters">{params}</node></node>'
    )


def addins_xcu(registry: Mapping[str, Function] = REGISTRY) -> str:
    """The ``CalcAddIns`` configuration: the wizard's names, descriptions and argument help."""
    functions = "\n".join(_function_node(rec) for rec in registry.values())
    return (
        '<?xml version="1.0" encoding="UTF-8"?>\n'
        '<oor:component-data xmlns:oor="http://openoffice.org/2001/registry" '
        'xmlns:xs="http://www.w3.org/2001/XMLSchema" oor:name="CalcAddIns" '
        'oor:package="org.openoffice.Office">\n<node oor:name="AddInInfo">\n'
        f'<node oor:name={quoteattr(SERVICE)} oor:op="replace">\n'
        f'<node oor:name="AddInFunctions">\n{functions}\n</node>\n</node>\n</node>\n'
        "</oor:component-data>\n"
    )


def description_xml(version: str) -> str:
    return (
        '<?xml version="1.0" encoding="UTF-8"?>\n'
        '<description xmlns="http://openoffice.org/extensions/description/2006" '
        'xmlns:xlink="http://www.w3.org/1999/xlink">\n'
        f'  <identifier value="{EXTENSION_ID}"/>\n  <version value={quoteattr(version)}/>\n'
        "  <display-name><name lang=\"en-US\">sheetfuncs: one-way analysis of variance "
        "functions</name></display-name>\n"
        "</description>\n"
    )


def manifest_xml() -> str:
    entries = (
        ("application/vnd.sun.star.uno-typelibrary;type=RDB", "types.rdb"),
        ("application/vnd.sun.star.uno-component;type=Python", COMPONENT_FILE),
        ("application/vnd.sun.star.configuration-data", "CalcAddIns.xcu"),
    )
    rows = "\n".join(
        f' <manifest:file-entry manifest:media-type="{kind}" manifest:full-path="{path}"/>'
        for kind, path in entries
    )
    return (
        '<?xml version="1.0" encoding="UTF-8"?>\n'
        '<manifest:manifest xmlns:manifest="http://openoffice.org/2001/manifest">\n'
        f"{rows}\n</manifest:manifest>\n"
    )


def component_text(site_dirs: Iterable[str], registry: Mapping[str, Function] = REGISTRY) -> str:
    """The component's source: :mod:`.component` with its settings line filled in."""
    source = (Path(__file__).with_name("component.py")).read_text(encoding="utf-8")
    settings = {
        "service": SERVICE,
        "site_dirs": list(site_dirs),
        "functions": {method_name(n): n for n in registry},
    }
    marker = "SETTINGS: dict = {}  # filled in by the build"
    if marker not in source:
        raise RuntimeError("component.py lost its settings line")
    return source.replace(marker, f"SETTINGS: dict = {settings!r}", 1)


def find_sdk_tool(name: str) -> Path | None:
    """An SDK program (``unoidl-write``) on PATH or beside LibreOffice's own programs."""
    found = shutil.which(name)
    if found:
        return Path(found)
    office = shutil.which("soffice") or shutil.which("libreoffice")
    if office:
        root = Path(office).resolve().parent.parent  # .../libreoffice/program/soffice
        for candidate in (root / "sdk" / "bin" / name, root / "program" / name):
            if candidate.exists():
                return candidate
    return None


def _type_registries(tool: Path) -> list[Path]:
    """LibreOffice's own type registries, which the interface refers to."""
    roots = [tool.resolve().parent.parent]
    office = shutil.which("soffice") or shutil.which("libreoffice")
    if office:
        roots.append(Path(office).resolve().parent.parent)
    for root in roots:
        types = root / "program" / "types.rdb"
        offapi = root / "program" / "types" / "offapi.rdb"
        if types.exists() and offapi.exists():
            return [types, offapi]
    raise InputError(
        "LibreOffice's type registries (program/types.rdb, program/types/offapi.rdb) were not "
        "found beside unoidl-write; install LibreOffice and its SDK from the same release"
    )


def compile_idl(idl: str, tool: Path | None = None) -> bytes:
    """The compiled type library (``.rdb``) of ``idl``, by the SDK's ``unoidl-write``."""
    tool = tool or find_sdk_tool("unoidl-write")
    if tool is None:
        raise InputError(
            "unoidl-write (LibreOffice SDK) was not found; install the SDK "
            "(Debian/Ubuntu: apt-get install --no-install-recommends libreoffice-dev "
            "libreoffice-dev-common) and try again"
        )
    with tempfile.TemporaryDirectory(prefix="sheetfuncs-idl-") as tmp:
        src, out = Path(tmp) / "functions.idl", Path(tmp) / "types.rdb"
        src.write_text(idl, encoding="utf-8")
        done = subprocess.run(
            [str(tool), *map(str, _type_registries(tool)), str(src), str(out)],
            capture_output=True, text=True, timeout=120,
        )
        if done.returncode != 0 or not out.exists():
            detail = " ".join((done.stderr or done.stdout).split())[:300]
            raise RuntimeError(f"unoidl-write failed: {detail}")
        return out.read_bytes()


def build_extension(
    target: Path, *, site_dirs: Iterable[str] = (), version: str = "0.1.0",
    registry: Mapping[str, Function] = REGISTRY, tool: Path | None = None,
) -> Built:
    """Write the extension to ``target`` (written beside it first, then renamed)."""
    dirs = tuple(site_dirs)
    parts = {
        "META-INF/manifest.xml": manifest_xml().encode(),
        "description.xml": description_xml(version).encode(),
        "types.rdb": compile_idl(idl_text(registry), tool),
        COMPONENT_FILE: component_text(dirs, registry).encode(),
        "CalcAddIns.xcu": addins_xcu(registry).encode(),
    }
    buffer = io.BytesIO()
    with zipfile.ZipFile(buffer, "w", zipfile.ZIP_DEFLATED) as zf:
        for name, data in parts.items():
            zf.writestr(name, data)
    target = Path(target)
    target.parent.mkdir(parents=True, exist_ok=True)
    part = target.with_name(target.name + ".part")
    part.write_bytes(buffer.getvalue())
    part.chmod(0o644)
    part.replace(target)
    return Built(target, tuple(registry), dirs, len(buffer.getvalue()))
