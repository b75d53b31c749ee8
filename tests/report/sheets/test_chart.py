"""The Chart sheet: two native charts, error bars on the means, and the series limit of the host."""

from __future__ import annotations

import zipfile

import openpyxl

from tests.support.scenarios import cells_text, write_in


def test_values_chart_stays_within_the_series_limit(tmp_path, monkeypatch):
    # the host allows 255 series per chart (Excel's specifications, from memory); the cap is
    # lowered here so that the many-groups layout is exercised on five groups (a report of 251
    # groups spends most of its time on 31,375 pairwise comparisons)
    import sheetfuncs.report.sheets.chart as chart_mod

    assert chart_mod.MAX_GROUP_SERIES + 1 <= 255
    monkeypatch.setattr(chart_mod, "MAX_GROUP_SERIES", 4)
    g = {f"Lot {i}": [1.0 + (i % 7) * 0.1, 1.2 + (i % 5) * 0.1, 1.1] for i in range(5)}
    path = write_in(tmp_path, g)
    with zipfile.ZipFile(path) as z:
        xml = [z.read(n).decode() for n in z.namelist() if n.startswith("xl/charts/chart")]
    values = next(x for x in xml if "scatterChart" in x)
    assert values.count("<c:ser>") + values.count("<ser>") == 2  # all values, and the means
    ws = openpyxl.load_workbook(path)["Chart"]
    assert "With 5 groups the values chart draws all groups as one series" in cells_text(ws)
    head = [c.row for (c,) in ws.iter_rows(min_col=1, max_col=1) if c.value == "Chart data: plotted values"][0]
    plotted = [r for r in ws.iter_rows(min_row=head + 2, max_col=3, values_only=True) if isinstance(r[0], int)]
    assert len(plotted) == 15  # every value is still plotted, in the one series
    assert f"$C${head + 2}:$C${head + 16}" in values


def test_chart_is_native_with_error_bars(demo):
    _, path, wb = demo
    charts = wb["Chart"]._charts
    assert len(charts) == 2
    with zipfile.ZipFile(path) as z:
        xml = [z.read(n).decode() for n in z.namelist() if n.startswith("xl/charts/chart")]
    assert len(xml) == 2
    means = next(x for x in xml if "lineChart" in x)
    assert "errBars>" in means and 'errValType val="cust"' in means
    values = next(x for x in xml if "scatterChart" in x)
    assert values.count("<ser>") + values.count("<c:ser>") == demo[0].k + 1  # groups, plus the means
