"""Hostile values through every worksheet function, as the hosts call them (issue 10, item 9).

A seeded fuzz test calls every function of the registry through the harness (the path xlwings
takes on Windows: host values, cleaning, the registry's wrapper, the written result) with random
cells and random option values, extreme but finite ones included. Bounded by a deadline and a
call count. What must hold for every call: no exception escapes (and none is caught by the
registry's last guard, which would be a bug too), no blank where a number is promised (a scalar
is a finite number or a message; a NaN in a result would show as the guard's line), every
message is one line.

Then one test per case the issue lists, each named after it.
"""

from __future__ import annotations

import datetime as dt
import decimal
import math
import random
import time
from fractions import Fraction
from typing import Any

import mpmath
import pytest
from scipy import stats

from sheetfuncs.worksheet import harness
from sheetfuncs.worksheet.harness import MISSING, call, column, is_message

SEED = 20240610
#: Wall-time bound of the fuzz test (seconds) and the most calls it makes.
DEADLINE = 50.0
MAX_CALLS = 150_000
#: What the last guard of the registry says (a bug); the fuzz test must never see it.
GUARD = "could not compute this"

_SUBNORMALS = (5e-324, 1e-320, 2.5e-310, -4e-315)
_SEVENTEEN = (0.30000000000000004, 0.1 + 0.7, 1 / 3, 2 / 3, math.pi, 1e16 + 2.0)
_EXTREME_OPTIONS = (
    0, -1, 0.5, 0.05, 0.95, 1, 2, 3, 10, 1e308, -1e308, 1.7976931348623157e308, 5e-324, 1e-300,
    1e-10, 0.999999, 1 - 1e-16, 0.30000000000000004, 1e15, 1e16, 12345.678, 10_000, 10_001,
)
_TEXT_OPTIONS = (
    "wide", "long", "rowwise", "tukey", "bonferroni", "holm", "scheffe", "games-howell",
    "fisher", "mean", "median", "trimmed", "Group 1", "Group 2", "A", "auto", "yes", "x\ny", "",
    "   ", "#N/A", "Factor", "Zone ✓", "a" * 300,
)
_ERRORS = (harness.NA, harness.DIV0, harness.VALUE, harness.REF, harness.NAME, harness.NUM,
           harness.NULL, harness.SPILL, harness.CALC)


def _magnitude(rng: random.Random) -> float:
    """A scale for one range's numbers: ordinary, huge, tiny or subnormal."""
    return rng.choice((1.0, 1.0, 1.0, 1e-3, 1e6, 1e100, 1e150, 1e154, 1e155, 1e200, 1e300,
                       1e307, 1e-150, 1e-300, 1e-310))


def _number(rng: random.Random, scale: float) -> Any:
    r = rng.random()
    if r < 0.55:
        v = round(rng.uniform(-2.0, 9.0), rng.randint(0, 4)) * scale
        return v if math.isfinite(v) else 1.7976931348623157e308
    if r < 0.65:
        return rng.choice(_SEVENTEEN) * (scale if scale < 1e300 else 1.0)
    if r < 0.72:
        return rng.choice(_SUBNORMALS)
    if r < 0.78:
        return rng.choice((1.7976931348623157e308, -1.7976931348623157e308, 1e308, -1e308))
    if r < 0.86:
        return rng.randint(-5, 50)
    if r < 0.93:
        return decimal.Decimal(f"{rng.uniform(0, 100):.2f}")
    return rng.uniform(-1, 1) * rng.choice((1e-300, 1e-160, 1e160, 1e300))


def _plain(rng: random.Random, scale: float) -> float:
    """A number as typed (up to 4 decimals) at the range's scale, now and then with 17 digits."""
    if rng.random() < 0.1:
        return rng.choice(_SEVENTEEN) * (scale if scale < 1e300 else 1.0)
    v = round(rng.uniform(1.0, 9.0), rng.randint(0, 4)) * scale
    return v if math.isfinite(v) else 1.7976931348623157e308


def _cell(rng: random.Random, scale: float, hostile: float) -> Any:
    """One cell: a number at the range's scale; with probability ``hostile`` anything."""
    if rng.random() >= hostile:
        return _plain(rng, scale)
    if rng.random() < 0.5:
        return _number(rng, scale)
    return rng.choice((
        None, "", True, False, "text", " Head 1 ", "#N/A", "#DIV/0!", "#SPILL!",
        rng.choice(_ERRORS), dt.date(2024, 3, 1), dt.datetime(2024, 3, 1, 12, 30),
        harness.COM_ERROR_CODES["#CALC!"], "x\ny", decimal.Decimal("1E+400"),
    ))


