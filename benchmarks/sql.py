"""Benchmark of the exact push-down to DuckDB against DuckDB's own float variance, from Parquet.

    python benchmarks/sql.py [--groups 10] [--size 1000000] [--repeat 3]
    python benchmarks/sql.py --size 10000000

Writes an invented dataset (fill weights with three decimals, one group per filling head) to a
temporary Parquet file, then times, in the same run and on the same file:

* ``var_samp``: DuckDB's own float aggregate, ``SELECT g, count(*), avg(x), var_samp(x) ... GROUP
  BY g`` (the baseline: one pass, no exactness);
* ``oneway_sql``: :func:`sheetfuncs.oneway_sql` on the file (the user's path: the scale query,
  the exact sums, the rationals);
* ``analyse_sql``: :func:`sheetfuncs.analyse_sql`, every analysis (the sums, then the second
  passes: group centres, Levene, Kruskal–Wallis counts, the normality sample);
* ``fetch``: the values fetched into numpy, sorted by group, and passed to
  :func:`sheetfuncs.oneway`;
* ``spark``: :func:`sheetfuncs.oneway_sql` on the same file read by Spark in local mode
  (``local[2]``, ``spark.read.parquet``); the session is started before the clock (its start-up
  is printed apart), and its peak memory adds the JVM's peak resident memory (``VmHWM``) to
  the Python process's (an upper bound: the two peaks need not coincide).

Each is run in a child process so that its peak resident memory (``ru_maxrss``; tracemalloc
does not see DuckDB's own memory) is its own. Goal (issue 13): the push-down within 4x of
``var_samp``, peak under 300 MB. Nothing here is a test: timings depend on the machine.
"""

from __future__ import annotations

import argparse
import json
import os
import subprocess
import sys
import tempfile

HERE = os.path.dirname(os.path.abspath(__file__))
ROOT = os.path.join(HERE, "..")

CHILD = r"""
import json, resource, sys, time
sys.path.insert(0, {root!r}); sys.path.insert(0, {here!r})
import duckdb
import numpy as np
import sheetfuncs as sf
from sheetfuncs.engines import oneway_sql
from timing import best_time

path, what, repeat = {path!r}, {what!r}, {repeat}
def quiet(con):
    con.execute("SET enable_progress_bar = false")
    return con

def var_samp():
    con = quiet(duckdb.connect())
    return con.execute(
        "SELECT g, count(*), avg(x), var_samp(x) FROM read_parquet(?) GROUP BY g", [path]
    ).fetchall()

def pushdown():
    return oneway_sql(path, group="g", value="x")

def analyse_all():
    return sf.analyse_sql(path, group="g", value="x").analysis.oneway

def fetch():
    con = quiet(duckdb.connect())
    sizes = con.execute("SELECT g, count(*) FROM read_parquet(?) GROUP BY g ORDER BY g", [path]).fetchall()
    x = con.execute("SELECT x FROM read_parquet(?) ORDER BY g", [path]).fetchnumpy()["x"]
    cut = np.cumsum([n for _, n in sizes])[:-1]
    return sf.oneway(dict(zip([g for g, _ in sizes], np.split(x, cut))))

def jvm_peak_mib(spark):
    proc = getattr(spark.sparkContext._gateway, "proc", None)
    if proc is None:
        return 0.0
    with open(f"/proc/{{proc.pid}}/status") as f:
        kib = next(int(ln.split()[1]) for ln in f if ln.startswith("VmHWM:"))
    return kib / 1024

started, spark = 0.0, None
if what == "spark":
    t0 = time.perf_counter()
    from pyspark.sql import SparkSession
    spark = (SparkSession.builder.master("local[2]").config("spark.ui.enabled", "false")
             .config("spark.sql.shuffle.partitions", "2").config("spark.ui.showConsoleProgress", "false")
             .getOrCreate())
    spark.sparkContext.setLogLevel("ERROR")
    started = time.perf_counter() - t0

def on_spark():
    return oneway_sql(spark.read.parquet(path), group="g", value="x")

fn = {{"var_samp": var_samp, "oneway_sql": pushdown, "analyse_sql": analyse_all, "fetch": fetch,
       "spark": on_spark}}[what]
seconds = best_time(fn, repeat)
out = fn()
peak = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024  # KiB on Linux -> MiB
if spark is not None:
    peak += jvm_peak_mib(spark)
print("RESULT " + json.dumps({{"seconds": seconds, "peak_mib": peak, "exact": getattr(out, "exact", None),
                              "start": started}}))
"""


def write_data(path: str, groups: int, size: int) -> None:
    """Invented fill weights: ``groups`` heads, ``size`` rows each, three decimals."""
    import duckdb

    con = duckdb.connect()
    con.execute("SET enable_progress_bar = false")
    con.execute(
        f"COPY (SELECT 'Head ' || CAST(i % {groups} + 1 AS VARCHAR) AS g, "
        "round(500.0::DOUBLE + (i % 997) * 0.013::DOUBLE + (i % 10) * 0.021::DOUBLE, 3) AS x "
        f"FROM range({groups * size}) r(i)) TO '{path}' (FORMAT parquet)"
    )


def run(path: str, what: str, repeat: int) -> dict[str, float]:
    code = CHILD.format(root=ROOT, here=HERE, path=path, what=what, repeat=repeat)
    done = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True)
    if done.returncode:
        raise SystemExit(f"{what} failed:\n{done.stderr}")
    line = next(ln for ln in done.stdout.splitlines()[::-1] if ln.startswith("RESULT "))
    return json.loads(line[len("RESULT "):])


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--groups", type=int, default=10)
    ap.add_argument("--size", type=int, default=1_000_000, help="rows per group (10000000 for the issue's figure)")
    ap.add_argument("--repeat", type=int, default=3)
    ap.add_argument("--no-fetch", action="store_true", help="skip the fetch-to-numpy path")
    ap.add_argument("--no-spark", action="store_true", help="skip Spark in local mode")
    a = ap.parse_args()
    with tempfile.TemporaryDirectory() as tmp:
        path = os.path.join(tmp, "fill.parquet")
        write_data(path, a.groups, a.size)
        print(f"{a.groups} groups x {a.size:,} rows from Parquet ({os.path.getsize(path) / 2**20:.0f} MiB), best of {a.repeat}")
        base = run(path, "var_samp", a.repeat)
        names = ["var_samp", "oneway_sql", "analyse_sql"] + ([] if a.no_fetch else ["fetch"])
        names += [] if a.no_spark else ["spark"]
        for name in names:
            r = base if name == "var_samp" else run(path, name, a.repeat)
            print(
                f"  {name:<11} {r['seconds']:8.3f} s  {r['seconds'] / base['seconds']:6.2f}x var_samp  "
                f"peak {r['peak_mib']:7.0f} MiB  exact={r['exact']}"
                + (f"  (session start {r['start']:.1f} s, not timed)" if name == "spark" else "")
            )


if __name__ == "__main__":
    main()
