"""Running the command line in a child process and measuring its time and peak memory.

The command runs as the child of a small Python wrapper, which reports the child's wall time and
its peak resident set size (``resource.getrusage(RUSAGE_CHILDREN).ru_maxrss``, kilobytes on
Linux): the figures are the command's own, not those of anything else the test session ran.
"""

from __future__ import annotations

import json
import os
import subprocess
import sys
from dataclasses import dataclass
from pathlib import Path

__all__ = ["Measured", "measure_cli"]

ROOT = Path(__file__).resolve().parents[2]

_WRAPPER = """
import json, resource, subprocess, sys, time
t0 = time.perf_counter()
done = subprocess.run(sys.argv[1:], capture_output=True, text=True)
seconds = time.perf_counter() - t0
peak = resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss
print(json.dumps({"code": done.returncode, "out": done.stdout, "err": done.stderr,
                  "seconds": seconds, "peak_mb": peak / 1024.0}))
"""


@dataclass(frozen=True)
class Measured:
    """What a command-line run gave, and what it cost."""

    code: int
    out: str
    err: str
    seconds: float
    peak_mb: float


def measure_cli(*args: str, cwd: Path, timeout: float = 120.0) -> Measured:
    """``python -m sheetfuncs ARGS`` in ``cwd``: exit code, output, wall time and peak memory."""
    env = dict(os.environ, PYTHONPATH=str(ROOT))
    done = subprocess.run(
        [sys.executable, "-c", _WRAPPER, sys.executable, "-m", "sheetfuncs", *args],
        cwd=cwd, env=env, capture_output=True, text=True, timeout=timeout,
    )
    return Measured(**json.loads(done.stdout))
