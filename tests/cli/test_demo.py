"""Tests of ``sheetfuncs demo`` (sheetfuncs.cli.demo): the report of the built-in invented data,
and which existing files it may replace without --force."""

from __future__ import annotations

import math
import zipfile
from pathlib import Path

import openpyxl

from sheetfuncs import oneway
from sheetfuncs.cli import DEFAULT_DEMO_OUTPUT, main
from sheetfuncs.cli.demo import replaceable_demo
from tests.support.cli import defined_value, run, small_csv


def test_demo_default_output_replaced_on_rerun(tmp_path, capsys, monkeypatch):
    monkeypatch.chdir(tmp_path)
    target = tmp_path / DEFAULT_DEMO_OUTPUT
    target.write_bytes(b"stale")
    code, out, err = run(["demo"], capsys)
    assert code == 0, err
    assert out.startswith(f"wrote {target.resolve()}")
    assert zipfile.is_zipfile(target)
    wb = openpyxl.load_workbook(target)
    assert "Findings" in wb.sheetnames and "Audit" in wb.sheetnames
    from sheetfuncs.input import demo_groups

    # the report carries the core's F ratio to the last bit (reference: sheetfuncs.oneway)
    assert math.isclose(defined_value(wb, "f_ratio"), oneway(demo_groups()).f, rel_tol=1e-15)
    code, out, err = run(["demo", "-o", "demo.xlsx"], capsys)
    assert code == 0 and (tmp_path / "demo.xlsx").exists()
    code, out, err = run(["demo", "-o", "demo.xlsx"], capsys)  # a rerun replaces it
    assert code == 0 and err == ""


def _plain_book(path: Path) -> Path:
    wb = openpyxl.Workbook()
    wb.active.append(["Supplier audit", 3])
    wb.save(path)
    return path


def test_demo_keeps_an_unrelated_workbook_unless_forced(tmp_path, capsys, monkeypatch):
    monkeypatch.chdir(tmp_path)
    other = _plain_book(tmp_path / "audit.xlsx")
    before = other.read_bytes()
    code, out, err = run(["demo", "-o", "audit.xlsx"], capsys)
    assert code == 1 and out == ""
    (line,) = err.splitlines()
    assert line == ("sheetfuncs: audit.xlsx already exists and is not a sheetfuncs demo report, "
                    "so it is kept; choose another name with -o, or add --force to replace it")
    assert other.read_bytes() == before
    code, out, err = run(["demo", "-o", "audit.xlsx", "--force"], capsys)
    assert code == 0 and err == ""
    assert "Findings" in openpyxl.load_workbook(other).sheetnames


def test_demo_keeps_text_and_other_reports_but_replaces_its_own(tmp_path, capsys, monkeypatch):
    monkeypatch.chdir(tmp_path)
    fake = tmp_path / "notes.xlsx"
    fake.write_text("Lot,Value\nA,1\n", encoding="utf-8")  # a CSV with a workbook's name
    code, _, err = run(["demo", "-o", "notes.xlsx"], capsys)
    assert code == 1 and "is not a sheetfuncs demo report" in err and err.count("\n") == 1
    assert fake.read_text(encoding="utf-8") == "Lot,Value\nA,1\n"
    # a sheetfuncs report of other data is not the demo's to replace
    src = small_csv(tmp_path)
    assert main(["report", str(src), "-o", "lots-report.xlsx"]) == 0
    before = (tmp_path / "lots-report.xlsx").read_bytes()
    capsys.readouterr()
    code, _, err = run(["demo", "-o", "lots-report.xlsx"], capsys)
    assert code == 1 and "is not a sheetfuncs demo report" in err
    assert (tmp_path / "lots-report.xlsx").read_bytes() == before
    # an earlier demo report under any name is replaced without --force
    assert main(["demo", "-o", "mine.xlsx"]) == 0
    (tmp_path / "mine.xlsx").write_bytes((tmp_path / "mine.xlsx").read_bytes())
    capsys.readouterr()
    code, _, err = run(["demo", "-o", "mine.xlsx"], capsys)
    assert code == 0 and err == ""
    # the default name is the demo's own, whatever it holds
    (tmp_path / DEFAULT_DEMO_OUTPUT).write_bytes(b"stale")
    assert main(["demo"]) == 0 and zipfile.is_zipfile(tmp_path / DEFAULT_DEMO_OUTPUT)


def test_replaceable_demo_refuses_folders_and_links(tmp_path, capsys):
    (tmp_path / "folder.xlsx").mkdir()
    assert replaceable_demo(tmp_path / "folder.xlsx") is False
    assert main(["demo", "-o", str(tmp_path / "mine.xlsx")]) == 0
    capsys.readouterr()
    assert replaceable_demo(tmp_path / "mine.xlsx") is True
    link = tmp_path / "link.xlsx"
    link.symlink_to(tmp_path / "mine.xlsx")
    assert replaceable_demo(link) is False  # a link is never followed to replace its target
    assert replaceable_demo(tmp_path / "folder" / DEFAULT_DEMO_OUTPUT) is True  # by its name


def test_demo_help_says_what_it_replaces(capsys):
    assert main(["demo", "--help"]) == 0
    text = " ".join(capsys.readouterr().out.split())
    assert "--force" in text and "not a sheetfuncs demo report" in text
    assert DEFAULT_DEMO_OUTPUT in text and "earlier demo report" in text


def test_demo_on_letter_paper_has_the_identifier_in_every_header(tmp_path, capsys):
    out = tmp_path / "d.xlsx"
    code, _, err = run(["demo", "-o", str(out), "--paper", "letter"], capsys)
    assert code == 0, err
    wb = openpyxl.load_workbook(out)
    about = {r[0]: r[1] for r in wb["About"].iter_rows(values_only=True) if r[0]}
    assert about["Sheet"] == "Hardness"  # the sheet the Data sheet's addresses name
    for ws in wb.worksheets:
        assert ws.page_setup.paperSize == 1, ws.title  # letter (ECMA-376 code)
        assert ws.oddHeader.right.text == f"Report {about['Report identifier']}", ws.title