#: Valid values of the text and logical options, by argument name (chosen most of the time).
_VALID = {
    "layout": ("wide", "wide", "long", "rowwise"),
    "labels": ("auto", True, False),
    "method": ("tukey", "bonferroni", "holm", "scheffe", "games-howell", "fisher"),
    "center": ("median", "mean", "trimmed"),
    "factor_name": ("Factor", "Oven zone"),
}


def _range(rng: random.Random) -> list[list[Any]]:
    rows, cols = rng.randint(1, 9), rng.choice((1, 2, 2, 3, 3, 4, 5, 6))
    scale, hostile = _magnitude(rng), rng.choice((0.0, 0.0, 0.0, 0.05, 0.1, 0.3, 0.7))
    cells = [[_cell(rng, scale, hostile) for _ in range(cols)] for _ in range(rows)]
    if rng.random() < 0.4:  # a row of labels
        cells.insert(0, [rng.choice(("A", "B", "C", "Head 1", 1, "a", None)) for _ in range(cols)])
    return cells


def _per_group(rng: random.Random, data: Any) -> Any:
    """A per-group range (pooling, weights, counts, means, SDs, names) of about the right length."""
    k = len(data[0]) if isinstance(data, list) and data and isinstance(data[0], list) else 3
    k = max(1, k + rng.choice((0, 0, 0, -1, 1)))
    if rng.random() < 0.3:  # pooling labels or contrast weights of a sensible kind
        return [[rng.choice((1, 2, -1, 0.5, "p", "q")) for _ in range(k)]]
    scale = _magnitude(rng)
    return [[_cell(rng, scale, 0.1) for _ in range(k)]]


def _option(rng: random.Random, kind: str) -> Any:
    r = rng.random()
    if r < 0.5:
        return MISSING
    if kind == "number":
        if r < 0.85:
            return rng.choice(_EXTREME_OPTIONS)
        return rng.choice((None, "", "0.05", True, harness.NA, dt.date(2024, 1, 1),
                           decimal.Decimal("0.1"), [[0.05, 0.1]], rng.choice(_SUBNORMALS)))
    if kind == "text":
        return rng.choice(_TEXT_OPTIONS)
    return rng.choice((True, False, "auto", "yes", 1, None, harness.NA))


def _arguments(rng: random.Random, rec: Any) -> list[Any]:
    args: list[Any] = []
    data: Any = None
    for a in rec.args:
        if a.kind == "range":
            if a.required and data is None and a.name == "data":
                data = _range(rng)
                args.append(data)
            elif a.name == "counts":
                data = [[rng.randint(1, 8) for _ in range(rng.randint(1, 6))]]
                args.append(data if rng.random() < 0.8 else _per_group(rng, data))
            elif not a.required and rng.random() < 0.5:
                args.append(MISSING)
            else:
                args.append(_per_group(rng, data))
        elif a.name == "control":
            args.append(rng.choice(("Group 1", "A", "Head 1", "nope", 1)))
        elif a.required and a.kind == "number":
            args.append(rng.choice(_EXTREME_OPTIONS))
        elif a.name in _VALID and rng.random() < 0.7:
            args.append(rng.choice(_VALID[a.name]))
        else:
            args.append(_option(rng, a.kind))
    while args and args[-1] is MISSING:
        args.pop()
    return [None if v is MISSING else v for v in args]


def _problems(rec: Any, shown: Any) -> list[str]:
    """What is wrong with what a cell shows, per the issue's acceptance (empty when fine)."""
    if isinstance(shown, str):
        if not is_message(shown):
            return [f"text that is not a one-line message: {shown[:120]!r}"]
        if GUARD in shown:
            return [f"the last guard caught a bug: {shown}"]
        return []
    if rec.result == "scalar":
        if not (isinstance(shown, float) and math.isfinite(shown)):
            return [f"a scalar that is not a finite number: {shown!r}"]
        return []
    out = []
    if not (isinstance(shown, list) and shown and all(isinstance(r, list) for r in shown)):
        return [f"a table that is not rows: {shown!r}"[:200]]
    if any(c in ("", None) for c in shown[0]):
        out.append("a blank in the header row")
    if any(r[0] in ("", None) for r in shown[1:]):
        out.append("a row without its label")
    return out


