"""The worksheet functions of the analyses beyond the F test, called as xlwings calls them.

Every function of issue 4 (alternatives to the F test, assumption checks, comparisons, letters,
effect sizes, planning, variance components) goes through :mod:`sheetfuncs.harness`: wide, long
and rowwise layouts with and without a header row, ignored cells, error cells, options given as
cells, and every input problem as one line of text. Two kinds of expectation:

* the front against the core: the cells must show exactly what the core's ``table()`` (or
  number) gives on the same groups; the core is checked against reference libraries in
  ``tests/reference/``, so here only the conversion in and the shaping out are under test;
* at least one check per function against an outside source named beside it (scipy.stats,
  statsmodels, Cohen's 1988 power tables, textbook formulas).

All measurement values are invented.
"""

from __future__ import annotations

import datetime as dt
import decimal
import math
import warnings
from typing import Any, Callable

import numpy as np
import pytest
from scipy import stats

from tests.support import ranges
from sheetfuncs.stats.alternatives import brown_forsythe, kruskal, welch
from sheetfuncs.stats import bartlett, checks, levene, shapiro_residuals
from sheetfuncs.stats.effects import effect_sizes
from sheetfuncs.worksheet.harness import BLANK, CALC, DIV0, MISSING, NA, REF, SPILL, call, column, is_message
from sheetfuncs.stats.lettering import letters
from sheetfuncs.stats.comparisons import METHODS, dunnett, pairwise
from sheetfuncs.stats.planning import detectable_effect, sample_size
from sheetfuncs.stats.planning import power as power_of
from sheetfuncs.worksheet.convert import MAX_DOUBLE
from sheetfuncs.worksheet.functions import REGISTRY
from sheetfuncs.stats.varcomp import variance_components

# --------------------------------------------------------------------------------------------
# the catalog of issue 4

#: The issue's worksheet functions (plus SF_CHECKS), with the signatures the registry records.
#: Data functions keep the catalog's order: data, required arguments, layout, labels, options.
CATALOG = {
    "SF_WELCH": "SF_WELCH(data, [layout], [labels])",
    "SF_BROWNFORSYTHE": "SF_BROWNFORSYTHE(data, [layout], [labels])",
    "SF_KRUSKAL": "SF_KRUSKAL(data, [layout], [labels])",
    "SF_LEVENE": "SF_LEVENE(data, [layout], [labels], [center])",
    "SF_BARTLETT": "SF_BARTLETT(data, [layout], [labels])",
    "SF_SHAPIRO": "SF_SHAPIRO(data, [layout], [labels])",
    "SF_CHECKS": "SF_CHECKS(data, [layout], [labels], [alpha])",
    "SF_PAIRS": "SF_PAIRS(data, [layout], [labels], [method], [alpha])",
    "SF_DUNNETT": "SF_DUNNETT(data, control, [layout], [labels], [alpha])",
    "SF_LETTERS": "SF_LETTERS(data, [layout], [labels], [method], [alpha])",
    "SF_EFFECT": "SF_EFFECT(data, [layout], [labels], [conf])",
    "SF_VARCOMP": "SF_VARCOMP(data, [layout], [labels], [conf])",
    "SF_POWER": "SF_POWER(k, n, cohens_f, [alpha])",
    "SF_SAMPLESIZE": "SF_SAMPLESIZE(k, cohens_f, [power], [alpha])",
    "SF_DETECTABLE": "SF_DETECTABLE(k, n, [power], [alpha])",
}
PLANNING = {"SF_POWER", "SF_SAMPLESIZE", "SF_DETECTABLE"}

#: The one-way catalog (issue 3), covered by tests/test_harness.py.
ONEWAY_DATA = {
    "SF_TABLE", "SF_GROUPS", "SF_GLT", "SF_CONTRAST", "SF_SSB", "SF_SSW", "SF_SST", "SF_DFB",
    "SF_DFW", "SF_DFT", "SF_MSB", "SF_MSW", "SF_F", "SF_P", "SF_R2",
}
ONEWAY_OTHER = {"SF_FROMSTATS", "SF_FTAIL", "SF_FCRIT"}

# Invented data: seal strength (N) of pouches from three sealing jaws of a packaging line.
GROUPS = {
    "Jaw 1": [21.4, 20.9, 21.8, 21.1, 20.7],
    "Jaw 2": [22.6, 23.1, 22.4, 22.9],
    "Jaw 3": [21.0, 21.5, 20.6, 21.3, 20.8, 21.9],
}
DEFAULT_NAMES = ["Group 1", "Group 2", "Group 3"]


def long(groups: dict[str, list[float]], header: bool = True) -> list[list[Any]]:
    return ranges.long(groups, header, names=("Jaw", "Seal strength"))


wide, rowwise = ranges.wide, ranges.rowwise
LAYOUTS = {"wide": wide, "long": long, "rowwise": rowwise}


def shown(value: Any) -> Any:
    """A core value as the cell shows it (GUIDE.md): blank for None and NaN, the largest double
    for infinity, numbers as floats, text and logicals as they are."""
    if isinstance(value, list):
        return [shown(v) for v in value]
    if value is None or (isinstance(value, float) and math.isnan(value)):
        return BLANK
    if isinstance(value, (str, bool)):
        return value
    v = float(value)
    return math.copysign(MAX_DOUBLE, v) if math.isinf(v) else v


