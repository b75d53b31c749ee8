"""Filling a template headless: data into its block, every formula's value stored with it.

:func:`fill_template` takes any workbook with a named data block and SF_ formulas (ours or a
user's), puts the data read from a file into the block, computes every SF_ cell with the core
(through the registry, as the harness calls it), gets the values of the other formulas from the
``formulas`` library (why that library: :mod:`.evaluate`), and writes a copy of the template in
which only the cells written differ. Formulas are kept, so the output stays live where the
functions are installed, and their values are stored, so that it shows the numbers in any
program.

The copy is made member by member in the template's order, with the same names, times and
compression (the approach of :mod:`sheetfuncs.worksheet.calc.workbook`); only the worksheet parts
that hold written cells change, and in them only those cells (:mod:`.cells`); a table over the
block gets its column names from the labels written. Macros of an ``.xlsm`` are copied as they
are. The target is written beside itself under a temporary name and renamed; on any problem
nothing is written. :func:`fill_batch` fills one workbook per data file.
"""

from __future__ import annotations

import os
import re
import shutil
import tempfile
import zipfile
from dataclasses import dataclass
from pathlib import Path
from typing import Any, Callable, Mapping, Sequence

import openpyxl

from ..errors import InputError
from ..input import column_letters, is_error_text, read_cells, read_groups, same_file
from ..input.files import check_archive, member_header
from .book import Block, find_block, read_book
from .cells import CellValue, ErrorValue, Value, patch_sheet, split_ref
from .compute import FormulaCell, compute_sf_cells
from .evaluate import UNKNOWN, evaluate_workbook

__all__ = ["Filled", "Batch", "fill_template", "fill_batch", "keep_stored_values", "CALC_ID"]

#: Progress of a batch: (files done, files in all, the data file being filled).
BatchProgress = Callable[[int, int, Path], None]

_SUFFIXES = (".xlsx", ".xlsm", ".xltx", ".xltm")


@dataclass(frozen=True)
class Filled:
    """What :func:`fill_template` did.

    ``block`` is the block's address (``'Data entry'!$B$12:$G$61``) and ``name`` its defined
    name; ``cells_written`` counts the data cells written (cleared ones included);
    ``computed`` lists the SF_ cells computed with the core and ``dependents`` the other formula
    cells whose value was stored (sheet-qualified addresses); ``notes`` says anything a user
    should know, one line each (cells the reading left out, values the library could not give).
    """

    template: Path
    target: Path
    name: str
    block: str
    cells_written: int
    computed: tuple[str, ...]
    dependents: tuple[str, ...]
    notes: tuple[str, ...]


@dataclass(frozen=True)
class Batch:
    """What :func:`fill_batch` did: one :class:`Filled` per data file filled, and the files
    that were not filled with the one line that says why."""

    filled: tuple[Filled, ...]
    failed: tuple[tuple[Path, str], ...]


def _check_paths(src: Path, dst: Path) -> None:
    if not src.is_file():
        raise InputError(f"the template {src} does not exist; check the file name")
    if src.suffix.lower() not in _SUFFIXES:
        raise InputError(f"the template {src.name} is not an .xlsx or .xlsm workbook; save it as one")
    check_archive(src)
    if dst.exists() and same_file(src, dst):
        raise InputError(f"the target {dst.name} is the template itself; give another file name")
    if not dst.parent.is_dir():
        raise InputError(f"the target's folder {dst.parent} does not exist; create it or choose another")
    if dst.suffix.lower() != src.suffix.lower():
        raise InputError(f"the target {dst.name} needs the template's ending {src.suffix} "
                         "(Excel refuses a file whose name does not match its content)")


def _ref(block: Block, i: int, j: int) -> str:
    return f"{column_letters(block.left + j)}{block.top + i}"


def _group_grid(block: Block, data: Path, options: dict[str, Any]) -> tuple[list[list[Value]], tuple[str, ...]]:
    loaded = read_groups(data, **options)
    groups = loaded.groups
    longest = max(a.size for a in groups.arrays)
    if len(groups.labels) > block.cols or longest > block.rows - 1:
        raise InputError(
            f"the data ({len(groups.labels)} groups, up to {longest} values each) do not fit the "
            f"block {block.name} ({block.cols} columns, {block.rows - 1} rows below the labels); "
            "use a template with a larger block or fewer data (nothing was written)")
    grid: list[list[Value]] = [[None] * block.cols for _ in range(block.rows)]
    for j, (label, values) in enumerate(zip(groups.labels, groups.arrays)):
        grid[0][j] = label
        for i, v in enumerate(values.tolist(), start=1):
            grid[i][j] = float(v)
    said = loaded.reading.summary(groups.labels, groups.counts)  # what was read, left out
    return grid, (said, *loaded.reading.notes)


#: The reading options that apply to a cells block (copied as it is: no groups, no labels).
_CELL_OPTIONS = ("sheet", "cell_range", "decimal_comma", "size_limit", "max_cells", "max_fields")


