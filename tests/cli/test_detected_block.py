"""The command line on messy QA sheets (invented data, tests/support/qa_sheets.py): the block
found is read, and an ambiguous sheet exits 1 with one line. Values are read back as written
(common practice)."""

from __future__ import annotations

from tests.support.cli import run, strict_json
from tests.support.qa_sheets import stacked, tablets


def test_table_reads_the_messy_workbook(tmp_path, capsys):
    path = tablets(tmp_path)
    code, out, err = run(["table", str(path), "--json"], capsys)
    assert code == 0, err
    data = strict_json(out)
    assert data["input"]["labels"] == ["Head 1", "Head 2", "Head 3", "Head 4"]
    assert data["input"]["range"] == "B3:E15" and data["input"]["n_total"] == 48
    assert data["oneway"]["k"] == 4


def test_an_ambiguous_sheet_exits_1_with_one_line(tmp_path, capsys):
    path = stacked(tmp_path)
    code, out, err = run(["table", str(path)], capsys)
    assert code == 1 and out == ""
    assert err.count("\n") == 1
    assert err.startswith('sheetfuncs: sheet "Hardness" holds two tables of the same shape')
    assert "--range 'Hardness'!A1:C10" in err
