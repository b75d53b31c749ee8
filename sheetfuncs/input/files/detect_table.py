"""Inside the table block: header, units row, identifier, label and summary columns, summary rows.

:func:`read_table` reads the block :mod:`.detect` chose as the table, for the wide layout (one
group per column), the long layout (label and value columns) or the rowwise layout. Rows are
first sorted by what they are (:mod:`.detect_rows`): data rows (numbers the majority of their
cells), summary rows (led by a summary word, or aggregate formulas over the block), sign-off
lines, other rows. The columns of the data rows are then sorted by what they hold.
"""

from __future__ import annotations

from collections.abc import Callable
from typing import Any

from ...errors import InputError
from ..cells import a1_range, column_letters
from ..groups import format_label
from ..reading import sheet_ref
from .detect_rows import Account, Block, Rows, Table, column_stats, is_label, lot_row, read_rows
from .block import is_blank
from .sheetcells import SheetCells
from .words import (
    is_comment_header, is_identifier_header, is_replicate_heading, is_row_heading, is_unit_row,
    summary_word,
)

__all__ = ["read_table"]


def read_table(
    block: Block, cells: SheetCells, layout: str, labels: str,
    formulas: Callable[[int, int, int, int], dict[tuple[int, int], str]] | None,
) -> Table:
    """The rectangle, the cells left out and the notes of the table ``block``."""
    fm = None
    if cells.has_formulas and formulas is not None:
        fm = formulas(block.top, block.left, block.bottom, block.right)
    rows = read_rows(block, fm)
    if layout == "long":
        return _long(rows, cells, labels)
    if layout == "rowwise":
        return _rowwise(rows, cells)
    return _wide(rows, cells, labels)


def _where(cells: SheetCells, r1: int, c1: int, r2: int, c2: int) -> str:
    return sheet_ref(cells.source.sheet, a1_range(r1, c1, r2, c2))


def _no_data(rows: Rows, cells: SheetCells) -> InputError:
    where = _where(cells, rows.block.top, rows.block.left, rows.block.bottom, rows.block.right)
    return InputError(
        f"the numbers in {where} are all in summary rows or identifier columns; give --range "
        "with the measurements"
    )


# --------------------------------------------------------------------------------------------
# wide


def _wide(rows: Rows, cells: SheetCells, labels: str) -> Table:
    """The wide layout: data rows, units row, lot numbers, columns, then the header."""
    acc = Account(rows, cells)
    data = rows.data_rows()
    if not data:
        raise _no_data(rows, cells)
    r0, last = data[0], data[-1]
    above = r0 - 1 if r0 - 1 in rows.runs else None
    units = above if above is not None and above - 1 in rows.runs and is_unit_row(rows.values(above)) and any(
        is_label(v) for v in rows.values(above - 1)) else None
    h = units - 1 if units is not None else above
    header, data = _lot_header(rows, cells, labels, h, r0, data, acc)
    head = header if header is not None else h
    value_cols = _sort_columns(rows, column_stats(rows, data, head), head, len(data), acc, cells)
    if header is None:
        header, data = _header(rows, cells, labels, h, r0, data, value_cols)
    top = header if header is not None else data[0]
    acc.rect(top, min(value_cols), last, max(value_cols), header, units)
    return acc.table("yes" if header is not None else "no")


def _lot_header(rows: Rows, cells: SheetCells, labels: str, h: int | None, r0: int,
                data: list[int], acc: Account) -> tuple[int | None, list[int]]:
    """The first data row as the header when it holds lot numbers (see :func:`lot_row`)."""
    if labels != "auto" or (h is not None and sum(1 for v in rows.values(h) if is_label(v)) > 1):
        return None, data
    lot = lot_row(rows, r0, data)
    where = _where(cells, r0, rows.block.left, r0, rows.block.right)
    if lot == "ambiguous":
        raise InputError(
            f"the first row of numbers {where} holds whole numbers, some far from the values "
            "below them (lot numbers?) and some not; give --labels yes (they are labels) or "
            "--labels no (they are data)"
        )
    if lot != "labels":
        return None, data
    acc.notes.append(
        f"the first row {where} holds whole numbers far from the values below them: read as "
        "group labels (--labels no reads it as data)"
    )
    return r0, data[1:]


