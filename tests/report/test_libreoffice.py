"""The report in a real spreadsheet program: LibreOffice recalculates the Audit sheet.

``soffice --headless --convert-to xlsx`` opens each report, computes every formula and saves the
results; openpyxl (``data_only=True``) reads them back. The Audit figures (the host's own COUNT,
SUMIF, SUMPRODUCT, DEVSQ and F.DIST.RT over the Data sheets) must equal the Python values to
1e-9 relative (p-values: 1e-9 relative or 1e-12 absolute, whichever is looser; a figure that is
exactly 0 in Python, such as SS between for equal group means, is compared at the scale of the
analysis, as the Audit sheet's own check does), on the built-in demo, on NIST StRD SmLs09 (13
constant leading digits; certified values from NIST), on every Findings scenario of
tests/report/test_findings.py, on an infinite-F report and on an equal-means report. All reports are
recalculated in ONE LibreOffice call (it accepts many files), and the demo and the
unequal-spreads scenario are rendered to PDF and PNG in a second one, to keep the run short.
"""

from __future__ import annotations

import math
import re
import subprocess

import openpyxl
import pytest

from tests.support import libreoffice as lo
from tests.support import nist
from sheetfuncs import as_groups, oneway
from sheetfuncs.input.demo import DEMO_FACTOR, DEMO_RESPONSE, DEMO_TITLE, DEMO_UNIT, demo_groups
from sheetfuncs.engines import analyse_sql
from sheetfuncs.report import write_report, write_sums_report
from tests.support.engines import parquet_file
from tests.support.scenarios import CLEAR, EQUAL_MEANS, INFINITE, NAMES, NONE, OVENS, UNEQUAL, name_cell

# invented: formula-like labels and two labels that differ only in case
SPLIT = {"=SUM(A1)": [10.2, 10.4, 10.1, 10.3], "+1": [10.8, 10.9, 10.7, 11.0],
         "-x": [10.0, 10.2, 10.1, 9.9], "@y": [10.5, 10.3, 10.6, 10.4],
         "lot a": [10.1, 10.0, 10.3], "lot A": [10.6, 10.4, 10.5]}

#: Reports of the same data analysed inside DuckDB from a Parquet file (the sums, not the rows).
SUMS_CASES = ("sums-smls09", "sums-unequal", "sums-equal")


def _value(wb, name):
    return name_cell(wb, name).value


def _expected(res):
    return {"ss_between": res.ss_between, "ss_within": res.ss_within, "df_between": res.df_between,
            "df_within": res.df_within, "f_ratio": res.f, "p_value": res.p}


def _agrees(got, want, name, res):
    """The Audit sheet's own rule: 1e-9 relative, with an absolute floor at the scale of the
    analysis for figures near 0 (SS total for sums of squares, 1e-9 for F, 1e-12 for p)."""
    if isinstance(want, float) and math.isinf(want):
        assert got == "infinite", f"{name}: LibreOffice {got!r}, Python {want!r}"
        return
    assert isinstance(got, (int, float)) and not isinstance(got, bool), f"{name}: {got!r}"
    floor = {"ss_between": 1e-9 * res.ss_total, "ss_within": 1e-9 * res.ss_total,
             "f_ratio": 1e-9, "p_value": 1e-12}.get(name, 0.0)
    tol = max(1e-9 * abs(want), floor)
    assert abs(got - want) <= tol, f"{name}: LibreOffice {got!r}, Python {want!r}"


def _checks(wb):
    return [c.value for (c,) in wb["Audit"].iter_rows(min_col=5, max_col=5) if c.value in ("agrees", "differs")]


def _errors(wb):
    return [(ws.title, c.coordinate, c.value) for ws in wb.worksheets for row in ws.iter_rows()
            for c in row if isinstance(c.value, str) and c.value.startswith("#")]


