"""Worksheet functions: the one registry behind ``=SF_TABLE(B2:F40)`` and its siblings.

This is the module a spreadsheet user points xlwings at ("UDF Modules" = ``sheetfuncs.udfs``),
and the only module of the package that imports xlwings. Each worksheet function is one record
(:class:`Function`: name, one-sentence description, arguments with kind, default and help text,
scalar or table result, an example on invented data) plus a thin wrapper that converts the cells
in, makes one core call and hands the core's result back. The same record

* applies xlwings' decorators (``xw.arg(name, ndim=2, err_to_str=True, doc=...)`` for ranges,
  ``xw.arg(name, doc=...)`` for single values, ``xw.ret(...)``, then ``xw.func(category=...)``
  last, because xlwings' ``func`` sets the category and ``arg``/``ret`` would reset it), so the
  spreadsheet's function dialog shows the description and the help of every argument;
* drives :mod:`sheetfuncs.harness`, which calls the functions as xlwings does on Windows;
* generates ``docs/functions.md`` (``python -m sheetfuncs.udfs --markdown``; ``--check`` fails
  when the file is out of date);
* is what the tests walk through (:data:`REGISTRY`).

Off Windows, xlwings' decorators are no-ops and its conversion code needs a running spreadsheet,
so the options are recorded here as well (:attr:`Arg.xlwings_options`), where tests can check them.

Conventions every wrapper gets from :func:`worksheet_function` (see the project guide):

* a missing optional argument arrives as ``None`` (the Python default of every optional
  parameter), as does a blank cell given as an option; both mean "use the documented default";
* options arrive as cell values: text (``layout``, ``factor_name``), a logical or the text
  ``"auto"`` (``labels``), numbers (``conf``, ``alpha``, degrees of freedom);
* tables come back as rows (header row first); scalars as plain numbers; infinity as the largest
  double, 1.7976931348623157E+308, so that comparisons still work; NaN and ``None`` as blank cells;
* an :class:`~sheetfuncs.errors.InputError` comes back as its one line of text
  (``sheetfuncs: ...``) in the cell; only a bug surfaces as a traceback.

Adding a function
-----------------
Write the wrapper with one parameter per argument (optional ones default to ``None``; annotate
with ``Any`` only, since xlwings reads annotations as converters) and decorate it::

    @worksheet_function(
        description="Spills ... for the groups in a range.",      # one sentence, <= 255 chars
        args=(DATA, Arg("conf", "number", "Confidence level ...", default=0.95), LAYOUT, LABELS),
        result="table",                                           # or "scalar"
        columns=("Group", "Estimate", ...),                       # table header, for the docs
        returns="One row per ...",
        example=Example("On the example sheet", (Ref("A1:C7"),)),
    )
    def SF_NEWTHING(data: Any, conf: Any = None, layout: Any = None, labels: Any = None) -> Any:
        return new_core_call(groups_from_range(data, layout, labels), conf).table()

The wrapper receives values already normalised by kind (defaults filled in, numbers as floats,
text trimmed) and returns the core's ``table()`` or one number. Then regenerate the docs:
``python -m sheetfuncs.udfs --markdown > docs/functions.md``. The tests pick the new function up
from :data:`REGISTRY` (registry checks, docs sync); add its harness tests and a check against an
outside source.
"""

from __future__ import annotations

import functools
import inspect
from collections.abc import Callable, Mapping
from dataclasses import dataclass, field
from types import MappingProxyType
from typing import Any

import xlwings as xw

