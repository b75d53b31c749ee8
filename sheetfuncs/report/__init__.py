"""The headless report writer: a formatted result workbook from one set of core results.

``write_report(groups, path, ...)`` writes the sheets Findings, Tables, Comparisons, Groups,
Data (Data 2, ... beyond a sheet's row limit), Chart, Audit and About; see ``docs/report.md``.
``write_sums_report(analysis, path, origin=...)`` writes the report of rows analysed inside a
database engine (:func:`sheetfuncs.engines.analyse_sql`), with a Sums sheet for the Data sheets.
"""

from .writer import (
    DEFAULT_MAX_GROUPS, ROW_LIMIT, SHEET_ORDER, build_workbook, write_report, write_sums_report,
)

__all__ = [
    "write_report", "write_sums_report", "build_workbook", "ROW_LIMIT", "SHEET_ORDER",
    "DEFAULT_MAX_GROUPS",
]
