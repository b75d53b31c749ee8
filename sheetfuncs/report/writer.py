"""write_report: the formatted result workbook, written safely (temporary file, then rename).

The sheets, in order: Findings, Tables, Comparisons, Groups, Data (then Data 2, Data 3, ... when
the values outgrow one sheet), Chart, Audit, About. The workbook is streamed in openpyxl's
write-only mode, so a report of a million observations needs little memory.
"""

from __future__ import annotations

import os
import shlex
import tempfile
from collections.abc import Mapping
from datetime import datetime, timezone
from pathlib import Path
from typing import Any

from openpyxl import Workbook
from openpyxl.workbook.defined_name import DefinedName

from ..errors import InputError
from ..input import InputSource, LoadedGroups, Reading, RowsOrigin, as_groups, same_file
from .context import ReportContext, prepare, prepare_sums
from .findings import findings
from .grid import Page, safe_text
from .sheets import (
    NAMES, DataLayout, Progress, build_about, build_audit, build_chart, build_comparisons,
    build_findings, build_groups, build_sums, build_tables, input_log, write_data,
)
from .trace import FOOTER_TEXT, PAPER_SIZES, Trace, check_paper, header_text, make_trace, python_call

__all__ = [
    "write_report", "write_sums_report", "build_workbook", "timestamp", "ROW_LIMIT", "SHEET_ORDER", "DEFAULT_MAX_GROUPS",
]

#: Rows in one sheet of the host (the header counts).
ROW_LIMIT = 1_048_576

#: The most groups a report takes unless told otherwise (``--max-groups``, ``max_groups=``): the
#: pairwise comparisons grow with the square of the number of groups (measured on two values
#: per group: 100 groups 7 s and 140 MB, 200 groups 22 s, 500 groups 107 s and 730 MB).
DEFAULT_MAX_GROUPS = 100

#: The sheets of a report, in order (Data sheets beyond the first follow "Data").
SHEET_ORDER = ("Findings", "Tables", "Comparisons", "Groups", "Data", "Chart", "Audit", "About")


def _version() -> str:
    from .. import __version__

    return __version__


def timestamp() -> str:
    """The time of writing, as the report shows it: ``2026-12-02 14:05:09 UTC``."""
    return datetime.now(timezone.utc).replace(microsecond=0).strftime("%Y-%m-%d %H:%M:%S UTC")


def _check_source(source: Any) -> InputSource | None:
    if source is None or isinstance(source, InputSource):
        return source
    raise InputError(
        f"the source must be a sheetfuncs.input.InputSource or None, not {type(source).__name__}; "
        "leave it out for data passed from Python"
    )


def _check_target(path: Any, force: bool, source: InputSource | None) -> Path:
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
    if source is not None and source.path and same_file(target, Path(os.fspath(source.path)).expanduser()):
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


