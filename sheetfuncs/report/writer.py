"""write_report: the formatted result workbook, written safely (temporary file, then rename).

The sheets, in order: Findings, Tables, Comparisons, Groups, Data (then Data 2, Data 3, ... when
the values outgrow one sheet), Chart, Audit, About. The workbook is streamed in openpyxl's
write-only mode, so a report of a million observations needs little memory.
"""

from __future__ import annotations

import os
import tempfile
from collections.abc import Callable
from pathlib import Path
from typing import Any

from openpyxl import Workbook
from openpyxl.cell import WriteOnlyCell
from openpyxl.workbook.defined_name import DefinedName

from ..errors import InputError
from ..stats import centred_values
from .context import ReportContext, prepare
from .findings import findings
from .grid import Style, apply_style, make_cell, safe_text, setup_print
from .sheets import (
    NAMES, TH, DataLayout, build_about, build_audit, build_chart, build_comparisons,
    build_findings, build_groups, build_tables, timestamp,
)

__all__ = ["write_report", "build_workbook", "ROW_LIMIT", "SHEET_ORDER"]

#: Rows in one sheet of the host (the header counts).
ROW_LIMIT = 1_048_576

#: The sheets of a report, in order (Data sheets beyond the first follow "Data").
SHEET_ORDER = ("Findings", "Tables", "Comparisons", "Groups", "Data", "Chart", "Audit", "About")

Progress = Callable[[str, int, int], None]

_LABEL = Style(halign="left")

_KIND_WORDS = {"text": "text", "logical": "logical value", "error": "error value", "date": "date",
               "nan": "not a number", "other": "other"}


def _version() -> str:
    from .. import __version__

    return __version__


def _check_target(path: Any, force: bool, source: Any) -> Path:
    try:
        target = Path(os.fspath(path)).expanduser()
    except TypeError:
        raise InputError(f"the output path must be a file name, not {path!r}") from None
    if target.suffix.lower() != ".xlsx":
        raise InputError(
            f"the report is an .xlsx workbook; give an output name ending in .xlsx, "
            f"not {target.name!r}"
        )
    folder = target.parent if str(target.parent) else Path(".")
    if not folder.is_dir():
        raise InputError(f"the folder {str(folder)!r} does not exist; create it first")
    if target.is_dir():
        raise InputError(f"{str(target)!r} is a folder; give a file name ending in .xlsx")
    src = getattr(source, "path", None) if source is not None else None
    if src:
        sp = Path(os.fspath(src)).expanduser()
        same = False
        try:
            same = target.exists() and sp.exists() and os.path.samefile(target, sp)
        except OSError:
            same = False
        if same or target.resolve() == sp.resolve():
            raise InputError(
                f"the output {str(target)!r} is the input file; the input is never "
                "overwritten: choose another output name"
            )
    if target.exists() and not force:
        raise InputError(
            f"{str(target)!r} already exists and is kept; use --force (force=True) "
            "to replace it, or choose another name"
        )
    return target


def _address(note: Any, source: Any) -> str:
    if source is not None and hasattr(source, "full_address"):
        return source.full_address(note.row, note.col)
    return f"{note.position} of the range"


def _content(value: Any) -> str:
    if isinstance(value, bool):
        return "TRUE" if value else "FALSE"
    if hasattr(value, "isoformat"):
        return value.isoformat()
    return value if isinstance(value, str) else repr(value)


def _data_header(an: ReportContext) -> list[str]:
    unit = f" ({an.unit})" if an.unit else ""
    return [
        "Group no.", an.factor, f"{an.response}{unit}", f"Centred value (value − {an.centre:f})", "",
        "Input cell not used", "Kind", "Content", "Action",
    ]


def _write_data(wb: Workbook, sheets: list[Any], an: ReportContext, layout: DataLayout, source: Any,
                progress: Progress | None) -> None:
    """Stream the long-form data and the log of unused input cells over the Data sheets."""
    header = _data_header(an)
    log = [(_address(c, source), _KIND_WORDS.get(c.kind, c.kind), _content(c.value), c.action)
           for c in an.groups.cells]
    vfmt = an.precision.value_format()
    total = layout.n_values
    cap = layout.capacity
    mom = an.moments

    def values():
        for gi, a in enumerate(an.groups.arrays):
            cen = centred_values(a, mom, an.centre)
            yield from ((gi, v, c) for v, c in zip(a.tolist(), cen.tolist()))

    it = values()
    done = 0
    li = 0
    step = 50_000
    for s, ws in enumerate(sheets):
        for col, w in zip("ABCDEFGHI", (10, 18, 20, 30, 3, 24, 14, 28, 10)):
            ws.column_dimensions[col].width = w
        ws.freeze_panes = "A2"
        setup_print(ws, True, "1:1")
        ws.append([make_cell(ws, h, TH.but(wrap=False, halign="right" if j in (0, 2, 3) else None))
                   if h else None for j, h in enumerate(header)])
        # Reused cells must carry a style: openpyxl's streaming writer keeps working on an
        # unstyled cell object after writing it, which would corrupt a reused one.
        # A label is handed over as plain text (the cheapest cell to stream) unless it begins
        # with "=", which openpyxl would take for a formula: that one goes as a styled text cell.
        label_cells = [make_cell(ws, lab, _LABEL) if safe_text(lab).startswith("=") else safe_text(lab)
                       for lab in an.groups.labels]
        vcell = WriteOnlyCell(ws)
        apply_style(vcell, Style(num=vfmt))
        vcell.data_type = "n"
        ccell = WriteOnlyCell(ws)
        apply_style(ccell, Style(num=vfmt))
        ccell.data_type = "n"
        rows_here = min(cap, max(total - s * cap, 0))
        logs_here = min(cap, max(len(log) - s * cap, 0))
        append = ws.append
        for i in range(rows_here):
            gi, v, c = next(it)
            vcell._value = repr(v)  # the shortest round-trip form (see _grid.set_float)
            ccell._value = repr(c)
            if li < len(log) and i < logs_here:
                addr, kind, content, action = log[li]
                li += 1
                append([gi + 1, label_cells[gi], vcell, ccell, None,
                        make_cell(ws, addr), make_cell(ws, kind), make_cell(ws, content), make_cell(ws, action)])
            else:
                append([gi + 1, label_cells[gi], vcell, ccell])
            done += 1
            if progress is not None and done % step == 0:
                progress("data", done, total)
        for i in range(rows_here, logs_here):
            addr, kind, content, action = log[li]
            li += 1
            append([None, None, None, None, None,
                    make_cell(ws, addr), make_cell(ws, kind), make_cell(ws, content), make_cell(ws, action)])
    if progress is not None:
        progress("data", done, total)