#: For each data function: the core call behind it, given the groups and the options by name.
CORE: dict[str, Callable[..., Any]] = {
    "SF_WELCH": lambda g: welch(g).table(),
    "SF_BROWNFORSYTHE": lambda g: brown_forsythe(g).table(),
    "SF_KRUSKAL": lambda g: kruskal(g).table(),
    "SF_LEVENE": lambda g, center="median": levene(g, center).table(),
    "SF_BARTLETT": lambda g: bartlett(g).table(),
    "SF_SHAPIRO": lambda g: shapiro_residuals(g).table(),
    "SF_CHECKS": lambda g, alpha=0.05: checks(g, alpha).table(),
    "SF_PAIRS": lambda g, method="tukey", alpha=0.05: pairwise(g, method, alpha).table(),
    "SF_DUNNETT": lambda g, control, alpha=0.05: dunnett(g, control, alpha).table(),
    "SF_LETTERS": lambda g, method="tukey", alpha=0.05: letters(g, method, alpha).table(),
    "SF_EFFECT": lambda g, conf=0.95: effect_sizes(g, conf).table(),
    "SF_VARCOMP": lambda g, conf=0.95: variance_components(g, conf).table(),
}
DATA_FUNCTIONS = sorted(CORE)


def call_on(name: str, data: Any, control: str = "Jaw 1", *, layout: Any = MISSING,
            labels: Any = MISSING, **options: Any) -> Any:
    """Call a data function as a formula would, giving Dunnett its control."""
    args = [data] + ([control] if name == "SF_DUNNETT" else [])
    named = dict(options)
    if layout is not MISSING:
        named["layout"] = layout
    if labels is not MISSING:
        named["labels"] = labels
    return call(name, *args, **named)


def expected(name: str, groups: Any, control: str = "Jaw 1", **options: Any) -> Any:
    extra = {"control": control} if name == "SF_DUNNETT" else {}
    return shown(CORE[name](groups, **extra, **options))


def test_every_issue4_function_is_registered_with_its_signature() -> None:
    for name, signature in CATALOG.items():
        assert REGISTRY[name].signature == signature
    assert set(CATALOG) == set(CORE) | PLANNING


def test_every_function_is_covered_here_or_by_the_oneway_harness_tests() -> None:
    data_functions = {n for n, rec in REGISTRY.items() if rec.args[0].name == "data"}
    assert data_functions == ONEWAY_DATA | set(CORE)
    assert set(REGISTRY) == ONEWAY_DATA | ONEWAY_OTHER | set(CATALOG)


@pytest.mark.parametrize("name", sorted(CATALOG))
def test_record_result_kind_and_documented_header(name: str) -> None:
    rec = REGISTRY[name]
    if name in PLANNING:
        assert rec.result == "scalar" and not rec.columns
        return
    assert rec.result == "table"
    header = call_on(name, wide(GROUPS))[0]
    assert len(header) == len(rec.columns)
    for got, documented in zip(header, rec.columns):
        if documented.startswith(("CI low (", "CI high (")):
            # the interval's kind and level are part of the header, e.g. "CI low (simultaneous 95%)"
            assert got.startswith(documented.split("(")[0] + "(") and got.endswith(")")
        elif documented == "q, t or F":
            assert got in ("q", "t", "F")
        else:
            assert got == documented


# --------------------------------------------------------------------------------------------
# the front gives the core's numbers


@pytest.mark.parametrize("header", [True, False], ids=["header", "no-header"])
@pytest.mark.parametrize("layout", list(LAYOUTS))
@pytest.mark.parametrize("name", DATA_FUNCTIONS)
def test_layouts_equal_core(name: str, layout: str, header: bool) -> None:
    data = LAYOUTS[layout](GROUPS, header)
    if layout == "long" or header:
        groups, control = GROUPS, "Jaw 1"  # in the long layout the labels are the first column
    else:
        groups, control = dict(zip(DEFAULT_NAMES, GROUPS.values())), "Group 1"
    got = call_on(name, data, control, layout=layout if layout != "wide" else MISSING)
    assert got == expected(name, groups, control)


@pytest.mark.parametrize("name", DATA_FUNCTIONS)
def test_blanks_text_logicals_and_blank_columns_ignored(name: str) -> None:
    data = wide(GROUPS)
    data.insert(3, ["retest", True, None])  # text, a logical and a blank among the values
    data.append(["", None, "seal torn"])
    ranges.with_blank_columns(data)  # an all-blank column in the middle and one at the right edge
    assert call_on(name, data) == expected(name, GROUPS)


@pytest.mark.parametrize("name", DATA_FUNCTIONS)
def test_decimal_numbers_count_like_floats(name: str) -> None:
    # currency-formatted cells arrive as decimal.Decimal
    data = ranges.as_decimals(wide(GROUPS))
    assert call_on(name, data) == expected(name, GROUPS)


@pytest.mark.parametrize("name", DATA_FUNCTIONS)
@pytest.mark.parametrize("error", [NA, DIV0, SPILL], ids=["N/A", "DIV0", "SPILL-as-COM-int"])
def test_error_cell_reported_with_its_position(name: str, error) -> None:
    data = wide(GROUPS)
    data[3][2] = error  # 0-based row 3, column 2: the range's row 4, column 3
    out = call_on(name, data)
    assert is_message(out), out
    assert error.name in out and "row 4, column 3" in out