def build_workbook(an: ReportContext, *, source: InputSource | None = None, progress: Progress | None = None,
                   row_limit: int = ROW_LIMIT, trace: Trace | None = None) -> Workbook:
    """The report workbook for an analysis (not yet saved), traced and printed as ``trace``
    says (default: A4, called from Python)."""
    source = _check_source(source)
    if trace is None:
        trace = make_trace(an, source_path=source.path if source else None, version=_version(),
                           call=python_call("build_workbook", {}))
    left, right = header_text(an.title, trace.identifier)
    page = Page(PAPER_SIZES[trace.paper], left, right, FOOTER_TEXT)
    written = timestamp()
    find = build_findings(an, findings(an), written)
    tables, pos = build_tables(an)
    comps = build_comparisons(an)
    groups = build_groups(an)
    before = [find, tables, comps, groups]
    if an.from_sums:  # the values stayed in a database: the Sums sheet instead of the Data sheets
        sums, cols = build_sums(an)
        log: list[Any] = []
        layout = None
        before.append(sums)
        audit, audit_refs = build_audit(an, cols, pos)
        data_names: tuple[str, ...] = ()
    else:
        log = input_log(an, source)
        layout = DataLayout.plan(an.counts, len(log), row_limit)
        audit, audit_refs = build_audit(an, layout, pos)
        data_names = layout.sheets
    chart = build_chart(an, layout)
    about = build_about(an, source=source, written=written, trace=trace, data_sheets=data_names)

    wb = Workbook(write_only=True)
    wb.properties.creator = "sheetfuncs"
    wb.properties.title = safe_text(an.title)[:250]
    wb.calculation.fullCalcOnLoad = True
    after = [chart, audit, about]
    targets = {}
    for grid in before:
        targets[grid.name] = wb.create_sheet(grid.name)
    data_sheets = [wb.create_sheet(name) for name in data_names]
    for grid in after:
        targets[grid.name] = wb.create_sheet(grid.name)
    for grid in before + after:
        grid.emit(targets[grid.name], page)
    if layout is not None:
        write_data(data_sheets, an, layout, log, progress, page)
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
    source: InputSource | None = None,
    reading: Reading | None = None,
    progress: Progress | None = None,
    max_groups: int = DEFAULT_MAX_GROUPS,
    paper: str = "a4",
    command: Any = None,
    reading_options: Any = None,
    _row_limit: int = ROW_LIMIT,
) -> Path:
    """Write the formatted result workbook of a one-way analysis to ``path`` (an ``.xlsx``).

    ``groups`` is anything :func:`sheetfuncs.as_groups` accepts (readers pass the
    :class:`~sheetfuncs.Groups` from :func:`~sheetfuncs.groups_from_range`), or what
    :func:`sheetfuncs.read_groups` returns (its ``source`` and ``reading`` come with it); ``alpha`` the
    significance level (intervals are at ``1 - alpha``); ``method`` the pairwise method;
    ``control`` a group label for Dunnett's comparisons with a control; ``factor``,
    ``response``, ``unit`` and ``title`` name things in the report; ``source`` an
    :class:`~sheetfuncs.input.InputSource` that gives input cells their sheet and address;
    ``reading`` the :class:`~sheetfuncs.input.Reading` of a file (what was read and what was
    left out: the Findings, Data and About sheets show it);
    ``progress(stage, done, total)`` is called during long work; ``max_groups`` limits the
    number of groups (:data:`DEFAULT_MAX_GROUPS`; the comparisons grow with its square);
    ``paper`` ``"a4"`` or ``"letter"`` for every printed page; ``command`` the command line as
    run (a front end passes ``sys.argv``; default: the Python call and its options) and
    ``reading_options`` the options the data were read with (a mapping), both for the About
    sheet. The input file, if any, is hashed (SHA-256) when the report is written.

    The workbook is written to a temporary file in the target folder and put into place at the
    end, so no partial file is ever left. An existing output is kept unless ``force``, also one
    that appears while the report is written (the last step creates the output exclusively);
    the input file (``source.path``) is never overwritten. Returns the path written. Raises
    :class:`~sheetfuncs.InputError` with a one-line message for bad input or options.

    Length: the docstring documents every option; the body is a straight sequence of checks.
    """
    if isinstance(groups, LoadedGroups):  # what read_groups returned: its source and reading too
        source = groups.source if source is None else source
        reading = groups.reading if reading is None else reading
        groups = groups.groups
    source = _check_source(source)
    paper = check_paper(paper)
    target = _check_target(path, force, source)
    groups = _check_group_count(as_groups(groups), max_groups)
    if progress is not None:
        progress("analysis", 0, 1)
    an = prepare(groups, alpha=alpha, method=method, control=control, factor=factor,
                 response=response, unit=unit, title=title, reading=reading)
    if progress is not None:
        progress("analysis", 1, 1)
    opts = dict(alpha=alpha, method=method, control=control, factor=factor, response=response,
                unit=unit, title=title, paper=paper)
    trace = make_trace(an, source_path=source.path if source else None, version=_version(),
                       call=_call(command, "write_report", opts),
                       reading_options=_check_mapping(reading_options), paper=paper)
    _write_workbook(an, target, source=source, progress=progress, row_limit=_row_limit, force=force,
                    trace=trace)
    return target


def write_sums_report(
    analysis: Any,
    path: Any,
    *,
    origin: RowsOrigin,
    factor: str = "Factor",
    response: str = "Response",
    unit: str | None = None,
    title: str | None = None,
    force: bool = False,
    progress: Progress | None = None,
    max_groups: int = DEFAULT_MAX_GROUPS,
    paper: str = "a4",
    command: Any = None,
) -> Path:
    """Write the report of an analysis of rows read by a database engine: ``analysis`` and
    ``origin`` are the ``analysis`` and ``origin`` of what
    :func:`sheetfuncs.engines.analyse_sql` returns (the options of the analysis were given
    there). When the values stayed in the database (``analysis.groups`` is ``None``), a Sums
    sheet with the exact per-group sums takes the place of the Data sheets and the Audit sheet
    recomputes from it; the About sheet names the engine, the rows' source and the row count
    (and the file's SHA-256 when the source is a file). Otherwise as :func:`write_report`."""
    an = prepare_sums(analysis, origin=origin, factor=factor, response=response, unit=unit,
                      title=title)
    paper = check_paper(paper)
    target = _check_target(path, force, None)
    _check_group_count(an, max_groups)
    call = _call(command, "write_sums_report", dict(factor=factor, response=response, unit=unit,
                                                    title=title, paper=paper))
    trace = make_trace(an, source_path=None, call=call, version=_version(), paper=paper)
    _write_workbook(an, target, source=None, progress=progress, row_limit=ROW_LIMIT, force=force,
                    trace=trace)
    return target


