"""Timing helper shared by the benchmark scripts."""

from __future__ import annotations

import gc
import time
from collections.abc import Callable


def best_time(fn: Callable[[], object], repeat: int) -> float:
    """Best wall time of ``repeat`` calls of ``fn``, in seconds, each from a collected heap."""
    best = float("inf")
    for _ in range(repeat):
        gc.collect()
        t0 = time.perf_counter()
        fn()
        best = min(best, time.perf_counter() - t0)
    return best
