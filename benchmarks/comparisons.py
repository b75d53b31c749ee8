"""Benchmark of the comparisons with many groups against scipy.stats.tukey_hsd.

    python benchmarks/comparisons.py [--groups 4 8 30] [--repeat 3]

For 4, 8 and 30 seeded groups of 2 to 11 values each (two decimals, as typed into a sheet;
the invented data have no meaning), it prints the time of scipy.stats.tukey_hsd on the same
data (the baseline, measured in the same run) and of sheetfuncs' Tukey–Kramer, Games–Howell,
Dunnett (control: the first group) and Bonferroni, the best of several runs, each with its ratio
to the baseline.

Targets: 30 groups in well under 1 s for Tukey–Kramer and Dunnett and under about 2 s for
Games–Howell; 8 groups in a few tens of milliseconds. Nothing here is a test: timings depend on
the machine and on what else runs on it.
"""

from __future__ import annotations

import argparse
import os
import sys

import numpy as np
from scipy import stats

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), ".."))
sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))

import sheetfuncs as sf  # noqa: E402
from timing import best_time  # noqa: E402
from sheetfuncs.stats.comparisons import dunnett, pairwise  # noqa: E402


def make_groups(k: int, seed: int = 30) -> list[np.ndarray]:
    """Seeded invented data: k groups of 2 to 11 values, unequal means and spreads."""
    rng = np.random.default_rng(seed)
    out = []
    for _ in range(k):
        n = int(rng.integers(2, 12))
        out.append(np.round(rng.normal(rng.uniform(48, 52), rng.uniform(0.5, 3.0), size=n), 2))
    return out


def run(k: int, repeat: int) -> None:
    arrays = make_groups(k)
    groups = sf.as_groups(arrays)  # cleaning is done once, as a front would do it
    control = groups.labels[0]
    cases = [
        ("scipy.stats.tukey_hsd (baseline)", lambda: stats.tukey_hsd(*arrays)),
        ("sheetfuncs tukey", lambda: pairwise(groups, "tukey")),
        ("sheetfuncs games-howell", lambda: pairwise(groups, "games-howell")),
        ("sheetfuncs dunnett", lambda: dunnett(groups, control)),
        ("sheetfuncs bonferroni", lambda: pairwise(groups, "bonferroni")),
    ]
    sizes = [len(a) for a in arrays]
    print(f"\n{k} groups, {sum(sizes)} values (sizes {min(sizes)} to {max(sizes)})")
    base = None
    for name, fn in cases:
        t = best_time(fn, repeat)
        if base is None:
            base = t
        print(f"  {name:34s} {t * 1e3:10.1f} ms   {t / base:10.3g} x baseline")


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--groups", type=int, nargs="+", default=[4, 8, 30])
    ap.add_argument("--repeat", type=int, default=3)
    args = ap.parse_args()
    for k in args.groups:
        run(k, args.repeat)


if __name__ == "__main__":
    main()
