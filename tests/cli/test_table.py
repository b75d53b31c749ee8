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


# invented hardness readings of four gasket lots; lot D is more spread out than the others
LOTS = {
    "Lot A": [61.2, 61.9, 60.8, 61.5, 61.1],
    "Lot B": [62.4, 62.0, 62.9, 62.2, 62.6],
    "Lot C": [61.4, 61.0, 61.8, 61.3],
    "Lot D": [63.9, 60.2, 65.1, 61.7, 64.4, 62.8],
}


def _lots_csv(tmp_path):
    rows = [list(LOTS)]
    longest = max(len(v) for v in LOTS.values())
    rows += [[v[i] if i < len(v) else "" for v in LOTS.values()] for i in range(longest)]
    return write_csv(tmp_path / "lots.csv", rows)


def _pair_records(res):
    return [
        {"group_a": r.group_a, "group_b": r.group_b, "difference": r.difference, "se": r.se,
         "ci_low": r.ci.low, "ci_high": r.ci.high, "statistic": r.statistic, "p": r.p,
         "differs": r.differs, "df": df}
        for r, df in zip(res.rows, res.row_df)
    ]


@pytest.mark.parametrize("method", [None, "bonferroni", "games-howell", "scheffe"])
def test_table_json_holds_the_comparisons_letters_and_effect_sizes(tmp_path, capsys, method):
    # the in-memory sheetfuncs calls (pairwise, letters, effect_sizes) on the same values
    import sheetfuncs

    path = _lots_csv(tmp_path)
    code, out, err = run(["table", str(path), "--json", *(["--method", method] if method else [])], capsys)
    assert code == 0, err
    doc = strict_json(out)
    m = method or "tukey"
    pw = sheetfuncs.pairwise(LOTS, m, 0.05)
    assert doc["pairwise"]["available"] is True
    assert doc["pairwise"]["method"] == m and doc["pairwise"]["method_name"] == pw.method_name
    assert doc["pairwise"]["interval"] == pw.interval and doc["pairwise"]["statistic_name"] == pw.statistic_name
    assert doc["pairwise"]["rows"] == _pair_records(pw)
    assert [(r["group_a"], r["group_b"]) for r in doc["pairwise"]["rows"]] == [
        ("Lot A", "Lot B"), ("Lot A", "Lot C"), ("Lot A", "Lot D"), ("Lot B", "Lot C"),
        ("Lot B", "Lot D"), ("Lot C", "Lot D")]
    let = sheetfuncs.letters(LOTS, m, 0.05)
    assert doc["letters"]["groups"] == [
        {"group": g, "mean": mean, "letters": x} for g, mean, x in zip(let.labels, let.means, let.letters)]
    eff = sheetfuncs.effect_sizes(LOTS, 0.95)
    es = doc["effect_sizes"]
    assert (es["eta_squared"], es["omega_squared"], es["epsilon_squared"], es["cohens_f"]) == (
        eff.eta_squared, eff.omega_squared, eff.epsilon_squared, eff.cohens_f)
    assert es["eta_squared_ci"] == {"low": eff.eta_squared_ci.low, "high": eff.eta_squared_ci.high}
    assert es["cohens_f_ci"] == {"low": eff.cohens_f_ci.low, "high": eff.cohens_f_ci.high}
    assert es["conf"] == 0.95


def test_table_json_adds_games_howell_when_spreads_differ(tmp_path, capsys):
    # the in-memory sheetfuncs calls: analyse's checks and pairwise(..., "games-howell")
    import sheetfuncs

    path = _lots_csv(tmp_path)
    code, out, err = run(["table", str(path), "--json"], capsys)
    doc = strict_json(out)
    assert code == 0, err
    assert sheetfuncs.checks(LOTS).variances_unequal is True  # lot D's SD is 5.5 times lot C's
    assert doc["checks"]["variances_unequal"] is True
    gh = sheetfuncs.pairwise(LOTS, "games-howell", 0.05)
    assert doc["unequal_variance_pairs"]["rows"] == _pair_records(gh)
    assert doc["unequal_variance_pairs"]["method"] == "games-howell"
    code, out, err = run(["table", str(path), "--json", "--method", "games-howell"], capsys)
    assert strict_json(out)["unequal_variance_pairs"] is None  # the chosen method already allows for it


def test_table_text_and_csv_keep_to_their_three_tables(tmp_path, capsys):
    path = _lots_csv(tmp_path)
    code, out, err = run(["table", str(path)], capsys)
    assert code == 0 and "Lot A  Lot B" not in out and "Letters" not in out and "Eta squared" not in out
    code, out, err = run(["table", str(path), "--csv"], capsys)
    assert code == 0 and len(out.strip("\n").split("\n\n")) == 4 and "Letters" not in out


def test_table_method_problems(tmp_path, capsys):
    path = _lots_csv(tmp_path)
    code, out, err = run(["table", str(path), "--method", "holm"], capsys)
    assert code == 2 and out == ""
    assert err.splitlines()[1] == (
        "sheetfuncs: table: --method chooses the pairwise comparisons, which only --json prints; "
        "add --json, or leave --method out (see: sheetfuncs table --help)")
    code, out, err = run(["table", str(path), "--json", "--method", "fastest"], capsys)
    assert code == 1 and out == "" and err.count("\n") == 1
    assert err.startswith('sheetfuncs: unknown comparison method "fastest"; use one of "tukey"')


def test_table_json_comparisons_stay_strict_json_when_f_is_infinite(tmp_path, capsys):
    # zero within-group variation and different means: F = +inf (project guide); no NaN/Infinity tokens
    path = write_csv(tmp_path / "flat.csv", [["A", "B", "C"], [1, 2, 4], [1, 2, 4], [1, 2, 4]])
    code, out, err = run(["table", str(path), "--json"], capsys)
    assert code == 0, err
    assert "Infinity" not in out and "NaN" not in out
    doc = strict_json(out)
    for key in ("pairwise", "letters", "effect_sizes"):
        rec = doc[key]
        assert isinstance(rec["available"], bool)
        if not rec["available"]:
            assert rec["reason"] and rec["what"]
    assert [r["statistic"] for r in doc["pairwise"]["rows"]] == ["inf", "inf", "inf"]
    assert [r["se"] for r in doc["pairwise"]["rows"]] == [0.0, 0.0, 0.0]
    assert doc["effect_sizes"]["cohens_f"] == "inf"
    assert doc["effect_sizes"]["cohens_f_ci"] == {"low": "inf", "high": "inf"}
