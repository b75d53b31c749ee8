"""The one-way analysis in the sheet: its table and each of its figures, the group summaries,
the table from summary statistics, the general linear test, contrasts and the F distribution.

Each function converts the cells in (:mod:`sheetfuncs.worksheet.convert`), makes one core call
(:mod:`sheetfuncs.stats`, :mod:`sheetfuncs.distributions`) and returns its ``table()`` or one
number; :func:`~sheetfuncs.worksheet.registry.worksheet_function` does the rest.
"""

from __future__ import annotations

from collections.abc import Callable
from typing import Any

from ...distributions import f_critical, f_tail
from ...input import groups_from_range
from ...stats import (
    ContrastResult, DescribeResult, LinearTestResult, OneWayResult, contrast, describe,
    linear_test, oneway, oneway_from_summary,
)
from ..convert import check_range_errors, per_group_column
from ..registry import MISSING, Arg, Example, Ref, worksheet_function
from .shared import CONF, DATA, DATA_REF, LABELS, LAYOUT, ON_SHEET, ON_SHEET_EXAMPLE

__all__ = [
    "SF_TABLE", "SF_SSB", "SF_SSW", "SF_SST", "SF_DFB", "SF_DFW", "SF_DFT", "SF_MSB", "SF_MSW",
    "SF_F", "SF_P", "SF_R2", "SF_GROUPS", "SF_FROMSTATS", "SF_GLT", "SF_CONTRAST", "SF_FTAIL",
    "SF_FCRIT",
]

# the one-way table and its figures ----------------------------------------------------------


@worksheet_function(
    description="Spills the one-way analysis-of-variance table (Source, df, SS, MS, F, p) for "
    "the groups in a range.",
    args=(
        DATA, LAYOUT, LABELS,
        Arg("factor_name", "text", "Name shown for the factor row, e.g. \"Filling head\".",
            default="Factor"),
    ),
    result="table",
    columns=OneWayResult.HEADER,
    returns="A header row, then the factor, Residual and Total rows. F and p sit on the factor "
    "row; F shows as 1.7976931348623157E+308 when there is no variation within the groups.",
    example=Example(ON_SHEET + ", with a name for the factor row", (DATA_REF, MISSING, MISSING, "Capping head")),
)
def SF_TABLE(data: Any, layout: Any = None, labels: Any = None, factor_name: Any = None) -> Any:
    return oneway(groups_from_range(data, layout, labels)).table(factor_name)


_FIGURES: tuple[tuple[str, str, str], ...] = (
    ("SF_SSB", "ss_between", "the sum of squares between groups (SS of the factor)"),
    ("SF_SSW", "ss_within", "the sum of squares within groups (residual SS)"),
    ("SF_SST", "ss_total", "the total sum of squares about the grand mean"),
    ("SF_DFB", "df_between", "the degrees of freedom between groups (groups minus one)"),
    ("SF_DFW", "df_within", "the residual degrees of freedom (values minus groups)"),
    ("SF_DFT", "df_total", "the total degrees of freedom (values minus one)"),
    ("SF_MSB", "ms_between", "the mean square between groups"),
    ("SF_MSW", "ms_within", "the residual mean square (pooled within-group variance)"),
    ("SF_F", "f", "the F ratio of the one-way analysis of variance"),
    ("SF_P", "p", "the p-value of the one-way F test (upper tail of F)"),
    ("SF_R2", "r_squared", "R squared, the share of the total sum of squares explained by the groups"),
)


def _oneway_figure(name: str, attribute: str, what: str) -> Callable[..., Any]:
    def figure(data: Any, layout: Any = None, labels: Any = None) -> Any:
        return getattr(oneway(groups_from_range(data, layout, labels)), attribute)

    figure.__name__ = figure.__qualname__ = name
    extra = " Shows 1.7976931348623157E+308 when there is no variation within the groups." if attribute == "f" else ""
    guard = " Guard decisions with ISNUMBER(): a message compares greater than any number." if attribute == "p" else ""
    return worksheet_function(
        description=f"Returns {what}, for the groups in a range.",
        args=(DATA, LAYOUT, LABELS),
        result="scalar",
        returns=f"One number: {what}.{extra}{guard}",
        example=ON_SHEET_EXAMPLE,
    )(figure)


SF_SSB, SF_SSW, SF_SST, SF_DFB, SF_DFW, SF_DFT, SF_MSB, SF_MSW, SF_F, SF_P, SF_R2 = (
    _oneway_figure(*spec) for spec in _FIGURES
)


# per-group summaries and summary input ------------------------------------------------------


@worksheet_function(
    description="Spills a summary of each group: n, mean, SD, standard error, t interval for the "
    "mean, minimum, median and maximum.",
    args=(DATA, LAYOUT, LABELS, CONF),
    result="table",
    columns=DescribeResult.HEADER,
    returns="A header row, then one row per group in range order. A group with one value has "
    "blank SD, SE and interval cells.",
    example=ON_SHEET_EXAMPLE,
)
def SF_GROUPS(data: Any, layout: Any = None, labels: Any = None, conf: Any = None) -> Any:
    res = describe(groups_from_range(data, layout, labels), conf)
    # a one-value group has no SD, SE or interval: blank on purpose (a NaN would be a bug)
    return [list(res.HEADER)] + [
        row if s.n > 1 else row[:3] + [None] * 4 + row[7:]
        for s, row in zip(res.groups, res.table()[1:])
    ]


