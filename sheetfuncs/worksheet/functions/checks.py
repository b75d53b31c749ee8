"""Beyond the F test: the alternatives to it (Welch, Brown-Forsythe, Kruskal-Wallis), the
assumption checks (Levene, Bartlett, normality of the residuals) and the checks' reading of
which test to read (SF_CHECKS). The methods and their sources: docs/checks.md.
"""

from __future__ import annotations

from typing import Any

from ...input import groups_from_range
from ...stats import (
    BartlettResult, BrownForsytheResult, ChecksResult, KruskalResult, LeveneResult,
    NormalityResult, WelchResult, bartlett, brown_forsythe, checks, kruskal, levene,
    shapiro_residuals, welch,
)
from ..registry import Arg, worksheet_function
from .shared import DATA, LABELS, LAYOUT, ON_SHEET_EXAMPLE

__all__ = [
    "SF_WELCH", "SF_BROWNFORSYTHE", "SF_KRUSKAL", "SF_LEVENE", "SF_BARTLETT", "SF_SHAPIRO",
    "SF_CHECKS",
]

_ALPHA_CHECKS = Arg(
    "alpha", "number", "Significance level each check is read at, between 0 and 1.", default=0.05
)


@worksheet_function(
    description="Spills Welch's test of equal group means, which does not assume equal "
    "variances: statistic, df1, df2 and p.",
    args=(DATA, LAYOUT, LABELS),
    result="table",
    columns=WelchResult.HEADER,
    returns="A header row and one row: Test, Statistic (Welch's F), df1 (groups minus one), df2 "
    "(Welch's approximate degrees of freedom, usually not a whole number) and p. Every group "
    "needs two or more values and some spread.",
    example=ON_SHEET_EXAMPLE,
)
def SF_WELCH(data: Any, layout: Any = None, labels: Any = None) -> Any:
    return welch(groups_from_range(data, layout, labels)).table()


@worksheet_function(
    description="Spills the Brown-Forsythe F* test of equal group means for unequal variances: "
    "statistic, df1, Satterthwaite's df2 and p.",
    args=(DATA, LAYOUT, LABELS),
    result="table",
    columns=BrownForsytheResult.HEADER,
    returns="A header row and one row: Test, Statistic (F*), df1 (groups minus one), df2 "
    "(Satterthwaite's degrees of freedom) and p. This is the 1974 test for means; the "
    "Brown-Forsythe test for variances is SF_LEVENE with center \"median\".",
    example=ON_SHEET_EXAMPLE,
)
def SF_BROWNFORSYTHE(data: Any, layout: Any = None, labels: Any = None) -> Any:
    return brown_forsythe(groups_from_range(data, layout, labels)).table()


@worksheet_function(
    description="Spills the Kruskal-Wallis rank test of the groups, with the tie correction and "
    "the rank epsilon squared effect size.",
    args=(DATA, LAYOUT, LABELS),
    result="table",
    columns=KruskalResult.HEADER,
    returns="A header row and one row: Test, Statistic (H, corrected for ties), df (groups minus "
    "one), p (chi-square approximation) and Rank epsilon squared, H (N + 1) / (N^2 - 1) for N "
    "values in all.",
    example=ON_SHEET_EXAMPLE,
)
def SF_KRUSKAL(data: Any, layout: Any = None, labels: Any = None) -> Any:
    return kruskal(groups_from_range(data, layout, labels)).table()


@worksheet_function(
    description="Spills Levene's test of equal group variances, on the distances from each "
    "group's median (Brown-Forsythe, the default) or mean.",
    args=(
        DATA, LAYOUT, LABELS,
        Arg("center", "text",
            "What each value's distance is measured from: \"median\" (the group median, robust "
            "to skewed data) or \"mean\" (the group mean, Levene's original).",
            default="median"),
    ),
    result="table",
    columns=LeveneResult.HEADER,
    returns="A header row and one row: Test (naming the centre), Statistic (the F ratio of the "
    "absolute distances), df1, df2 and p.",
    example=ON_SHEET_EXAMPLE,
)
def SF_LEVENE(data: Any, layout: Any = None, labels: Any = None, center: Any = None) -> Any:
    return levene(groups_from_range(data, layout, labels), center).table()


@worksheet_function(
    description="Spills Bartlett's chi-square test of equal group variances, which is sensitive "
    "to non-normal data.",
    args=(DATA, LAYOUT, LABELS),
    result="table",
    columns=BartlettResult.HEADER,
    returns="A header row and one row: Test, Statistic (chi-square), df (groups minus one) and "
    "p. For data that may not be normal, SF_LEVENE is the robust choice.",
    example=ON_SHEET_EXAMPLE,
)
def SF_BARTLETT(data: Any, layout: Any = None, labels: Any = None) -> Any:
    return bartlett(groups_from_range(data, layout, labels)).table()


@worksheet_function(
    description="Spills the Shapiro-Wilk test of normality on the residuals of the one-way "
    "model (D'Agostino-Pearson above 5,000 residuals).",
    args=(DATA, LAYOUT, LABELS),
    result="table",
    columns=NormalityResult.HEADER,
    returns="A header row and one row: Test (naming the method), Statistic (W, or K^2 above "
    "5,000 residuals), n (residuals tested) and p. The residuals are each value minus its group "
    "mean; groups of one value are left out, since their residual is zero by construction.",
    example=ON_SHEET_EXAMPLE,
)
def SF_SHAPIRO(data: Any, layout: Any = None, labels: Any = None) -> Any:
    return shapiro_residuals(groups_from_range(data, layout, labels)).table()


@worksheet_function(
    description="Spills the assumption checks of the one-way analysis and which test to read: "
    "the one-way F, Welch, or Kruskal-Wallis alongside the F.",
    args=(DATA, LAYOUT, LABELS, _ALPHA_CHECKS),
    result="table",
    columns=ChecksResult.HEADER,
    returns="A header row; then the Read row, which names the test to read and carries its "
    "statistic, df and p; then one row per check: Levene (median), the ratio of the largest to "
    "the smallest group SD, Bartlett (for reference), the normality of the residuals, the "
    "smallest group size, the one-way F, Welch and Kruskal-Wallis. A df cell holding two "
    "degrees of freedom is text such as \"2, 12\"; a check that cannot run says why in its "
    "Reading. The rule: variances look unequal when the median-centred Levene test has p < "
    "alpha or the largest group SD is more than twice the smallest (a rule of thumb); residuals "
    "look non-normal when their normality test has p < alpha; read Welch when variances look "
    "unequal, else Kruskal-Wallis alongside the F when residuals look non-normal and the "
    "smallest group has fewer than 15 values, else the one-way F (see docs/checks.md). "
    "Pre-testing assumptions is itself a judgement: look at the data, weigh how they were "
    "collected and follow your organisation's procedures before acting on the reading.",
    example=ON_SHEET_EXAMPLE,
)
def SF_CHECKS(data: Any, layout: Any = None, labels: Any = None, alpha: Any = None) -> Any:
    return checks(groups_from_range(data, layout, labels), alpha).table()