# analyses are imported by name: the package's functions `power`, `pairwise` and `letters`
# hide their module names
from ..stats import (
    BrownForsytheResult, KruskalResult, WelchResult, brown_forsythe, kruskal, welch,
)
from ..stats import (
    BartlettResult, ChecksResult, LeveneResult, NormalityResult, bartlett, checks, levene,
    shapiro_residuals,
)
from ..stats import DescribeResult, describe
from ..stats import EffectSizes, effect_sizes
from ..errors import InputError
from ..distributions import f_critical, f_tail
from ..input import format_label, groups_from_range
from ..stats import LettersResult, letters
from ..stats import ContrastResult, LinearTestResult, contrast, linear_test
from ..stats import OneWayResult, oneway, oneway_from_summary
from ..stats import PairwiseResult, dunnett, pairwise
from ..stats import detectable_effect, sample_size
from ..stats import power as power_of
from ..stats import VarianceComponents, variance_components
from .convert import (
    cell_message, check_range_errors, normalise, per_group_column, shape_result,
)

__all__ = [
    "CATEGORY", "KINDS", "RESULTS", "DIALOG_LIMIT", "REQUIRED", "MISSING",
    "Arg", "Ref", "Example", "Function", "EXAMPLE_NOTE", "EXAMPLE_SHEET",
    "formula_literal", "formula_text", "apply_xlwings", "worksheet_function", "REGISTRY",
]

#: The category the function dialog lists the functions under.
CATEGORY = "sheetfuncs"
#: Argument kinds: a range of cells, or one number, text or logical value.
KINDS = ("range", "number", "text", "logical")
#: Result kinds: one value in the cell, or a table that spills with one header row.
RESULTS = ("scalar", "table")
#: The host keeps at most 255 characters of a function or argument description.
DIALOG_LIMIT = 255


class _Required:
    """Marks an argument without a default."""

    def __repr__(self) -> str:
        return "REQUIRED"


REQUIRED: Any = _Required()


class _Missing:
    """An argument left out of a formula in an example, e.g. ``=SF_TABLE(A1:C7,,,"Head")``."""

    def __repr__(self) -> str:
        return "MISSING"


MISSING: Any = _Missing()


@dataclass(frozen=True)
class Arg:
    """One argument of a worksheet function.

    ``kind`` is ``range`` (a block of cells, always read as rows), ``number``, ``text`` or
    ``logical`` (one value; ``labels`` also takes the text ``"auto"``). ``default`` is the value
    used when the argument is left out or its cell is blank; :data:`REQUIRED` when it must be
    given (``None`` for an optional range means "not given").
    """

    name: str
    kind: str
    help: str
    default: Any = REQUIRED

    def __post_init__(self) -> None:
        if self.kind not in KINDS:
            raise ValueError(f"argument {self.name}: kind must be one of {KINDS}, not {self.kind!r}")

    @property
    def required(self) -> bool:
        return self.default is REQUIRED

    @property
    def default_text(self) -> str:
        """The default as a spreadsheet user would type it."""
        if self.required:
            return "required"
        if self.default is None:
            return "none"
        return formula_literal(self.default)

    @property
    def dialog_text(self) -> str:
        """What the function dialog shows for this argument (help plus the default)."""
        if self.required:
            return self.help
        if self.default is None:
            return f"{self.help} Optional."
        return f"{self.help} Optional; default {self.default_text}."

    @property
    def xlwings_options(self) -> dict[str, Any]:
        """Keyword options for ``xw.arg``: error cells arrive as their text (without
        ``err_to_str`` xlwings would hand them over as blanks); ranges always arrive 2-D."""
        opts: dict[str, Any] = {"doc": self.dialog_text, "err_to_str": True}
        if self.kind == "range":
            opts["ndim"] = 2
        return opts


@dataclass(frozen=True)
class Ref:
    """A cell reference in an example formula, e.g. ``Ref("A1:C7")``."""

    address: str


#: The shared example sheet (invented data), laid out from cell A1.
EXAMPLE_NOTE = (
    "Invented data: cap removal torque (N·m) of caps from three capping heads of a bottling "
    "line. One cap was lost (its cell holds a note, which is ignored) and one cell is blank."
)
EXAMPLE_SHEET: tuple[tuple[Any, ...], ...] = (
    ("Head A", "Head B", "Head C"),
    (1.52, 1.61, 1.47),
    (1.49, 1.66, 1.45),
    (1.55, 1.58, 1.50),
    (1.51, 1.63, 1.44),
    (1.48, "cap lost", 1.46),
    (1.53, 1.65, None),
)


