"""Reading a block of cells from a workbook (``.xlsx``, ``.xlsm``) or a CSV file, safely."""

from .reader import (
    CSV_SUFFIXES, DEFAULT_SIZE_LIMIT, WORKBOOK_SUFFIXES, CellBlock, LoadedGroups, check_archive,
    csv_value, detect_delimiter, input_kind, openpyxl_uses_defusedxml, read_cells, read_groups,
    workbook_properties,
)

__all__ = [
    "CSV_SUFFIXES", "DEFAULT_SIZE_LIMIT", "WORKBOOK_SUFFIXES", "CellBlock", "LoadedGroups",
    "check_archive", "csv_value", "detect_delimiter", "input_kind", "openpyxl_uses_defusedxml",
    "read_cells", "read_groups", "workbook_properties",
]
