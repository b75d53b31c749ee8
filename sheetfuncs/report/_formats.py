"""Number formats that follow the data's precision, and the same rules for numbers in text.

The data's precision is the number of decimals ``D`` the values were recorded with (the scale of
the decimal-exact moments; ``None`` on the floating-point path). Values and their extremes are
shown with ``D`` decimals, means, SDs, intervals and differences with ``D + 2`` (common practice:
one or two digits more than the data), sums of squares and mean squares with ``2D + 2`` (they are
in squared units). Test statistics show four significant digits; p-values four decimals, and
``<0.0001`` below that.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

__all__ = ["Precision", "P_FORMAT", "P_FLOOR", "fixed", "format_p", "format_number", "sig_decimals"]

P_FLOOR = 0.0001
#: Shows p-values with four decimals and ``<0.0001`` below that; the cell keeps the full value.
P_FORMAT = '[<0.0001]"<0.0001";0.0000'
_MAX_DECIMALS = 12


def fixed(decimals: int) -> str:
    """A fixed-decimals format: ``0``, ``0.0``, ``0.000`` ..."""
    d = max(0, min(int(decimals), _MAX_DECIMALS))
    return "0" if d == 0 else "0." + "0" * d


def sig_decimals(x: float, sig: int = 4) -> int:
    """Decimals that show ``x`` with about ``sig`` significant digits (0 for large numbers)."""
    if not math.isfinite(x) or x == 0:
        return sig - 1
    return max(0, min(_MAX_DECIMALS, sig - 1 - int(math.floor(math.log10(abs(x))))))


@dataclass(frozen=True)
class Precision:
    """Decimals for each kind of figure, from the data's own decimals (``None``: unknown)."""

    data_decimals: int | None

    @property
    def value(self) -> int:
        return 4 if self.data_decimals is None else min(self.data_decimals, _MAX_DECIMALS)

    @property
    def mean(self) -> int:
        return min(self.value + 2, _MAX_DECIMALS)

    @property
    def square(self) -> int:
        return min(2 * self.value + 2, _MAX_DECIMALS)

    def value_format(self) -> str:
        return fixed(self.value)

    def mean_format(self) -> str:
        return fixed(self.mean)

    def square_format(self) -> str:
        return fixed(self.square)

    def stat_format(self, x: float) -> str:
        return fixed(sig_decimals(x))


def format_p(p: float) -> str:
    """A p-value as text: ``p < 0.0001`` or ``p = 0.0123``."""
    if p is None or (isinstance(p, float) and math.isnan(p)):
        return "p undefined"
    if p < P_FLOOR:
        return "p < 0.0001"
    return f"p = {p:.4f}"


def format_number(x: float, decimals: int) -> str:
    """A number as text with fixed decimals, thousands separated; inf/NaN in words."""
    if x is None:
        return "undefined"
    if math.isnan(x):
        return "undefined"
    if math.isinf(x):
        return "infinite" if x > 0 else "minus infinite"
    d = max(0, min(int(decimals), _MAX_DECIMALS))
    s = f"{x:,.{d}f}"
    if s.startswith("-") and float(s.replace(",", "")) == 0:
        s = s[1:]
    return s


def format_sig(x: float, sig: int = 4) -> str:
    """A statistic as text with about ``sig`` significant digits."""
    if x is None or math.isnan(x):
        return "undefined"
    if math.isinf(x):
        return "infinite"
    if x != 0 and abs(x) < 10 ** -(_MAX_DECIMALS - sig):
        return f"{x:.{sig - 1}e}"
    return format_number(x, sig_decimals(x, sig))
