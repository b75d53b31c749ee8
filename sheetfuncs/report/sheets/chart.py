"""The Chart sheet: two native charts and the numbers behind them.

The means chart shows each group's mean with its t interval as error bars; the values chart
shows the individual values of each group, spread a little sideways so that equal values stay
visible, with the group means. Above 10,000 values a group of more than 201 values is plotted
as 201 evenly spaced order statistics; above :data:`MAX_GROUP_SERIES` groups the values chart
draws all groups as one series (spreadsheet programs allow 255 series per chart). The sheet's
print area covers the charts and their notes only: the chart data under them do not print.
"""

from __future__ import annotations

import math

import numpy as np
from openpyxl.chart import LineChart, Reference, ScatterChart, Series
from openpyxl.chart.data_source import NumDataSource, NumRef
from openpyxl.chart.error_bar import ErrorBars
from openpyxl.chart.shapes import GraphicalProperties

from ..context import ReportContext
from ..grid import Grid, Style, quote_sheet, safe_text
from .data_layout import DataLayout
from .styles import HEADING, INT_STYLE, NAVY, NOTE, TH, put_title

__all__ = ["MAX_GROUP_SERIES", "build_chart"]

_DIRECT_LIMIT = 10_000
#: Above this many groups the values chart draws one series for all groups: the host allows
#: 255 series per chart (the means are one more series).
MAX_GROUP_SERIES = 250
_PLOTTED_PER_GROUP = 201
#: The row of the means table's header (the charts sit above it) and of the notes.
_MEANS_TOP = 43
_NOTE_ROW = 40
_LANES = (-0.16, -0.08, 0.0, 0.08, 0.16)
_PALETTE = ("4472C4", "ED7D31", "70AD47", "7F6000", "5B9BD5", "C00000", "7030A0", "264478",
            "9E480E", "43682B")
_ONE_VALUE = "one value: no interval, drawn without an error bar"


def build_chart(an: ReportContext, layout: DataLayout | None) -> Grid:
    """The Chart sheet of ``an``, whose data are laid out as ``layout`` (``None``: the values
    stayed in a database, and only the means chart is drawn)."""
    g = Grid("Chart")
    k = an.k
    unit = f" ({an.unit})" if an.unit else ""
    put_title(g, f"Chart · {an.response}{unit} by {an.factor}",
              f"Group means with {an.conf:.0%} t intervals"
              + (", and the individual values" if layout is not None else ""))
    top = _MEANS_TOP
    last = _put_means_table(g, an, top)
    g.charts.append((_means_chart(g.name, an, top, last), "A4"))
    g.widths = {1: 10.0, 2: 18.0, 3: 14.0, 4: 12.0, 5: 12.0, 6: 10.0, 7: 10.0}
    g.freeze = None
    g.print_area = f"A1:G{_NOTE_ROW + 1}"  # the charts and their notes: the chart data do not print
    if layout is None:
        g.print_area = "A1:G22"
        g.put(22, 1, "The individual values stayed in the database, so no chart of them is "
              "drawn; the Sums sheet holds what the analysis was computed from.", NOTE)
        g.merge(22, 1, 22, 7)
        return g
    scatter = _values_chart(an)
    sample = layout.n_values > _DIRECT_LIMIT
    merged = k > MAX_GROUP_SERIES  # one series per group would pass the host's series limit
    for ser in _put_values(g, an, last + 3, sample, merged):
        scatter.series.append(ser)
    _put_notes(g, k, sample, merged)
    means = Series(Reference(_Ref(g.name), min_col=3, min_row=top + 1, max_row=last),
                   Reference(_Ref(g.name), min_col=1, min_row=top + 1, max_row=last), title="Mean")
    _markers_only(means, "dash", 16, "000000")
    scatter.series.append(means)
    _axes_visible(scatter)
    scatter.width, scatter.height = 17.0, 8.5
    g.charts.append((scatter, "A22"))
    return g


def _put_means_table(g: Grid, an: ReportContext, top: int) -> int:
    """The means chart's numbers, under the charts: each group's position, label, mean,
    interval and error-bar half-widths. Returns the table's last row."""
    prec = an.precision
    g.put(top - 1, 1, "Chart data: means and interval half-widths (from the Groups sheet)", HEADING)
    head = ["Position", an.factor, "Mean", "CI low", "CI high", "Minus", "Plus"]
    g.put_row(top, 1, head, TH)
    for i, s in enumerate(an.describe, start=1):
        r = top + i
        g.put(r, 1, i, INT_STYLE)
        g.put(r, 2, s.label)
        g.put(r, 3, s.mean, Style(num=prec.mean_format(s.mean)))
        if s.n > 1:
            for col, v in ((4, s.ci.low), (5, s.ci.high), (6, s.mean - s.ci.low), (7, s.ci.high - s.mean)):
                g.put(r, col, v, Style(num=prec.mean_format(v)))
        else:
            g.put(r, 4, math.nan)
            g.put(r, 5, math.nan)
            g.put(r, 6, 0.0, comment=_ONE_VALUE)
            g.put(r, 7, 0.0, comment=_ONE_VALUE)
    return top + an.k