@pytest.fixture(scope="module")
def batch(tmp_path_factory):
    """Every report of this module, recalculated by LibreOffice in one call."""
    lo.require_office()
    tmp = tmp_path_factory.mktemp("lo-batch")
    ds = nist.load("SmLs09")
    cases = {
        "demo": (demo_groups(), dict(factor=DEMO_FACTOR, response=DEMO_RESPONSE, unit=DEMO_UNIT,
                                     title=DEMO_TITLE, control="Zone 1")),
        "smls09": (as_groups(ds.groups), dict(factor="Treatment", response="Value")),
        "split": (as_groups(SPLIT), dict(_row_limit=6)),  # Data over five sheets
        "clear": (as_groups(CLEAR), dict(factor="Filling line", response="fill weight", unit="g")),
        "none": (as_groups(NONE), dict(factor="Lot", response="assay")),
        "unequal": (as_groups(UNEQUAL), dict(factor="Supplier", response="bore diameter", unit="mm")),
        "ovens": (as_groups(OVENS), dict(factor="Oven", response="cure time")),
        "infinite": (as_groups(INFINITE), {}),
        "equal": (as_groups(EQUAL_MEANS), dict(factor="Filling head", response="fill weight")),
    }
    srcs = {name: write_report(g, tmp / f"{name}.xlsx", **kw) for name, (g, kw) in cases.items()}
    for name in SUMS_CASES:  # the same data analysed inside DuckDB: the Sums sheet, no Data sheet
        g = cases[name[len("sums-"):]][0]
        res = analyse_sql(parquet_file(tmp / f"{name}.parquet", dict(zip(g.labels, map(list, g.arrays)))),
                          group="g", value="x")
        srcs[name] = write_sums_report(res.analysis, tmp / f"{name}.xlsx", origin=res.origin)
        cases[name] = (g, {})
    outs = lo.convert_many(list(srcs.values()), "xlsx", tmp / "recalculated")
    books = {name: openpyxl.load_workbook(out, data_only=True) for name, out in zip(srcs, outs)}
    return {name: (cases[name][0], srcs[name], books[name]) for name in cases}, ds, tmp


@pytest.mark.parametrize("name", ["demo", "smls09", "split", "clear", "none", "unequal", "ovens",
                                  "infinite", "equal", *SUMS_CASES])
def test_audit_recalculated_by_libreoffice_equals_python(batch, name):
    reports, _, _ = batch
    g, _, wb = reports[name]
    res = oneway(g)
    want = _expected(res)
    for key in NAMES:
        _agrees(_value(wb, "audit_" + key), want[key], key, res)
        _agrees(_value(wb, key), want[key], key, res)  # Tables survive the round trip too
    checks = _checks(wb)
    assert len(checks) == 11 and set(checks) == {"agrees"}, checks  # the sheet's own verdict
    assert _errors(wb) == []  # no #NAME?, #VALUE!, #DIV/0! anywhere after recalculation


def test_equal_means_recalculate_to_rounding_noise_and_still_agree(batch):
    reports, _, _ = batch
    g, _, wb = reports["equal"]
    assert oneway(g).ss_between == 0 and _value(wb, "ss_between") == 0
    assert abs(_value(wb, "audit_ss_between")) <= 1e-9 * oneway(g).ss_total


@pytest.mark.parametrize("name", ["smls09", "sums-smls09"])
def test_smls09_audit_equals_the_certified_values(batch, name):
    reports, ds, _ = batch
    _, _, wb = reports[name]
    cert = ds.certified  # NIST StRD SmLs09 certified values
    assert _value(wb, "audit_ss_between") == pytest.approx(cert.ss_between, rel=1e-9)
    assert _value(wb, "audit_ss_within") == pytest.approx(cert.ss_within, rel=1e-9)
    assert _value(wb, "audit_f_ratio") == pytest.approx(cert.f, rel=1e-9)
    assert _value(wb, "audit_df_within") == cert.df_within


def test_split_data_sheets_and_text_labels_in_libreoffice(batch):
    reports, _, _ = batch
    g, _, wb = reports["split"]
    # 22 values, 5 per sheet below a header row
    assert [n for n in wb.sheetnames if n.startswith("Data")] == ["Data", "Data 2", "Data 3", "Data 4", "Data 5"]
    labels = [wb["Groups"].cell(5 + i, 1).value for i in range(g.k)]
    assert labels == list(g.labels)  # still the text, never evaluated as formulas
    data_labels = {r[0] for ws in wb.worksheets if ws.title.startswith("Data")
                   for r in ws.iter_rows(min_row=2, min_col=2, max_col=2, values_only=True) if r[0]}
    assert data_labels == set(g.labels)
    findings = " ".join(str(c.value) for row in wb["Findings"].iter_rows() for c in row if c.value)
    assert "Possible typo" in findings