@dataclass(frozen=True)
class Example:
    """A short example for the docs: cells laid out from A1 and the arguments of one formula.

    ``args`` holds :class:`Ref` references into ``cells``, literal values (text, numbers,
    logicals, a tuple of rows for an array constant such as ``{1,-0.5,-0.5}``) or
    :data:`MISSING`. ``cells`` defaults to the shared example sheet.
    """

    note: str
    args: tuple[Any, ...]
    cells: tuple[tuple[Any, ...], ...] = EXAMPLE_SHEET

    @property
    def shared(self) -> bool:
        return self.cells is EXAMPLE_SHEET


@dataclass(frozen=True)
class Function:
    """The record of one worksheet function (see the module docstring)."""

    name: str
    description: str
    args: tuple[Arg, ...]
    result: str
    returns: str
    example: Example
    columns: tuple[str, ...] = ()
    func_options: Mapping[str, Any] = field(default_factory=lambda: MappingProxyType({"category": CATEGORY}))
    ret_options: Mapping[str, Any] = field(default_factory=dict)
    call: Callable[..., Any] = field(default=None, compare=False, repr=False)  # type: ignore[assignment]

    @property
    def signature(self) -> str:
        """``SF_TABLE(data, [layout], [labels], [factor_name])``."""
        parts = [a.name if a.required else f"[{a.name}]" for a in self.args]
        return f"{self.name}({', '.join(parts)})"

    @property
    def example_formula(self) -> str:
        return formula_text(self.name, self.example.args)


def formula_literal(value: Any) -> str:
    """A value as typed in a formula: text quoted, TRUE/FALSE, shortest numbers, array constants."""
    if value is MISSING:
        return ""
    if isinstance(value, Ref):
        return value.address
    if isinstance(value, bool):
        return "TRUE" if value else "FALSE"
    if isinstance(value, str):
        return '"' + value.replace('"', '""') + '"'
    if isinstance(value, tuple):
        return "{" + ";".join(",".join(formula_literal(v) for v in row) for row in value) + "}"
    return format_label(value)


def formula_text(name: str, args: tuple[Any, ...]) -> str:
    return f"={name}({','.join(formula_literal(a) for a in args)})"


# --------------------------------------------------------------------------------------------
# the registry


def apply_xlwings(f: Callable[..., Any], record: Function, xlw: Any = xw) -> Callable[..., Any]:
    """Apply xlwings' decorators from the record: ``arg`` for each argument, ``ret``, then ``func``
    last (on Windows ``arg`` and ``ret`` reset the category that ``func`` sets). ``xlw`` is the
    xlwings module; tests pass a recorder."""
    for a in record.args:
        f = xlw.arg(a.name, **a.xlwings_options)(f)
    f = xlw.ret(**dict(record.ret_options))(f)
    return xlw.func(**dict(record.func_options))(f)


def _check_signature(fn: Callable[..., Any], args: tuple[Arg, ...]) -> inspect.Signature:
    sig = inspect.signature(fn)
    params = list(sig.parameters.values())
    names = [p.name for p in params]
    if names != [a.name for a in args]:
        raise TypeError(f"{fn.__name__}: parameters {names} do not match the record {[a.name for a in args]}")
    for p, a in zip(params, args):
        if p.kind is not inspect.Parameter.POSITIONAL_OR_KEYWORD:
            raise TypeError(f"{fn.__name__}: parameter {p.name} must be positional-or-keyword")
        if a.required != (p.default is inspect.Parameter.empty):
            raise TypeError(f"{fn.__name__}: parameter {p.name} must be {'required' if a.required else 'optional'}")
        if not a.required and p.default is not None:
            raise TypeError(f"{fn.__name__}: optional parameter {p.name} must default to None")
        if p.annotation not in (inspect.Parameter.empty, "Any", Any):
            raise TypeError(f"{fn.__name__}: annotate {p.name} with Any (xlwings reads annotations as converters)")
    return sig


