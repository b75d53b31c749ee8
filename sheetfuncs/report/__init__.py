"""The headless report writer: a formatted result workbook from one set of core results.

``write_report(groups, path, ...)`` writes the sheets Findings, Tables, Comparisons, Groups,
Data (Data 2, ... beyond a sheet's row limit), Chart, Audit and About; see ``docs/report.md``.
"""

from .writer import DEFAULT_MAX_GROUPS, ROW_LIMIT, SHEET_ORDER, build_workbook, write_report

__all__ = ["write_report", "build_workbook", "ROW_LIMIT", "SHEET_ORDER", "DEFAULT_MAX_GROUPS"]
