"""From cells to groups: the one cleaning step between what a user has and what the statistics need.

``cells`` (what a cell holds, the host's error values, A1 references), ``groups``
(:class:`Groups` and Python inputs, missing values dropped on request), ``labels`` (labels as
text, possible typos, renames and case merges), ``ranges`` (the range rules that clean a
spreadsheet range, error cells read as missing values on request), ``options`` (checks of scalar options, values as messages show them), ``source`` (where
a range came from), ``files`` (workbooks and CSV files, read safely) and ``demo`` (the built-in
invented data). Other layers import from this package, not its modules.
"""

from .cells import (
    COM_ERROR_CODES, ERROR_TEXTS, MAX_COLS, MAX_ROWS, RangeRef, a1_range, cell_position,
    column_letters, column_number, error_text, is_error_text, parse_range,
)
from .demo import DEMO_FACTOR, DEMO_RESPONSE, DEMO_TITLE, DEMO_UNIT, demo_groups, demo_rows
from .files import (
    DEFAULT_MAX_CELLS, DEFAULT_MAX_FIELDS, DEFAULT_SIZE_LIMIT, CellBlock, LoadedGroups, read_cells, read_groups, same_file,
    workbook_properties,
)
from .labels import parse_rename, relabel
from .reading import LeftOut, Reading, cell_content, group_sizes, sheet_ref
from .groups import CellNote, Groups, as_groups, first_duplicate, format_label
from .options import (
    as_real, check_alpha, check_conf, check_number, check_probability, check_range, check_whole,
    one_line, shown,
)
from .ranges import groups_from_long, groups_from_range, parse_errors
from .source import InputSource, RowsOrigin

__all__ = [
    "COM_ERROR_CODES", "ERROR_TEXTS", "MAX_COLS", "MAX_ROWS", "RangeRef", "a1_range",
    "cell_position", "column_letters", "column_number", "error_text", "is_error_text", "parse_range",
    "DEMO_FACTOR", "DEMO_RESPONSE", "DEMO_TITLE", "DEMO_UNIT", "demo_groups", "demo_rows",
    "DEFAULT_MAX_CELLS", "DEFAULT_MAX_FIELDS", "DEFAULT_SIZE_LIMIT", "CellBlock", "LoadedGroups", "read_cells", "read_groups",
    "same_file", "workbook_properties",
    "CellNote", "Groups", "as_groups", "first_duplicate", "format_label", "groups_from_long", "groups_from_range",
    "as_real", "check_alpha", "check_conf", "check_number", "check_probability", "check_range",
    "check_whole", "one_line", "shown",
    "InputSource", "RowsOrigin", "LeftOut", "Reading", "cell_content", "group_sizes", "sheet_ref", "parse_rename", "relabel", "parse_errors",
]
