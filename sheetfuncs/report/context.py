"""What one report shows: the core's analysis, the names the user gave, and two report figures.

The report writer never computes statistics of its own: :func:`prepare` calls
:func:`sheetfuncs.stats.analyse` once and the sheet builders only shape its results. The report
adds the names of the factor, the response and its unit and the title; the Audit sheet's
centring constant (a round number near the grand mean, from which a spreadsheet's own
floating-point functions reproduce the exact figures, :mod:`sheetfuncs.stats.centring`); and
the decimals figures are shown with (:class:`~sheetfuncs.report.formats.Precision`).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, fields
from decimal import Decimal
from typing import Any

from ..errors import InputError
from ..input import Reading, RowsOrigin
from ..stats import Analysis, DescribeResult, ExactMoments, OneWayResult, analyse, centring_constant
from .formats import Precision

__all__ = ["ReportContext", "prepare", "prepare_sums", "shaped"]


@dataclass(frozen=True)
class ReportContext(Analysis):
    """Every result of the analysis (the fields of :class:`~sheetfuncs.stats.Analysis`), plus
    ``factor``, ``response``, ``unit`` (or ``None``) and ``title`` as the report names them,
    ``centre`` (the Audit sheet's centring constant), ``precision`` (decimals shown) and
    ``reading`` (what was read from a file, or ``None`` for data passed from Python) and
    ``origin`` (where rows read by a database engine came from, or ``None``; the analysis's
    ``groups`` is then ``None`` and the report holds the per-group exact sums)."""

    factor: str
    response: str
    unit: str | None
    title: str
    centre: Decimal
    precision: Precision
    reading: Reading | None = None
    origin: RowsOrigin | None = None

    @property
    def from_sums(self) -> bool:
        """Whether the values stayed in a database (the report holds the per-group sums)."""
        return self.groups is None

    def units(self, text: str) -> str:
        """``text`` followed by the unit, when there is one: ``2.95 Shore A``."""
        return f"{text} {self.unit}" if self.unit else text


def _text_option(value: Any, name: str, default: str | None) -> str | None:
    if value is None:
        return default
    if not isinstance(value, str):
        raise InputError(f"{name} must be text, not {value!r}")
    s = value.strip()
    return s if s else default


def _names(factor: Any, response: Any, unit: Any, title: Any) -> dict[str, Any]:
    """The names the report gives things, checked, with their defaults."""
    fac = _text_option(factor, "the factor name", "Factor")
    resp = _text_option(response, "the response name", "Response")
    return dict(factor=fac, response=resp, unit=_text_option(unit, "the unit", None),
                title=_text_option(title, "the title", None) or f"{resp} by {fac}")


def _smallest_spread(desc: DescribeResult, ow: OneWayResult) -> float | None:
    """The smallest positive group SD (the overall SD when no group varies): it sets the
    decimals of the floating-point path, whose values carry no decimals of their own."""
    sds = [float(s.sd) for s in desc if s.n > 1 and math.isfinite(float(s.sd)) and float(s.sd) > 0]
    if sds:
        return min(sds)
    if ow.df_total > 0 and ow.ss_total > 0 and math.isfinite(ow.ss_total):
        return math.sqrt(ow.ss_total / ow.df_total)
    return None


def prepare(
    groups: Any,
    *,
    alpha: Any = 0.05,
    method: Any = "tukey",
    control: Any = None,
    factor: str | None = "Factor",
    response: str | None = "Response",
    unit: str | None = None,
    title: str | None = None,
    reading: Reading | None = None,
) -> ReportContext:
    """Run every analysis of the report once. Option errors and an impossible one-way analysis
    raise :class:`~sheetfuncs.errors.InputError`; a secondary analysis that cannot run is kept
    as :class:`~sheetfuncs.stats.Unavailable` with its reason."""
    names = _names(factor, response, unit, title)
    if reading is not None and not isinstance(reading, Reading):
        raise InputError(
            f"reading must be a sheetfuncs.input.Reading or None, not {type(reading).__name__}; "
            "pass the reading of read_groups(), or leave it out"
        )
    an = analyse(groups, alpha=alpha, method=method, control=control)
    return shaped(an, **names, reading=reading)


def shaped(an: Analysis, *, factor: str, response: str, unit: str | None, title: str,
           reading: Reading | None = None, origin: RowsOrigin | None = None) -> ReportContext:
    """The report's view of an analysis already computed (names already checked)."""
    mom = an.moments
    prec = Precision(mom.scale if isinstance(mom, ExactMoments) else None, _smallest_spread(an.describe, an.oneway))
    return ReportContext(
        **{f.name: getattr(an, f.name) for f in fields(Analysis)},
        factor=factor, response=response, unit=unit, title=title,
        centre=centring_constant(mom, an.oneway), precision=prec, reading=reading, origin=origin,
    )


def prepare_sums(
    an: Analysis, *, origin: RowsOrigin, factor: str | None = "Factor",
    response: str | None = "Response", unit: str | None = None, title: str | None = None,
) -> ReportContext:
    """The report's view of an analysis of rows read by a database engine
    (:func:`sheetfuncs.engines.analyse_sql`), with the names checked as :func:`prepare` does."""
    if not isinstance(an, Analysis):
        raise InputError(f"the analysis must be a sheetfuncs Analysis, not {type(an).__name__}")
    if not isinstance(origin, RowsOrigin):
        raise InputError(
            f"origin must be the RowsOrigin of analyse_sql, not {type(origin).__name__}")
    names = _names(factor, response, unit, title)
    return shaped(an, **names, origin=origin)