def test_sums_report_has_the_sums_sheet_and_no_data_sheet(batch):
    reports, _, _ = batch
    g, _, wb = reports["sums-unequal"]
    assert wb.sheetnames == ["Findings", "Tables", "Comparisons", "Groups", "Sums", "Chart",
                             "Audit", "About"]
    # the same figures as the report of the values themselves (the in-memory sheetfuncs call)
    plain = reports["unequal"][2]
    for key in NAMES:
        assert _value(wb, key) == _value(plain, key), key
    about = {r[0]: r[1] for r in wb["About"].iter_rows(values_only=True) if r[0]}
    assert about["Engine"].startswith("DuckDB ") and about["Rows read"] == g.n_total
    assert about["SQL source (after FROM)"].startswith("read_parquet(")
    words = [r[6] for r in wb["Audit"].iter_rows(values_only=True) if len(r) > 6 and r[6]]
    assert "Σ of the groups' SS (from the Sums sheet)" in words
    assert not any("SUMPRODUCT" in w or "DEVSQ" in w for w in words)  # no Data sheet to sum over


def test_infinite_f_stays_a_word_after_recalculation(batch):
    reports, _, _ = batch
    _, _, wb = reports["infinite"]
    assert _value(wb, "f_ratio") == "infinite" and _value(wb, "audit_f_ratio") == "infinite"
    assert _value(wb, "audit_p_value") == 0


@pytest.fixture(scope="module")
def pdfs(batch):
    """The demo and the unequal-spreads report, and the demo on letter paper, rendered to PDF in
    one LibreOffice call."""
    reports, _, tmp = batch
    letter = write_report(demo_groups(), tmp / "demo-letter.xlsx", factor=DEMO_FACTOR,
                          response=DEMO_RESPONSE, unit=DEMO_UNIT, title=DEMO_TITLE, paper="letter")
    srcs = [reports["demo"][1], reports["unequal"][1], letter]
    return dict(zip(("demo", "unequal", "demo-letter"), lo.convert_many(srcs, "pdf", tmp / "pdf")))


def _pdf_pages(pdf):
    """Each page's size in whole points, short side first, and text (poppler's pdfinfo and
    pdftotext)."""
    info = subprocess.run(["pdfinfo", "-f", "1", "-l", "999", str(pdf)], capture_output=True,
                          text=True, check=True, timeout=lo.TIMEOUT).stdout
    sizes = [tuple(sorted(round(float(x)) for x in m)) for m in
             re.findall(r"^Page +\d+ size: +([\d.]+) x ([\d.]+) pts", info, re.M)]
    text = subprocess.run(["pdftotext", "-layout", str(pdf), "-"], capture_output=True, text=True,
                          check=True, timeout=lo.TIMEOUT).stdout
    pages = text.split("\f")
    return sizes, pages[:len(sizes)]


def test_letter_report_prints_letter_pages_each_with_the_identifier_and_its_number(pdfs):
    ident = _ident(pdfs["demo-letter"])
    sizes, pages = _pdf_pages(pdfs["demo-letter"])
    assert len(sizes) >= 3 and set(sizes) == {(612, 792)}  # US letter, 8.5 x 11 in (common practice)
    for i, page in enumerate(pages, 1):
        assert f"Report {ident}" in page, i
        assert re.search(rf"page {i} of {len(pages)}\b", page), i
    a4_sizes, a4_pages = _pdf_pages(pdfs["demo"])  # the default paper
    assert set(a4_sizes) == {(595, 842)}  # A4, 210 x 297 mm in whole points (common practice)
    assert all(f"Report {_ident(pdfs['demo'])}" in p for p in a4_pages)


def _ident(pdf):
    """The report identifier on the About sheet of the report a PDF was made from."""
    ws = openpyxl.load_workbook(pdf.parent.parent / f"{pdf.stem}.xlsx")["About"]
    return next(r[1] for r in ws.iter_rows(values_only=True) if r[0] == "Report identifier")


def test_reports_render_to_pdf_and_png(batch, pdfs):
    _, _, tmp = batch
    for pdf in (pdfs["demo"], pdfs["unequal"]):
        assert pdf.stat().st_size > 20_000
        assert pdf.read_bytes()[:5] == b"%PDF-"
        pages = lo.render_png(pdf, tmp / "png" / pdf.stem, first=1, last=2, dpi=50)
        assert len(pages) == 2
        for p in pages:
            assert p.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n" and p.stat().st_size > 10_000