@pytest.mark.parametrize("name", DATA_FUNCTIONS)
def test_one_column_range_is_one_group(name: str) -> None:
    """A one-column range arrives as rows of one cell (ndim=2): one group cannot be compared."""
    out = call_on(name, column(["Jaw 1"] + GROUPS["Jaw 1"]))
    assert is_message(out) and "at least two groups" in out, out


OPTIONS = [
    ("SF_LEVENE", {"center": "mean"}),
    ("SF_LEVENE", {"center": " Median "}),
    ("SF_CHECKS", {"alpha": 0.2}),
    ("SF_DUNNETT", {"alpha": 0.01}),
    ("SF_LETTERS", {"method": "holm", "alpha": 0.1}),
    ("SF_LETTERS", {"method": "games-howell"}),
    ("SF_EFFECT", {"conf": 0.9}),
    ("SF_VARCOMP", {"conf": 0.8}),
] + [("SF_PAIRS", {"method": m, "alpha": a}) for m in METHODS for a in (0.05, 0.01)]


@pytest.mark.parametrize("name, options", OPTIONS, ids=[f"{n}-{o}" for n, o in OPTIONS])
def test_options_equal_core(name: str, options: dict[str, Any]) -> None:
    core_options = {k: v.strip() if isinstance(v, str) else v for k, v in options.items()}
    assert call_on(name, wide(GROUPS), **options) == expected(name, GROUPS, **core_options)


def test_options_as_cells() -> None:
    data = wide(GROUPS)
    # a blank option cell means the default; a one-cell range is its value; text is trimmed
    assert call("SF_PAIRS", data, None, None, None, None) == call("SF_PAIRS", data)
    assert call("SF_PAIRS", data, MISSING, MISSING, [["  Holm "]], [[0.1]]) == expected(
        "SF_PAIRS", GROUPS, method="holm", alpha=0.1
    )
    assert call("SF_EFFECT", data, MISSING, MISSING, decimal.Decimal("0.9")) == expected(
        "SF_EFFECT", GROUPS, conf=0.9
    )
    assert call("SF_DUNNETT", data, [[" Jaw 2 "]]) == expected("SF_DUNNETT", GROUPS, "Jaw 2")
    assert call("SF_POWER", [[4.0]], decimal.Decimal(20), 0.25, None) == power_of(4, 20, 0.25)


def test_dunnett_control_typed_as_a_number_matches_a_numeric_label() -> None:
    # GUIDE.md: numeric labels are shown in their shortest form, so lots 1, 2, 3 are "1", "2", "3"
    data = wide(GROUPS)
    data[0] = [1.0, 2.0, 3.0]
    lots = dict(zip(["1", "2", "3"], GROUPS.values()))
    want = expected("SF_DUNNETT", lots, "3")
    for control in (3, 3.0, "3", " 3 ", decimal.Decimal("3.00"), [[3.0]]):
        assert call("SF_DUNNETT", data, control, MISSING, True) == want
    assert [r[1] for r in want[1:]] == ["3", "3"] and [r[0] for r in want[1:]] == ["1", "2"]
    out = call("SF_DUNNETT", data, 4, MISSING, True)
    assert is_message(out) and 'the control "4" is not one of the groups ("1", "2", "3")' in out


def test_dunnett_control_as_a_date_label() -> None:
    # GUIDE.md: a date in a label position is written as an ISO date (one group per shift day)
    data = wide(GROUPS)
    data[0] = [dt.date(2024, 3, 1), dt.date(2024, 3, 2), dt.date(2024, 3, 4)]
    days = dict(zip(["2024-03-01", "2024-03-02", "2024-03-04"], GROUPS.values()))
    assert call("SF_DUNNETT", data, dt.date(2024, 3, 1), MISSING, True) == expected(
        "SF_DUNNETT", days, "2024-03-01"
    )


def test_logicals_stay_logical_and_blanks_stay_blank() -> None:
    pairs = call("SF_PAIRS", wide(GROUPS))
    assert all(type(r[-1]) is bool for r in pairs[1:])
    assert {r[-1] for r in pairs[1:]} == {True, False}
    effects = call("SF_EFFECT", wide(GROUPS))
    assert effects[2][2] == BLANK and effects[2][3] == BLANK  # no interval for omega squared
    assert call("SF_VARCOMP", wide(GROUPS))[4][4] == BLANK  # no share for the ICC


def test_infinite_values_show_as_the_largest_double() -> None:
    # GUIDE.md: no variation within groups but different means: statistics are infinite
    data = [["A", "B", "C"], [1.0, 2.0, 4.0], [1.0, 2.0, 4.0], [1.0, 2.0, 4.0]]
    pairs = call("SF_PAIRS", data)
    assert [r[6] for r in pairs[1:]] == [MAX_DOUBLE] * 3 and [r[7] for r in pairs[1:]] == [0.0] * 3
    dun = call("SF_DUNNETT", data, "A")
    assert [r[6] for r in dun[1:]] == [MAX_DOUBLE, MAX_DOUBLE]
    effects = call("SF_EFFECT", data)
    assert effects[4][1:4] == [MAX_DOUBLE] * 3  # Cohen's f and its interval
    assert call("SF_CHECKS", data)[1][1] == MAX_DOUBLE  # the one-way F is read
    assert pairs == shown(pairwise(dict(A=[1.0] * 3, B=[2.0] * 3, C=[4.0] * 3)).table())


