"""Writing templates: every kind into a folder, the same bytes every time, the Calc form, the
one-line messages, and LibreOffice opening each kind headless."""

from __future__ import annotations

import re
import zipfile
from pathlib import Path

import pytest
from openpyxl import load_workbook

from sheetfuncs.errors import InputError
from sheetfuncs.templates import FIXED_TIME, KINDS, template_parts, write_all, write_template
from sheetfuncs.worksheet.calc.workbook import convert_workbook
from sheetfuncs.worksheet import harness
from sheetfuncs.worksheet.calc.check import Example, compare
from sheetfuncs.worksheet.calc.office import run_job
from tests.support.libreoffice import convert_many, require_office
from tests.support.template_cells import argument_value, calls


@pytest.fixture(scope="module")
def folder(tmp_path_factory: pytest.TempPathFactory) -> Path:
    out = tmp_path_factory.mktemp("all") / "templates"
    write_all(out)
    return out


def test_write_all_writes_one_file_per_kind(folder: Path) -> None:
    assert sorted(p.name for p in folder.iterdir()) == sorted(f"{k}.xlsx" for k in KINDS)
    for kind in KINDS:
        wb = load_workbook(folder / f"{kind}.xlsx")
        assert wb.sheetnames == ["Record", "Data"]


def test_two_writes_give_the_same_bytes(folder: Path, tmp_path: Path) -> None:
    again = write_all(tmp_path / "again")
    for w in again:
        assert w.path.read_bytes() == (folder / w.path.name).read_bytes(), w.kind


def test_members_and_properties_carry_the_fixed_date(folder: Path) -> None:
    with zipfile.ZipFile(folder / "compare-groups.xlsx") as z:
        assert {i.date_time for i in z.infolist()} == {FIXED_TIME.timetuple()[:6]}
    wb = load_workbook(folder / "compare-groups.xlsx")
    assert wb.properties.created == FIXED_TIME and wb.properties.modified == FIXED_TIME


def test_a_changed_template_is_told_apart_by_its_parts(folder: Path, tmp_path: Path) -> None:
    """The currency check the stored copies use: compare the uncompressed parts."""
    wb = load_workbook(folder / "study-plan.xlsx")
    wb["Record"]["B2"] = "changed"
    wb.save(tmp_path / "changed.xlsx")
    current = template_parts(folder / "study-plan.xlsx")
    assert template_parts(write_template("study-plan", tmp_path / "plan.xlsx").path) == current
    changed = template_parts(tmp_path / "changed.xlsx")
    assert changed != current
    assert changed["xl/worksheets/sheet1.xml"] != current["xl/worksheets/sheet1.xml"]


def test_calc_form_rewrites_only_the_function_names(folder: Path, tmp_path: Path) -> None:
    w = write_template("compare-groups", tmp_path / "calc.xlsx", host="calc")
    assert w.host == "calc"
    calc, excel = template_parts(w.path), template_parts(folder / "compare-groups.xlsx")
    assert calc.keys() == excel.keys()
    changed = sorted(k for k in calc if calc[k] != excel[k])
    assert changed == ["xl/worksheets/sheet1.xml"]
    text = calc["xl/worksheets/sheet1.xml"].decode()
    assert "SF_CHECKS(" not in text and "ORG.SHEETFUNCS.CALC.FUNCTIONS." in text
    back = tmp_path / "back.xlsx"
    convert_workbook(w.path, back, to="excel")
    assert template_parts(back) == excel


def test_calc_form_is_deterministic_too(tmp_path: Path) -> None:
    a = write_template("lot-homogeneity", tmp_path / "a.xlsx", host="calc").path.read_bytes()
    b = write_template("lot-homogeneity", tmp_path / "b.xlsx", host="calc").path.read_bytes()
    assert a == b


def test_unknown_kind_is_one_line(tmp_path: Path) -> None:
    with pytest.raises(InputError) as e:
        write_template("anova", tmp_path / "x.xlsx")
    assert str(e.value) == (
        "sheetfuncs: there is no template kind 'anova'; choose one of compare-groups, "
        "lot-homogeneity, study-plan, summary-compare")
    assert not (tmp_path / "x.xlsx").exists()


def test_unknown_host_is_one_line(tmp_path: Path) -> None:
    with pytest.raises(InputError) as e:
        write_template("study-plan", tmp_path / "x.xlsx", host="numbers")
    assert str(e.value) == "sheetfuncs: a template is written for excel or calc, not 'numbers'"


def test_other_file_type_is_one_line(tmp_path: Path) -> None:
    with pytest.raises(InputError) as e:
        write_template("study-plan", tmp_path / "x.xls")
    assert str(e.value) == ("sheetfuncs: a template is written as .xlsx; give a name ending "
                            ".xlsx, not x.xls")
    assert list(tmp_path.iterdir()) == []


