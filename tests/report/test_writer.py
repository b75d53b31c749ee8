"""The report workbook as a whole, read back with openpyxl (no spreadsheet program needed):
its sheets and names, figures equal to the core's (NIST StRD where certified values exist),
text that stays text, and the safe write (temporary file, rename, nothing overwritten).

The sheets' own contents are checked in tests/report/sheets/, the LibreOffice recalculation in
tests/report/test_libreoffice.py.
"""

from __future__ import annotations

import os
from decimal import Decimal
from pathlib import Path

import openpyxl
import pytest

import sheetfuncs.report.writer as writer_mod
from sheetfuncs import InputError, oneway
from sheetfuncs.input.source import InputSource
from sheetfuncs.report import SHEET_ORDER, write_report
from sheetfuncs.report.formats import P_FORMAT

from tests.support import nist
from tests.support.race import appear_while_writing
from tests.support.scenarios import CLEAR, INFINITE, NAMES, NONE, cells_text, name_cell, write_in

# ---------------------------------------------------------------------------------------------
# structure


def test_sheets_in_order(demo):
    _, _, wb = demo
    assert wb.sheetnames == list(SHEET_ORDER)


def test_defined_names_point_at_the_right_cells(demo):
    g, _, wb = demo
    ow = oneway(g)
    expected = {"ss_between": ow.ss_between, "ss_within": ow.ss_within, "df_between": ow.df_between,
                "df_within": ow.df_within, "f_ratio": ow.f, "p_value": ow.p}
    for name in NAMES:
        assert name in wb.defined_names and "audit_" + name in wb.defined_names
        cell = name_cell(wb, name)
        assert cell.parent.title == "Tables"
        assert cell.value == expected[name]  # the core's number, written unrounded
        twin = name_cell(wb, "audit_" + name)
        assert twin.parent.title == "Audit"
        assert isinstance(twin.value, str) and twin.value.startswith("=")  # a live formula
    # the Audit rows say what they recompute
    labels = {n: name_cell(wb, "audit_" + n).offset(column=-1).value for n in NAMES}
    assert labels == {"ss_between": "SS between", "ss_within": "SS within (residual)",
                      "df_between": "df between", "df_within": "df within", "f_ratio": "F", "p_value": "p"}


def test_p_values_shown_below_floor_and_frozen_headers(demo):
    _, _, wb = demo
    p_cell = name_cell(wb, "p_value")
    assert p_cell.value < 1e-4 and p_cell.number_format == P_FORMAT
    assert wb["Data"].freeze_panes == "A2"
    assert wb["Groups"].freeze_panes == "B5"
    for ws in wb.worksheets:
        assert ws.page_setup.fitToWidth == 1 and ws.sheet_properties.pageSetUpPr.fitToPage
        assert ws.column_dimensions["A"].width > 5


# ---------------------------------------------------------------------------------------------
# numbers equal the core's (NIST StRD)


def test_oneway_on_nist_smls09_equals_certified(tmp_path):
    # NIST StRD SmLs09 (certified values): the written Tables figures.
    ds = nist.load("SmLs09")
    path = write_in(tmp_path, ds.groups)
    wb = openpyxl.load_workbook(path)
    cert = ds.certified
    assert name_cell(wb, "ss_between").value == pytest.approx(cert.ss_between, rel=1e-12)
    assert name_cell(wb, "ss_within").value == pytest.approx(cert.ss_within, rel=1e-12)
    assert name_cell(wb, "f_ratio").value == pytest.approx(cert.f, rel=1e-12)
    assert name_cell(wb, "df_within").value == cert.df_within
    # the centred column holds value - constant as the exact decimal difference
    c = Decimal(str(wb["Audit"]["C5"].value).removeprefix("exactly "))
    for row in wb["Data"].iter_rows(min_row=2, max_row=60, max_col=4, values_only=True):
        assert row[3] == float(Decimal(repr(row[2])) - c)
        assert abs(row[3]) < 1  # 13 constant leading digits removed


