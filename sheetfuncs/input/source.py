"""Where a range came from, so that fronts can give sheet-and-address positions."""

from __future__ import annotations

from dataclasses import dataclass

from .cells import column_letters

__all__ = ["InputSource"]


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
