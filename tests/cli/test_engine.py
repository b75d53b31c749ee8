"""``report`` and ``table`` on inputs read by column: Parquet, CSV and a DuckDB database query.

The numbers are compared with the same command on the same values read as a sheet (the
in-memory sheetfuncs call): the exact path gives the same figures to the last printed digit.
"""

from __future__ import annotations

import hashlib

import duckdb
import openpyxl
import pytest

from tests.support.cli import defined_value, run, strict_json
from tests.support.engines import frame, parquet_file

# invented fill weights (g) of three filling heads, one NULL label and a NaN value
HEADS = {"H1": [500.12, 500.31, 499.98, 500.07, 500.22],
         "H2": [500.41, 500.52, 500.38, 500.60],
         "H3": [499.91, 500.02, 499.87, 499.95, 500.04, 499.99]}


@pytest.fixture()
def files(tmp_path):
    pq = parquet_file(tmp_path / "fills.parquet", HEADS)
    wide = tmp_path / "fills-wide.csv"
    rows = max(len(v) for v in HEADS.values())
    lines = [",".join(HEADS)] + [",".join(str(v[i]) if i < len(v) else "" for v in HEADS.values())
                                 for i in range(rows)]
    wide.write_text("\n".join(lines) + "\n")
    long_csv = tmp_path / "fills.csv"
    frame(HEADS).to_csv(long_csv, index=False)
    db = tmp_path / "lab.db"
    con = duckdb.connect(str(db))
    df = frame(HEADS)  # noqa: F841 (read by DuckDB's replacement scan)
    con.execute("CREATE TABLE fills AS SELECT g AS head, x AS weight, 'L1' AS line FROM df")
    con.execute("INSERT INTO fills VALUES (NULL, 500.0, 'L1'), ('H1', 'NaN'::DOUBLE, 'L2')")
    con.close()
    return tmp_path, pq, wide, long_csv, db


def test_table_from_parquet_equals_the_sheet_reading(files, capsys):
    _, pq, wide, _, _ = files
    code, out, err = run(["table", str(pq), "--group", "g", "--value", "x", "--json"], capsys)
    assert code == 0, err
    doc = strict_json(out)
    code, out2, _ = run(["table", str(wide), "--json"], capsys)
    ref = strict_json(out2)
    for key in ("ss_between", "ss_within", "f", "p", "df_within"):
        assert doc["oneway"][key] == ref["oneway"][key], key  # the in-memory sheetfuncs call
    assert doc["oneway"]["exact"] is True
    assert doc["input"]["engine"] == "DuckDB" and doc["input"]["rows_read"] == 15
    sums = doc["input"]["exact_sums"]
    assert len(sums["sum"]) == 3 and all(isinstance(s, str) for s in sums["sum_of_squares"])
    assert doc["groups"] == ref["groups"]
    for key in ("pairwise", "letters", "effect_sizes", "unequal_variance_pairs"):
        assert doc[key] == ref[key], key  # the in-memory sheetfuncs call on the same values


def test_table_by_column_json_holds_comparisons(files, capsys):
    # the in-memory sheetfuncs calls: pairwise, letters and effect_sizes on the same values
    import sheetfuncs

    _, pq, _, _, _ = files
    code, out, err = run(["table", str(pq), "--group", "g", "--value", "x", "--json",
                          "--method", "holm"], capsys)
    assert code == 0, err
    assert "Infinity" not in out and "NaN" not in out
    doc = strict_json(out)
    pw = sheetfuncs.pairwise(HEADS, "holm", 0.05)
    assert doc["pairwise"]["method"] == "holm"
    rows = doc["pairwise"]["rows"]
    assert [(r["group_a"], r["group_b"]) for r in rows] == [(r.group_a, r.group_b) for r in pw.rows]
    for got, want in zip(rows, pw.rows):
        assert got["difference"] == pytest.approx(want.difference, rel=1e-12, abs=1e-12)
        assert got["p"] == pytest.approx(want.p, rel=1e-9)
        assert (got["ci_low"], got["ci_high"]) == pytest.approx(tuple(want.ci), rel=1e-12)
        assert got["differs"] is want.differs
    let = sheetfuncs.letters(HEADS, "holm", 0.05)
    assert [g["letters"] for g in doc["letters"]["groups"]] == list(let.letters)
    eff = sheetfuncs.effect_sizes(HEADS, 0.95)
    assert doc["effect_sizes"]["eta_squared"] == pytest.approx(eff.eta_squared, rel=1e-12)
    assert doc["effect_sizes"]["cohens_f_ci"]["low"] == pytest.approx(eff.cohens_f_ci.low, rel=1e-9)
    code, out, _ = run(["table", str(pq), "--group", "g", "--value", "x"], capsys)
    assert code == 0 and "Letters" not in out  # the text output keeps to its three tables


def test_table_from_a_duckdb_query_counts_what_it_leaves_out(files, capsys):
    _, _, _, _, db = files
    code, out, err = run(["table", "--duckdb", str(db), "--query", "SELECT * FROM fills",
                          "--group", "head", "--value", "weight", "--missing", "drop"], capsys)
    assert code == 0, err
    assert "Read lab.db by column with DuckDB" in out and "17 rows" in out
    assert "1 row with no group label (NULL) left out" in out
    assert '1 missing value (NULL or NaN) dropped: "H1" 1' in out
    code, out, err = run(["table", "--duckdb", str(db), "--query", "fills", "--group", "head",
                          "--value", "weight", "--where", "line = 'L1'"], capsys)
    assert code == 0, err
    assert "16 rows with line = 'L1', 15 values in 3 groups" in out


