"""Power, sample size and detectable effect for a balanced one-way analysis of variance.

Model (Cohen 1988, *Statistical Power Analysis for the Behavioral Sciences*, 2nd ed., ch. 8):
``k`` groups of ``n`` values each, normal errors with common SD ``sigma``, group means ``mu_i``.
Cohen's effect size is the SD of the group means over the SD within groups,

    f = sqrt( sum_i (mu_i - mu)^2 / k ) / sigma.

Under that alternative the F ratio follows the noncentral F distribution with degrees of freedom
``(k - 1, k (n - 1))`` and noncentrality ``lambda = k n f^2``, so the power of the test at level
``alpha`` is

    power = P( F'(k - 1, k (n - 1); lambda) > F_crit ),  F_crit = upper alpha point of F(k - 1, k (n - 1)).

A difference in the response's units: two group means ``D`` apart with the other ``k - 2``
midway between them is the least favourable configuration for that range of means (the
smallest f, so the largest study, among all configurations whose means span ``D``; Cohen's
minimum-variability pattern, 1988, ch. 8), and gives ``f = D / (sigma sqrt(2 k))``
(:func:`cohens_f_from_difference`).

``sample_size`` returns the smallest whole ``n`` per group whose power reaches the target;
``detectable_effect`` inverts the power in ``f``. Cohen's tables were built from approximations;
the values here come from the noncentral F itself, so a table entry may differ by one in rare
cases near a boundary.

The noncentral F probabilities come from :mod:`sheetfuncs.distributions.noncentral_f`
(``scipy.stats.ncf``, and Patnaik's (1949) approximation for noncentrality above 1e8).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any, ClassVar

from scipy import optimize

from ..errors import InputError
from ..distributions import f_critical, ncf_sf
from ..input import check_alpha, check_number, check_probability, check_whole, shown

__all__ = [
    "MAX_GROUPS",
    "power",
    "sample_size",
    "detectable_effect",
    "cohens_f_from_difference",
    "plan",
    "PowerPlan",
]

#: The largest group size :func:`sample_size` searches (beyond it the plan is not practical).
MAX_PER_GROUP = 10**11  # with k <= MAX_GROUPS, df2 stays within the F tail's direct range (1e15)


# --------------------------------------------------------------------------------------------
# argument checks


#: The most groups a plan takes (a real study has far fewer; the noncentral F is checked up to it).
MAX_GROUPS = 10_000


def _groups_arg(k: Any) -> int:
    return check_whole(k, "k (the number of groups)", 2, MAX_GROUPS)


def _n_arg(n: Any) -> int:
    return check_whole(n, "n (values per group)", 2, MAX_PER_GROUP)


def _f_arg(cohens_f: Any) -> float:
    v = check_number(cohens_f, "the effect size f")
    if v <= 0.0:
        raise InputError(
            f"the effect size f must be greater than 0 (Cohen's guide: 0.1 small, "
            f"0.25 medium, 0.4 large), not {shown(cohens_f)}"
        )
    return v


def _positive_arg(v: Any, what: str) -> float:
    x = check_number(v, what)
    if x <= 0.0:
        raise InputError(f"{what} must be greater than 0, not {shown(v)}")
    return x


def _power_arg(p: Any, alpha: float) -> float:
    v = check_probability(p, "power", "0.8")
    if v <= alpha:
        raise InputError(
            f"power {v:g} must be greater than alpha {alpha:g}; even no effect at "
            "all is detected with probability alpha"
        )
    return v


# --------------------------------------------------------------------------------------------
# the computations (arguments already checked)


def _dfs(k: int, n: int) -> tuple[int, int]:
    return k - 1, k * (n - 1)


def _power(k: int, n: int, cohens_f: float, alpha: float) -> float:
    d1, d2 = _dfs(k, n)
    crit = f_critical(alpha, d1, d2)
    return ncf_sf(crit, d1, d2, k * n * cohens_f * cohens_f)


def _sample_size(k: int, cohens_f: float, target: float, alpha: float) -> int:
    if _power(k, 2, cohens_f, alpha) >= target:
        return 2
    lo, hi = 2, 4
    while _power(k, hi, cohens_f, alpha) < target:
        lo = hi
        if hi >= MAX_PER_GROUP:
            raise InputError(
                f"an effect of f = {cohens_f:g} is too small to plan for: more than "
                f"{MAX_PER_GROUP:.0e} values per group would be needed for power {target:g}; "
                "check the effect size"
            )
        hi = min(2 * hi, MAX_PER_GROUP)
    while hi - lo > 1:  # power(lo) < target <= power(hi)
        mid = (lo + hi) // 2
        if _power(k, mid, cohens_f, alpha) >= target:
            hi = mid
        else:
            lo = mid
    return hi


def _detectable(k: int, n: int, target: float, alpha: float) -> float:
    d1, d2 = _dfs(k, n)
    crit = f_critical(alpha, d1, d2)

    def gap(lam: float) -> float:
        return ncf_sf(crit, d1, d2, lam) - target

    lo, hi = 0.0, max(1.0, 2.0 * d1)
    while gap(hi) < 0.0:
        lo, hi = hi, hi * 4.0
        if hi > 1e300:  # pragma: no cover - power is a distribution tail and reaches 1 long before
            raise InputError("no effect size reaches that power; check the arguments")
    lam = optimize.brentq(gap, lo, hi, xtol=1e-300, rtol=1e-14, maxiter=500)
    return math.sqrt(lam / (k * n))


# --------------------------------------------------------------------------------------------
# public functions returning plain numbers


def power(k: Any, n: Any, cohens_f: Any, alpha: Any = 0.05) -> float:
    """Power of the one-way F test with ``k`` groups of ``n`` values at Cohen's effect size ``cohens_f``.

    Balanced one-way model; noncentral F with ``lambda = k n f^2`` and degrees of freedom
    ``(k - 1, k (n - 1))`` (Cohen 1988, ch. 8).
    """
    kk, nn, ff, a = _groups_arg(k), _n_arg(n), _f_arg(cohens_f), check_alpha(alpha)
    return _power(kk, nn, ff, a)


def sample_size(k: Any, cohens_f: Any, power: Any = 0.8, alpha: Any = 0.05) -> int:
    """The smallest whole number of values per group for which the power reaches ``power``.

    Balanced one-way model, Cohen's f (``cohens_f``), noncentral F (Cohen 1988, ch. 8). For
    ``k = 4``, ``cohens_f = 0.25``, ``alpha = 0.05`` and power 0.80 this gives 45 per group, as Cohen's table.
    """
    kk, ff, a = _groups_arg(k), _f_arg(cohens_f), check_alpha(alpha)
    target = _power_arg(power, a)
    return _sample_size(kk, ff, target, a)


def detectable_effect(k: Any, n: Any, power: Any = 0.8, alpha: Any = 0.05) -> float:
    """Cohen's effect size f that ``k`` groups of ``n`` values detect with probability ``power``.

    Solves ``power(k, n, cohens_f, alpha) = power`` for ``cohens_f`` by a bracketing root finder on the
    noncentrality (Cohen 1988, ch. 8).
    """
    kk, nn, a = _groups_arg(k), _n_arg(n), check_alpha(alpha)
    target = _power_arg(power, a)
    return _detectable(kk, nn, target, a)


def cohens_f_from_difference(k: Any, difference: Any, sd: Any) -> float:
    """Cohen's f of ``k`` group means of which two lie ``difference`` apart and the other
    ``k - 2`` midway between them, with SD ``sd`` within groups: ``D / (sd sqrt(2 k))``.

    The least favourable configuration for a range ``D`` of the means (Cohen's
    minimum-variability pattern, 1988, ch. 8): the means' SD about their mean is ``D / sqrt(2 k)``. Two groups give
    ``D / (2 sd)``. ``difference`` and ``sd`` are in the response's units.
    """
    kk = _groups_arg(k)
    d = _positive_arg(difference, "the difference to detect")
    s = _positive_arg(sd, "the SD within groups")
    f = d / (s * math.sqrt(2.0 * kk))
    if not math.isfinite(f) or f == 0.0:
        raise InputError(
            f"a difference of {d:g} with an SD of {s:g} gives an effect size f of {f:g}, which "
            "cannot be planned for; check the difference and the SD (same units)"
        )
    return f


# --------------------------------------------------------------------------------------------
# a richer result for reports


@dataclass(frozen=True)
class PowerPlan:
    """A worked power plan for a balanced one-way study (Cohen 1988, ch. 8).

    Fields: ``k`` groups of ``n`` values (``n_total = k n``); ``cohens_f`` Cohen's effect size f;
    ``alpha``; ``power`` the power of that design (when ``n`` was solved for, the achieved power,
    at least ``target_power``); ``target_power`` (``None`` unless ``n`` was solved for);
    ``df_between = k - 1`` and ``df_within = k (n - 1)``; ``critical_f`` the upper alpha point
    of F(df_between, df_within); ``noncentrality = k n f^2``; ``solved_for`` is ``"n"``,
    ``"cohens_f"`` or
    ``"power"``; ``notes`` plain-language remarks. When the effect was given as a difference in
    the response's units, ``difference`` (two means that far apart, the other ``k - 2`` midway
    between them) and ``sd`` (the SD within groups) are set and ``cohens_f`` was derived from
    them (:func:`cohens_f_from_difference`); otherwise both are ``None``.
    """

    k: int
    n: int
    cohens_f: float
    alpha: float
    power: float
    target_power: float | None
    df_between: int
    df_within: int
    critical_f: float
    noncentrality: float
    n_total: int
    solved_for: str
    notes: tuple[str, ...]
    difference: float | None = None
    sd: float | None = None

    #: The table's header row.
    HEADER: ClassVar[tuple[str, ...]] = ("Quantity", "Value", "Note")

    def table(self) -> list[list[Any]]:
        """Header row, then one row per quantity; the Note says which one was solved for."""

        def note(name: str) -> str:
            return "solved for" if name == self.solved_for else "given"

        power_note = note("power")
        if self.solved_for == "n":
            power_note = f"achieved (at least {self.target_power:g} asked)"
        units: list[list[Any]] = []
        f_note = note("cohens_f")
        if self.difference is not None:
            units = [
                ["Difference", self.difference,
                 "given: two means this far apart, the others midway (response units)"],
                ["SD within groups", self.sd, "given (response units)"],
            ]
            f_note = "difference / (SD x sqrt(2 x groups))"
        return [
            list(self.HEADER),
            ["Groups", self.k, "given"],
            ["Values per group", self.n, note("n")],
            ["Total values", self.n_total, "groups x values per group"],
            *units,
            ["Effect size f", self.cohens_f, f_note],
            ["Alpha", self.alpha, "given"],
            ["Power", self.power, power_note],
            ["Critical F", self.critical_f, f"upper {self.alpha:g} point of F({self.df_between}, {self.df_within})"],
            ["Noncentrality", self.noncentrality, "groups x values per group x f squared"],
        ]


def _blank(v: Any) -> bool:
    return v is None or (isinstance(v, str) and v.strip() == "")


def _effect_in_units(kk: int, cohens_f: Any, difference: Any, sd: Any) -> Any:
    """``cohens_f`` as given, or derived from ``difference`` and ``sd`` (both or neither)."""
    if _blank(difference) and _blank(sd):
        return cohens_f
    if _blank(difference) or _blank(sd):
        given, other = ("sd", "difference") if _blank(difference) else ("difference", "sd")
        raise InputError(
            f"{given} was given without {other}: a difference in the response's units needs "
            "the SD within groups in the same units, and the other way round"
        )
    if not _blank(cohens_f):
        raise InputError(
            "give either cohens_f or difference and sd, not both: the effect size f is derived "
            "from the difference and the SD"
        )
    return cohens_f_from_difference(kk, difference, sd)


def plan(
    k: Any, n: Any = None, cohens_f: Any = None, power: Any = None, alpha: Any = 0.05, *,
    difference: Any = None, sd: Any = None,
) -> PowerPlan:
    """Solve a balanced one-way power plan: give ``k`` and exactly two of ``n``, ``cohens_f``
    and ``power``.

    The missing one is computed as :func:`sample_size`, :func:`detectable_effect` or
    :func:`power` would (Cohen 1988, ch. 8); the result carries the whole design. Instead of
    ``cohens_f``, the effect may be given in the response's units: ``difference`` (two group
    means that far apart, the other ``k - 2`` midway between them, the least favourable
    configuration) with ``sd``, the SD within groups; f is then
    :func:`cohens_f_from_difference` and the plan solves for ``n`` or ``power``.
    """
    kk = _groups_arg(k)
    a = check_alpha(alpha)
    cohens_f = _effect_in_units(kk, cohens_f, difference, sd)
    in_units = not _blank(difference)
    missing = [name for name, v in (("n", n), ("cohens_f", cohens_f), ("power", power)) if _blank(v)]
    if len(missing) != 1:
        raise InputError(
            "give exactly two of n (values per group), cohens_f (effect size, or difference "
            "and sd) and power; the third is solved for (missing now: "
            f"{', '.join(missing) or 'none'})"
        )
    target: float | None = None
    notes: list[str] = []
    if missing[0] == "n":
        ff = _f_arg(cohens_f)
        target = _power_arg(power, a)
        nn = _sample_size(kk, ff, target, a)
        pw = _power(kk, nn, ff, a)
        if nn == 2 and pw >= target:
            notes.append("2 values per group (the fewest that leave an estimate of spread) already reach the power asked")
    elif missing[0] == "cohens_f":
        nn = _n_arg(n)
        pw = _power_arg(power, a)
        ff = _detectable(kk, nn, pw, a)
    else:
        nn, ff = _n_arg(n), _f_arg(cohens_f)
        pw = _power(kk, nn, ff, a)
    d1, d2 = _dfs(kk, nn)
    notes.append(
        "assumes equal group sizes, independent values and a common normal spread; Cohen's "
        "guide for f: 0.1 small, 0.25 medium, 0.4 large"
    )
    return PowerPlan(
        k=kk, n=nn, cohens_f=ff, alpha=a, power=pw, target_power=target, df_between=d1, df_within=d2,
        critical_f=f_critical(a, d1, d2), noncentrality=kk * nn * ff * ff, n_total=kk * nn,
        solved_for=missing[0], notes=tuple(notes),
        difference=check_number(difference, "difference") if in_units else None,
        sd=check_number(sd, "sd") if in_units else None,
    )