def _cell_grid(block: Block, data: Path, options: dict[str, Any]) -> tuple[list[list[Value]], tuple[str, ...]]:
    cells = read_cells(data, **{k: v for k, v in options.items() if k in _CELL_OPTIONS})
    if cells.n_rows > block.rows or cells.n_cols > block.cols:
        raise InputError(
            f"the data ({cells.n_rows} rows x {cells.n_cols} columns) do not fit the block "
            f"{block.name} ({block.rows} x {block.cols}); use a template with a larger block or "
            "fewer data (nothing was written)")
    grid: list[list[Value]] = [[None] * block.cols for _ in range(block.rows)]
    for i, row in enumerate(cells.rows):
        for j, v in enumerate(row):
            grid[i][j] = _data_value(v)
    return grid, tuple(cells.notes)


def _data_value(v: Any) -> Value:
    if isinstance(v, bool) or v is None:
        return v
    if isinstance(v, (int, float)):
        return float(v)
    if isinstance(v, str) and is_error_text(v.strip()):
        return ErrorValue(v.strip())
    if hasattr(v, "isoformat"):
        return v.isoformat()
    return str(v)


def _data_writes(block: Block, data: Path, options: dict[str, Any]) -> tuple[dict[str, CellValue], tuple[str, ...], tuple[str, ...]]:
    """The block's cells to write, the header labels and the reading's notes."""
    grid, notes = (_cell_grid if block.cells else _group_grid)(block, data, options)
    writes = {_ref(block, i, j): CellValue(grid[i][j])
              for i in range(block.rows) for j in range(block.cols)}
    header = tuple("" if v is None else str(v) for v in grid[0])
    return writes, header, notes


_COLUMN = re.compile(r'(<(?:\w+:)?tableColumn\b[^>]*?\bname=")([^"]*)(")')


def _xml_attr(text: str) -> str:
    return (text.replace("&", "&amp;").replace("<", "&lt;").replace('"', "&quot;")
            .replace("\n", "_x000a_"))


def patch_table(xml: str, header: Sequence[str]) -> str:
    """The table part with its column names set to the header's texts; a blank header cell
    keeps the column's name (Excel requires one)."""
    names = iter(header)

    def one(m: re.Match[str]) -> str:
        label = next(names, "")
        return m.group(0) if not label else m.group(1) + _xml_attr(label) + m.group(3)

    return _COLUMN.sub(one, xml)


#: Excel's calculation-engine id since Excel 2016 (common practice: what it writes in calcPr).
CALC_ID = 191029
_CALC_PR = re.compile(r"<calcPr\b[^>]*?/?>")


def keep_stored_values(xml: str) -> str:
    """The workbook part with its calculation settings asking programs to show the stored
    values: no ``fullCalcOnLoad`` (openpyxl sets it, and a program then recalculates every
    formula on opening: an SF_ cell where the functions are not installed would show #NAME?
    instead of its value) and a current ``calcId`` (Excel recalculates a workbook calculated by
    an older engine). Nothing else in the part changes; without a ``calcPr`` it is unchanged."""
    m = _CALC_PR.search(xml)
    if m is None:
        return xml
    tag = re.sub(r'\s+fullCalcOnLoad="(?:1|true)"', "", m.group(0))
    found = re.search(r'\bcalcId="(\d+)"', tag)
    if found is None:
        tag = tag.replace("<calcPr", f'<calcPr calcId="{CALC_ID}"', 1)
    elif int(found.group(1)) < CALC_ID:
        tag = tag.replace(found.group(0), f'calcId="{CALC_ID}"')
    return xml[:m.start()] + tag + xml[m.end():]


def write_copy(src: Path, dst: Path, parts: Mapping[str, Mapping[str, CellValue]],
               tables: Mapping[str, Sequence[str]], workbook: str | None = None) -> None:
    """Copy ``src`` to ``dst`` member by member, with the cells of ``parts`` (sheet part →
    cells) written, the table parts ``tables`` given their column names and, when
    ``workbook`` names the workbook part, its calculation settings set to show the stored
    values (:func:`keep_stored_values`)."""
    fd, tmp_name = tempfile.mkstemp(prefix=f".{dst.name}.", suffix=".tmp", dir=dst.parent)
    tmp = Path(tmp_name)
    try:
        with os.fdopen(fd, "wb") as fh, zipfile.ZipFile(src) as zin, zipfile.ZipFile(fh, "w") as out:
            out.comment = zin.comment
            for info in zin.infolist():
                data = zin.read(info)
                if info.filename in parts:
                    data = patch_sheet(data.decode("utf-8"), parts[info.filename]).encode("utf-8")
                elif info.filename in tables:
                    data = patch_table(data.decode("utf-8"), tables[info.filename]).encode("utf-8")
                elif info.filename == workbook:
                    data = keep_stored_values(data.decode("utf-8")).encode("utf-8")
                out.writestr(member_header(info), data)
        shutil.copymode(src, tmp)
        os.replace(tmp, dst)
    except BaseException:
        tmp.unlink(missing_ok=True)
        raise