# ---------------------------------------------------------------------------------------------
# safety: text is text, nothing lost, nothing overwritten


FORMULA_LIKE = ["=SUM(A1:A3)", "+cmd", "-1+1", "@A1", "=HYPERLINK(\"http://x\")"]


def test_formula_like_labels_read_back_as_text(tmp_path):
    g = {lab: [1.0 + i, 1.5 + i, 1.25 + i] for i, lab in enumerate(FORMULA_LIKE)}
    path = write_in(tmp_path, g, factor="=1+1", response="@resp", unit="-u", title="+title")
    wb = openpyxl.load_workbook(path)
    data_labels = {c.value: c.data_type for (c,) in wb["Data"].iter_rows(min_row=2, min_col=2, max_col=2)}
    assert set(data_labels) == set(FORMULA_LIKE)
    assert set(data_labels.values()) == {"s"}
    groups_col = [wb["Groups"].cell(5 + i, 1) for i in range(len(FORMULA_LIKE))]
    assert [c.value for c in groups_col] == FORMULA_LIKE and {c.data_type for c in groups_col} == {"s"}
    assert wb["Data"]["B1"].value == "=1+1" and wb["Data"]["B1"].data_type == "s"
    assert wb["Findings"]["A1"].value == "+title" and wb["Findings"]["A1"].data_type == "s"
    for ws in wb.worksheets:
        if ws.title == "Audit":
            continue
        for row in ws.iter_rows():
            for c in row:
                assert c.data_type != "f", f"{ws.title}!{c.coordinate} became a formula: {c.value!r}"


def test_control_characters_everywhere_still_give_a_readable_workbook(tmp_path):
    # labels, factor, response and title end up in cells, chart titles and series names
    g = {"Head 1\x01": [1.0, 1.2, 1.1], "Head\x022": [1.5, 1.4, 1.6]}
    path = write_in(tmp_path, g, factor="\x03Head", response="fill\x04", title="t\x05")
    wb = openpyxl.load_workbook(path)  # would fail on invalid XML
    assert wb["Groups"]["A5"].value == "Head 1\u2401"
    assert len(wb["Chart"]._charts) == 2


def test_existing_output_kept_unless_force(tmp_path):
    path = write_in(tmp_path, CLEAR)
    before = path.read_bytes()
    with pytest.raises(InputError, match="already exists and is kept; use --force"):
        write_report(NONE, path)
    assert path.read_bytes() == before
    write_report(NONE, path, force=True)
    assert path.read_bytes() != before
    assert "Lot 1" in cells_text(openpyxl.load_workbook(path)["Groups"])


def test_input_never_overwritten(tmp_path):
    inp = tmp_path / "input.xlsx"
    inp.write_bytes(b"the input workbook")
    for target in (inp, tmp_path / "sub" / ".." / "input.xlsx"):
        (tmp_path / "sub").mkdir(exist_ok=True)
        with pytest.raises(InputError, match="is the input file; the input is never overwritten"):
            write_report(CLEAR, target, force=True, source=InputSource(path=str(inp)))
    assert inp.read_bytes() == b"the input workbook"


def test_temp_file_then_rename_and_nothing_left_on_error(tmp_path, monkeypatch):
    moves = []
    real_link = os.link

    def spy(src, dst):  # a new report is put in place by a hard link (kept if dst exists)
        moves.append((Path(src), Path(dst)))
        return real_link(src, dst)

    monkeypatch.setattr(writer_mod.os, "link", spy)
    path = write_in(tmp_path, CLEAR)
    (src, dst), = moves
    assert dst == path and src.parent == path.parent and src != path and not src.exists()
    before = path.read_bytes()

    def broken(*args, **kw):
        raise RuntimeError("simulated failure while building the workbook")

    monkeypatch.setattr(writer_mod, "build_workbook", broken)
    with pytest.raises(RuntimeError):
        write_report(NONE, path, force=True)
    assert path.read_bytes() == before  # the old report is untouched
    with pytest.raises(RuntimeError):
        write_report(NONE, tmp_path / "new.xlsx")
    assert sorted(p.name for p in tmp_path.iterdir()) == ["r.xlsx"]  # no partial or temp file


