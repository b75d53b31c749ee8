"""sheetfuncs, exact one-way analysis of variance for spreadsheet users.

The layers, with imports running only downward: :mod:`~sheetfuncs.input` (from cells to
groups), :mod:`~sheetfuncs.distributions`, :mod:`~sheetfuncs.stats` (the pure core: functions on
numbers returning frozen result objects), then the fronts, which only convert arguments in and
shape results out: :mod:`~sheetfuncs.worksheet` (the live worksheet functions, handed to xlwings
by :mod:`sheetfuncs.udfs`), :mod:`~sheetfuncs.report` (the headless report writer),
:mod:`~sheetfuncs.engines` (the analyses pushed down to DuckDB and Spark),
:mod:`~sheetfuncs.templates` and :mod:`~sheetfuncs.cli` (the command line). This module is the public API of the library.
"""

from importlib import import_module
from typing import Any

#: Where each public name lives; imported on first use (PEP 562), so that ``import sheetfuncs``
#: and the command line start without loading numpy and scipy first (and Ctrl-C during start-up
#: is one line, see :mod:`sheetfuncs.__main__`).
_EXPORTS = {
    "InputError": ".errors",
    "CellNote": ".input", "Groups": ".input", "as_groups": ".input", "groups_from_long": ".input",
    "groups_from_range": ".input", "CellBlock": ".input", "LoadedGroups": ".input",
    "read_cells": ".input", "read_groups": ".input",
    "f_critical": ".distributions", "f_tail": ".distributions",
    "OneWayResult": ".stats", "oneway": ".stats", "oneway_from_summary": ".stats",
    "ContrastResult": ".stats", "LinearTestResult": ".stats", "contrast": ".stats",
    "linear_test": ".stats", "DescribeResult": ".stats", "GroupSummary": ".stats",
    "describe": ".stats", "BrownForsytheResult": ".stats", "KruskalResult": ".stats",
    "WelchResult": ".stats", "brown_forsythe": ".stats", "kruskal": ".stats", "welch": ".stats",
    "BartlettResult": ".stats", "ChecksResult": ".stats", "LeveneResult": ".stats",
    "NormalityResult": ".stats", "bartlett": ".stats", "checks": ".stats", "levene": ".stats",
    "shapiro_residuals": ".stats", "PairRow": ".stats", "PairwiseResult": ".stats",
    "dunnett": ".stats", "pairwise": ".stats", "LettersResult": ".stats", "letters": ".stats",
    "EffectSizes": ".stats", "effect_sizes": ".stats", "PowerPlan": ".stats",
    "detectable_effect": ".stats", "plan": ".stats", "cohens_f_from_difference": ".stats", "power": ".stats", "sample_size": ".stats",
    "VarianceComponents": ".stats", "variance_components": ".stats",
    "oneway_sql": ".engines", "group_sums": ".engines", "GroupSums": ".engines",
    "analyse_sql": ".engines", "SqlAnalysis": ".engines",
}

__version__ = "0.1.0"

__all__ = [
    # input
    "InputError", "CellNote", "Groups", "as_groups", "groups_from_range", "groups_from_long",
    "CellBlock", "LoadedGroups", "read_cells", "read_groups",
    # the one-way analysis, general linear test, F distribution, summaries
    "OneWayResult", "oneway", "oneway_from_summary",
    # the same analyses pushed down to a database engine (DuckDB: pip install sheetfuncs[sql];
    # Spark: sheetfuncs[spark])
    "oneway_sql", "group_sums", "GroupSums", "analyse_sql", "SqlAnalysis",
    "LinearTestResult", "ContrastResult", "linear_test", "contrast",
    "f_tail", "f_critical",
    "DescribeResult", "GroupSummary", "describe",
    # alternatives and assumption checks
    "WelchResult", "BrownForsytheResult", "KruskalResult", "welch", "brown_forsythe", "kruskal",
    "LeveneResult", "BartlettResult", "NormalityResult", "ChecksResult",
    "levene", "bartlett", "shapiro_residuals", "checks",
    # comparisons
    "PairRow", "PairwiseResult", "pairwise", "dunnett", "LettersResult", "letters",
    # effect sizes, planning, variance components
    "EffectSizes", "effect_sizes", "PowerPlan", "power", "sample_size", "detectable_effect", "plan",
    "cohens_f_from_difference",
    "VarianceComponents", "variance_components",
    "__version__",
]


def __getattr__(name: str) -> Any:
    """A public name (imported from its module on first use), or a sub-package such as
    ``sheetfuncs.stats``."""
    module = _EXPORTS.get(name)
    if module is not None:
        value = getattr(import_module(module, __name__), name)
        globals()[name] = value
        return value
    try:
        return import_module(f".{name}", __name__)
    except ModuleNotFoundError:
        raise AttributeError(f"module {__name__!r} has no attribute {name!r}") from None


def __dir__() -> list[str]:
    return sorted(set(globals()) | set(__all__))
