"""The report in a real spreadsheet program: LibreOffice recalculates the Audit sheet.

``soffice --headless --convert-to xlsx`` opens each report, computes every formula and saves the
results; openpyxl (``data_only=True``) reads them back. The Audit figures (the host's own COUNT,
SUMIF, SUMPRODUCT, DEVSQ and F.DIST.RT over the Data sheets) must equal the Python values to
1e-9 relative (p-values: 1e-9 relative or 1e-12 absolute, whichever is looser), on the built-in
demo and on NIST StRD SmLs09 (13 constant leading digits; certified values from NIST). The demo
is also rendered to PDF and PNG. One conversion per report (module-scoped fixtures) keeps the
run short.
"""

from __future__ import annotations

import math

import openpyxl
import pytest

import lo
import nist
from sheetfuncs import as_groups, oneway
from sheetfuncs.demo import DEMO_FACTOR, DEMO_RESPONSE, DEMO_TITLE, DEMO_UNIT, demo_groups
from sheetfuncs.report import write_report

NAMES = ("ss_between", "ss_within", "df_between", "df_within", "f_ratio", "p_value")


def _value(wb, name):
    (sheet, coord), = list(wb.defined_names[name].destinations)
    return wb[sheet][coord.replace("$", "")].value


def _expected(res):
    return {"ss_between": res.ss_between, "ss_within": res.ss_within, "df_between": res.df_between,
            "df_within": res.df_within, "f_ratio": res.f, "p_value": res.p}


def _agrees(got, want, name):
    assert isinstance(got, (int, float)) and not isinstance(got, bool), f"{name}: {got!r}"
    if name == "p_value":
        tol = max(1e-9 * abs(want), 1e-12)
    else:
        tol = 1e-9 * abs(want)
    assert abs(got - want) <= tol, f"{name}: LibreOffice {got!r}, Python {want!r}"


def _recalculated(tmp, groups, name, **kw):
    lo.require_office()
    src = write_report(groups, tmp / f"{name}.xlsx", **kw)
    out = lo.convert(src, "xlsx", tmp / "recalculated")
    return src, openpyxl.load_workbook(out, data_only=True)


@pytest.fixture(scope="module")
def demo(tmp_path_factory):
    tmp = tmp_path_factory.mktemp("lo-demo")
    g = demo_groups()
    src, wb = _recalculated(tmp, g, "demo", factor=DEMO_FACTOR, response=DEMO_RESPONSE,
                            unit=DEMO_UNIT, title=DEMO_TITLE, control="Zone 1")
    return g, src, wb, tmp


@pytest.fixture(scope="module")
def smls09(tmp_path_factory):
    tmp = tmp_path_factory.mktemp("lo-smls09")
    ds = nist.load("SmLs09")
    g = as_groups(ds.groups)
    _, wb = _recalculated(tmp, g, "smls09", factor="Treatment", response="Value")
    return g, ds, wb


@pytest.fixture(scope="module")
def split(tmp_path_factory):
    # formula-like labels, a case-only label difference, and Data spread over four sheets
    tmp = tmp_path_factory.mktemp("lo-split")
    g = as_groups({"=SUM(A1)": [10.2, 10.4, 10.1, 10.3], "+1": [10.8, 10.9, 10.7, 11.0],
                   "-x": [10.0, 10.2, 10.1, 9.9], "@y": [10.5, 10.3, 10.6, 10.4],
                   "lot a": [10.1, 10.0, 10.3], "lot A": [10.6, 10.4, 10.5]})
    _, wb = _recalculated(tmp, g, "split", _row_limit=6)
    return g, wb


def test_demo_audit_recalculated_by_libreoffice_equals_python(demo):
    g, _, wb, _ = demo
    want = _expected(oneway(g))
    for name in NAMES:
        _agrees(_value(wb, "audit_" + name), want[name], name)
        _agrees(_value(wb, name), want[name], name)  # Tables survive the round trip too


def test_demo_audit_check_column_says_agrees(demo):
    _, _, wb, _ = demo
    checks = [c.value for (c,) in wb["Audit"].iter_rows(min_col=5, max_col=5) if c.value in ("agrees", "differs")]
    assert checks and set(checks) == {"agrees"}
    errors = [(ws.title, c.coordinate, c.value) for ws in wb.worksheets for row in ws.iter_rows()
              for c in row if isinstance(c.value, str) and c.value.startswith("#")]
    assert errors == []  # no #NAME?, #VALUE!, #DIV/0! anywhere after recalculation


def test_smls09_audit_recalculated_by_libreoffice(smls09):
    g, ds, wb = smls09
    want = _expected(oneway(g))
    for name in NAMES:
        _agrees(_value(wb, "audit_" + name), want[name], name)
    # and against the NIST StRD certified values for SmLs09
    cert = ds.certified
    assert _value(wb, "audit_ss_between") == pytest.approx(cert.ss_between, rel=1e-9)
    assert _value(wb, "audit_ss_within") == pytest.approx(cert.ss_within, rel=1e-9)
    assert _value(wb, "audit_f_ratio") == pytest.approx(cert.f, rel=1e-9)
    assert _value(wb, "audit_df_within") == cert.df_within


def test_split_data_sheets_and_text_labels_in_libreoffice(split):
    g, wb = split
    # 22 values, 5 per sheet below a header row
    assert [n for n in wb.sheetnames if n.startswith("Data")] == ["Data", "Data 2", "Data 3", "Data 4", "Data 5"]
    want = _expected(oneway(g))
    for name in NAMES:
        _agrees(_value(wb, "audit_" + name), want[name], name)
    labels = [wb["Groups"].cell(5 + i, 1).value for i in range(g.k)]
    assert labels == list(g.labels)  # still the text, never evaluated as formulas
    data_labels = {r[0] for ws in wb.worksheets if ws.title.startswith("Data")
                   for r in ws.iter_rows(min_row=2, min_col=2, max_col=2, values_only=True) if r[0]}
    assert data_labels == set(g.labels)
    findings = " ".join(str(c.value) for row in wb["Findings"].iter_rows() for c in row if c.value)
    assert "Possible typo" in findings


def test_demo_renders_to_pdf_and_png(demo):
    _, src, _, tmp = demo
    pdf = lo.convert(src, "pdf", tmp / "pdf")
    assert pdf.stat().st_size > 20_000
    assert pdf.read_bytes()[:5] == b"%PDF-"
    pages = lo.render_png(pdf, tmp / "png" / "page", first=1, last=2, dpi=50)
    assert len(pages) == 2
    for p in pages:
        assert p.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n" and p.stat().st_size > 10_000
