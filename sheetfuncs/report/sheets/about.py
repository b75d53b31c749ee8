"""The About sheet: the input, the options, the software and arithmetic, the published source of
every method (:mod:`.references`) and the cautions."""

from __future__ import annotations

import platform
from typing import Any

import numpy as np

from ...input import InputSource
from ...stats import ExactMoments
from ..context import ReportContext
from ..findings import CAUTIONS
from ..grid import Grid, Style
from ..trace import Trace
from .references import REFERENCES, reference_keys
from .styles import HEADING, INT_STYLE, KEY, TEXT, put_title

__all__ = ["build_about"]

_LAYOUT_WORDS = {"wide": "wide (one group per column)", "long": "long (label and value columns)",
                 "rowwise": "one group per row", "python": "Python sequences"}
_LABEL_WORDS = {"range": "read from the range", "default": "numbered (Group 1, Group 2, …)",
                "given": "given with the data"}


class _Lines:
    """Writes the About sheet down its rows: headings, key-value items and bullets."""

    def __init__(self, grid: Grid, row: int) -> None:
        self.g = grid
        self.r = row

    def section(self, title: str) -> None:
        self.g.put(self.r, 1, title, HEADING)
        self.r += 1

    def item(self, key: str, value: Any, style: Style = TEXT) -> None:
        self.g.put(self.r, 1, key, KEY)
        self.g.put(self.r, 2, value, style)
        if isinstance(value, str):
            self.g.merge(self.r, 2, self.r, 4)
        self.r += 1

    def bullet(self, text: str) -> None:
        self.g.put(self.r, 1, "•", Style(halign="right", valign="top"))
        self.g.put(self.r, 2, text, TEXT)
        self.g.merge(self.r, 2, self.r, 4)
        self.r += 1

    def gap(self) -> None:
        self.r += 1


def build_about(an: ReportContext, *, source: InputSource | None, written: str, trace: Trace,
                data_sheets: tuple[str, ...]) -> Grid:
    """The About sheet of ``an``, read from ``source``, written at ``written`` as ``trace``
    records it, with its data on ``data_sheets``."""
    g = Grid("About")
    put_title(g, "About this report", "Inputs, options, software and the methods behind every figure")
    out = _Lines(g, 4)
    out.section("Record")
    _record_items(out, trace, written)
    out.gap()
    out.section("Input")
    _file_items(out, trace)
    _input_items(out, an, source, data_sheets)
    out.gap()
    out.section("Options")
    _option_items(out, an, trace)
    out.gap()
    out.section("Software and arithmetic")
    _software_items(out, an, trace.version)
    out.gap()
    out.section("Method references")
    for key in reference_keys(an):
        out.bullet(REFERENCES[key])
    out.gap()
    out.section("Cautions")
    for c in CAUTIONS:
        out.bullet(c)
    g.widths = {1: 32.0, 2: 40.0, 3: 30.0, 4: 30.0}
    g.freeze = "A3"
    return g


def _origin_items(out: _Lines, an: ReportContext) -> None:
    """Rows read by a database engine: the engine, what was read, the filter, the rows."""
    o = an.origin
    left_int = INT_STYLE.but(halign="left")
    out.item("Engine", f"{o.engine} {o.engine_version}")
    out.item("Rows read from", o.source)
    out.item("SQL source (after FROM)", o.from_sql)
    out.item("Filter (WHERE)", o.where or "none")
    out.item("Rows read", o.rows_read, left_int)
    out.item("Rows with no group label (left out)", o.null_labels, left_int)
    out.item("Missing values (NULL or NaN) left out", sum(o.missing), left_int)
    out.item("Groups", an.k, left_int)
    out.item("Values used", an.n_total, left_int)
    for note in o.notes:
        out.bullet(note)
    if an.from_sums:
        out.item("Exact sums", "on the Sums sheet (the values stayed in the database)")
    else:
        out.item("Values", "fetched from the database: some have more than 15 significant "
                 "digits, which no exact sum holds (floating-point path)")