def test_planning_functions_equal_core() -> None:
    for k, n, f, a in ((2, 10, 0.4, 0.05), (4, 20, 0.25, 0.05), (6, 7, 0.5, 0.01)):
        assert call("SF_POWER", k, n, f, a) == power_of(k, n, f, a)
        assert call("SF_SAMPLESIZE", k, f, 0.9, a) == float(sample_size(k, f, 0.9, a))
        assert call("SF_DETECTABLE", k, n, 0.9, a) == detectable_effect(k, n, 0.9, a)
    # defaults: alpha 0.05, power 0.8; a blank cell means the default
    assert call("SF_POWER", 4, 20, 0.25) == power_of(4, 20, 0.25, 0.05)
    assert call("SF_SAMPLESIZE", 4, 0.25, None, None) == float(sample_size(4, 0.25, 0.8, 0.05))
    assert call("SF_DETECTABLE", 4, 20, MISSING, 0.05) == detectable_effect(4, 20, 0.8, 0.05)
    assert type(call("SF_SAMPLESIZE", 4, 0.25)) is float  # a cell holds every number as a double


# --------------------------------------------------------------------------------------------
# outside sources, through the cells

ARRAYS = [np.array(v) for v in GROUPS.values()]


def _rows(table: list[list[Any]]) -> dict[str, list[Any]]:
    return {r[0]: r[1:] for r in table[1:]}


def test_welch_against_scipy_and_statsmodels() -> None:
    # reference libraries: scipy.stats.f_oneway(equal_var=False) and statsmodels
    # anova_oneway(use_var="unequal") for the degrees of freedom (Welch 1951)
    from statsmodels.stats.oneway import anova_oneway

    out = call("SF_WELCH", long(GROUPS), "long")[1]
    ref = stats.f_oneway(*ARRAYS, equal_var=False)
    assert out[1] == pytest.approx(ref.statistic, rel=1e-12)
    assert out[4] == pytest.approx(ref.pvalue, rel=1e-10)
    assert out[3] == pytest.approx(float(anova_oneway(ARRAYS, use_var="unequal").df_denom), rel=1e-10)


def test_brown_forsythe_against_statsmodels() -> None:
    # reference library: statsmodels anova_oneway(use_var="bf"): statistic, df_num2, df_denom, pvalue2
    from statsmodels.stats.oneway import anova_oneway

    ref = anova_oneway(ARRAYS, use_var="bf")
    out = call("SF_BROWNFORSYTHE", rowwise(GROUPS), "rowwise")[1]
    assert out[1] == pytest.approx(float(ref.statistic), rel=1e-10)
    assert out[2] == float(ref.df_num2) == 2.0
    assert out[3] == pytest.approx(float(ref.df_denom), rel=1e-10)
    assert out[4] == pytest.approx(float(ref.pvalue2), rel=1e-8)


def test_kruskal_against_scipy() -> None:
    # reference library: scipy.stats.kruskal (tie-corrected H); effect size formula of
    # Tomczak & Tomczak (2014): epsilon^2 = H (N + 1) / (N^2 - 1)
    tied = {"Jaw 1": [21.4, 21.0, 21.8, 21.1], "Jaw 2": [22.6, 21.4, 22.4, 22.6], "Jaw 3": [21.0, 21.5, 21.0]}
    out = call("SF_KRUSKAL", wide(tied))[1]
    ref = stats.kruskal(*tied.values())
    n = sum(len(v) for v in tied.values())
    assert out[1] == pytest.approx(ref.statistic, rel=1e-12)
    assert out[2] == 2.0 and out[3] == pytest.approx(ref.pvalue, rel=1e-10)
    assert out[4] == pytest.approx(ref.statistic * (n + 1) / (n * n - 1), rel=1e-12)


@pytest.mark.parametrize("center", ["median", "mean"])
def test_levene_against_scipy(center: str) -> None:
    # reference library: scipy.stats.levene(center=...)
    out = call("SF_LEVENE", wide(GROUPS), MISSING, MISSING, center)[1]
    ref = stats.levene(*ARRAYS, center=center)
    assert out[0] == f"Levene ({center})"
    assert out[1] == pytest.approx(ref.statistic, rel=1e-10)
    assert out[4] == pytest.approx(ref.pvalue, rel=1e-10)
    assert out[2:4] == [2.0, 12.0]


def test_bartlett_against_scipy() -> None:
    # reference library: scipy.stats.bartlett
    out = call("SF_BARTLETT", wide(GROUPS))[1]
    ref = stats.bartlett(*ARRAYS)
    assert out[1] == pytest.approx(ref.statistic, rel=1e-10)
    assert out[3] == pytest.approx(ref.pvalue, rel=1e-10)


def test_shapiro_against_scipy_on_the_residuals() -> None:
    # reference library: scipy.stats.shapiro on the residuals y - group mean (numpy)
    out = call("SF_SHAPIRO", wide(GROUPS))[1]
    res = np.concatenate([a - a.mean() for a in ARRAYS])
    ref = stats.shapiro(res)
    assert out[0] == "Shapiro-Wilk (residuals)" and out[2] == float(res.size)
    assert out[1] == pytest.approx(ref.statistic, rel=1e-6)
    assert out[3] == pytest.approx(ref.pvalue, rel=1e-4)