def _numbers_as_text(rows: Rows, cells: SheetCells, c: int, name: str | None) -> InputError:
    """A column whose cells are numbers stored as text: the spreadsheet's own functions skip
    them, and so would the range rules; leaving the column out would drop a group silently."""
    b = rows.block
    where = sheet_ref(cells.source.sheet, a1_range(b.top, c, b.bottom, c))
    what = f' ("{name}")' if name else ""
    return InputError(
        f"the column {where}{what} holds numbers stored as text, which a spreadsheet's own "
        "functions skip; convert them to numbers in the sheet (or give a --range without that "
        "column)"
    )


def _numbered_or_data(rows: Rows, cells: SheetCells, c: int, name: str, st: Any) -> InputError:
    """A first column headed like a group whose values run 1, 2, 3, ...: sample numbers or
    measurements? Either reading is one ``--range`` away."""
    b = rows.block
    return InputError(
        f'column {column_letters(c)} ("{name}") holds the consecutive whole numbers '
        f"{st.lo:g} to {st.hi:g}: if they number the rows give --range "
        f"{_where(cells, b.top, c + 1, b.bottom, b.right)}, if they are measurements give "
        f"--range {_where(cells, b.top, b.left, b.bottom, b.right)}"
    )


def _numbered(stats: dict[int, Any], c: int, n_data: int) -> bool:
    """Whether column ``c`` numbers the rows: the first column, a run of consecutive whole
    numbers (step 1) in every one of at least 3 data rows, with another column of numbers."""
    st = stats[c]
    return (
        c == min(stats) and st.consecutive and st.numbers == n_data >= 3 and st.numbers_only
        and sum(1 for s in stats.values() if s.numbers) >= 2
    )


def _sort_columns(rows: Rows, stats: dict[int, Any], head: int | None, n_data: int, acc: Account,
                  cells: SheetCells) -> list[int]:
    """The value columns; identifier, label, date and summary columns go to ``acc``."""
    value_cols: list[int] = []
    text_cols: list[int] = []
    for c, st in sorted(stats.items()):
        title = rows.value(head, c) if head is not None else None
        name = format_label(title) if is_label(title) else None
        numbered = _numbered(stats, c, n_data)
        if numbered and name is not None and not (is_identifier_header(title) or is_row_heading(title)):
            raise _numbered_or_data(rows, cells, c, name, stats[c])
        if is_identifier_header(title) or numbered:
            acc.column(c, f"identifier column ({name})" if name else "identifier column", "identifier")
        elif summary_word(title) or c in rows.summary_cols:
            acc.column(c, f"summary column ({name})" if name else "summary column", "summary")
        elif not (st.numbers or st.others or st.texts or st.dates) and name:
            value_cols.append(c)  # a labelled column without values: the range rules say so
        elif not st.numbers and not st.others:
            if st.texts and 2 * st.numeric_texts >= st.texts:
                raise _numbers_as_text(rows, cells, c, name)
            if st.texts:
                text_cols.append(c)
            what = ("date column" if st.dates and not st.texts
                    else "comment column" if is_comment_header(title) else "label column")
            acc.column(c, f"{what} ({name})" if name else what,
                       "comment" if what == "comment column" else "identifier")
        else:
            value_cols.append(c)
    if not value_cols:
        raise _no_data(rows, cells)
    if len(value_cols) == 1 and len(text_cols) == 1 and stats[text_cols[0]].repeats:
        c = min(text_cols[0], value_cols[0])
        where = _where(cells, rows.block.top, c, rows.block.bottom, max(text_cols[0], value_cols[0]))
        raise InputError(
            f"{where} looks like the long layout (a column of group labels beside a column of "
            "numbers); give --layout long"
        )
    _check_replicates(rows, cells, head, value_cols, text_cols, stats)
    return value_cols


def _check_replicates(rows: Rows, cells: SheetCells, head: int | None, value_cols: list[int],
                      text_cols: list[int], stats: dict[int, Any]) -> None:
    """Stop when the columns are headed as replicates (``Rep 1``, ``Run 2``, ``3``) beside a
    column with a label per row: the rows are then likely the groups (``--layout rowwise``)."""
    if head is None or len(text_cols) != 1 or stats[text_cols[0]].repeats or len(value_cols) < 2:
        return
    titles = [rows.value(head, c) for c in value_cols]
    if all(isinstance(t, str) and is_replicate_heading(t) for t in titles):
        where = _where(cells, head, min(value_cols), head, max(value_cols))
        block = _where(cells, head, min(value_cols), rows.block.bottom, max(value_cols))
        raise InputError(
            f"the columns headed {where} look like replicates, and column "
            f"{column_letters(text_cols[0])} holds a label for each row: if each row is a group, "
            f"give --layout rowwise; if each column is, give --range {block}"
        )


