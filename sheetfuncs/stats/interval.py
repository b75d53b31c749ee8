"""The one interval type that every result uses."""

from __future__ import annotations

from typing import NamedTuple

__all__ = ["Interval"]


class Interval(NamedTuple):
    """A two-sided interval, ``low`` to ``high``.

    A named tuple, so ``low, high = res.ci`` and ``res.ci == (a, b)`` work as well as
    ``res.ci.low``. Which interval it is (confidence level, simultaneous or not) is said by the
    result that holds it.
    """

    low: float
    high: float