def test_checks_read_welch_when_one_spread_is_four_times_the_others() -> None:
    # issue 4 acceptance, invented case: one group's SD four times the others'; the Levene row
    # is checked against scipy.stats.levene(center="median")
    base = [-1.2, -0.6, 0.0, 0.6, 1.2, -0.9, 0.9, -0.3, 0.3, 0.0]
    spread = {"Jaw 1": [20.0 + 0.1 * d for d in base], "Jaw 2": [21.0 + 0.1 * d for d in base],
              "Jaw 3": [20.5 + 0.4 * d for d in base]}
    out = call("SF_CHECKS", wide(spread))
    assert out[1][0] == "Read" and out[1][4] == "Welch"
    w = welch(spread)
    assert out[1][1] == w.statistic and out[1][3] == w.p
    rows = _rows(out)
    assert rows["Largest / smallest SD"][0] == pytest.approx(4.0, rel=1e-12)
    ref = stats.levene(*spread.values(), center="median")
    assert rows["Levene (median)"][0] == pytest.approx(ref.statistic, rel=1e-10)
    assert rows["Levene (median)"][2] == pytest.approx(ref.pvalue, rel=1e-10)


def test_checks_read_the_oneway_f_on_a_well_behaved_case() -> None:
    # reference library: scipy.stats.f_oneway for the F that the Read row carries
    out = call("SF_CHECKS", wide(GROUPS))
    assert out[1][4] == "One-way F"
    ref = stats.f_oneway(*ARRAYS)
    assert out[1][1] == pytest.approx(ref.statistic, rel=1e-12)
    assert out[1][3] == pytest.approx(ref.pvalue, rel=1e-10)
    assert out[1][2] == "2, 12"  # the two degrees of freedom in one cell


def _matrix_index(table: list[list[Any]]) -> list[tuple[int, int, list[Any]]]:
    labels = list(GROUPS)
    return [(labels.index(r[0]), labels.index(r[1]), r) for r in table[1:]]


@pytest.mark.parametrize("method, equal_var", [("tukey", True), ("games-howell", False)])
def test_pairs_against_scipy_tukey_hsd(method: str, equal_var: bool) -> None:
    # reference library: scipy.stats.tukey_hsd (Tukey-Kramer; equal_var=False: Games-Howell)
    ref = stats.tukey_hsd(*ARRAYS, equal_var=equal_var)
    ci = ref.confidence_interval(0.95)
    out = call("SF_PAIRS", wide(GROUPS), MISSING, MISSING, method)
    for i, j, r in _matrix_index(out):
        assert r[2] == pytest.approx(ref.statistic[i, j], rel=1e-12)
        assert r[4] == pytest.approx(ci.low[i, j], rel=1e-6)
        assert r[5] == pytest.approx(ci.high[i, j], rel=1e-6)
        assert r[7] == pytest.approx(ref.pvalue[i, j], rel=1e-5, abs=1e-9)
        assert r[8] is bool(ref.pvalue[i, j] < 0.05)


@pytest.mark.parametrize("method", ["bonferroni", "holm", "sidak"])
def test_pairs_adjustments_against_statsmodels_multipletests(method: str) -> None:
    # reference library: statsmodels.stats.multitest.multipletests on pooled-t p-values
    # (scipy.stats.t, residual mean square from numpy)
    from statsmodels.stats.multitest import multipletests

    ns = [a.size for a in ARRAYS]
    dfw = sum(ns) - len(ns)
    mse = sum(float(((a - a.mean()) ** 2).sum()) for a in ARRAYS) / dfw
    out = call("SF_PAIRS", wide(GROUPS), MISSING, MISSING, method)
    raw = []
    for i, j, r in _matrix_index(out):
        t = (ARRAYS[i].mean() - ARRAYS[j].mean()) / math.sqrt(mse * (1 / ns[i] + 1 / ns[j]))
        assert r[6] == pytest.approx(t, rel=1e-10)
        raw.append(2 * stats.t.sf(abs(t), dfw))
    adjusted = multipletests(raw, alpha=0.05, method=method)[1]
    assert [r[7] for r in out[1:]] == pytest.approx(list(adjusted), rel=1e-9, abs=1e-15)


def test_pairs_scheffe_against_the_textbook_formula() -> None:
    # textbook formula (Scheffe 1953): F = t^2 / (k - 1) on (k - 1, N - k), interval
    # d +/- sqrt((k - 1) F_crit) SE; distributions from scipy.stats.f
    ns = [a.size for a in ARRAYS]
    k, dfw = len(ns), sum(ns) - len(ns)
    mse = sum(float(((a - a.mean()) ** 2).sum()) for a in ARRAYS) / dfw
    out = call("SF_PAIRS", wide(GROUPS), MISSING, MISSING, "scheffe", 0.1)
    for i, j, r in _matrix_index(out):
        d = ARRAYS[i].mean() - ARRAYS[j].mean()
        se = math.sqrt(mse * (1 / ns[i] + 1 / ns[j]))
        f = (d / se) ** 2 / (k - 1)
        half = math.sqrt((k - 1) * stats.f.isf(0.1, k - 1, dfw)) * se
        assert r[6] == pytest.approx(f, rel=1e-10)
        assert r[7] == pytest.approx(stats.f.sf(f, k - 1, dfw), rel=1e-9)
        assert r[4] == pytest.approx(d - half, rel=1e-9) and r[5] == pytest.approx(d + half, rel=1e-9)
    assert "simultaneous 90%" in out[0][4]