def test_write_failure_is_a_clear_message(tmp_path, monkeypatch):
    real_save = writer_mod.Workbook.save

    def full_disk(self, filename):
        real_save(self, filename)  # the file is written, then the disk "fills up"
        raise OSError(28, "No space left on device")

    monkeypatch.setattr(writer_mod.Workbook, "save", full_disk)
    with pytest.raises(InputError, match="could not write .*No space left on device"):
        write_report(CLEAR, tmp_path / "r.xlsx")
    assert list(tmp_path.iterdir()) == []


@pytest.mark.parametrize(
    "kw, message",
    [
        (dict(alpha=1.5), "alpha must lie strictly between 0 and 1"),
        (dict(method="fastest"), "unknown comparison method"),
        (dict(control="Line Z"), 'the control "Line Z" is not one of the groups'),
        (dict(factor=3), "the factor name must be text"),
    ],
)
def test_bad_options_write_nothing(tmp_path, kw, message):
    with pytest.raises(InputError, match=message):
        write_report(CLEAR, tmp_path / "r.xlsx", **kw)
    assert list(tmp_path.iterdir()) == []


@pytest.mark.parametrize(
    "name, message",
    [("r.xls", "ending in .xlsx"), ("missing/r.xlsx", "does not exist; create it first")],
)
def test_bad_output_paths(tmp_path, name, message):
    with pytest.raises(InputError, match=message):
        write_report(CLEAR, tmp_path / name)


@pytest.mark.parametrize("source", ["zones.xlsx", {"path": "zones.xlsx"}])
def test_a_source_that_is_not_an_input_source_is_refused(tmp_path, source):
    with pytest.raises(InputError, match=r"^sheetfuncs: the source must be a sheetfuncs\.input\.InputSource or None, not (str|dict);"):
        write_report(CLEAR, tmp_path / "r.xlsx", source=source)
    assert list(tmp_path.iterdir()) == []


def test_impossible_analysis_writes_nothing(tmp_path):
    with pytest.raises(InputError, match="all values are identical"):
        write_report({"a": [1.0, 1.0], "b": [1.0, 1.0]}, tmp_path / "r.xlsx")
    assert list(tmp_path.iterdir()) == []


# ---------------------------------------------------------------------------------------------
# infinite and undefined values


def test_infinite_and_undefined_are_words_with_notes(tmp_path):
    # no variation within groups: F = +inf, p = 0 (GUIDE: shown as text in a cell)
    path = write_in(tmp_path, INFINITE)
    wb = openpyxl.load_workbook(path)
    f_cell = name_cell(wb, "f_ratio")
    assert f_cell.value == "infinite" and f_cell.comment is not None
    assert name_cell(wb, "p_value").value == 0
    sd = wb["Groups"]["D7"]  # group "c" has one value: no SD
    assert sd.value == "undefined" and sd.comment is not None
    text = cells_text(wb["Findings"])
    assert "not available" in text  # Welch needs within-group variation


# ---------------------------------------------------------------------------------------------
# progress and folders


def test_progress_is_reported(tmp_path):
    seen = []
    write_report(CLEAR, tmp_path / "r.xlsx", progress=lambda *a: seen.append(a))
    stages = [s for s, _, _ in seen]
    assert stages[0] == "analysis" and "data" in stages and stages[-1] == "saving"
    assert ("data", 18, 18) in seen


