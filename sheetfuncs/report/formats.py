"""Number formats that follow the data's precision, and the same rules for numbers in text.

The data's precision is the number of decimals ``D`` the values were recorded with (the scale of
the decimal-exact moments; ``None`` on the floating-point path). Values and their extremes are
shown with ``D`` decimals, means, SDs, intervals and differences with ``D + 2`` (common practice:
one or two digits more than the data), sums of squares and mean squares with ``2D + 2`` (they are
in squared units). On the floating-point path, where the data carry no decimals of their own,
``D`` comes from the spread: enough decimals to show the smallest group SD with three
significant digits. A figure too small for its format (it would show as zeros, or as a single
digit) is shown with four significant digits instead (scientific notation in cells). Test statistics
show four significant digits; p-values four decimals, and ``<0.0001`` below that.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

__all__ = [
    "Precision", "P_FORMAT", "P_FLOOR", "SCIENTIFIC", "fixed", "fits", "format_p", "format_number",
    "format_measure", "format_sig", "sig_decimals", "spread_decimals",
]

P_FLOOR = 0.0001
#: Shows p-values with four decimals and ``<0.0001`` below that; the cell keeps the full value.
P_FORMAT = '[<0.0001]"<0.0001";0.0000'
_MAX_DECIMALS = 12
#: Four significant digits in scientific notation, for figures below a fixed format's resolution.
SCIENTIFIC = "0.000E+00"


def fixed(decimals: int) -> str:
    """A fixed-decimals format: ``0``, ``0.0``, ``0.000`` ..."""
    d = max(0, min(int(decimals), _MAX_DECIMALS))
    return "0" if d == 0 else "0." + "0" * d


def sig_decimals(x: float, sig: int = 4) -> int:
    """Decimals that show ``x`` with about ``sig`` significant digits (0 for large numbers)."""
    if not math.isfinite(x) or x == 0:
        return sig - 1
    return max(0, min(_MAX_DECIMALS, sig - 1 - int(math.floor(math.log10(abs(x))))))


def spread_decimals(sd: float | None) -> int | None:
    """Decimals that show a spread ``sd`` with three significant digits (``None`` if no spread)."""
    if sd is None or not math.isfinite(sd) or sd <= 0:
        return None
    return max(0, min(_MAX_DECIMALS, 2 - int(math.floor(math.log10(sd)))))


def fits(x: object, decimals: int) -> bool:
    """Whether a nonzero ``x`` shows as more than zeros at ``decimals`` decimals (at least one
    unit of the last decimal); zero, texts and non-finite values always fit."""
    if isinstance(x, bool) or not isinstance(x, (int, float)):
        return True
    v = float(x)
    if v == 0 or not math.isfinite(v):
        return True
    return abs(v) >= 10.0 ** -max(0, min(int(decimals), _MAX_DECIMALS))


@dataclass(frozen=True)
class Precision:
    """Decimals for each kind of figure, from the data's own decimals (``None``: unknown, the
    floating-point path), with ``spread`` (the smallest positive group SD) deciding the
    decimals when the data's own are unknown."""

    data_decimals: int | None
    spread: float | None = None

    @property
    def value(self) -> int:
        if self.data_decimals is None:
            d = spread_decimals(self.spread)
            return 4 if d is None else d
        return min(self.data_decimals, _MAX_DECIMALS)

    @property
    def mean(self) -> int:
        return min(self.value + 2, _MAX_DECIMALS)

    @property
    def square(self) -> int:
        return min(2 * self.value + 2, _MAX_DECIMALS)

    def value_format(self, x: object = None) -> str:
        return _fit(x, self.value)

    def mean_format(self, x: object = None) -> str:
        return _fit(x, self.mean)

    def square_format(self, x: object = None) -> str:
        return _fit(x, self.square)


def _fit(x: object, decimals: int) -> str:
    """``fixed(decimals)``, or scientific when ``x`` is too small to show there."""
    return fixed(decimals) if fits(x, decimals) else SCIENTIFIC


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


def format_measure(x: float, decimals: int) -> str:
    """A measurement (mean, difference, spread, interval end) as text with ``decimals``
    decimals, or with four significant digits when it is too small to show there."""
    if x is not None and not fits(x, decimals):
        return format_sig(x)
    return format_number(x, decimals)


def format_sig(x: float, sig: int = 4) -> str:
    """A statistic as text with about ``sig`` significant digits."""
    if x is None or math.isnan(x):
        return "undefined"
    if math.isinf(x):
        return "infinite"
    if x != 0 and abs(x) < 10 ** -(_MAX_DECIMALS - sig):
        return f"{x:.{sig - 1}e}"
    return format_number(x, sig_decimals(x, sig))
