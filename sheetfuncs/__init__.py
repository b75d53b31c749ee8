"""sheetfuncs, exact one-way analysis of variance for spreadsheet users.

The layers, with imports running only downward: :mod:`~sheetfuncs.input` (from cells to
groups), :mod:`~sheetfuncs.distributions`, :mod:`~sheetfuncs.stats` (the pure core: functions on
numbers returning frozen result objects), then the fronts, which only convert arguments in and
shape results out: :mod:`~sheetfuncs.worksheet` (the live worksheet functions, handed to xlwings
by :mod:`sheetfuncs.udfs`), :mod:`~sheetfuncs.report` (the headless report writer) and
:mod:`~sheetfuncs.cli` (the command line). This module is the public API of the library.
"""

from .errors import InputError
from .input import CellNote, Groups, as_groups, groups_from_long, groups_from_range
from .distributions import f_critical, f_tail
from .stats import OneWayResult, oneway, oneway_from_summary
from .stats import ContrastResult, LinearTestResult, contrast, linear_test
from .stats import DescribeResult, GroupSummary, describe
from .stats import BrownForsytheResult, KruskalResult, WelchResult, brown_forsythe, kruskal, welch
from .stats import (
    BartlettResult, ChecksResult, LeveneResult, NormalityResult, bartlett, checks, levene,
    shapiro_residuals,
)
from .stats import PairRow, PairwiseResult, dunnett, pairwise
from .stats import LettersResult, letters
from .stats import EffectSizes, effect_sizes
from .stats import PowerPlan, detectable_effect, plan, power, sample_size
from .stats import VarianceComponents, variance_components
from .input import CellBlock, LoadedGroups, read_cells, read_groups

__version__ = "0.1.0"

__all__ = [
    # input
    "InputError", "CellNote", "Groups", "as_groups", "groups_from_range", "groups_from_long",
    "CellBlock", "LoadedGroups", "read_cells", "read_groups",
    # the one-way analysis, general linear test, F distribution, summaries
    "OneWayResult", "oneway", "oneway_from_summary",
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
    "VarianceComponents", "variance_components",
    "__version__",
]
