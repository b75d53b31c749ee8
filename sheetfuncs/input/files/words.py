"""The words block detection reads in a sheet: summary words, units, identifier headers, sign-offs.

Each list is what QA worksheets commonly hold (common practice); matching is on whole words,
case-insensitive, after surrounding spaces and a trailing colon or full stop are dropped.
"""

from __future__ import annotations

import re
from typing import Any

__all__ = [
    "AGGREGATES", "is_identifier_header", "is_signoff", "is_unit_row", "summary_word",
]

#: Words that lead a summary row or head a summary column.
SUMMARY_WORDS = frozenset({
    "mean", "average", "avg", "avg.", "sd", "s.d.", "std", "std dev", "std. dev.", "std.dev.",
    "stdev", "st dev", "st. dev.", "standard deviation", "s", "total", "sum", "min", "min.",
    "minimum", "max", "max.", "maximum", "range", "count", "n", "cv", "cv%", "cv (%)", "%cv",
    "%rsd", "rsd", "rsd%", "rsd (%)", "median", "var", "variance", "se", "sem", "std err",
    "standard error", "grand mean", "overall mean", "mean value", "x-bar", "xbar", "x̄",
    "subtotal", "totals", "n =", "n=", "mean:", "average value",
})

#: Functions that aggregate a range: a formula using one over the block's cells is a summary.
AGGREGATES = frozenset({
    "AVERAGE", "AVERAGEA", "AVERAGEIF", "AVERAGEIFS", "STDEV", "STDEVA", "STDEVP", "STDEVPA",
    "STDEV.S", "STDEV.P", "VAR", "VARA", "VARP", "VARPA", "VAR.S", "VAR.P", "SUM", "SUMIF",
    "SUMIFS", "SUMPRODUCT", "SUMSQ", "MIN", "MINA", "MINIFS", "MAX", "MAXA", "MAXIFS", "COUNT",
    "COUNTA", "COUNTIF", "COUNTIFS", "COUNTBLANK", "MEDIAN", "MODE", "MODE.SNGL", "PERCENTILE",
    "QUARTILE", "SUBTOTAL", "AGGREGATE", "DEVSQ", "AVEDEV", "GEOMEAN", "HARMEAN", "TRIMMEAN",
    "LARGE", "SMALL", "PRODUCT", "STEYX", "CONFIDENCE", "CONFIDENCE.T", "CONFIDENCE.NORM",
})

#: Words that name an identifier column (whole words of the header).
IDENTIFIER_WORDS = frozenset({
    "sample", "samples", "no", "no.", "nr", "nr.", "number", "#", "id", "run", "specimen",
    "part", "item", "seq", "sequence", "replicate", "rep", "unit", "serial", "index", "obs",
    "observation", "trial", "piece", "position", "pos", "shot", "cavity", "test",
})

#: Headers that are identifiers only together with another word ("Unit no", "Test no").
_WEAK = frozenset({"unit", "test", "position", "pos", "piece"})

#: Unit tokens of a units row.
UNIT_TOKENS = frozenset({
    "mm", "cm", "m", "µm", "μm", "um", "nm", "in", "inch", "g", "mg", "kg", "µg", "ug", "n", "kn",
    "mn", "mpa", "pa", "kpa", "gpa", "bar", "psi", "ksi", "%", "s", "sec", "ms", "min", "h", "hr",
    "°c", "°f", "c", "k", "ml", "l", "µl", "ul", "ppm", "ppb", "hrc", "hrb", "hb", "hv", "shore a",
    "nm·m", "n·m", "nm2", "mm2", "mm²", "g/l", "mg/l", "g/ml", "g/cm3", "g/cm³", "kg/m3", "kg/m³",
    "mpa·s", "cp", "cps", "rpm", "v", "mv", "a", "ma", "ω", "ohm", "kohm", "j", "kj", "w", "kw",
    "hz", "khz", "db", "lux", "%rh", "rh", "ph", "ntu", "cfu", "cfu/g", "cfu/ml", "mg/kg", "wt%",
    "w/w", "v/v", "µs/cm", "us/cm", "ms/cm", "units", "unit", "pcs", "count",
})

