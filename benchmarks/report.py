"""Benchmark of the report writer.

1. A report of 100,000 observations against a bare openpyxl write of the same Data sheet (the
   same four columns of the same rows, no styles, no other sheets), measured in the same run:
   the ratio report / bare write (goal: at most 3).
2. A report of 1,000,000 observations: time and peak memory (goal: under 2 GB). Each
   measurement runs in a fresh child process, so that peak memory (``ru_maxrss``) is its own.

The machine may be shared, so the bare write and the report run interleaved, ``--repeats``
times each (bare, report, bare, report, ...), and the best time of each is kept: the ratio is
best report / best bare write. ``--profile`` also prints where a report spends its time
(cProfile, top functions by own time), to see what the report costs beyond the bare write.

Data are invented: seeded normal values with two decimals, in five groups.

    python benchmarks/report.py [--small N] [--large N] [--repeats R] [--profile]
"""

from __future__ import annotations

import argparse
import json
import os
import resource
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]


def _groups(n: int):
    import numpy as np

    rng = np.random.default_rng(20240501)
    k = 5
    sizes = [n // k + (1 if i < n % k else 0) for i in range(k)]
    return {f"Cell {i + 1}": np.round(rng.normal(250.0 + 0.3 * i, 2.0, s), 2) for i, s in enumerate(sizes)}


def _bare(n: int, path: Path) -> None:
    """The baseline: the Data sheet's rows written by openpyxl with nothing else."""
    from openpyxl import Workbook

    groups = _groups(n)
    wb = Workbook(write_only=True)
    ws = wb.create_sheet("Data")
    ws.append(["Group no.", "Factor", "Response", "Centred value"])
    for gi, (label, a) in enumerate(groups.items(), start=1):
        for v in a.tolist():
            ws.append([gi, label, v, v - 250.0])
    wb.save(path)


def _report(n: int, path: Path) -> None:
    from sheetfuncs.report import write_report

    write_report(_groups(n), path, factor="Cell", response="Weight", unit="g", force=True)


def _child(kind: str, n: int) -> None:
    import openpyxl  # noqa: F401  (imports are not part of the measured write)

    if kind == "report":
        import sheetfuncs.report  # noqa: F401
    with tempfile.TemporaryDirectory() as tmp:
        path = Path(tmp) / f"{kind}.xlsx"
        t0 = time.perf_counter()
        (_bare if kind == "bare" else _report)(n, path)
        seconds = time.perf_counter() - t0
        size = path.stat().st_size
    peak_kb = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss  # kilobytes on Linux
    print(json.dumps({"seconds": seconds, "peak_mb": peak_kb / 1024.0, "bytes": size}))


def _profile(n: int) -> None:
    import cProfile
    import pstats

    import sheetfuncs.report  # noqa: F401

    with tempfile.TemporaryDirectory() as tmp:
        prof = cProfile.Profile()
        prof.runcall(_report, n, Path(tmp) / "report.xlsx")
    pstats.Stats(prof).sort_stats("tottime").print_stats(15)


def _measure(kind: str, n: int) -> dict:
    env = dict(os.environ, PYTHONPATH=str(ROOT) + os.pathsep + os.environ.get("PYTHONPATH", ""))
    out = subprocess.run([sys.executable, __file__, "--child", kind, str(n)], capture_output=True,
                         text=True, env=env, check=True)
    return json.loads(out.stdout.strip().splitlines()[-1])


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--small", type=int, default=100_000)
    ap.add_argument("--large", type=int, default=1_000_000)
    ap.add_argument("--repeats", type=int, default=5, help="interleaved runs of each (best kept)")
    ap.add_argument("--profile", action="store_true", help="also profile one report")
    ap.add_argument("--child", nargs=2, help=argparse.SUPPRESS)
    args = ap.parse_args()
    if args.child:
        _child(args.child[0], int(args.child[1]))
        return
    n = args.small
    bare_runs, rep_runs = [], []
    for _ in range(max(1, args.repeats)):
        bare_runs.append(_measure("bare", n))
        rep_runs.append(_measure("report", n))
    bare = min(bare_runs, key=lambda m: m["seconds"])
    rep = min(rep_runs, key=lambda m: m["seconds"])
    ratio = rep["seconds"] / bare["seconds"]
    pairs = sorted(r["seconds"] / b["seconds"] for b, r in zip(bare_runs, rep_runs))
    print(f"{n:,} observations, {len(bare_runs)} interleaved runs each, best of each")
    all_bare = ", ".join(f"{m['seconds']:.2f}" for m in bare_runs)
    all_rep = ", ".join(f"{m['seconds']:.2f}" for m in rep_runs)
    print(f"  bare openpyxl write of the Data sheet : {bare['seconds']:7.2f} s   (runs: {all_bare})")
    print(f"  full report (8 sheets, charts, audit) : {rep['seconds']:7.2f} s   "
          f"({rep['bytes'] / 1e6:.1f} MB file; runs: {all_rep})")
    print(f"  ratio best report / best bare write   : {ratio:7.2f}   (goal: at most 3; "
          f"run-by-run ratios {pairs[0]:.2f} to {pairs[-1]:.2f})")
    big = _measure("report", args.large)
    print(f"{args.large:,} observations")
    print(f"  full report time                      : {big['seconds']:7.2f} s   "
          f"({big['bytes'] / 1e6:.1f} MB file)")
    print(f"  peak memory (max RSS of the process)  : {big['peak_mb']:7.0f} MB  (goal: under 2048 MB)")
    if args.profile:
        print(f"Profile of one report of {n:,} observations (top functions by own time):")
        _profile(n)


if __name__ == "__main__":
    main()
