"""Reference values computed with mpmath at 30 digits (test-only reference library)."""

from __future__ import annotations

import mpmath as mp

__all__ = ["many_to_one_normal"]


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
