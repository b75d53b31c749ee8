"""Tests of ``sheetfuncs table`` (sheetfuncs.cli.table): JSON, CSV and text output.

Numeric checks name their source: NIST StRD certified values.
"""

from __future__ import annotations

import csv
import io
import math

import pytest

from tests.support import nist
from tests.support.cli import DEMO_BOOK, nist_csv, run, strict_json, write_csv


def test_table_json_matches_nist_certified_values(tmp_path, capsys):
    # NIST StRD SmLs01 (certified values in the dataset header)
    path = nist_csv(tmp_path, "SmLs01")
    code, out, err = run(["table", str(path), "--layout", "long", "--json"], capsys)
    assert code == 0 and err.startswith("SmLs01.csv: read A1:B190: 9 groups, 189 values (1 21, 2 21,")
    doc = strict_json(out)
    cert = nist.load("SmLs01").certified
    ow = doc["oneway"]
    assert ow["df_between"] == cert.df_between and ow["df_within"] == cert.df_within
    assert math.isclose(ow["f"], cert.f, rel_tol=1e-13)
    assert math.isclose(ow["ss_within"], cert.ss_within, rel_tol=1e-13)
    assert math.isclose(ow["r_squared"], cert.r_squared, rel_tol=1e-13)
    assert ow["exact"] is True
    assert ow["table"][0]["Source"] == "Factor" and ow["table"][1]["Source"] == "Residual"
    assert doc["checks"]["read"] in ("oneway", "welch", "kruskal")
    assert doc["checks"]["table"][0]["Check"] == "Read"
    assert [g["Group"] for g in doc["groups"]] == list(nist.load("SmLs01").groups)
    assert "engineering judgement" in doc["caution"]


def test_table_json_writes_infinity_as_inf(tmp_path, capsys):
    # zero within-group variation and different means: F = +inf, p = 0 (project guide)
    path = write_csv(tmp_path / "flat.csv", [["A", "B"], [1, 2], [1, 2], [1, 2]])
    code, out, err = run(["table", str(path), "--json"], capsys)
    assert code == 0, err
    assert "Infinity" not in out and "NaN" not in out
    doc = strict_json(out)
    assert doc["oneway"]["f"] == "inf" and doc["oneway"]["p"] == 0.0
    assert doc["oneway"]["table"][0]["F"] == "inf"


def test_table_csv_defuses_formula_like_text(tmp_path, capsys):
    rows = [["=HYPERLINK(\"x\")", "+B", "-C", "@D"]]
    rows += [[-1.5, -2.5, -3.5, -0.5], [-1.7, -2.1, -3.3, -0.9], [-1.2, -2.9, -3.1, -0.4]]
    path = write_csv(tmp_path / "inj.csv", rows)
    code, out, err = run(["table", str(path), "--csv", "--factor", "=1+1"], capsys)
    assert code == 0, err
    sections = out.strip("\n").split("\n\n")
    assert len(sections) == 4
    parsed = [list(csv.reader(io.StringIO(s))) for s in sections]
    assert parsed[0][:2] == [["Read", "Item", "Cells"], ["block", "A1:D4", "16"]]  # what was read, first
    assert [r[1] for r in parsed[0][2:]] == ["'=HYPERLINK(\"x\")", "'+B", "'-C", "'@D"]
    assert parsed[1][0] == ["Source", "df", "SS", "MS", "F", "p"]
    assert parsed[1][1][0] == "'=1+1"
    groups = parsed[3]
    assert [r[0] for r in groups[1:]] == ["'=HYPERLINK(\"x\")", "'+B", "'-C", "'@D"]
    means = [float(r[2]) for r in groups[1:]]  # negative numbers are numbers, not text
    # the first mean is (-1.5 - 1.7 - 1.2) / 3, worked by hand
    assert means[0] == pytest.approx(-1.4666666666666666, rel=1e-15)
    for section in parsed:
        for row in section:
            for cell in row:
                assert not cell.startswith(("=", "+", "@", "\t", "\r")), cell
                if cell.startswith("-"):
                    float(cell)  # only numbers may start with a minus sign


def test_table_text_output(tmp_path, capsys):
    code, out, err = run(["table", str(DEMO_BOOK)], capsys)
    assert code == 0 and err == (
        "demo.xlsx: read 'Hardness'!A1:D9: 4 groups, 30 values (Zone 1 8, Zone 2 8, Zone 3 7, "
        'Zone 4 7); left out 1 cell: C8 text in the data ("retest")\n'
    )
    lines = out.splitlines()
    assert lines[0].startswith("Read 'Hardness'!A1:D9 of demo.xlsx")
    assert lines[0].endswith("30 values in 4 groups (Zone 1 8, Zone 2 8, Zone 3 7, Zone 4 7)")
    assert lines[1] == "  left out 'Hardness'!C8: text in the data (\"retest\")"
    assert any(line.split()[:2] == ["Source", "df"] for line in lines)
    assert any(line.startswith("Residual") for line in lines)
    assert any(line.startswith("Checks (alpha = 0.05); read:") for line in lines)
    assert "engineering judgement" in out


def test_table_text_names_ignored_cells_with_quotes(tmp_path, capsys):
    path = write_csv(tmp_path / "q.csv", [["A", "B"], [1, 2], ["n/a", 3], [1.5, "TRUE"], [2, 4]])
    code, out, err = run(["table", str(path)], capsys)
    assert code == 0, err
    assert '  left out A3: text in the data ("n/a")\n  left out B4: logical value in the data (TRUE)' in out
    assert "'n/a'" not in out