def test_missing_folder_is_one_line(tmp_path: Path) -> None:
    with pytest.raises(InputError) as e:
        write_template("study-plan", tmp_path / "no" / "x.xlsx")
    assert str(e.value).startswith(f"sheetfuncs: cannot write into {tmp_path / 'no'} (")
    assert str(e.value).endswith("); give a folder you can write to")


def test_folder_that_is_a_file_is_one_line(tmp_path: Path) -> None:
    (tmp_path / "f").write_text("x")
    with pytest.raises(InputError) as e:
        write_all(tmp_path / "f")
    assert str(e.value).startswith(f"sheetfuncs: cannot make the folder {tmp_path / 'f'} (")
    assert (tmp_path / "f").read_text() == "x"


def test_every_kind_opens_in_libreoffice_headless(folder: Path, tmp_path: Path) -> None:
    """``soffice --convert-to`` (xlsx to ods and to pdf): each file opens and prints."""
    require_office()
    srcs = [folder / f"{k}.xlsx" for k in KINDS]
    for fmt in ("ods", "pdf"):
        outs = convert_many(srcs, fmt, tmp_path / fmt)
        for out in outs:
            assert out.stat().st_size > 1000, out
    pdf = (tmp_path / "pdf" / "compare-groups.pdf").read_bytes()
    pages = re.findall(rb"/Type\s*/Page\b(?!s)", pdf)
    assert pdf.startswith(b"%PDF") and len(pages) >= 2  # the record and the data sheet


@pytest.fixture(scope="module")
def calc_read(calc_office, tmp_path_factory: pytest.TempPathFactory) -> dict[str, tuple]:
    """Every kind in its Calc form, opened and recalculated in headless Calc with the
    extension built from this checkout (one LibreOffice start for all kinds)."""
    office, profile = calc_office
    folder = tmp_path_factory.mktemp("calc-form")
    steps, written = [], {}
    for kind in KINDS:
        w = write_template(kind, folder / f"{kind}.xlsx", host="calc")
        excel = write_template(kind, folder / f"{kind}-excel.xlsx")
        written[kind] = (w, load_workbook(excel.path))
        steps += [{"op": "load", "path": str(w.path)}, {"op": "recalc"}]
        steps += [{"op": "read", "sheet": w.record_sheet, "at": a.ref, "key": f"{kind} {a.ref}"}
                  for a in w.arrays]
        steps += [{"op": "read", "sheet": w.record_sheet, "at": d, "key": f"{kind} {d}"}
                  for d in w.decisions]
        steps += [{"op": "close"}]
    read = run_job(office, steps, profile)
    return {kind: (w, wb, read) for kind, (w, wb) in written.items()}


@pytest.mark.parametrize("kind", KINDS)
def test_calc_recalculates_every_area_to_the_python_call(calc_read, kind) -> None:
    """Calc's numbers against the Python call through the harness (equal to 1e-15 relative, as
    the extension's own live tests hold them), with the arguments read from the formula."""
    w, wb, read = calc_read[kind]
    for area in w.arrays:
        (call,) = calls("=" + area.formula)
        expected = harness.call(call.name, *[argument_value(wb, a) for a in call.args])
        ex = Example(call.name, (), "=" + area.formula, expected)
        assert compare(ex, read[f"{kind} {area.ref}"]) == [], area.ref


def python_verdicts(kind: str, wb) -> list[str]:
    """The decisions the Python call (through the harness) gives on the example data, with the
    template's settings (alpha 0.05, ICC limit 0.2, wanted power 0.8)."""
    def value(formula: str):
        (call,) = calls("=" + formula)
        return harness.call(call.name, *[argument_value(wb, a) for a in call.args])
    differ = {True: "means differ", False: "no difference shown"}
    if kind == "compare-groups":
        return [differ[value('SF_CHECKS(Measurements,"wide",TRUE,Alpha)')[1][3] < 0.05]]
    if kind == "lot-homogeneity":
        p = value('SF_P(Lots,"wide",TRUE)')
        upper = value('SF_VARCOMP(Lots,"wide",TRUE,Confidence)')[4][3]
        return ["lots differ" if p < 0.05 else "no difference between lots shown",
                "upper limit of the ICC within the limit" if upper <= 0.2
                else "ICC not shown within the limit"]
    if kind == "study-plan":
        power = value("SF_POWER(GroupCount,PerGroup,EffectF,Alpha)")
        return ["plan reaches the wanted power" if power >= 0.8
                else "plan falls short: see the values needed per group"]
    table = value("SF_FROMSTATS('Data'!$C$9:$C$19,'Data'!$D$9:$D$19,'Data'!$E$9:$E$19,"
                  "'Data'!$B$9:$B$19)")
    return [differ[table[1][5] < 0.05]]


@pytest.mark.parametrize("kind", KINDS)
def test_calc_shows_the_python_verdict_in_every_decision_cell(calc_read, kind) -> None:
    w, wb, read = calc_read[kind]
    shown = [read[f"{kind} {d}"]["values"][0][0] for d in w.decisions]
    assert shown == python_verdicts(kind, wb)
