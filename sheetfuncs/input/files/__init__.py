"""Reading a block of cells from a workbook (``.xlsx``, ``.xlsm``) or a CSV file, safely.

``reader`` (the entry points), ``safety`` (the checks before anything is parsed), ``xlsx``
(workbooks, document properties), ``delimited`` (CSV files, the number grammar of their fields)
and ``block`` (the block of cells both readers return).
"""

from .block import CellBlock, Progress
from .delimited import csv_value, detect_delimiter
from .reader import (
    CSV_SUFFIXES, DEFAULT_MAX_CELLS, DEFAULT_MAX_FIELDS, WORKBOOK_SUFFIXES, LoadedGroups, ReadOptions, input_kind, read_cells, read_groups,
    same_file,
)
from .safety import DEFAULT_SIZE_LIMIT, check_archive, member_header, openpyxl_uses_defusedxml
from .xlsx import workbook_properties

__all__ = [
    "CSV_SUFFIXES", "DEFAULT_MAX_CELLS", "DEFAULT_MAX_FIELDS", "DEFAULT_SIZE_LIMIT", "WORKBOOK_SUFFIXES", "CellBlock", "LoadedGroups",
    "Progress", "ReadOptions", "check_archive", "member_header", "csv_value", "detect_delimiter", "input_kind",
    "openpyxl_uses_defusedxml", "read_cells", "read_groups", "same_file", "workbook_properties",
]
