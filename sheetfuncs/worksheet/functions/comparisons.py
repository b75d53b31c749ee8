"""Comparisons of groups: every pair (Tukey-Kramer and the other methods), each group with a
control (Dunnett), and the compact letter display. The methods and their sources:
docs/comparisons.md.
"""

from __future__ import annotations

from typing import Any

from ...input import groups_from_range
# the package's functions `pairwise` and `letters` hide their module names: import them by name
from ...stats import LettersResult, PairwiseResult, dunnett, letters, pairwise
from ..registry import Arg, Example, worksheet_function
from .shared import DATA, DATA_REF, LABELS, LAYOUT, ON_SHEET, ON_SHEET_EXAMPLE

__all__ = ["SF_PAIRS", "SF_DUNNETT", "SF_LETTERS"]

_METHOD = Arg(
    "method", "text",
    "Comparison method: \"tukey\" (Tukey-Kramer), \"games-howell\", \"bonferroni\", \"holm\", "
    "\"sidak\" or \"scheffe\".",
    default="tukey",
)
_ALPHA_FAMILY = Arg(
    "alpha", "number",
    "Significance level for the whole family of comparisons, between 0 and 1.",
    default=0.05,
)


def _pair_columns(statistic: str) -> tuple[str, ...]:
    """The pairwise table's header as the docs show it: the interval's kind and level, and the
    statistic's name, are filled in per call."""
    return tuple(h.format(interval="kind and level", statistic=statistic) for h in PairwiseResult.HEADER)


@worksheet_function(
    description="Spills every pairwise comparison of the group means (Tukey-Kramer unless told "
    "otherwise): differences, intervals, adjusted p-values and whether each pair differs.",
    args=(DATA, LAYOUT, LABELS, _METHOD, _ALPHA_FAMILY),
    result="table",
    columns=_pair_columns("q, t or F"),
    returns="A header row, then one row per pair of groups in range order: Group A, Group B, "
    "Difference (mean of A minus mean of B), SE, the interval for the difference, the method's "
    "statistic (q for Tukey-Kramer and Games-Howell, t for Bonferroni, Holm and Sidak, F for "
    "Scheffe), the adjusted p-value (never above 1) and Differs (TRUE when p < alpha). The "
    "interval headers say what the intervals are: simultaneous at 1 - alpha, except that Holm "
    "rows show Bonferroni intervals and Games-Howell intervals are approximate. The pooled "
    "methods use the one-way residual mean square; Games-Howell uses each pair's own variances.",
    example=ON_SHEET_EXAMPLE,
)
def SF_PAIRS(data: Any, layout: Any = None, labels: Any = None, method: Any = None,
             alpha: Any = None) -> Any:
    return pairwise(groups_from_range(data, layout, labels), method, alpha).table()


@worksheet_function(
    description="Spills Dunnett's comparisons of every group with one control group: "
    "differences, simultaneous intervals, adjusted p-values and whether each group differs.",
    args=(
        DATA,
        Arg("control", "text",
            "The label of the control group, as the range shows it (a control typed as 3 "
            "matches the label 3)."),
        LAYOUT, LABELS, _ALPHA_FAMILY,
    ),
    result="table",
    columns=_pair_columns("t"),
    returns="A header row, then one row per group other than the control, in range order: the "
    "group, the control, Difference (group mean minus control mean), SE, the simultaneous "
    "interval, t, the adjusted two-sided p-value and Differs (TRUE when p < alpha). p-values and "
    "the critical value come from the many-to-one multivariate t distribution, integrated by "
    "deterministic quadrature, so a recalculation gives the same digits.",
    example=Example(ON_SHEET + ", with head A as the reference head", (DATA_REF, "Head A")),
)
def SF_DUNNETT(data: Any, control: Any, layout: Any = None, labels: Any = None,
               alpha: Any = None) -> Any:
    return dunnett(groups_from_range(data, layout, labels), control, alpha).table()


@worksheet_function(
    description="Spills the compact letter display of the pairwise comparisons: groups that "
    "share a letter are not separated, and \"a\" goes to the highest mean.",
    args=(DATA, LAYOUT, LABELS, _METHOD, _ALPHA_FAMILY),
    result="table",
    columns=LettersResult.HEADER,
    returns="A header row, then one row per group, highest mean first: Group, Mean and Letters. "
    "Two groups share a letter exactly when the chosen method does not separate them at alpha "
    "(insert-and-absorb algorithm of Piepho 2004).",
    example=ON_SHEET_EXAMPLE,
)
def SF_LETTERS(data: Any, layout: Any = None, labels: Any = None, method: Any = None,
               alpha: Any = None) -> Any:
    return letters(groups_from_range(data, layout, labels), method, alpha).table()
