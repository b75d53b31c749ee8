"""Benchmark of reading a workbook: the path a user's file takes before any statistics.

An invented QA sheet (a title row, a header row, a Sample column numbering the rows, ``--rows``
rows of ``--groups`` columns of 2-decimal values, and Mean and SD rows under the data) is read
three ways, interleaved ``--repeats`` times, the best of each kept:

1. a bare pass of openpyxl's read-only reader over the sheet's saved values (the baseline: the
   least any reader of this file must do);
2. ``read_groups`` without a range: the cells present, the block found, the groups cleaned and
   the reading's account of every cell;
3. ``read_groups`` with the data block given as ``--range``.

The ratios to the bare pass say what sheetfuncs adds to reading the file.

    python benchmarks/reading.py [--rows N] [--groups K] [--repeats R]
"""

from __future__ import annotations

import argparse
import random
import sys
import tempfile
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

import openpyxl  # noqa: E402

from sheetfuncs.input import column_letters, read_groups  # noqa: E402


def write_sheet(path: Path, rows: int, groups: int) -> str:
    """The invented sheet; returns the A1 range of its data block (header included)."""
    rng = random.Random(20261203)
    wb = openpyxl.Workbook(write_only=True)
    ws = wb.create_sheet("Fill weights")
    ws.append(["Fill weight by filling head (invented data)"])
    ws.append(["Sample"] + [f"Head {j + 1}" for j in range(groups)])
    for i in range(rows):
        ws.append([i + 1] + [round(rng.gauss(500 + j, 1.5), 2) for j in range(groups)])
    last = column_letters(groups + 1)
    ws.append(["Mean"] + [f"=AVERAGE({column_letters(j + 2)}3:{column_letters(j + 2)}{rows + 2})"
                          for j in range(groups)])
    ws.append(["SD"] + [f"=STDEV({column_letters(j + 2)}3:{column_letters(j + 2)}{rows + 2})"
                        for j in range(groups)])
    wb.save(path)
    return f"B2:{last}{rows + 2}"


def bare(path: Path) -> int:
    wb = openpyxl.load_workbook(path, read_only=True, data_only=True)
    n = sum(1 for row in wb.worksheets[0].iter_rows(values_only=True) for v in row if v is not None)
    wb.close()
    return n


def timed(fn) -> float:
    t = time.perf_counter()
    fn()
    return time.perf_counter() - t


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--rows", type=int, default=100_000)
    ap.add_argument("--groups", type=int, default=10)
    ap.add_argument("--repeats", type=int, default=3)
    args = ap.parse_args()
    with tempfile.TemporaryDirectory() as tmp:
        path = Path(tmp) / "fill.xlsx"
        block = write_sheet(path, args.rows, args.groups)
        found = read_groups(path)
        given = read_groups(path, cell_range=block)
        assert found.groups.counts == given.groups.counts and found.reading.balanced
        best = {"bare": float("inf"), "found": float("inf"), "range": float("inf")}
        for _ in range(args.repeats):
            best["bare"] = min(best["bare"], timed(lambda: bare(path)))
            best["found"] = min(best["found"], timed(lambda: read_groups(path)))
            best["range"] = min(best["range"], timed(lambda: read_groups(path, cell_range=block)))
    cells = args.rows * args.groups
    print(f"{args.rows:,} rows x {args.groups} groups ({cells:,} values), best of {args.repeats}")
    print(f"{'path':<34}{'best s':>9}{'x bare':>9}")
    names = {"bare": "openpyxl read-only pass (baseline)", "found": "read_groups, block found",
             "range": "read_groups, --range given"}
    for key, name in names.items():
        print(f"{name:<34}{best[key]:>9.2f}{best[key] / best['bare']:>9.2f}")
    print(f"reading: {found.reading.summary(found.groups.labels, found.groups.counts)[:160]}...")


if __name__ == "__main__":
    main()