#: How sign-off lines begin.
_SIGNOFF = re.compile(
    r"^(checked|approved|reviewed|verified|prepared|signed|authori[sz]ed|released|recorded|"
    r"entered|tested|inspected|witnessed)( by)?\b|^(signature|sign[- ]?off|initials|qa sign)\b",
    re.IGNORECASE,
)
_BRACKETED = re.compile(r"^[(\[][^()\[\]]{1,12}[)\]]$")
_SPLIT = re.compile(r"[\s_./:-]+")


def _key(v: Any) -> str:
    """A cell's text as compared: trimmed, case-folded, a trailing colon dropped."""
    s = v.strip().casefold() if isinstance(v, str) else ""
    return s[:-1].rstrip() if s.endswith(":") else s


def summary_word(v: Any) -> bool:
    """Whether a cell holds a summary word (``Mean``, ``SD``, ``CV%``, ``Std dev:`` ...)."""
    if not isinstance(v, str) or len(v) > 40:
        return False
    s = _key(v)
    return s in SUMMARY_WORDS or s.rstrip(".") in SUMMARY_WORDS


def is_identifier_header(v: Any) -> bool:
    """Whether a header names an identifier column: every word of it an identifier word
    (``Sample``, ``Sample no``, ``ID``, ``#``, ``Unit no``; not ``Run 1`` or ``Unit``)."""
    if not isinstance(v, str) or len(v) > 40:
        return False
    key = _key(v)
    words = [w for w in _SPLIT.split(key) if w]
    if key == "#" or (words and key.startswith("#") and len(words) == 1):
        return True
    if not words or not all(w in IDENTIFIER_WORDS or w == "#" for w in words):
        return False
    return len(words) > 1 or words[0] not in _WEAK


#: Headers of a column of remarks (``Comment``, ``Notes``, ``Remarks:``).
COMMENT_WORDS = frozenset({"comment", "comments", "note", "notes", "remark", "remarks", "observation",
                           "observations", "deviation", "deviations", "remarque", "bemerkung"})


def is_comment_header(v: Any) -> bool:
    """Whether a header names a column of remarks (``Comment``, ``Notes``, ``Remarks``)."""
    return isinstance(v, str) and _key(v) in COMMENT_WORDS


_REPLICATE = re.compile(
    r"^(?:(?:rep(?:licate)?|run|meas(?:urement)?|reading|trial|test|determination|n|r|x)"
    r"\.?\s*(?:no\.?|#)?\s*)?\d{1,3}$", re.IGNORECASE,
)


def is_replicate_heading(v: Any) -> bool:
    """Whether a column heading numbers a replicate (``Rep 1``, ``Run 2``, ``Reading #3``, ``4``)."""
    return isinstance(v, str) and _REPLICATE.match(v.strip()) is not None


#: Words of a heading that labels rows rather than a group (``Lot``, ``Batch``, ``Day 1-12``).
ROW_WORDS = frozenset({"lot", "lots", "batch", "batches", "day", "days", "week", "shift", "hour",
                       "month", "year", "time", "date", "order", "order no"})


def is_row_heading(v: Any) -> bool:
    """Whether a heading labels rows (``Lot``, ``Batch no``, ``Day``): with consecutive whole
    numbers under it, the column numbers the rows."""
    if not isinstance(v, str) or len(v) > 40:
        return False
    words = [w for w in _SPLIT.split(_key(v)) if w]
    return bool(words) and words[0] in ROW_WORDS


def is_signoff(v: Any) -> bool:
    """Whether a cell begins a sign-off line (``Checked by:``, ``Approved by``, ``Signature``)."""
    return isinstance(v, str) and _SIGNOFF.match(v.strip()) is not None


def _unit_like(v: str) -> bool:
    s = v.strip()
    return s.casefold() in UNIT_TOKENS or _BRACKETED.match(s) is not None


def is_unit_row(cells: list[Any]) -> bool:
    """Whether the non-blank ``cells`` of a row are units: every one a unit token (``mm``,
    ``MPa``), a short text in brackets (``(mm)``, ``[N]``), or the same short text in every
    column (at least two)."""
    texts = [v for v in cells if v is not None and v != ""]
    if not texts or not all(isinstance(v, str) for v in texts):
        return False
    if all(_unit_like(v) for v in texts):
        return True
    return len(texts) >= 2 and len(set(v.strip() for v in texts)) == 1 and len(texts[0].strip()) <= 8