def _call(command: Any, function: str, options: dict[str, Any]) -> str:
    """The command line as run (a sequence of arguments, shown as a shell would take them), or
    the Python call with its options."""
    if command is None:
        return python_call(function, options)
    if isinstance(command, str) or not all(isinstance(x, str) for x in command):
        raise InputError("command must be the command line as a list of texts (sys.argv), or None")
    return shlex.join(command)


def _check_mapping(options: Any) -> dict[str, Any]:
    """The reading options as a dict (``None``: none recorded)."""
    if options is None:
        return {}
    if not isinstance(options, Mapping):
        raise InputError(f"reading_options must be a mapping of names to values, not {type(options).__name__}")
    return dict(options)


def _write_workbook(an: ReportContext, target: Path, *, source: InputSource | None,
                    progress: Progress | None, row_limit: int, force: bool, trace: Trace) -> None:
    """Build the workbook and put it at ``target`` through a temporary file."""
    tmp = _temp_file(target)
    try:
        wb = build_workbook(an, source=source, progress=progress, row_limit=row_limit, trace=trace)
        if progress is not None:
            progress("saving", 0, 1)
        _save(wb, tmp, target, force)
    except OSError as err:
        tmp.unlink(missing_ok=True)
        raise InputError(f"could not write {str(target)!r}: {err.strerror or err}") from None
    except BaseException:
        tmp.unlink(missing_ok=True)
        raise
    if progress is not None:
        progress("saving", 1, 1)


def _temp_file(target: Path) -> Path:
    """A new empty temporary file beside ``target`` (hidden, named after it)."""
    folder = target.parent if str(target.parent) else Path(".")
    try:
        fd, tmp_name = tempfile.mkstemp(dir=folder, prefix=f".{target.stem}.", suffix=".tmp")
    except OSError as err:
        raise InputError(
            f"cannot create a file in the folder {str(folder)!r} (the system says: "
            f"{err.strerror or err}); choose a folder you can write to"
        ) from None
    os.close(fd)
    return Path(tmp_name)


def _check_group_count(groups: Any, max_groups: Any) -> Any:
    """The groups, when there are at most ``max_groups`` of them (a whole number, at least 1)."""
    if isinstance(max_groups, bool) or not isinstance(max_groups, int) or max_groups < 1:
        raise InputError(
            f"the limit on groups must be a whole number of at least 1, not {max_groups!r}"
        )
    k = groups.k
    if k > max_groups:
        raise InputError(
            f"the data have {k:,} groups, more than the {max_groups:,} a report takes (its "
            f"comparisons grow with the square of the number of groups); give --max-groups {k} "
            f"(Python: max_groups={k}) to write it anyway, or use sheetfuncs table"
        )
    return groups


def _save(wb: Workbook, tmp: Path, target: Path, force: bool) -> None:
    """Save ``wb`` to ``tmp`` with the usual permissions of a new file, then put it at ``target``
    (:func:`_put_in_place`)."""
    wb.save(tmp)
    mask = os.umask(0)
    os.umask(mask)
    os.chmod(tmp, 0o666 & ~mask)
    _put_in_place(tmp, target, force)


def _put_in_place(tmp: Path, target: Path, force: bool) -> None:
    """Rename ``tmp`` to ``target``: with ``force`` replacing any file there; without, only when
    no file is there at this moment (a hard link fails if the name exists; where the file system
    has no hard links, the name is first reserved by creating it exclusively). A file found
    there is kept, and the message says so; ``tmp`` is removed in every case."""
    if force:
        os.replace(tmp, target)
        return
    try:
        try:
            os.link(tmp, target)
        except FileExistsError:
            raise
        except (OSError, NotImplementedError):  # no hard links here: reserve the name
            os.close(os.open(target, os.O_CREAT | os.O_EXCL | os.O_WRONLY, 0o666))
            try:
                os.replace(tmp, target)
            except BaseException:
                target.unlink(missing_ok=True)  # our empty reservation
                raise
    except FileExistsError:
        tmp.unlink(missing_ok=True)
        raise InputError(
            f"{str(target)!r} appeared while the report was being written and is kept; use "
            "--force (force=True) to replace it, or choose another name"
        ) from None
    tmp.unlink(missing_ok=True)