def worksheet_function(
    *,
    description: str,
    args: tuple[Arg, ...],
    result: str,
    returns: str,
    example: Example,
    columns: tuple[str, ...] = (),
    ret_options: Mapping[str, Any] | None = None,
) -> Callable[[Callable[..., Any]], Callable[..., Any]]:
    """Register a wrapper as a worksheet function named after it (see the module docstring)."""
    if result not in RESULTS:
        raise ValueError(f"result must be one of {RESULTS}, not {result!r}")

    def wrap(inner: Callable[..., Any]) -> Callable[..., Any]:
        sig = _check_signature(inner, args)

        @functools.wraps(inner)
        def cell_function(*values: Any, **named: Any) -> Any:
            bound = sig.bind(*values, **named)
            bound.apply_defaults()
            try:
                given = [normalise(bound.arguments[a.name], a) for a in args]
                return shape_result(inner(*given), result)
            except InputError as err:
                return cell_message(err)

        cell_function.__doc__ = description
        record = Function(
            name=inner.__name__,
            description=description,
            args=args,
            result=result,
            returns=returns,
            example=example,
            columns=tuple(columns),
            ret_options=MappingProxyType(dict(ret_options or {})),
            call=cell_function,
        )
        cell_function.__sheetfuncs__ = record  # type: ignore[attr-defined]
        return apply_xlwings(cell_function, record)

    return wrap


# shared arguments ---------------------------------------------------------------------------

DATA = Arg(
    "data", "range",
    "The measurements: one group per column (layout \"wide\"), label and value columns "
    "(\"long\") or one group per row (\"rowwise\"). Blanks, text and logical values are ignored.",
)
LAYOUT = Arg(
    "layout", "text",
    "How the range holds the groups: \"wide\" (one per column), \"long\" (label column, value "
    "column) or \"rowwise\" (one per row).",
    default="wide",
)
LABELS = Arg(
    "labels", "logical",
    "Does the first row (first column when rowwise) hold group labels? TRUE, FALSE, or \"auto\" "
    "(yes when all its non-blank cells are text).",
    default="auto",
)
CONF = Arg("conf", "number", "Confidence level of the intervals, between 0 and 1.", default=0.95)

_DATA_REF = Ref("A1:C7")
_ON_SHEET = "On the example sheet (invented data)"


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
    example=Example(_ON_SHEET + ", with a name for the factor row", (_DATA_REF, MISSING, MISSING, "Capping head")),
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
        example=Example(_ON_SHEET, (_DATA_REF,)),
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
    example=Example(_ON_SHEET, (_DATA_REF,)),
)
def SF_GROUPS(data: Any, layout: Any = None, labels: Any = None, conf: Any = None) -> Any:
    return describe(groups_from_range(data, layout, labels), conf).table()


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
        _ON_SHEET + ": do heads A and C share one mean?",
        (_DATA_REF, (("A or C", "B", "A or C"),)),
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
        _ON_SHEET + ": head B against the average of heads A and C",
        (_DATA_REF, ((-0.5, 1, -0.5),)),
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


# beyond the F test: alternatives, assumption checks --------------------------------------

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
    example=Example(_ON_SHEET, (_DATA_REF,)),
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
    example=Example(_ON_SHEET, (_DATA_REF,)),
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
    example=Example(_ON_SHEET, (_DATA_REF,)),
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
    example=Example(_ON_SHEET, (_DATA_REF,)),
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
    example=Example(_ON_SHEET, (_DATA_REF,)),
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
    example=Example(_ON_SHEET, (_DATA_REF,)),
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
    example=Example(_ON_SHEET, (_DATA_REF,)),
)
def SF_CHECKS(data: Any, layout: Any = None, labels: Any = None, alpha: Any = None) -> Any:
    return checks(groups_from_range(data, layout, labels), alpha).table()