def test_a_folder_that_refuses_new_files_gets_a_clear_message(tmp_path, monkeypatch):
    # e.g. a read-only share, or /proc on Linux (which answers "No such file or directory")
    def refuse(*args, **kwargs):
        raise PermissionError(13, "Permission denied")

    monkeypatch.setattr(writer_mod.tempfile, "mkstemp", refuse)
    target = tmp_path / "report.xlsx"
    with pytest.raises(InputError) as e:
        write_report({"A": [1.0, 2.0, 3.0], "B": [2.0, 3.0, 4.5]}, target)
    assert str(e.value) == (
        f"sheetfuncs: cannot create a file in the folder {str(tmp_path)!r} (the system says: "
        "Permission denied); choose a folder you can write to"
    )
    assert list(tmp_path.iterdir()) == []


# --------------------------------------------------------------------------------------------
# a file that appears at the output path while the report is written


def _appearing(monkeypatch, path: Path) -> None:
    appear_while_writing(monkeypatch, path, b"written by someone else meanwhile")


def test_file_that_appears_during_a_run_is_kept(tmp_path, monkeypatch):
    path = tmp_path / "r.xlsx"
    _appearing(monkeypatch, path)
    with pytest.raises(InputError) as ei:
        write_report(CLEAR, path)
    assert str(ei.value) == (
        f"sheetfuncs: {str(path)!r} appeared while the report was being written and is kept; "
        "use --force (force=True) to replace it, or choose another name"
    )
    assert path.read_bytes() == b"written by someone else meanwhile"
    assert [p.name for p in tmp_path.iterdir()] == ["r.xlsx"]  # no temp file left


def test_file_that_appears_during_a_run_is_replaced_with_force(tmp_path, monkeypatch):
    path = tmp_path / "r.xlsx"
    _appearing(monkeypatch, path)
    assert write_report(CLEAR, path, force=True) == path
    assert openpyxl.load_workbook(path).sheetnames[0] == "Findings"
    assert [p.name for p in tmp_path.iterdir()] == ["r.xlsx"]


def test_without_hard_links_the_name_is_reserved_exclusively(tmp_path, monkeypatch):
    def no_links(src, dst):
        raise PermissionError(1, "Operation not permitted")  # as on a file system without links

    monkeypatch.setattr(writer_mod.os, "link", no_links)
    path = write_in(tmp_path, CLEAR)
    assert openpyxl.load_workbook(path).sheetnames[0] == "Findings"
    other = tmp_path / "other.xlsx"
    _appearing(monkeypatch, other)
    with pytest.raises(InputError, match="appeared while the report was being written and is kept"):
        write_report(CLEAR, other)
    assert other.read_bytes() == b"written by someone else meanwhile"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["other.xlsx", "r.xlsx"]


# --------------------------------------------------------------------------------------------
# the limit on groups


def test_more_groups_than_the_limit_is_one_line(tmp_path):
    groups = {f"Lot {i}": [5.0 + i / 100, 5.1 + i / 100] for i in range(1, 102)}  # invented
    with pytest.raises(InputError) as ei:
        write_report(groups, tmp_path / "r.xlsx")
    assert str(ei.value) == (
        "sheetfuncs: the data have 101 groups, more than the 100 a report takes (its "
        "comparisons grow with the square of the number of groups); give --max-groups 101 "
        "(Python: max_groups=101) to write it anyway, or use sheetfuncs table"
    )
    assert list(tmp_path.iterdir()) == []
    small = {k: groups[k] for k in list(groups)[:4]}
    with pytest.raises(InputError, match="the data have 4 groups, more than the 3 a report"):
        write_report(small, tmp_path / "r.xlsx", max_groups=3)
    for bad in (0, 2.5, True, "10"):
        with pytest.raises(InputError) as ei:
            write_report(small, tmp_path / "r.xlsx", max_groups=bad)
        assert ei.value.reason == (
            f"the limit on groups must be a whole number of at least 1, not {bad!r}")
    assert write_report(small, tmp_path / "r.xlsx", max_groups=4).exists()