def test_fuzz_every_function_with_hostile_cells_and_options() -> None:
    rng = random.Random(SEED)
    names = sorted(harness.REGISTRY)
    start = time.monotonic()
    calls, failures = 0, []
    while calls < MAX_CALLS and time.monotonic() - start < DEADLINE:
        name = names[calls % len(names)]
        rec = harness.REGISTRY[name]
        args = _arguments(rng, rec)
        calls += 1
        try:
            shown = call(name, *args)
        except Exception as e:  # an escaped exception (or a value the host cannot hold)
            failures.append(f"{name}{tuple(args)!r:.300}: {type(e).__name__}: {e}")
            continue
        failures += [f"{name}{tuple(args)!r:.300}: {p}" for p in _problems(rec, shown)]
    print(f"fuzz: {calls} calls in {time.monotonic() - start:.1f} s")
    assert calls >= 10 * len(names)  # every function is called many times
    assert failures == [], f"{len(failures)} of {calls} calls failed; first: {failures[:5]}"


# --------------------------------------------------------------------------------------------
# each case of the issue, on its own


def _near_1e154() -> list[list[float]]:
    """Three groups near 1e154 on the floating-point path (three values have 17 digits)."""
    return [
        ["A", "B", "C"],
        [1.0000000000000002e154, 1.0000000000000011e154, 1.0000000000000021e154],
        [1.0000000000000003e154, 1.0000000000000013e154, 1.0000000000000027e154],
        [1.0000000000000005e154, 1.0000000000000012e154, 1.0000000000000024e154],
    ]


def _exact_ssw(rows: list[list[Any]]) -> Fraction:
    """Reference: exact rational arithmetic (fractions) on the doubles' values."""
    groups = [[Fraction(r[c]) for r in rows[1:]] for c in range(len(rows[0]))]
    return sum((sum((x - sum(g) / len(g)) ** 2 for x in g) for g in groups), Fraction(0))


#: Values of both signs up to 1e154 with a 17-digit value: the issue's OverflowError in fsum.
_MIXED_1E154 = [
    [0.30000000000000004, 0.91e154, -0.83e154],
    [0.52e154, -0.37e154, 0.74e154],
    [-0.99e154, 0.66e154, 0.12e154],
    [0.87e154, -0.58e154, -0.95e154],
]


@pytest.mark.parametrize("rows", [_near_1e154(), _MIXED_1E154], ids=["near", "mixed"])
def test_case_values_near_1e154_on_the_float_path_raise_no_overflow(rows: list[list[Any]]) -> None:
    for name in ("SF_TABLE", "SF_SSB", "SF_SSW", "SF_SST", "SF_MSB", "SF_MSW", "SF_F", "SF_P",
                 "SF_R2", "SF_DFB", "SF_DFW", "SF_DFT", "SF_GROUPS", "SF_CHECKS", "SF_PAIRS",
                 "SF_LETTERS", "SF_EFFECT", "SF_VARCOMP", "SF_WELCH", "SF_LEVENE",
                 "SF_BROWNFORSYTHE", "SF_BARTLETT"):
        shown = call(name, rows)
        assert not isinstance(shown, str) or (is_message(shown) and GUARD not in shown), (name, shown)
    dunnett = call("SF_DUNNETT", rows, "A" if rows[0][0] == "A" else "Group 1")
    assert dunnett != "" and GUARD not in str(dunnett)


def test_case_values_near_1e154_give_numbers_or_the_too_large_line() -> None:
    rows = _near_1e154()
    # the within-group SS is about 1e278: a number; reference: exact rational arithmetic
    # (fractions). The message below stands for sums of squares above about 1e300.
    assert call("SF_SSW", rows) == pytest.approx(float(_exact_ssw(rows)), rel=1e-13)
    assert call("SF_SST", _MIXED_1E154) == (
        "sheetfuncs: the values are too large for double-precision sums of squares (they exceed "
        "about 1e300); rescale the data, e.g. express them in larger units"
    )


def test_case_subnormal_df2_in_ftail_and_fcrit() -> None:
    want = "sheetfuncs: df2 must be a positive number of at least 0.5 (degrees of freedom), not 5e-324"
    assert call("SF_FTAIL", 1.5, 2, 5e-324) == want
    assert call("SF_FCRIT", 0.05, 2, 5e-324) == want


