"""The Sums sheet of a report whose rows stayed in DuckDB (sheetfuncs.report.sheets.sums)."""

from __future__ import annotations

from fractions import Fraction

import duckdb
import openpyxl
import pytest

from sheetfuncs.engines import analyse_sql, group_sums
from sheetfuncs.errors import InputError
from sheetfuncs.report import write_sums_report
from tests.support.engines import double_table

# invented bore diameters (mm) of three suppliers, values that share eight leading digits
BORES = {"Supplier A": [25.00012, 25.00018, 25.00009, 25.00015],
         "Supplier B": [25.00021, 25.00026, 25.00019],
         "Supplier C": [25.00011, 25.00008, 25.00013, 25.00010, 25.00012]}


@pytest.fixture()
def report(tmp_path):
    con = duckdb.connect()
    double_table(con, "bores", BORES)
    res = analyse_sql((con, "bores"), group="g", value="x")
    path = write_sums_report(res.analysis, tmp_path / "bores.xlsx", origin=res.origin,
                             factor="Supplier", response="Bore", unit="mm")
    return openpyxl.load_workbook(path), group_sums((con, "bores"), group="g", value="x"), res


def test_the_sums_are_written_digit_for_digit(report):
    wb, sums, _ = report
    ws = wb["Sums"]
    assert ws["B5"].value == sums.scale and ws["B6"].value == str(sums.offset)
    rows = [r for r in ws.iter_rows(min_row=10, max_row=12, values_only=True)]
    assert [r[1] for r in rows] == list(sums.labels)
    assert [r[2] for r in rows] == list(sums.n)
    assert [r[4] for r in rows] == [str(s) for s in sums.s]  # text: no 15-digit rounding
    assert [r[5] for r in rows] == [str(q) for q in sums.q]


def test_means_and_sums_of_squares_are_the_exact_fractions_rounded_once(report):
    wb, sums, res = report
    ws = wb["Sums"]
    centre = Fraction(ws["B7"].value)
    mom = sums.moments()
    for i, r in enumerate(ws.iter_rows(min_row=10, max_row=12, values_only=True)):
        # the mean and SS of the decimal values, exactly (Fraction of each value's text: common practice)
        vals = [Fraction(str(v)) for v in BORES[sums.labels[i]]]
        mean = sum(vals) / len(vals)
        assert mom.mean(i) == mean
        assert r[6] == float(mean - centre)
        assert r[7] == float(sum((v - mean) ** 2 for v in vals))
    assert "Data" not in wb.sheetnames


def test_the_origin_must_be_the_engines(report, tmp_path):
    _, _, res = report
    with pytest.raises(InputError, match="origin must be the RowsOrigin of analyse_sql, not dict"):
        write_sums_report(res.analysis, tmp_path / "x.xlsx", origin={})
    with pytest.raises(InputError, match="the analysis must be a sheetfuncs Analysis, not list"):
        write_sums_report([], tmp_path / "x.xlsx", origin=res.origin)
    assert not (tmp_path / "x.xlsx").exists()
