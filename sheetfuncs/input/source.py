"""Where the data came from: a range (:class:`InputSource`, so that fronts can give
sheet-and-address positions) or rows read by a database engine (:class:`RowsOrigin`)."""

from __future__ import annotations

from dataclasses import dataclass

from .cells import column_letters

__all__ = ["InputSource", "RowsOrigin"]


@dataclass(frozen=True)
class InputSource:
    """The file, sheet and top-left cell (1-based) of the range the groups were read from."""

    path: str | None = None
    sheet: str | None = None
    first_row: int = 1
    first_col: int = 1

    def address(self, row: int, col: int) -> str:
        """A1-style address of the 0-based cell (row, col) of the range, e.g. ``C5``."""
        return f"{column_letters(self.first_col + col)}{self.first_row + row}"

    def full_address(self, row: int, col: int) -> str:
        """Address with the sheet name when known, e.g. ``'Lot data'!C5``."""
        a = self.address(row, col)
        if not self.sheet:
            return a
        name = self.sheet.replace("'", "''")
        return f"'{name}'!{a}"


@dataclass(frozen=True)
class RowsOrigin:
    """Where the rows came from: ``engine`` and ``engine_version`` (e.g. ``"DuckDB"``,
    ``"2.0.1"``), ``source`` (the file name, table name or ``"the query"``), ``from_sql`` (the
    SQL text after ``FROM``: the file reader, the table or the query), ``where`` (the filter, or
    ``None``), ``rows_read`` (rows inside the filter, those left out included),
    ``null_labels`` (rows left out for a NULL group label), ``missing`` (NULL or NaN values left
    out, per group, with ``missing="drop"``), ``notes`` (the same in words), ``fetched``
    (whether the values had to be fetched for the in-memory analysis) and ``path`` (the
    absolute path of the Parquet or CSV file read, ``None`` for a table or a query)."""

    engine: str
    engine_version: str
    source: str
    from_sql: str
    where: str | None
    rows_read: int
    null_labels: int
    missing: tuple[int, ...]
    notes: tuple[str, ...]
    fetched: bool = False
    path: str | None = None