_COUNTS = Arg(
    "counts", "range",
    "The number of values in each group, one cell per group. A header cell on top of counts, "
    "means and SDs is skipped.",
)
_MEANS = Arg("means", "range", "The mean of each group, in the same order.")
_SDS = Arg(
    "sds", "range",
    "The standard deviation (n - 1 divisor) of each group, in the same order; 0 for a group of "
    "one value.",
)
_NAMES = Arg(
    "names", "range",
    "Group names, in the same order, each different; checked to match the number of groups "
    "(the table itself names no groups).",
    default=None,
)

_SUMMARY_NOTE = (
    "Invented data: one reference material assayed by four labs (mg/kg); each lab reports its "
    "count, mean and SD"
)
_SUMMARY_SHEET: tuple[tuple[Any, ...], ...] = (
    ("Lab", "n", "Mean", "SD"),
    ("Lab 1", 6, 10.12, 0.21),
    ("Lab 2", 6, 10.31, 0.18),
    ("Lab 3", 5, 10.05, 0.25),
    ("Lab 4", 6, 10.22, 0.19),
)


@worksheet_function(
    description="Spills the one-way analysis-of-variance table from each group's count, mean and "
    "standard deviation, when the raw values are not at hand.",
    args=(_COUNTS, _MEANS, _SDS, _NAMES),
    result="table",
    columns=OneWayResult.HEADER,
    returns="The same table as SF_TABLE: header row, then the factor, Residual and Total rows.",
    example=Example(
        _SUMMARY_NOTE, (Ref("B2:B5"), Ref("C2:C5"), Ref("D2:D5"), Ref("A2:A5")), _SUMMARY_SHEET
    ),
)
def SF_FROMSTATS(counts: Any, means: Any, sds: Any, names: Any = None) -> Any:
    cols = [
        per_group_column(counts, _COUNTS), per_group_column(means, _MEANS),
        per_group_column(sds, _SDS), per_group_column(names, _NAMES),
    ]
    return oneway_from_summary(*_without_headers(cols)).table()


def _without_headers(cols: list[list[Any] | None]) -> list[list[Any] | None]:
    """Summary columns selected with their header cells: when counts, means and SDs all start
    with text, that first row is a header row (of the names too, when they are as long)."""
    counts, means, sds, names = cols
    assert counts is not None and means is not None and sds is not None
    if not all(c and isinstance(c[0], str) for c in (counts, means, sds)):
        return cols
    if names is not None and len(names) == len(counts):
        names = names[1:]
    return [counts[1:], means[1:], sds[1:], names]


# linear tests -------------------------------------------------------------------------------

_POOLING = Arg(
    "pooling", "range",
    "One label per group, in group order, in one row or one column: groups with the same label "
    "share one mean in the reduced model.",
)
_WEIGHTS = Arg(
    "weights", "range",
    "One weight per group, in group order, in one row or one column, summing to zero (e.g. 1, "
    "-0.5, -0.5).",
)


@worksheet_function(
    description="Spills the general linear test of a reduced model in which the groups with the "
    "same pooling label share one mean, against the one-way model.",
    args=(DATA, _POOLING, LAYOUT, LABELS),
    result="table",
    columns=LinearTestResult.HEADER,
    returns="A header row, then the reduced and full residual lines and their difference, which "
    "carries F and p.",
    example=Example(
        ON_SHEET + ": do heads A and C share one mean?",
        (DATA_REF, (("A or C", "B", "A or C"),)),
    ),
)
def SF_GLT(data: Any, pooling: Any, layout: Any = None, labels: Any = None) -> Any:
    check_range_errors(pooling, _POOLING)
    return linear_test(groups_from_range(data, layout, labels), pooling).table()


@worksheet_function(
    description="Spills the estimate, standard error, t test and confidence interval of a "
    "contrast of the group means (weights summing to zero).",
    args=(DATA, _WEIGHTS, LAYOUT, LABELS, CONF),
    result="table",
    columns=ContrastResult.HEADER,
    returns="A header row and one row: estimate, SE, t, residual df, two-sided p and the "
    "interval.",
    example=Example(
        ON_SHEET + ": head B against the average of heads A and C",
        (DATA_REF, ((-0.5, 1, -0.5),)),
    ),
)
def SF_CONTRAST(data: Any, weights: Any, layout: Any = None, labels: Any = None, conf: Any = None) -> Any:
    check_range_errors(weights, _WEIGHTS)
    return contrast(groups_from_range(data, layout, labels), weights, conf).table()


# the F distribution -------------------------------------------------------------------------

_DF1 = Arg("df1", "number", "Numerator degrees of freedom (between groups).")
_DF2 = Arg("df2", "number", "Denominator degrees of freedom (residual).")


@worksheet_function(
    description="Returns the upper-tail probability P(F > x) of the F distribution, accurate "
    "far into the tail.",
    args=(Arg("x", "number", "The F value."), _DF1, _DF2),
    result="scalar",
    returns="One number between 0 and 1.",
    example=Example("An F ratio of 4.1 on 2 and 14 degrees of freedom", (4.1, 2, 14)),
)
def SF_FTAIL(x: Any, df1: Any, df2: Any) -> Any:
    return f_tail(x, df1, df2)


@worksheet_function(
    description="Returns the critical value of the F distribution: the x with P(F > x) = alpha.",
    args=(Arg("alpha", "number", "Upper-tail probability, between 0 and 1 (e.g. 0.05)."), _DF1, _DF2),
    result="scalar",
    returns="One number: reject equal means at level alpha when F exceeds it.",
    example=Example("The 5 % critical value on 2 and 14 degrees of freedom", (0.05, 2, 14)),
)
def SF_FCRIT(alpha: Any, df1: Any, df2: Any) -> Any:
    return f_critical(alpha, df1, df2)
