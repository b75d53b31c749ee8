"""SF_TABLE and SF_R2 on the NIST StRD one-way ANOVA datasets, called through the harness as a
spreadsheet would call them (source: NIST Statistical Reference Datasets, Analysis of Variance;
certified values from each file's header, read by tests/nist.py).

Each dataset is laid out twice, as an analyst would keep it: long (a header row, then treatment
number and response per row, treatments as numbers) and wide (one column per treatment, the
treatment numbers as labels with labels=TRUE). Every figure the cells show must keep a log
relative error of at least 14 against the certified value; degrees of freedom are exact.
"""

from __future__ import annotations

import pytest

from tests.support.nist import NAMES, lre, load
from sheetfuncs.worksheet.harness import call


def _long(ds) -> list[list[object]]:
    rows: list[list[object]] = [["Treatment", "Response"]]
    for label, values in ds.groups.items():
        rows += [[float(label), v] for v in values]
    return rows


def _wide(ds) -> list[list[object]]:
    labels = list(ds.groups)
    n = max(len(v) for v in ds.groups.values())
    rows: list[list[object]] = [[float(x) for x in labels]]
    for i in range(n):
        rows.append([ds.groups[k][i] if i < len(ds.groups[k]) else None for k in labels])
    return rows


@pytest.mark.parametrize("layout", ["long", "wide"])
@pytest.mark.parametrize("name", NAMES)
def test_sf_table_keeps_14_digits(name: str, layout: str) -> None:
    ds = load(name)
    cert = ds.certified
    data = _long(ds) if layout == "long" else _wide(ds)
    labels = True if layout == "wide" else None  # long: the header row is found by its text
    table = call("SF_TABLE", data, layout, labels)
    assert table[0] == ["Source", "df", "SS", "MS", "F", "p"]
    factor, residual, total = table[1], table[2], table[3]
    assert factor[1] == cert.df_between and residual[1] == cert.df_within
    assert total[1] == cert.df_between + cert.df_within
    figures = {
        "SS between": (factor[2], cert.ss_between),
        "SS within": (residual[2], cert.ss_within),
        "MS between": (factor[3], cert.ms_between),
        "MS within": (residual[3], cert.ms_within),
        "F": (factor[4], cert.f),
    }
    r2 = call("SF_R2", data, layout, labels)
    figures["R squared"] = (r2, cert.r_squared)
    digits = {k: lre(v, c) for k, (v, c) in figures.items()}
    assert min(digits.values()) >= 14, digits