def test_dunnett_against_scipy() -> None:
    # reference library: scipy.stats.dunnett (randomised quasi-Monte Carlo: fixed random_state,
    # 1e-3 tolerance)
    out = call("SF_DUNNETT", wide(GROUPS), "Jaw 3")
    ref = stats.dunnett(ARRAYS[0], ARRAYS[1], control=ARRAYS[2], random_state=20240611)
    ci = ref.confidence_interval(0.95)
    assert [r[0] for r in out[1:]] == ["Jaw 1", "Jaw 2"] and {r[1] for r in out[1:]} == {"Jaw 3"}
    for i, r in enumerate(out[1:]):
        assert r[6] == pytest.approx(ref.statistic[i], rel=1e-10)
        assert r[7] == pytest.approx(ref.pvalue[i], abs=1e-3)
        assert r[4] == pytest.approx(ci.low[i], abs=1e-3) and r[5] == pytest.approx(ci.high[i], abs=1e-3)


def test_letters_share_a_letter_exactly_when_scipy_tukey_hsd_does_not_separate() -> None:
    # reference library: scipy.stats.tukey_hsd; invented data with overlapping groups
    # (Jaw 1 ~ Jaw 2, Jaw 2 ~ Jaw 3, Jaw 1 != Jaw 3, Jaw 4 apart from all)
    data = {
        "Jaw 1": [19.6, 20.4, 19.9, 20.3, 20.1, 19.7],
        "Jaw 2": [19.9, 20.7, 20.2, 20.6, 20.4, 20.0],
        "Jaw 3": [20.2, 21.0, 20.5, 20.9, 20.7, 20.3],
        "Jaw 4": [22.5, 23.3, 22.8, 23.2, 23.0, 22.6],
    }
    out = call("SF_LETTERS", wide(data))
    shown_letters = {r[0]: r[2] for r in out[1:]}
    assert [r[0] for r in out[1:]] == ["Jaw 4", "Jaw 3", "Jaw 2", "Jaw 1"]  # highest mean first
    assert shown_letters["Jaw 4"] == "a"
    ref = stats.tukey_hsd(*data.values())
    labels = list(data)
    separated = 0
    for i in range(4):
        for j in range(i + 1, 4):
            share = bool(set(shown_letters[labels[i]]) & set(shown_letters[labels[j]]))
            assert share == (ref.pvalue[i, j] >= 0.05), (labels[i], labels[j])
            separated += not share
    assert separated == 4  # the case mixes shared and separate letters
    assert shown_letters == {"Jaw 4": "a", "Jaw 3": "b", "Jaw 2": "bc", "Jaw 1": "c"}


def test_effect_sizes_against_textbook_formulas_and_scipy_ncf() -> None:
    # textbook formulas: eta^2 = SSB/SST, omega^2 = (SSB - (k-1) MSW)/(SST + MSW) (Hays 1963),
    # epsilon^2 = (SSB - (k-1) MSW)/SST (Kelley 1935), f = sqrt(SSB/SSW) (Cohen 1988); interval
    # limits checked with scipy.stats.ncf: P(F' <= F_obs; lambda) = 0.975 and 0.025, lambda = N f^2
    allv = np.concatenate(ARRAYS)
    n, k = allv.size, len(ARRAYS)
    ssb = sum(a.size * (a.mean() - allv.mean()) ** 2 for a in ARRAYS)
    ssw = sum(float(((a - a.mean()) ** 2).sum()) for a in ARRAYS)
    sst, msw = ssb + ssw, ssw / (n - k)
    rows = _rows(call("SF_EFFECT", wide(GROUPS)))
    assert rows["Eta squared"][0] == pytest.approx(ssb / sst, rel=1e-12)
    assert rows["Omega squared"][0] == pytest.approx((ssb - (k - 1) * msw) / (sst + msw), rel=1e-12)
    assert rows["Epsilon squared"][0] == pytest.approx((ssb - (k - 1) * msw) / sst, rel=1e-12)
    assert rows["Cohen's f"][0] == pytest.approx(math.sqrt(ssb / ssw), rel=1e-12)
    f_obs = stats.f_oneway(*ARRAYS).statistic
    f_low, f_high = rows["Cohen's f"][1:3]
    assert stats.ncf.cdf(f_obs, k - 1, n - k, n * f_low**2) == pytest.approx(0.975, abs=1e-8)
    assert stats.ncf.cdf(f_obs, k - 1, n - k, n * f_high**2) == pytest.approx(0.025, abs=1e-8)
    lam_low = n * f_low**2
    assert rows["Eta squared"][1] == pytest.approx(lam_low / (lam_low + n), rel=1e-10)


def test_power_against_statsmodels() -> None:
    # reference library: statsmodels.stats.power.FTestAnovaPower (nobs = k n, noncentrality = f^2 nobs)
    from statsmodels.stats.power import FTestAnovaPower

    ref = FTestAnovaPower()
    for k, n, f in ((4, 20, 0.25), (3, 12, 0.4), (5, 8, 0.3)):
        assert call("SF_POWER", k, n, f) == pytest.approx(
            ref.power(effect_size=f, nobs=k * n, alpha=0.05, k_groups=k), rel=1e-8
        )