# comparisons of groups ----------------------------------------------------------------------

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
_PAIR_COLUMNS = tuple(
    h.format(interval="kind and level", statistic="q, t or F") for h in PairwiseResult.HEADER
)


@worksheet_function(
    description="Spills every pairwise comparison of the group means (Tukey-Kramer unless told "
    "otherwise): differences, intervals, adjusted p-values and whether each pair differs.",
    args=(DATA, LAYOUT, LABELS, _METHOD, _ALPHA_FAMILY),
    result="table",
    columns=_PAIR_COLUMNS,
    returns="A header row, then one row per pair of groups in range order: Group A, Group B, "
    "Difference (mean of A minus mean of B), SE, the interval for the difference, the method's "
    "statistic (q for Tukey-Kramer and Games-Howell, t for Bonferroni, Holm and Sidak, F for "
    "Scheffe), the adjusted p-value (never above 1) and Differs (TRUE when p < alpha). The "
    "interval headers say what the intervals are: simultaneous at 1 - alpha, except that Holm "
    "rows show Bonferroni intervals and Games-Howell intervals are approximate. The pooled "
    "methods use the one-way residual mean square; Games-Howell uses each pair's own variances.",
    example=Example(_ON_SHEET, (_DATA_REF,)),
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
    columns=tuple(h.format(interval="kind and level", statistic="t") for h in PairwiseResult.HEADER),
    returns="A header row, then one row per group other than the control, in range order: the "
    "group, the control, Difference (group mean minus control mean), SE, the simultaneous "
    "interval, t, the adjusted two-sided p-value and Differs (TRUE when p < alpha). p-values and "
    "the critical value come from the many-to-one multivariate t distribution, integrated by "
    "deterministic quadrature, so a recalculation gives the same digits.",
    example=Example(_ON_SHEET + ", with head A as the reference head", (_DATA_REF, "Head A")),
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
    example=Example(_ON_SHEET, (_DATA_REF,)),
)
def SF_LETTERS(data: Any, layout: Any = None, labels: Any = None, method: Any = None,
               alpha: Any = None) -> Any:
    return letters(groups_from_range(data, layout, labels), method, alpha).table()


# effect sizes, planning, variance components ------------------------------------------------


@worksheet_function(
    description="Spills the effect sizes of the one-way analysis (eta squared, omega squared, "
    "epsilon squared and Cohen's f), with intervals for eta squared and f.",
    args=(DATA, LAYOUT, LABELS, CONF),
    result="table",
    columns=EffectSizes.HEADER,
    returns="A header row, then Eta squared, Omega squared, Epsilon squared and Cohen's f. Eta "
    "squared and f carry equal-tailed intervals from the noncentral F at the observed F "
    "(Steiger 2004); omega and epsilon squared are bias-corrected and shown as 0 when they come "
    "out negative, which their Note says. Cohen's f shows as 1.7976931348623157E+308 when there "
    "is no variation within the groups.",
    example=Example(_ON_SHEET, (_DATA_REF,)),
)
def SF_EFFECT(data: Any, layout: Any = None, labels: Any = None, conf: Any = None) -> Any:
    return effect_sizes(groups_from_range(data, layout, labels), conf).table()


_K = Arg("k", "number", "The number of groups, a whole number of at least 2.")
_N = Arg("n", "number", "The number of values in each group (equal sizes), a whole number of at least 2.")
_F = Arg(
    "cohens_f", "number",
    "Cohen's effect size f: the SD of the group means over the SD within groups (0.1 small, "
    "0.25 medium, 0.4 large).",
)
_POWER = Arg(
    "power", "number",
    "The wanted power, the chance that the F test detects the effect, above alpha and below 1.",
    default=0.8,
)
_ALPHA_TEST = Arg("alpha", "number", "Significance level of the F test, between 0 and 1.", default=0.05)
_PLAN_NOTE = (
    " Balanced one-way design with independent values and a common normal spread; noncentral F "
    "with noncentrality k n f^2 (Cohen 1988, ch. 8)."
)