def _input_items(out: _Lines, an: ReportContext, source: InputSource | None, data_sheets: tuple[str, ...]) -> None:
    gr = an.groups
    r = an.reading
    if an.origin is not None:
        _origin_items(out, an)
        if gr is not None:  # values fetched from the database (more than 15 significant digits)
            out.item("Data sheets", ", ".join(data_sheets))
        return
    if r is not None:
        if r.sheet:
            out.item("Sheet", str(r.sheet))
        out.item("Range read", r.where)
        out.item("How it was found", "read from the sheet (no range given): the header, data "
                 "rows and columns found as the log on the Data sheet shows" if r.detected
                 else "the range given")
    elif source is not None and (source.path or source.sheet):
        if not source.path:
            out.item("Source", "data passed from Python (no file); cell addresses as on the sheet below")
        if source.sheet:
            out.item("Sheet", str(source.sheet))
        out.item("First cell of the range", source.address(0, 0))
    else:
        out.item("Source", "data passed from Python (no file)")
    out.item("Layout", _LAYOUT_WORDS.get(gr.layout, gr.layout))
    out.item("Labels", _LABEL_WORDS.get(gr.label_source, gr.label_source))
    left_int = INT_STYLE.but(halign="left")
    out.item("Groups", gr.k, left_int)
    out.item("Values used", gr.n_total, left_int)
    if r is not None:
        out.item("Non-blank cells read", r.cells_read, left_int)
        out.item("Cells used (values and labels)", r.cells_used, left_int)
        out.item("Cells left out", r.cells_left_out, left_int)
        out.item("Error cells read as missing", r.missing, left_int)
        for note in r.notes:
            out.bullet(note)
    else:
        out.item("Input cells not used", len(gr.cells), left_int)
    out.item("Data sheets", ", ".join(data_sheets))


def _record_items(out: _Lines, trace: Trace, written: str) -> None:
    """The identifier (also in every printed page's header), the call and the time."""
    out.item("Report identifier", trace.identifier)
    out.item("How it is made", "the first 12 hex digits of a SHA-256 of the data's fingerprint "
             "(below), the options and the sheetfuncs version: the same inputs, options and "
             "version give the same identifier")
    out.item("Written by", trace.call)
    out.item("Written (UTC)", written)
    out.item("Paper", {"a4": "A4", "letter": "Letter"}[trace.paper])


def _file_items(out: _Lines, trace: Trace) -> None:
    """The input file (absolute path, size, SHA-256) and the data's fingerprint."""
    if trace.input_path is not None:
        out.item("Input file (absolute path)", trace.input_path)
        if trace.input_sha256 is None:
            out.item("Input file SHA-256", "none: the file was not found when the report was written")
        else:
            out.item("Input file size (bytes)", trace.input_size, INT_STYLE.but(halign="left"))
            out.item("Input file SHA-256", trace.input_sha256)
    if trace.data_sha256 != trace.input_sha256:
        out.item("Data fingerprint (SHA-256)", trace.data_sha256)


def _option_items(out: _Lines, an: ReportContext, trace: Trace) -> None:
    if trace.reading_options:
        out.item("Reading options", ", ".join(f"{k}={v}" for k, v in trace.reading_options))
    else:
        out.item("Reading options", "none recorded")
    out.item("alpha (significance level)", an.alpha, Style(num="0.####", halign="left"))
    out.item("Confidence level of intervals", an.conf, Style(num="0.##%", halign="left"))
    out.item("Pairwise method", an.method_name)
    out.item("Control group (Dunnett)", an.control if an.control is not None else "none")
    out.item("Factor", an.factor)
    out.item("Response", an.response)
    out.item("Unit", an.unit or "none given")
    out.item("Title", an.title)


def _software_items(out: _Lines, an: ReportContext, version: str) -> None:
    import openpyxl
    import scipy

    out.item("sheetfuncs version", version)
    out.item("numpy version", np.__version__)
    out.item("scipy version", scipy.__version__)
    out.item("openpyxl version", openpyxl.__version__)
    out.item("Python version", platform.python_version())
    mom = an.moments
    if isinstance(mom, ExactMoments):  # the decimal-exact path (an.exact)
        scale = mom.scale
        out.item("Arithmetic", "decimal-exact path: every value was read as its shortest decimal; counts, "
                 "sums and sums of squares were accumulated exactly as integers and the sums of "
                 f"squares rounded once at the end (the data carry {scale} decimal"
                 f"{'' if scale == 1 else 's'}).")
    else:
        out.item("Arithmetic", "floating-point path: some values have more than 15 significant digits "
                 "(typically formula results); per-group two-pass sums of squares with the "
                 "corrected-sum term.")
    out.item("Centring constant (Audit)", f"{an.centre:f}")
    out.item("p-values", "upper tails from survival functions (never 1 − cdf), accurate far into the tail")

