"""The worksheet functions, one module per topic, and :data:`REGISTRY`, every one of them.

``oneway`` (the one-way table and its figures, group summaries, the table from summary
statistics, the general linear test, contrasts, the F distribution), ``checks`` (the
alternatives to the F test and the assumption checks), ``comparisons`` (pairs, Dunnett,
letters) and ``effects`` (effect sizes, planning, variance components); ``shared`` holds the
arguments most of them take and the example sheet (invented data) of the documentation.
Each function is the object :func:`~sheetfuncs.worksheet.registry.worksheet_function` made,
with its record as ``__sheetfuncs__``; :mod:`sheetfuncs.udfs` hands them to xlwings.
"""

from collections.abc import Mapping

from ..registry import Function, collect
from . import checks, comparisons, effects, oneway
from .checks import (
    SF_BARTLETT, SF_BROWNFORSYTHE, SF_CHECKS, SF_KRUSKAL, SF_LEVENE, SF_SHAPIRO, SF_WELCH,
)
from .comparisons import SF_DUNNETT, SF_LETTERS, SF_PAIRS
from .effects import SF_DETECTABLE, SF_EFFECT, SF_POWER, SF_SAMPLESIZE, SF_VARCOMP
from .oneway import (
    SF_CONTRAST, SF_DFB, SF_DFT, SF_DFW, SF_F, SF_FCRIT, SF_FROMSTATS, SF_FTAIL, SF_GLT,
    SF_GROUPS, SF_MSB, SF_MSW, SF_P, SF_R2, SF_SSB, SF_SST, SF_SSW, SF_TABLE,
)
from .shared import EXAMPLE_NOTE, EXAMPLE_SHEET

#: Every worksheet function by name, in the documented order: topic by topic, and within a
#: topic in the order its module defines them.
REGISTRY: Mapping[str, Function] = collect(oneway, checks, comparisons, effects)

__all__ = [
    "REGISTRY", "EXAMPLE_NOTE", "EXAMPLE_SHEET",
    # oneway
    "SF_TABLE", "SF_SSB", "SF_SSW", "SF_SST", "SF_DFB", "SF_DFW", "SF_DFT", "SF_MSB", "SF_MSW",
    "SF_F", "SF_P", "SF_R2", "SF_GROUPS", "SF_FROMSTATS", "SF_GLT", "SF_CONTRAST", "SF_FTAIL",
    "SF_FCRIT",
    # checks
    "SF_WELCH", "SF_BROWNFORSYTHE", "SF_KRUSKAL", "SF_LEVENE", "SF_BARTLETT", "SF_SHAPIRO",
    "SF_CHECKS",
    # comparisons
    "SF_PAIRS", "SF_DUNNETT", "SF_LETTERS",
    # effects
    "SF_EFFECT", "SF_POWER", "SF_SAMPLESIZE", "SF_DETECTABLE", "SF_VARCOMP",
]