def _means_chart(sheet: str, an: ReportContext, top: int, last: int) -> LineChart:
    """The group means with their intervals as error bars, from the means table at ``top``."""
    unit = f" ({an.unit})" if an.unit else ""
    line = LineChart()
    line.title = f"Group means with {an.conf:.0%} intervals"
    line.y_axis.title = safe_text(f"{an.response}{unit}")
    line.x_axis.title = safe_text(an.factor)
    line.legend = None
    ser = Series(Reference(_Ref(sheet), min_col=3, min_row=top + 1, max_row=last), title="Mean")
    _markers_only(ser, "circle", 8, NAVY)
    ser.errBars = ErrorBars(
        errDir="y", errBarType="both", errValType="cust", noEndCap=False,
        plus=NumDataSource(numRef=NumRef(f=f"{quote_sheet(sheet)}!$G${top + 1}:$G${last}")),
        minus=NumDataSource(numRef=NumRef(f=f"{quote_sheet(sheet)}!$F${top + 1}:$F${last}")),
    )
    line.series.append(ser)
    line.set_categories(Reference(_Ref(sheet), min_col=2, min_row=top + 1, max_row=last))
    _axes_visible(line)
    line.width, line.height = 17.0, 8.5
    return line


def _values_chart(an: ReportContext) -> ScatterChart:
    """The values chart's frame: titles, and an x axis of group positions 1..k."""
    k = an.k
    unit = f" ({an.unit})" if an.unit else ""
    scatter = ScatterChart()
    scatter.title = "Individual values, with the group means"
    scatter.scatterStyle = "lineMarker"
    scatter.y_axis.title = safe_text(f"{an.response}{unit}")
    scatter.x_axis.title = safe_text(f"{an.factor} (position 1 to {k}; see the table below)")
    scatter.x_axis.scaling.min = 0
    scatter.x_axis.scaling.max = k + 1
    scatter.x_axis.majorUnit = 1
    scatter.x_axis.number_format = f'[<0.5]"";[>{k + 0.5}]"";0'
    scatter.x_axis.majorGridlines = None
    return scatter


def _plotted(arr: np.ndarray, sample: bool) -> np.ndarray:
    """A group's values in order, or, when ``sample``, 201 evenly spaced order statistics."""
    pts = np.sort(arr)
    if sample and pts.size > _PLOTTED_PER_GROUP:
        pts = pts[np.round(np.linspace(0, pts.size - 1, _PLOTTED_PER_GROUP)).astype(int)]
    return pts


def _put_values(g: Grid, an: ReportContext, vtop: int, sample: bool, merged: bool) -> list[Series]:
    """The values chart's numbers (position, plotted-at, value) from row ``vtop``, and its
    series: one per group, or one for all groups when ``merged``."""
    col0 = 1
    g.put(vtop - 1, col0, "Chart data: plotted values", HEADING)
    g.put_row(vtop, col0, ["Position", "Plotted at", an.response], TH)
    vstyle = Style(num=an.precision.value_format())
    series = []
    r = vtop
    for i, arr in enumerate(an.groups.arrays, start=1):
        r0 = r + 1
        for j, v in enumerate(_plotted(arr, sample).tolist()):
            r += 1
            g.put(r, col0, i, INT_STYLE)
            g.put(r, col0 + 1, i + _LANES[j % len(_LANES)], Style(num="0.00"))
            g.put(r, col0 + 2, v, vstyle)
        if not merged:
            series.append(_values_series(g.name, col0, r0, r, safe_text(an.groups.labels[i - 1]),
                                         5, _PALETTE[(i - 1) % len(_PALETTE)]))
    if merged:
        series.append(_values_series(g.name, col0, vtop + 1, r, "Values", 4, _PALETTE[0]))
    return series


def _values_series(sheet: str, col0: int, first: int, last: int, title: str, size: int, color: str) -> Series:
    """Values in column ``col0 + 2`` against their plotted-at positions in ``col0 + 1``."""
    ser = Series(Reference(_Ref(sheet), min_col=col0 + 2, min_row=first, max_row=last),
                 Reference(_Ref(sheet), min_col=col0 + 1, min_row=first, max_row=last), title=title)
    _markers_only(ser, "circle", size, color)
    return ser


def _put_notes(g: Grid, k: int, sample: bool, merged: bool) -> None:
    """What the values chart plots, above the numbers."""
    if sample:
        g.put(_NOTE_ROW, 1, f"The values chart plots, for groups of more than {_PLOTTED_PER_GROUP} "
              f"values, {_PLOTTED_PER_GROUP} evenly spaced order statistics (smallest to largest); "
              "every value is on the Data sheet. Points are spread sideways so that equal values "
              "stay visible.", NOTE)
    else:
        g.put(_NOTE_ROW, 1, "The values chart plots every value (a copy of the Data sheet's values, "
              "sorted within each group and spread sideways so that equal values stay visible).", NOTE)
    if merged:
        g.put(_NOTE_ROW + 1, 1, f"With {k} groups the values chart draws all groups as one series "
              f"(one colour): spreadsheet programs allow at most 255 series in a chart, so one "
              f"series per group is drawn only up to {MAX_GROUP_SERIES} groups.", NOTE)
        g.merge(_NOTE_ROW + 1, 1, _NOTE_ROW + 1, 8)
    g.merge(_NOTE_ROW, 1, _NOTE_ROW, 8)


class _Ref:
    """A stand-in worksheet for ``openpyxl.chart.Reference`` (it needs only a title)."""

    def __init__(self, title: str) -> None:
        self.title = title


def _axes_visible(chart: LineChart | ScatterChart) -> None:
    """Show both axes (some programs hide an axis whose ``delete`` flag is left unset)."""
    for ax in (chart.x_axis, chart.y_axis):
        try:
            ax.delete = False
        except AttributeError:
            pass


def _markers_only(s: Series, symbol: str, size: int, color: str) -> None:
    s.marker.symbol = symbol
    s.marker.size = size
    s.marker.graphicalProperties = GraphicalProperties(solidFill=color)
    s.marker.graphicalProperties.line.solidFill = color
    s.graphicalProperties.line.noFill = True
    s.smooth = False
