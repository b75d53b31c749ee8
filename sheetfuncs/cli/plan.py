"""``sheetfuncs plan``: values per group that a balanced one-way study needs, or the power of a
given number of values per group.

The effect is Cohen's f (``--effect``) or a difference in the response's units (``--difference``
with ``--sd``: two group means that far apart, the others midway between them, the least
favourable configuration). Every number comes from :func:`sheetfuncs.stats.plan` (noncentral F;
Cohen 1988, ch. 8); this module checks which options go together and says the plan in words.
"""

from __future__ import annotations

import argparse
from typing import Any

from .parser import UsageError

__all__ = ["DEFAULT_POWER", "plan_lines", "run_plan"]

#: The power asked for when neither ``--power`` nor ``--n`` is given.
DEFAULT_POWER = 0.8


def effect_options(args: argparse.Namespace) -> None:
    """Usage errors for options that do not go together."""
    units = args.difference is not None or args.sd is not None
    if args.effect is not None and units:
        raise UsageError("give the effect either as --effect F or as --difference D with --sd S, "
                         "not both")
    if args.effect is None and not units:
        raise UsageError("give the effect to detect: --effect F (Cohen's f), or --difference D "
                         "with --sd S (in the response's units)")
    if args.difference is None and args.sd is not None:
        raise UsageError("--sd goes with --difference D, the difference between group means to "
                         "detect (in the same units)")
    if args.sd is None and args.difference is not None:
        raise UsageError("--difference needs --sd S, the SD within groups in the same units")
    if args.n is not None and args.power is not None:
        raise UsageError("give --power P (to find the values per group) or --n N (to get the "
                         "power of N per group), not both")


def configuration(k: int, d: float) -> str:
    """The least favourable configuration for a range ``d`` of the means, in words."""
    if k == 2:
        return f"the two group means {d:g} apart"
    rest = "the third mean" if k == 3 else f"the other {k - 2} means"
    return (f"two group means {d:g} apart, {rest} midway between them (the least favourable "
            "configuration for that difference)")


def plan_lines(pl: Any) -> list[str]:
    """The plan in words: what was planned, the effect, the size and the power."""
    if pl.difference is not None:
        effect = [
            f"Groups: {pl.k}; {configuration(pl.k, pl.difference)}; SD within groups "
            f"{pl.sd:g} (difference and SD in the response's units)",
            f"Effect size f = D / (S x sqrt(2 x {pl.k})) = {pl.difference:g} / ({pl.sd:g} x "
            f"sqrt({2 * pl.k})) = {pl.cohens_f:.4g}",
        ]
    else:
        effect = [f"Groups: {pl.k}; effect size f = {pl.cohens_f:g}"]
    if pl.solved_for == "n":
        return [
            *effect,
            f"Alpha = {pl.alpha:g}; target power = {pl.target_power:g}",
            f"Values per group: {pl.n} (total {pl.n_total})",
            f"Achieved power: {pl.power:.4f}",
        ]
    return [
        *effect,
        f"Alpha = {pl.alpha:g}; values per group: {pl.n} (total {pl.n_total}), given",
        f"Power: {pl.power:.4f} (the chance that the F test at alpha {pl.alpha:g} finds this "
        "effect)",
    ]


def run_plan(args: argparse.Namespace) -> int:
    from ..stats import plan

    effect_options(args)
    power = None if args.n is not None else (DEFAULT_POWER if args.power is None else args.power)
    pl = plan(args.groups, n=args.n, cohens_f=args.effect, power=power, alpha=args.alpha,
              difference=args.difference, sd=args.sd)
    print("\n".join(plan_lines(pl)))
    print("Balanced one-way design, noncentral F (Cohen 1988, ch. 8). Plan with margin for "
          "lost samples, and follow your organisation's procedures for study design.")
    return 0
