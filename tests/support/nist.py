"""Loader for the NIST StRD one-way ANOVA datasets copied into tests/reference/nist/.

Source: NIST Statistical Reference Datasets, Analysis of Variance section (public domain).
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass
from functools import lru_cache
from pathlib import Path

HERE = Path(__file__).resolve().parents[1] / "reference" / "nist"
NAMES = (
    "AtmWtAg", "SiRstv", "SmLs01", "SmLs02", "SmLs03", "SmLs04", "SmLs05", "SmLs06",
    "SmLs07", "SmLs08", "SmLs09",
)


@dataclass(frozen=True)
class Certified:
    df_between: int
    df_within: int
    ss_between: float
    ss_within: float
    ms_between: float
    ms_within: float
    f: float
    r_squared: float
    residual_sd: float


@dataclass(frozen=True)
class Dataset:
    name: str
    certified: Certified
    groups: dict[str, list[float]]      # treatment label -> values (Python floats)
    text_values: dict[str, list[str]]   # the values exactly as printed in the file


@lru_cache(maxsize=None)
def load(name: str) -> Dataset:
    lines = (HERE / f"{name}.dat").read_text().splitlines()
    rows = {}
    r2 = sd = None
    for ln in lines[:60]:
        m = re.match(r"\s*(Between|Within)\s+\w+\s+(\d+)\s+(\S+)\s+(\S+)(?:\s+(\S+))?\s*$", ln)
        if m:
            rows[m.group(1)] = m.groups()[1:]
        if "R-Squared" in ln:
            r2 = float(ln.split()[-1])
        if "Standard Deviation" in ln:
            sd = float(ln.split()[-1])
    b, w = rows["Between"], rows["Within"]
    cert = Certified(
        df_between=int(b[0]), df_within=int(w[0]),
        ss_between=float(b[1]), ss_within=float(w[1]),
        ms_between=float(b[2]), ms_within=float(w[2]),
        f=float(b[3]), r_squared=float(r2), residual_sd=float(sd),
    )
    start = next(i for i, ln in enumerate(lines) if ln.strip().startswith("Data:") and i > 40)
    groups: dict[str, list[float]] = {}
    texts: dict[str, list[str]] = {}
    for ln in lines[start + 1 :]:
        parts = ln.split()
        if len(parts) == 2:
            groups.setdefault(parts[0], []).append(float(parts[1]))
            texts.setdefault(parts[0], []).append(parts[1])
    return Dataset(name, cert, groups, texts)


def lre(value: float, certified: float) -> float:
    """Log relative error, the StRD measure of correct significant digits (capped at 15)."""
    if value == certified:
        return 15.0
    if certified == 0:
        return -math.log10(abs(value))
    return min(15.0, -math.log10(abs(value - certified) / abs(certified)))
