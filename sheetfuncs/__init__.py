"""sheetfuncs: exact one-way analysis of variance for spreadsheet users.

The core is pure functions on numbers returning frozen result objects; the worksheet functions
(:mod:`sheetfuncs.udfs`), the report writer (:mod:`sheetfuncs.report`) and the command line only
convert arguments in and shape results out.
"""

from .errors import InputError
from .groups import CellNote, Groups, as_groups, groups_from_long, groups_from_range
from .fdist import f_critical, f_tail
from .oneway import OneWayResult, oneway, oneway_from_summary
from .linear import ContrastResult, LinearTestResult, contrast, linear_test
from .describe import DescribeResult, GroupSummary, describe

__version__ = "0.1.0"

__all__ = [
    "InputError",
    "CellNote",
    "Groups",
    "as_groups",
    "groups_from_range",
    "groups_from_long",
    "f_tail",
    "f_critical",
    "OneWayResult",
    "oneway",
    "oneway_from_summary",
    "LinearTestResult",
    "ContrastResult",
    "linear_test",
    "contrast",
    "DescribeResult",
    "GroupSummary",
    "describe",
    "__version__",
]

from .alternatives import BrownForsytheResult, KruskalResult, WelchResult, brown_forsythe, kruskal, welch  # noqa: E402
from .assumptions import (  # noqa: E402
    BartlettResult, ChecksResult, LeveneResult, NormalityResult, bartlett, checks, levene, shapiro_residuals,
)

__all__ += [
    "WelchResult", "BrownForsytheResult", "KruskalResult", "welch", "brown_forsythe", "kruskal",
    "LeveneResult", "BartlettResult", "NormalityResult", "ChecksResult",
    "levene", "bartlett", "shapiro_residuals", "checks",
]

from .effects import EffectSizes, effect_sizes  # noqa: E402
from .power import PowerPlan, detectable_effect, plan, power, sample_size  # noqa: E402  (the function shadows the module name)
from .varcomp import VarianceComponents, variance_components  # noqa: E402

__all__ += [
    "EffectSizes", "effect_sizes", "PowerPlan", "power", "sample_size", "detectable_effect", "plan",
    "VarianceComponents", "variance_components",
]

from .readers import CellBlock, LoadedGroups, read_cells, read_groups  # noqa: E402

__all__ += ["CellBlock", "LoadedGroups", "read_cells", "read_groups"]

from .pairwise import PairRow, PairwiseResult, dunnett, pairwise  # noqa: E402  (functions shadow their module names)
from .letters import LettersResult, letters  # noqa: E402

__all__ += ["PairRow", "PairwiseResult", "pairwise", "dunnett", "LettersResult", "letters"]