def _where(sheet: str, ref: str) -> str:
    return "'" + sheet.replace("'", "''") + "'!" + ref


def _differs(new: Value, old: Any) -> bool:
    if isinstance(new, ErrorValue):
        return new.text != old
    if isinstance(new, float) and isinstance(old, (int, float)) and not isinstance(old, bool):
        return new != float(old)
    return new != old and not (new in ("", None) and old in ("", None))


def _dependents(formulas: Sequence[FormulaCell], values: Mapping[tuple[str, str], Value],
                cached: Any) -> tuple[dict[tuple[str, str], Value], list[str]]:
    """The non-SF formula cells whose value changed, and notes on values the library lacked."""
    out: dict[tuple[str, str], Value] = {}
    notes: list[str] = []
    for f in formulas:
        if f.sf:
            continue
        first, _, last = (f.area or f.ref).partition(":")
        for key in _area_cells(f.sheet, first, last or first):
            if key not in values:
                continue
            new = values[key]
            if isinstance(new, ErrorValue) and new.text == UNKNOWN:
                notes.append(f"{_where(*key)}: the evaluation library does not know a function of "
                             f"{f.text}; its stored value was left as it was")
            elif _differs(new, cached[key[0]][key[1]].value):
                out[key] = new
    return out, notes


def _area_cells(sheet: str, first: str, last: str) -> list[tuple[str, str]]:
    (r1, c1), (r2, c2) = split_ref(first), split_ref(last)
    return [(sheet, f"{column_letters(c)}{r}") for r in range(r1, r2 + 1) for c in range(c1, c2 + 1)]


def fill_template(template: str | os.PathLike[str], data: str | os.PathLike[str],
                  target: str | os.PathLike[str], *, into: str | None = None,
                  sheet: str | None = None, cell_range: str | None = None,
                  **read_options: Any) -> Filled:
    """Fill ``template`` with the data of ``data`` and write the result to ``target``.

    ``into`` names the block (a defined name or a table; default: the only defined name over a
    range of cells); ``sheet``, ``cell_range`` and ``read_options`` are passed to the reader
    (:func:`sheetfuncs.input.read_groups`, or :func:`sheetfuncs.input.read_cells` for a block
    marked ``sheetfuncs: cells``). Bad or ambiguous input raises :class:`InputError` with one
    line, and nothing is written.
    """
    src, dst, path = Path(template), Path(target), Path(data)
    _check_paths(src, dst)
    book = read_book(src)
    block = find_block(book, into, src.name)
    options = dict(read_options, sheet=sheet, cell_range=cell_range)
    writes, header, notes = _data_writes(block, path, options)
    tables = {block.table.part: header} if block.table else {}
    with tempfile.TemporaryDirectory(prefix="sheetfuncs-fill-") as tmp:
        stage = Path(tmp) / ("stage" + src.suffix.lower())
        write_copy(src, stage, {block.part: writes}, tables)
        names = {n.upper(): t for n, t, _ in book.names}
        computed, formulas = compute_sf_cells(stage, names)
        sheets = tuple(s for s, _ in book.sheets)
        values = evaluate_workbook(stage, sheets, dict(computed.given)).as_dict()
    cached = openpyxl.load_workbook(src, data_only=True)
    deps, dep_notes = _dependents(formulas, values, cached)
    parts: dict[str, dict[str, CellValue]] = {block.part: dict(writes)}
    for (sh, ref), v in list(computed.cells) + list(deps.items()):
        parts.setdefault(book.part_of(sh), {})[ref] = CellValue(v, keep_formula=True)
    write_copy(src, dst, parts, tables, workbook=book.part)
    return Filled(src, dst, block.name, block.address, len(writes),
                  tuple(_where(f.sheet, f.area or f.ref) for f in formulas if f.sf),
                  tuple(_where(*k) for k in deps), notes + computed.notes + tuple(dep_notes))


def fill_batch(template: str | os.PathLike[str], data_files: Sequence[str | os.PathLike[str]],
               folder: str | os.PathLike[str], *, progress: BatchProgress | None = None,
               **options: Any) -> Batch:
    """Fill ``template`` once per data file, into ``folder``/<data file's stem><template's
    ending>. A file that cannot be filled is listed with its one line; the others are filled.
    ``progress(done, total, data_file)`` is called before each file and once at the end."""
    paths = [Path(p) for p in data_files]
    stems = [p.stem for p in paths]
    twice = sorted({s for s in stems if stems.count(s) > 1})
    if twice:
        raise InputError(f"several data files are named {twice[0]}, and each gives "
                         f"{twice[0]}{Path(template).suffix}; rename them (nothing was written)")
    out_dir = Path(folder)
    filled, failed = [], []
    for i, p in enumerate(paths):
        if progress is not None:
            progress(i, len(paths), p)
        try:
            filled.append(fill_template(template, p, out_dir / (p.stem + Path(template).suffix),
                                        **options))
        except InputError as e:
            failed.append((p, str(e)))
    if progress is not None and paths:
        progress(len(paths), len(paths), paths[-1])
    return Batch(tuple(filled), tuple(failed))
