"""Effect sizes, planning (power, sample size, detectable effect) and the variance components
of the one-way random-effects model. The methods and their sources: docs/effects.md.
"""

from __future__ import annotations

from typing import Any

from ...input import groups_from_range
# the package's function `power` hides its module's name: import it by name
from ...stats import (
    EffectSizes, VarianceComponents, detectable_effect, effect_sizes, sample_size,
    variance_components,
)
from ...stats import power as power_of
from ..registry import Arg, Example, Ref, worksheet_function
from .shared import CONF, DATA, LABELS, LAYOUT, ON_SHEET_EXAMPLE

__all__ = ["SF_EFFECT", "SF_POWER", "SF_SAMPLESIZE", "SF_DETECTABLE", "SF_VARCOMP"]


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
    example=ON_SHEET_EXAMPLE,
)
def SF_EFFECT(data: Any, layout: Any = None, labels: Any = None, conf: Any = None) -> Any:
    return effect_sizes(groups_from_range(data, layout, labels), conf).table()


_K = Arg("k", "number", "The number of groups, a whole number from 2 to 10,000.")
_N = Arg("n", "number", "The number of values in each group (equal sizes), a whole number from 2 to 100,000,000,000.")
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
