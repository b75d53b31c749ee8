"""The report's sheets, one module per sheet, laid out from the results of
:func:`sheetfuncs.stats.analyse` (none computes a statistic).

``findings``, ``tables``, ``comparisons``, ``groups``, ``sums`` (for rows that stayed in a
database), ``chart``, ``audit`` and ``about`` lay their sheet out on a :class:`~sheetfuncs.report.grid.Grid`; ``data`` streams the Data sheets.
Shared pieces: ``styles`` (the look and the conditional-format marks), ``tabular`` (result
tables styled by column), ``data_layout`` (where every value sits on the Data sheets) and
``references`` (the published source of every method). The Audit sheet holds formulas only:
they recompute n, SS, df, MS, F and p from the Data sheets with the host's own functions.
"""

from .about import build_about
from .audit import build_audit
from .chart import build_chart
from .comparisons import build_comparisons
from .data import Progress, input_log, write_data
from .data_layout import DataLayout, Segment
from .findings import build_findings
from .groups import build_groups
from .styles import p_rule
from .sums import SumsColumns, build_sums
from .tables import NAMES, Positions, build_tables

__all__ = [
    "DataLayout", "Segment", "NAMES", "Positions", "Progress", "build_findings",
    "build_tables", "build_comparisons", "build_groups", "build_chart", "build_audit", "build_about",
    "write_data", "input_log", "p_rule", "SumsColumns", "build_sums",
]
