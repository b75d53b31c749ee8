"""``sheetfuncs plan``: values per group that a balanced one-way study needs.

The sample size and its achieved power come from :func:`sheetfuncs.stats.sample_size` and
:func:`sheetfuncs.stats.power` (noncentral F; Cohen 1988, ch. 8).
"""

from __future__ import annotations

import argparse

__all__ = ["run_plan"]


def run_plan(args: argparse.Namespace) -> int:
    from ..stats import power, sample_size

    n = sample_size(args.groups, args.effect, args.power, args.alpha)
    achieved = power(args.groups, n, args.effect, args.alpha)
    print(
        f"Groups: {args.groups}; effect size f = {args.effect:g}; alpha = {args.alpha:g}; "
        f"target power = {args.power:g}"
    )
    print(f"Values per group: {n} (total {n * args.groups})")
    print(f"Achieved power: {achieved:.4f}")
    print("Balanced one-way design, noncentral F (Cohen 1988, ch. 8). Plan with margin for "
          "lost samples, and follow your organisation's procedures for study design.")
    return 0
