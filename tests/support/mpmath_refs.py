"""Reference values computed with mpmath at high precision (test-only reference library)."""

from __future__ import annotations

from collections.abc import Iterable

import mpmath as mp

__all__ = ["many_to_one_normal", "bartlett_statistic"]


def many_to_one_normal(h: float, lam: list[float]) -> float:
    """P(max |Z_j| > h), corr l_i l_j, by mpmath at 30 digits (Dunnett 1955 reduction)."""
    with mp.workdps(30):
        h = mp.mpf(h)
        ls = [mp.mpf(x) for x in lam]
        ss = [mp.sqrt(1 - x * x) for x in ls]

        def f(u):
            inside = mp.mpf(1)
            for l, s in zip(ls, ss):
                inside *= mp.ncdf((h - l * u) / s) - mp.ncdf((-h - l * u) / s)
            return mp.npdf(u) * (1 - inside)

        return float(mp.quad(f, [-mp.inf, -h, -h / 2, 0, h / 2, h, mp.inf]))


def bartlett_statistic(groups: Iterable[Iterable[float]], dps: int = 50) -> float:
    """Bartlett's (1937) textbook formula evaluated with mpmath on the exact decimal values."""
    with mp.workdps(dps):
        groups = [[mp.mpf(repr(float(x))) for x in g] for g in groups]

        def var(g):
            m = sum(g) / len(g)
            return sum((x - m) ** 2 for x in g) / (len(g) - 1)

        v = [var(g) for g in groups]
        ns = [len(g) for g in groups]
        n, k = sum(ns), len(ns)
        sp = sum((ni - 1) * vi for ni, vi in zip(ns, v)) / (n - k)
        num = (n - k) * mp.log(sp) - sum((ni - 1) * mp.log(vi) for ni, vi in zip(ns, v))
        corr = 1 + (sum(mp.mpf(1) / (ni - 1) for ni in ns) - mp.mpf(1) / (n - k)) / (3 * (k - 1))
        return float(num / corr)