def build_workbook(an: ReportContext, *, source: Any = None, progress: Progress | None = None,
                   row_limit: int = ROW_LIMIT) -> Workbook:
    """The report workbook for an analysis (not yet saved)."""
    written = timestamp()
    n_log = len(an.groups.cells)
    layout = DataLayout.plan(an.groups.counts, n_log, row_limit)
    fi = findings(an)
    find = build_findings(an, fi, written)
    tables, pos = build_tables(an)
    comps = build_comparisons(an)
    groups, _ = build_groups(an)
    chart = build_chart(an, layout)
    audit, audit_refs = build_audit(an, layout, pos)
    about = build_about(an, source=source, written=written, version=_version(), data_sheets=layout.sheets)

    wb = Workbook(write_only=True)
    wb.properties.creator = "sheetfuncs"
    wb.properties.title = safe_text(an.title)[:250]
    wb.calculation.fullCalcOnLoad = True
    before = [find, tables, comps, groups]
    after = [chart, audit, about]
    targets = {}
    for grid in before:
        targets[grid.name] = wb.create_sheet(grid.name)
    data_sheets = [wb.create_sheet(name) for name in layout.sheets]
    for grid in after:
        targets[grid.name] = wb.create_sheet(grid.name)
    for grid in before + after:
        grid.emit(targets[grid.name])
    _write_data(wb, data_sheets, an, layout, source, progress)
    for name in NAMES:
        wb.defined_names[name] = DefinedName(name, attr_text=pos.cells[name])
        wb.defined_names["audit_" + name] = DefinedName("audit_" + name, attr_text=audit_refs[name])
    return wb


def write_report(
    groups: Any,
    path: Any,
    *,
    alpha: float = 0.05,
    method: str = "tukey",
    control: Any = None,
    factor: str = "Factor",
    response: str = "Response",
    unit: str | None = None,
    title: str | None = None,
    force: bool = False,
    source: Any = None,
    progress: Progress | None = None,
    _row_limit: int = ROW_LIMIT,
) -> Path:
    """Write the formatted result workbook of a one-way analysis to ``path`` (an ``.xlsx``).

    ``groups`` is anything :func:`sheetfuncs.as_groups` accepts (readers pass the
    :class:`~sheetfuncs.Groups` from :func:`~sheetfuncs.groups_from_range`); ``alpha`` the
    significance level (intervals are at ``1 - alpha``); ``method`` the pairwise method;
    ``control`` a group label for Dunnett's comparisons with a control; ``factor``,
    ``response``, ``unit`` and ``title`` name things in the report; ``source`` an
    :class:`~sheetfuncs.source.InputSource` that gives input cells their sheet and address;
    ``progress(stage, done, total)`` is called during long work.

    The workbook is written to a temporary file in the target folder and renamed into place,
    so no partial file is ever left. An existing output is kept unless ``force``; the input
    file (``source.path``) is never overwritten. Returns the path written. Raises
    :class:`~sheetfuncs.InputError` with a one-line message for bad input or options.
    """
    target = _check_target(path, force, source)
    if progress is not None:
        progress("analysis", 0, 1)
    an = prepare(groups, alpha=alpha, method=method, control=control, factor=factor,
                 response=response, unit=unit, title=title)
    if progress is not None:
        progress("analysis", 1, 1)
    folder = target.parent if str(target.parent) else Path(".")
    try:
        fd, tmp_name = tempfile.mkstemp(dir=folder, prefix=f".{target.stem}.", suffix=".tmp")
    except OSError as err:
        raise InputError(
            f"cannot create a file in the folder {str(folder)!r} (the system says: "
            f"{err.strerror or err}); choose a folder you can write to"
        ) from None
    os.close(fd)
    tmp = Path(tmp_name)
    try:
        wb = build_workbook(an, source=source, progress=progress, row_limit=_row_limit)
        if progress is not None:
            progress("saving", 0, 1)
        wb.save(tmp)
        mask = os.umask(0)
        os.umask(mask)
        os.chmod(tmp, 0o666 & ~mask)
        os.replace(tmp, target)
    except OSError as err:
        tmp.unlink(missing_ok=True)
        raise InputError(f"could not write {str(target)!r}: {err.strerror or err}") from None
    except BaseException:
        tmp.unlink(missing_ok=True)
        raise
    if progress is not None:
        progress("saving", 1, 1)
    return target