def _header(rows: Rows, cells: SheetCells, labels: str, h: int | None, r0: int, data: list[int],
            value_cols: list[int]) -> tuple[int | None, list[int]]:
    """The header row (``None``: no labels) and the data rows under it."""
    if labels == "no":
        return None, data
    over = [rows.value(h, c) for c in value_cols] if h is not None else []
    title = h is not None and len(value_cols) > 1 and sum(1 for v in rows.values(h) if not is_blank(v)) == 1
    if labels == "yes":
        if h is not None and not title and any(not is_blank(v) for v in over):
            return h, data
        return r0, data[1:]
    if h is None:
        return None, data
    named = [v for v in over if is_label(v)]
    if len(named) == len(value_cols):
        return h, data
    if not named and title:
        return None, data  # a title or note right above the numbers
    missing = [c for c, v in zip(value_cols, over) if not is_label(v)]
    where = _where(cells, h, min(value_cols), h, max(value_cols))
    blank = f"{column_letters(missing[0])}{h}"
    raise InputError(
        f"the row above the numbers, {where}, has labels over some columns of numbers but not "
        f"over others ({blank}); give --labels yes or --labels no, or a --range that holds the table"
    )


# --------------------------------------------------------------------------------------------
# long and rowwise


def _long(rows: Rows, cells: SheetCells, labels: str) -> Table:
    """The long layout: a label column and a value column; further columns are comments."""
    acc = Account(rows, cells)
    data = [r for r in rows.order if rows.kind[r] in ("data", "other") and rows.counts[r][0]]
    if not data:
        raise _no_data(rows, cells)
    r0, last = data[0], data[-1]
    span = [r for r in rows.order if r0 <= r <= last and rows.kind[r] not in ("summary", "signoff")]
    above = r0 - 1 if r0 - 1 in rows.runs else None
    header = None
    if labels == "yes":
        header = above if above is not None else r0
    elif labels == "auto" and above is not None and all(
        is_label(v) for v in rows.values(above) if v is not None and v != ""
    ):
        header = above
    body = [r for r in span if r != header]
    stats = column_stats(rows, body, header)
    cols = []
    for c, st in sorted(stats.items()):
        title = rows.value(header, c) if header is not None else None
        if is_identifier_header(title) or _numbered(stats, c, len(body)):
            name = format_label(title) if is_label(title) else None
            acc.column(c, f"identifier column ({name})" if name else "identifier column", "identifier")
        else:
            cols.append(c)
    if len(cols) < 2 or cols[1] != cols[0] + 1 or stats[cols[1]].numbers == 0:
        where = _where(cells, rows.block.top, rows.block.left, rows.block.bottom, rows.block.right)
        raise InputError(
            f"in the long layout the first two columns of {where} should hold the group labels "
            "and the values, but they do not; give --range with the label and value columns"
        )
    for c in cols[2:]:
        title = rows.value(header, c) if header is not None else None
        acc.column(c, f"comment column ({format_label(title)})" if is_label(title) else "comment column",
                   "comment")
    acc.rect(header if header is not None else r0, cols[0], last, cols[1], header, None)
    return acc.table("yes" if header is not None else "no")


def _rowwise(rows: Rows, cells: SheetCells) -> Table:
    """The rowwise layout: the rows that hold numbers, with the title and sign-off rows left out."""
    acc = Account(rows, cells)
    data = [r for r in rows.order if rows.kind[r] in ("data", "other") and rows.counts[r][0]]
    if not data:
        raise _no_data(rows, cells)
    r0, last = data[0], data[-1]
    span = [r for r in rows.order if r0 <= r <= last]
    left = min(rows.runs[r][1] for r in span)
    right = max(rows.runs[r][1] + len(rows.runs[r][2]) - 1 for r in span)
    acc.rect(r0, left, last, right, None, None, heading="column headings above the table")
    return acc.table("auto")