def test_sample_size_against_cohen_table() -> None:
    # Cohen (1988) power tables, ch. 8: k = 4 (u = 3), f = 0.25, alpha = 0.05, power 0.80 -> 45 per group
    assert call("SF_SAMPLESIZE", 4, 0.25, 0.8, 0.05) == 45.0
    assert call("SF_SAMPLESIZE", 4, 0.25) == 45.0  # the same by default


def test_detectable_effect_against_statsmodels() -> None:
    # reference library: statsmodels FTestAnovaPower.solve_power for the effect size
    from statsmodels.stats.power import FTestAnovaPower

    got = call("SF_DETECTABLE", 4, 10, 0.8, 0.05)
    ref = FTestAnovaPower().solve_power(effect_size=None, nobs=40, alpha=0.05, power=0.8, k_groups=4)
    assert got == pytest.approx(float(ref), rel=1e-6)


def test_varcomp_against_statsmodels_mixedlm_reml() -> None:
    # reference library: statsmodels MixedLM (random intercept per lot, REML) on balanced data,
    # within 1e-4 relative; within-lot interval: chi-square formula with scipy.stats.chi2
    import statsmodels.api as sm

    rng = np.random.default_rng(20240611)
    y = np.round(50.0 + rng.normal(0, 0.2, (6, 1)) + rng.normal(0, 0.1, (6, 4)), 3)
    lots = {f"Lot {101 + i}": list(r) for i, r in enumerate(y)}
    out = _rows(call("SF_VARCOMP", rowwise(lots), "rowwise"))
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")  # convergence chatter from the tight tolerance
        fit = sm.MixedLM(y.ravel(), np.ones((24, 1)), groups=np.repeat(np.arange(6), 4)).fit(
            reml=True, method="bfgs", gtol=1e-12
        )
    between, within = float(np.asarray(fit.cov_re)[0, 0]), float(fit.scale)
    assert out["Between groups"][0] == pytest.approx(between, rel=1e-4)
    assert out["Within groups"][0] == pytest.approx(within, rel=1e-4)
    assert out["Intraclass correlation"][0] == pytest.approx(between / (between + within), rel=1e-4)
    msw, df = out["Within groups"][0], 18
    assert out["Within groups"][1] == pytest.approx(df * msw / stats.chi2.isf(0.025, df), rel=1e-12)
    assert out["Within groups"][2] == pytest.approx(df * msw / stats.chi2.ppf(0.025, df), rel=1e-12)


# --------------------------------------------------------------------------------------------
# every input problem gives one line of text

TIED = [["A", "B"], [1.0, 1.0], [1.0, 1.0], [1.0, 1.0]]
FLAT_A = [["A", "B", "C"], [1.0, 2.0, 3.0], [1.0, 2.5, 3.5], [1.0, 2.2, 3.1]]
ONE_VALUE_A = [["A", "B"], [1.0, 2.0], [None, 2.5], [None, 2.2]]
FLAT_ALL = [["A", "B"], [1.0, 2.0], [1.0, 2.0]]
DATA = wide(GROUPS)