@worksheet_function(
    description="Returns the power of the one-way F test for k groups of n values each when the "
    "true effect size is Cohen's f.",
    args=(_K, _N, _F, _ALPHA_TEST),
    result="scalar",
    returns="One number between alpha and 1: the chance that the test gives p < alpha." + _PLAN_NOTE,
    example=Example("Four groups of 20 values each and a medium effect, f = 0.25", (4, 20, 0.25)),
)
def SF_POWER(k: Any, n: Any, cohens_f: Any, alpha: Any = None) -> Any:
    return power_of(k, n, cohens_f, alpha)


@worksheet_function(
    description="Returns the smallest number of values per group for which the one-way F test "
    "on k groups reaches the wanted power at Cohen's effect size f.",
    args=(_K, _F, _POWER, _ALPHA_TEST),
    result="scalar",
    returns="One whole number: values per group (the study needs k times as many in all)." + _PLAN_NOTE,
    example=Example("Four groups, a medium effect (f = 0.25), power 0.8 and alpha 0.05", (4, 0.25)),
)
def SF_SAMPLESIZE(k: Any, cohens_f: Any, power: Any = None, alpha: Any = None) -> Any:
    return sample_size(k, cohens_f, power, alpha)


@worksheet_function(
    description="Returns the smallest Cohen's effect size f that the one-way F test on k groups "
    "of n values each detects with the wanted power.",
    args=(_K, _N, _POWER, _ALPHA_TEST),
    result="scalar",
    returns="One number: Cohen's f (multiply by the SD within groups for the SD of the group "
    "means it corresponds to)." + _PLAN_NOTE,
    example=Example("Four groups of 10 values each, power 0.8 and alpha 0.05", (4, 10)),
)
def SF_DETECTABLE(k: Any, n: Any, power: Any = None, alpha: Any = None) -> Any:
    return detectable_effect(k, n, power, alpha)


_LOTS_NOTE = (
    "Invented data: certified value checks of four lots of a calibration material (mg/L), three "
    "replicate measurements per lot"
)
_LOTS_SHEET: tuple[tuple[Any, ...], ...] = (
    ("Lot 101", "Lot 102", "Lot 103", "Lot 104"),
    (50.12, 50.31, 50.08, 50.22),
    (50.18, 50.27, 50.11, 50.19),
    (50.15, 50.35, 50.04, 50.26),
)


@worksheet_function(
    description="Spills the variance components of the one-way random-effects model: within and "
    "between groups, their total and the intraclass correlation, with intervals.",
    args=(DATA, LAYOUT, LABELS, CONF),
    result="table",
    columns=VarianceComponents.HEADER,
    returns="A header row, then Between groups, Within groups, Total and Intraclass correlation, "
    "each with its estimate, interval and share of the total variance, and a last row with the "
    "effective group size n0; the Note column carries each row's notes. Estimators: ANOVA "
    "(method of moments), with the effective group size n0 when sizes differ. Intervals: "
    "chi-square (within), modified large-sample (between: Ting et al. 1990; total: Graybill & "
    "Wang 1980), F-based (intraclass correlation: Searle 1971). A between estimate that comes "
    "out negative is shown as 0 (the groups vary no more than the values within them); with "
    "unequal group sizes the between, total and ICC intervals are approximate.",
    example=Example(_LOTS_NOTE, (Ref("A1:D4"),), _LOTS_SHEET),
)
def SF_VARCOMP(data: Any, layout: Any = None, labels: Any = None, conf: Any = None) -> Any:
    return variance_components(groups_from_range(data, layout, labels), conf).table()


def _collect(namespace: Mapping[str, Any]) -> Mapping[str, Function]:
    found = {}
    for value in namespace.values():
        record = getattr(value, "__sheetfuncs__", None)
        if isinstance(record, Function):
            found[record.name] = record
    return MappingProxyType(found)


#: Every worksheet function of this module, by name, in the order they are defined.
REGISTRY: Mapping[str, Function] = _collect(globals())
