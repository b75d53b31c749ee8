"""``SF_P`` on a 10,000x10 range in a real, headless LibreOffice Calc against the Python call.

The extension is built from this checkout and installed into a throw-away profile (as the tests
do). One sheet holds a header row of labels and 10,000 rows x 10 columns of invented
measurements with two decimals; ``=SF_P(A1:J10001)`` sits beside them, with Calc's own
``=AVERAGE(A1:J10001)`` as a baseline from the same program. Calc then recalculates after one data cell
changes, ``--repeat`` times; each time is the change plus reading the formula cell, which is
when Calc recalculates it (the path a user's edit takes: Calc hands the range to the
extension, which reads it, cleans it, calls the core and hands the number back).

Python baselines, measured in the same run: ``udfs.SF_P`` on the rows as xlwings hands them
over (the Python call), and the plain ``AVERAGE`` formula cell's recalculation in Calc.
Prints the ratio Calc/Python; issue 11's goal is at most 5.

Run ``python benchmarks/calc.py`` (needs LibreOffice, its Python bridge and SDK).
"""

from __future__ import annotations

import argparse
import statistics
import sys
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parent.parent))
sys.path.insert(0, str(Path(__file__).resolve().parent))

from timing import best_time  # noqa: E402

from sheetfuncs import udfs  # noqa: E402
from sheetfuncs.worksheet.calc.office import find_office, run_job  # noqa: E402
from tests.support.calc import installed_profile, remove  # noqa: E402


def sheet(rows: int, cols: int, seed: int = 11) -> list[list[object]]:
    """A header of labels, then invented measurements with two decimals."""
    rng = np.random.default_rng(seed)
    values = np.round(rng.normal(50.0, 2.0, size=(rows, cols)) + np.arange(cols) * 0.02, 2)
    return [[f"Head {c + 1}" for c in range(cols)]] + values.tolist()


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--rows", type=int, default=10_000)
    ap.add_argument("--cols", type=int, default=10)
    ap.add_argument("--repeat", type=int, default=15)
    args = ap.parse_args(argv)
    cells = sheet(args.rows, args.cols)
    last = f"{chr(64 + args.cols)}{args.rows + 1}"
    python = best_time(lambda: udfs.SF_P(cells), 15)
    office = find_office()
    profile = installed_profile(office)
    try:
        steps = [
            {"op": "new"}, {"op": "cells", "at": "A1", "rows": cells},
            {"op": "formula", "at": "L1", "formula": f"=SF_P(A1:{last})"},
            {"op": "formula", "at": "L2", "formula": f"=AVERAGE(A1:{last})"},
            {"op": "recalc"}, {"op": "read", "at": "L1:L2", "key": "shown"},
            {"op": "formula", "at": "L1", "formula": ""},
            {"op": "time", "at": "B3", "watch": "L2", "repeat": args.repeat, "key": "average"},
            {"op": "formula", "at": "L1", "formula": f"=SF_P(A1:{last})"},
            {"op": "time", "at": "B3", "watch": "L1", "repeat": args.repeat, "key": "sf_p"},
        ]
        read = run_job(office, steps, profile)
    finally:
        remove(profile)
    shown = read["shown"]["values"][0][0]
    calc = statistics.median(read["sf_p"])
    average = statistics.median(read["average"])
    print(f"SF_P on a {args.rows:,}x{args.cols} range (header row + invented measurements)")
    print(f"  Calc shows {shown!r}; the Python call gives {udfs.SF_P(cells)!r}")
    print(f"  LibreOffice started in {read['_started']:.2f} s")
    print(f"  Python call (udfs.SF_P on the rows as xlwings hands them over): {python * 1e3:.1f} ms (best of 15)")
    print(f"  Calc, one cell changed, SF_P recalculated: median {calc * 1e3:.1f} ms, best "
          f"{min(read['sf_p']) * 1e3:.1f} ms ({args.repeat} changes)")
    print(f"  Calc's own AVERAGE on the same range, same way: median {average * 1e3:.1f} ms")
    print(f"  ratio Calc/Python: {calc / python:.1f}x (median), {min(read['sf_p']) / python:.1f}x "
          f"(best); goal <= 5x")
    return 0


if __name__ == "__main__":
    sys.exit(main())