PROBLEMS = [
    # (label, function, arguments, phrase in the message)
    ("unknown method", "SF_PAIRS", (DATA, MISSING, MISSING, "fisher"), 'unknown comparison method "fisher"'),
    ("method as a number", "SF_PAIRS", (DATA, MISSING, MISSING, 3), 'unknown comparison method "3"'),
    ("dunnett as a pairwise method", "SF_PAIRS", (DATA, MISSING, MISSING, "dunnett"), "SF_DUNNETT"),
    ("unknown letters method", "SF_LETTERS", (DATA, MISSING, MISSING, "lsd"), "unknown comparison method"),
    ("letters by dunnett", "SF_LETTERS", (DATA, MISSING, MISSING, "Dunnett"), "letters need every pair"),
    ("pairs alpha out of range", "SF_PAIRS", (DATA, MISSING, MISSING, MISSING, 5), "alpha must lie strictly between 0 and 1"),
    ("letters alpha as text", "SF_LETTERS", (DATA, MISSING, MISSING, MISSING, "five"), "alpha must be a number"),
    ("games-howell zero variance", "SF_PAIRS", (FLAT_A, MISSING, MISSING, "games-howell"), 'group "A" has zero variance'),
    ("games-howell one value", "SF_PAIRS", (ONE_VALUE_A, MISSING, MISSING, "games-howell"), 'group "A" has only one value'),
    ("pairs all values identical", "SF_PAIRS", (TIED,), "all values are identical"),
    ("unknown control", "SF_DUNNETT", (DATA, "Jaw 9"), 'the control "Jaw 9" is not one of the groups ("Jaw 1", "Jaw 2", "Jaw 3")'),
    ("control in another case", "SF_DUNNETT", (DATA, "jaw 1"), 'the control "jaw 1" is not one of the groups'),
    ("control blank", "SF_DUNNETT", (DATA, None), "control is missing"),
    ("control holds an error", "SF_DUNNETT", (DATA, NA), "control holds the error #N/A"),
    ("control given a range", "SF_DUNNETT", (DATA, [["Jaw 1", "Jaw 2"]]), "not a range of 2 cells"),
    ("dunnett alpha out of range", "SF_DUNNETT", (DATA, "Jaw 1", MISSING, MISSING, 0.0), "alpha must lie strictly"),
    ("welch zero variance", "SF_WELCH", (FLAT_A,), 'group "A" has zero variance'),
    ("welch one value", "SF_WELCH", (ONE_VALUE_A,), 'group "A" has only one value'),
    ("brown-forsythe no spread at all", "SF_BROWNFORSYTHE", (FLAT_ALL,), "every group has zero variance"),
    ("brown-forsythe one value", "SF_BROWNFORSYTHE", (ONE_VALUE_A,), 'group "A" has only one value'),
    ("kruskal all values tied", "SF_KRUSKAL", (TIED,), "every value is the same"),
    ("kruskal one group", "SF_KRUSKAL", ([["A"], [1.0], [2.0]],), "at least two groups"),
    ("levene all distances equal", "SF_LEVENE", (TIED,), "Levene's test has no differences in spread"),
    ("levene unknown centre", "SF_LEVENE", (DATA, MISSING, MISSING, "trimmed"), 'center must be "median"'),
    ("levene one value", "SF_LEVENE", (ONE_VALUE_A,), 'group "A" has only one value'),
    ("bartlett zero variance", "SF_BARTLETT", (FLAT_A,), 'group "A" has zero variance'),
    ("bartlett one value", "SF_BARTLETT", (ONE_VALUE_A,), 'group "A" has only one value'),
    ("shapiro too few residuals", "SF_SHAPIRO", ([["A", "B"], [1.0, 2.0], [None, 2.5]],), "needs at least 3"),
    ("shapiro all residuals zero", "SF_SHAPIRO", (FLAT_ALL,), "all residuals are zero"),
    ("checks alpha out of range", "SF_CHECKS", (DATA, MISSING, MISSING, 2), "alpha must lie strictly"),
    ("checks all values identical", "SF_CHECKS", (TIED,), "all values are identical"),
    ("effect conf out of range", "SF_EFFECT", (DATA, MISSING, MISSING, 95), "confidence level must lie strictly"),
    ("effect conf holds an error", "SF_EFFECT", (DATA, MISSING, MISSING, DIV0), "conf holds the error #DIV/0!"),
    ("varcomp conf zero", "SF_VARCOMP", (DATA, MISSING, MISSING, 0), "confidence level must lie strictly"),
    ("varcomp no residual df", "SF_VARCOMP", ([["A", "B"], [1.0, 2.0]],), "no residual degrees of freedom"),
    ("varcomp error in labels", "SF_VARCOMP", ([["A", REF], [1.0, 2.0], [1.5, 2.5]],), "#REF!"),
    ("power k below 2", "SF_POWER", (1, 10, 0.25), "k (the number of groups) must be a whole number from 2 to 10,000"),
    ("power k not whole", "SF_POWER", (2.5, 10, 0.25), "must be a whole number"),
    ("power n below 2", "SF_POWER", (3, 1, 0.25), "n (values per group) must be a whole number from 2 to 100,000,000,000"),
    ("power f zero", "SF_POWER", (3, 10, 0), "the effect size f must be greater than 0"),
    ("power f negative", "SF_POWER", (3, 10, -0.2), "the effect size f must be greater than 0"),
    ("power alpha one", "SF_POWER", (3, 10, 0.25, 1.0), "alpha must lie strictly between 0 and 1"),
    ("power f blank", "SF_POWER", (3, 10, None), "f is missing"),
    ("power k as text", "SF_POWER", ("four", 10, 0.25), "k must be a number"),
    ("power n as a date", "SF_POWER", (3, dt.date(2024, 1, 1), 0.25), "n is a date"),
    ("power holds an error", "SF_POWER", (3, 10, CALC), "f holds the error #CALC!"),
    ("sample size power one", "SF_SAMPLESIZE", (3, 0.25, 1.0), "power must lie strictly between 0 and 1"),
    ("sample size power below alpha", "SF_SAMPLESIZE", (3, 0.25, 0.01), "must be greater than alpha"),
    ("sample size k below 2", "SF_SAMPLESIZE", (1, 0.25), "k (the number of groups)"),
    ("sample size f zero", "SF_SAMPLESIZE", (3, 0.0), "the effect size f must be greater than 0"),
    ("sample size effect too small", "SF_SAMPLESIZE", (3, 1e-9), "too small to plan for"),
    ("detectable alpha zero", "SF_DETECTABLE", (3, 10, 0.8, 0.0), "alpha must lie strictly between 0 and 1"),
    ("detectable power negative", "SF_DETECTABLE", (3, 10, -0.5), "power must lie strictly between 0 and 1"),
    ("detectable n below 2", "SF_DETECTABLE", (3, 1), "n (values per group)"),
    ("detectable n given a range", "SF_DETECTABLE", (3, column([10.0, 12.0])), "not a range of 2 cells"),
]


@pytest.mark.parametrize("name, args, phrase", [p[1:] for p in PROBLEMS], ids=[p[0] for p in PROBLEMS])
def test_input_problem_gives_one_line_of_text(name: str, args: tuple, phrase: str) -> None:
    out = call(name, *args)
    assert is_message(out), out
    assert phrase in out, out


def test_every_issue4_function_has_an_input_problem_test() -> None:
    assert set(CATALOG) <= {p[1] for p in PROBLEMS}