def test_a_nan_stops_without_missing_drop(files, capsys):
    _, _, _, _, db = files
    code, _, err = run(["table", "--duckdb", str(db), "--query", "fills", "--group", "head",
                        "--value", "weight"], capsys)
    assert code == 1 and len(err.splitlines()) == 1
    assert '1 missing value (NULL or NaN) in column "weight", the first in group "H1"' in err
    assert "(on the command line: --missing drop)" in err


def test_report_from_parquet_holds_the_sums(files, capsys):
    tmp, pq, wide, _, _ = files
    out = tmp / "r.xlsx"
    code, stdout, err = run(["report", str(pq), "--group", "g", "--value", "x", "-o", str(out),
                             "--factor", "Filling head"], capsys)
    assert code == 0, err
    assert f"wrote {out}" in stdout
    wb = openpyxl.load_workbook(out)
    assert "Sums" in wb.sheetnames and "Data" not in wb.sheetnames
    ref_out = tmp / "ref.xlsx"
    assert run(["report", str(wide), "-o", str(ref_out)], capsys)[0] == 0
    ref = openpyxl.load_workbook(ref_out)
    for name in ("ss_between", "ss_within", "f_ratio", "p_value"):
        assert defined_value(wb, name) == defined_value(ref, name), name


def test_report_from_a_long_csv_by_column(files, capsys):
    tmp, _, _, long_csv, _ = files
    code, _, err = run(["report", str(long_csv), "--group", "g", "--value", "x", "--out-dir",
                        str(tmp / "out")], capsys)
    assert code == 0, err
    assert (tmp / "out" / "fills-report.xlsx").is_file()


@pytest.mark.parametrize("argv, fragment", [
    (["table", "{pq}"], "fills.parquet is read by column: give both --group COL and --value COL"),
    (["table", "{pq}", "--group", "g", "--value", "x", "--sheet", "S"], "--sheet applies to cells"),
    (["table", "--query", "fills", "--group", "g", "--value", "x", "{pq}"], "--query goes with --duckdb"),
    (["table", "--duckdb", "{db}", "--group", "g", "--value", "x"], "--duckdb needs --query"),
    (["table", "--duckdb", "{db}", "--query", "fills", "--group", "g", "--value", "x", "{pq}"],
     "--duckdb names the input"),
    (["table", "{wide}", "--missing", "drop"], "--missing applies to an input read by column"),
    (["table"], "give an input file"),
    (["report", "-o", "r.xlsx"], "give an input file"),
    (["table", "{tmp}/x.xlsx", "--group", "g", "--value", "x"], "cannot be read by column"),
])
def test_usage_errors_are_two_lines(files, capsys, argv, fragment):
    tmp, pq, wide, _, db = files
    args = [a.format(pq=pq, db=db, wide=wide, tmp=tmp) for a in argv]
    code, _, err = run(args, capsys)
    lines = err.splitlines()
    assert code == 2 and len(lines) == 2 and fragment in lines[1], err


@pytest.mark.parametrize("argv, fragment", [
    (["--group", "head", "--value", "nope"], 'no column "nope"'),
    (["--group", "head", "--value", "line"], "holds VARCHAR, not numbers"),
    (["--group", "head", "--value", "weight", "--where", "line = "], "rejected the query"),
    (["--group", "head", "--value", "weight", "--where", "head = 'H1' AND line = 'L1'"],
     "at least two groups"),
])
def test_input_problems_are_one_line(files, capsys, argv, fragment):
    _, _, _, _, db = files
    code, _, err = run(["table", "--duckdb", str(db), "--query", "fills", *argv], capsys)
    assert code == 1 and len(err.splitlines()) == 1 and fragment in err, err


def test_a_missing_database_file_is_one_line(tmp_path, capsys):
    code, _, err = run(["table", "--duckdb", str(tmp_path / "none.db"), "--query", "t",
                        "--group", "g", "--value", "x"], capsys)
    assert code == 1 and "no database file" in err and len(err.splitlines()) == 1


def test_report_from_parquet_names_the_file_and_its_sha256(files, capsys):
    tmp, pq, _, _, _ = files
    out = tmp / "r.xlsx"
    argv = ["report", str(pq), "--group", "g", "--value", "x", "-o", str(out), "--paper", "letter"]
    code, _, err = run(argv, capsys)
    assert code == 0, err
    wb = openpyxl.load_workbook(out)
    about = {r[0]: r[1] for r in wb["About"].iter_rows(values_only=True) if r[0]}
    assert about["Input file (absolute path)"] == str(pq.resolve())
    assert about["Input file SHA-256"] == hashlib.sha256(pq.read_bytes()).hexdigest()  # hashlib (reference library)
    assert about["Data fingerprint (SHA-256)"] != about["Input file SHA-256"]  # the origin and sums as well
    assert all(ws.page_setup.paperSize == 1 for ws in wb.worksheets)  # letter (ECMA-376 code)