@pytest.mark.parametrize("name,args", [
    ("SF_PAIRS", (None, None, None, 5e-324)),
    ("SF_LETTERS", (None, None, None, 5e-324)),
    ("SF_DUNNETT", ("A", None, None, 5e-324)),
])
def test_case_alpha_5e_324_in_pairs_letters_dunnett(name: str, args: tuple[Any, ...]) -> None:
    rows = [["A", "B", "C"], [1.0, 2.0, 3.5], [2.0, 3.0, 4.0], [3.0, 4.5, 5.0]]
    assert call(name, rows, *args) == (
        "sheetfuncs: alpha must be a number from 1e-10 to 0.5 (e.g. 0.05), not 5e-324"
    )


def test_case_k_1e308_in_samplesize_and_power() -> None:
    want = "sheetfuncs: k (the number of groups) must be a whole number from 2 to 10,000, not 1e+308"
    assert call("SF_SAMPLESIZE", 1e308, 0.25) == want
    assert call("SF_POWER", 1e308, 20, 0.25) == want  # was "df2 must be ... 1900000…" (310 digits)
    assert call("SF_DETECTABLE", 1e308, 2) == want


def test_case_detectable_1e308_2_has_no_nan_in_the_solver() -> None:
    assert call("SF_DETECTABLE", 1e308, 2).startswith("sheetfuncs: k (the number of groups)")
    # the largest k allowed is answered; reference: scipy.stats.ncf at the returned effect
    f = call("SF_DETECTABLE", 10_000, 2)
    k, n = 10_000, 2
    crit = stats.f.isf(0.05, k - 1, k * (n - 1))
    assert stats.ncf.sf(crit, k - 1, k * (n - 1), k * n * f * f) == pytest.approx(0.8, abs=1e-6)


def test_case_fcrit_0_5_1e308_10_is_the_chi_square_limit() -> None:
    # df1 = 1e308 is infinite to double precision: F = df2 / chi2(df2); reference: mpmath
    # (the median of chi2(10), found with mpmath.findroot on the regularised gamma function)
    mpmath.mp.dps = 30
    med = mpmath.findroot(lambda x: mpmath.gammainc(5, 0, x / 2, regularized=True) - 0.5, 9.3)
    assert call("SF_FCRIT", 0.5, 1e308, 10) == pytest.approx(float(10 / med), rel=1e-13)


def test_case_ftail_1_5_1e308_2_5_is_a_number_not_a_blank() -> None:
    # P(F(inf, 2.5) > 1.5) = P(chi2(2.5) < 2.5 / 1.5); reference: mpmath's regularised gamma
    mpmath.mp.dps = 30
    ref = mpmath.gammainc(1.25, 0, mpmath.mpf(2.5) / 1.5 / 2, regularized=True)
    assert call("SF_FTAIL", 1.5, 1e308, 2.5) == pytest.approx(float(ref), rel=1e-13)


@pytest.mark.parametrize("args", [
    (1.5, 1e308, 2.5), (0.5, 1e308, 2.5), (40.0, 1e308, 3.0), (1.5, 2.5, 1e308), (3.0, 7.0, 1e200),
    (0.99, 1e300, 1e300), (1.0, 1e300, 1e300), (1.01, 1e300, 1e300),
])
def test_case_the_eight_blanks_of_ftail_are_numbers(args: tuple[float, float, float]) -> None:
    # reference: scipy.stats.chi2 at the limits (df infinite: chi-square forms; both infinite: F = 1)
    x, d1, d2 = args
    if d1 >= 1e300 and d2 >= 1e300:
        ref = 1.0 if x < 1 else (0.5 if x == 1 else 0.0)
    elif d1 > d2:
        ref = stats.chi2.cdf(d2 / x, d2)
    else:
        ref = stats.chi2.sf(d1 * x, d1)
    assert call("SF_FTAIL", *args) == pytest.approx(ref, rel=1e-12, abs=0)


def test_case_power_1e308_20_0_25_names_k_in_short_form() -> None:
    shown = call("SF_POWER", 1e308, 20, 0.25)
    assert "k (the number of groups)" in shown and "1e+308" in shown and len(shown) < 120


def test_case_a_nan_result_is_never_a_blank() -> None:
    # a one-value group has no SD: the core leaves those cells empty on purpose (None); any NaN
    # would come back as the guard's line, never as a blank standing for a number
    out = call("SF_GROUPS", [["A", "B"], [1.0, 2.0], [None, 3.0]])
    assert out[1][3:7] == ["", "", "", ""] and isinstance(out[2][3], float)


def test_case_column_of_values_near_1e300_gives_a_message_not_a_traceback() -> None:
    shown = call("SF_F", column([1e300, -1e300, 2e300, 0.30000000000000004]))
    assert is_message(shown) and GUARD not in shown
