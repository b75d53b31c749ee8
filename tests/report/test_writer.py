"""The report workbook, read back with openpyxl (no spreadsheet program needed).

The LibreOffice checks (recalculated Audit cells, PDF rendering) are in
tests/test_report_libreoffice.py. Numbers here are compared with the core's own results on the
same groups (the report must not compute anything itself) and, where a published value exists,
with it (NIST StRD, scipy.stats).
"""

from __future__ import annotations

import os
import zipfile
from decimal import Decimal
from pathlib import Path

import numpy as np
import openpyxl
import pytest
from hypothesis import given, strategies as st
from scipy import stats

import sheetfuncs.report.writer as writer_mod
from sheetfuncs import InputError, as_groups, describe, groups_from_range, oneway
from sheetfuncs.stats.assumptions import checks
from sheetfuncs.input.demo import DEMO_FACTOR, DEMO_RESPONSE, DEMO_TITLE, DEMO_UNIT, demo_groups
from sheetfuncs.stats.effects import effect_sizes
from sheetfuncs.stats.lettering import letters
from sheetfuncs.stats.moments import compute_moments
from sheetfuncs.stats.comparisons import dunnett, pairwise
from sheetfuncs.report import SHEET_ORDER, write_report
from sheetfuncs.report.context import prepare
from sheetfuncs.stats import centred_values, centring_constant
from sheetfuncs.report.findings import findings
from sheetfuncs.report.formats import P_FORMAT
from sheetfuncs.report.grid import safe_text
from sheetfuncs.input.source import InputSource

from tests.support import nist
from tests.support.scenarios import CLEAR, EQUAL_MEANS, NONE, UNEQUAL

NAMES = ("ss_between", "ss_within", "df_between", "df_within", "f_ratio", "p_value")

def _write(tmp: Path, groups, name="r.xlsx", **kw) -> Path:
    return write_report(groups, tmp / name, **kw)


def _cells_text(ws) -> str:
    return "\n".join(str(c.value) for row in ws.iter_rows() for c in row if c.value is not None)


def _name_cell(wb, name):
    (sheet, coord), = list(wb.defined_names[name].destinations)
    return wb[sheet][coord.replace("$", "")]


@pytest.fixture(scope="module")
def demo(tmp_path_factory):
    tmp = tmp_path_factory.mktemp("demo")
    g = demo_groups()
    src = InputSource(path=str(tmp / "zones.xlsx"), sheet="Lot data", first_row=3, first_col=2)
    path = write_report(g, tmp / "demo.xlsx", factor=DEMO_FACTOR, response=DEMO_RESPONSE,
                        unit=DEMO_UNIT, title=DEMO_TITLE, control="Zone 1", source=src)
    return g, path, openpyxl.load_workbook(path)


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
        cell = _name_cell(wb, name)
        assert cell.parent.title == "Tables"
        assert cell.value == expected[name]  # the core's number, written unrounded
        twin = _name_cell(wb, "audit_" + name)
        assert twin.parent.title == "Audit"
        assert isinstance(twin.value, str) and twin.value.startswith("=")  # a live formula
    # the Audit rows say what they recompute
    labels = {n: _name_cell(wb, "audit_" + n).offset(column=-1).value for n in NAMES}
    assert labels == {"ss_between": "SS between", "ss_within": "SS within (residual)",
                      "df_between": "df between", "df_within": "df within", "f_ratio": "F", "p_value": "p"}


def test_audit_formulas_use_the_hosts_functions_on_the_centred_column(demo):
    _, _, wb = demo
    formulas = " ".join(str(c.value) for row in wb["Audit"].iter_rows() for c in row
                        if isinstance(c.value, str) and c.value.startswith("="))
    for fn in ("COUNT(", "COUNTIF(", "SUMIF(", "SUMPRODUCT(", "DEVSQ(", "_xlfn.F.DIST.RT("):
        assert fn in formulas
    assert "Data!$D$2:$D$31" in formulas  # the centred values, 30 of them
    # a post-2007 function without its _xlfn. prefix would show #NAME? in the host
    assert "F.DIST.RT(" not in formulas.replace("_xlfn.F.DIST.RT(", "")




def test_audit_checks_allow_rounding_noise_at_the_scale_of_the_analysis(tmp_path):
    # exactly equal means: a host's floating-point sums give SS between ~1e-33, not 0; the
    # check compares it at the scale of SS total (and MS, F, p at theirs), never with no room
    assert oneway(EQUAL_MEANS).ss_between == 0
    wb = openpyxl.load_workbook(_write(tmp_path, EQUAL_MEANS))
    checks_ = {row[0].value: row[4].value for row in wb["Audit"].iter_rows(min_row=7, max_col=5)
               if isinstance(row[4].value, str) and row[4].value.startswith("=IF(")}
    ss_total_row = next(r[0].row for r in wb["Audit"].iter_rows(min_row=7, max_col=1) if r[0].value == "SS total")
    for name in ("SS between", "SS within (residual)", "SS total"):
        assert f"1E-9*ABS(C{ss_total_row})" in checks_[name]
    assert "1E-9*MAX(ABS(C" in checks_["MS between"] and "1E-9*MAX(ABS(C" in checks_["MS within"]
    assert "MAX(1E-9*ABS(C" in checks_["F"] and ",1E-9)" in checks_["F"]
    assert ",1E-12)" in checks_["p"]
    assert "MAX(1E-9*ABS(C" in checks_["df between"] and ",0)" in checks_["df between"]


def test_values_chart_stays_within_the_series_limit(tmp_path, monkeypatch):
    # the host allows 255 series per chart (Excel's specifications, from memory); the cap is
    # lowered here so that the many-groups layout is exercised on five groups (a report of 251
    # groups spends most of its time on 31,375 pairwise comparisons)
    import sheetfuncs.report.sheets.chart as chart_mod

    assert chart_mod.MAX_GROUP_SERIES + 1 <= 255
    monkeypatch.setattr(chart_mod, "MAX_GROUP_SERIES", 4)
    g = {f"Lot {i}": [1.0 + (i % 7) * 0.1, 1.2 + (i % 5) * 0.1, 1.1] for i in range(5)}
    path = _write(tmp_path, g)
    with zipfile.ZipFile(path) as z:
        xml = [z.read(n).decode() for n in z.namelist() if n.startswith("xl/charts/chart")]
    values = next(x for x in xml if "scatterChart" in x)
    assert values.count("<c:ser>") + values.count("<ser>") == 2  # all values, and the means
    ws = openpyxl.load_workbook(path)["Chart"]
    assert "With 5 groups the values chart draws all groups as one series" in _cells_text(ws)
    head = [c.row for (c,) in ws.iter_rows(min_col=1, max_col=1) if c.value == "Chart data: plotted values"][0]
    plotted = [r for r in ws.iter_rows(min_row=head + 2, max_col=3, values_only=True) if isinstance(r[0], int)]
    assert len(plotted) == 15  # every value is still plotted, in the one series
    assert f"$C${head + 2}:$C${head + 16}" in values


def test_chart_is_native_with_error_bars(demo):
    _, path, wb = demo
    charts = wb["Chart"]._charts
    assert len(charts) == 2
    with zipfile.ZipFile(path) as z:
        xml = [z.read(n).decode() for n in z.namelist() if n.startswith("xl/charts/chart")]
    assert len(xml) == 2
    means = next(x for x in xml if "lineChart" in x)
    assert "errBars>" in means and 'errValType val="cust"' in means
    values = next(x for x in xml if "scatterChart" in x)
    assert values.count("<ser>") + values.count("<c:ser>") == demo[0].k + 1  # groups, plus the means


def test_conditional_formatting_marks_p_below_alpha(demo):
    _, _, wb = demo
    rules = [(cf.sqref, r.formula[0]) for cf in wb["Tables"].conditional_formatting for r in cf.rules]
    assert rules, "no conditional formatting on Tables"
    assert any("<0.05" in f and "ISNUMBER" in f for _, f in rules)
    p_cell = _name_cell(wb, "p_value")
    assert any(p_cell.coordinate in str(sq) for sq, _ in rules)


def test_p_values_shown_below_floor_and_frozen_headers(demo):
    _, _, wb = demo
    p_cell = _name_cell(wb, "p_value")
    assert p_cell.value < 1e-4 and p_cell.number_format == P_FORMAT
    assert wb["Data"].freeze_panes == "A2"
    assert wb["Groups"].freeze_panes == "B5"
    for ws in wb.worksheets:
        assert ws.page_setup.fitToWidth == 1 and ws.sheet_properties.pageSetUpPr.fitToPage
        assert ws.column_dimensions["A"].width > 5


def test_number_formats_follow_the_data_precision(demo, tmp_path):
    _, _, wb = demo  # demo values carry one decimal
    assert wb["Data"]["C2"].number_format == "0.0"
    assert wb["Groups"]["C5"].number_format == "0.000"  # mean: two more decimals
    assert _name_cell(wb, "ss_between").number_format == "0.0000"  # squares: 2D + 2
    three = _write(tmp_path, {"A": [1.125, 1.250, 1.375], "B": [1.5, 1.625, 1.75]})
    wb3 = openpyxl.load_workbook(three)
    assert wb3["Data"]["C2"].number_format == "0.000"
    assert wb3["Groups"]["C5"].number_format == "0.00000"


def _shown(value: float, fmt: str) -> str:
    """What a spreadsheet shows for ``value`` in the fixed or scientific format ``fmt``
    (common practice: 0.000 = three decimals, 0.000E+00 = four significant digits)."""
    if "E" in fmt:
        return f"{value:.{len(fmt.split('E')[0].split('.')[1])}E}"
    return f"{value:.{len(fmt.split('.')[1]) if '.' in fmt else 0}f}"


def _has_digits(text: str) -> bool:
    return any(ch in "123456789" for ch in text)


# invented: float-path measurements of about 1e-6 (not shortest decimals: formula results)
TINY_FLOAT = {f"Probe {i + 1}": (1e-6 + 4e-8 * np.random.default_rng(7 + i).standard_normal(7) + i * 3e-8).tolist()
              for i in range(3)}
# invented: exact-path readings with seven decimals; SS about 1e-13
TINY_EXACT = {"a": [0.0000012, 0.0000013, 0.0000011, 0.0000012], "b": [0.0000014, 0.0000013, 0.0000015, 0.0000014]}


@pytest.mark.parametrize("groups", [TINY_FLOAT, TINY_EXACT], ids=["float path", "exact path"])
def test_very_small_figures_never_show_as_zeros(tmp_path, groups):
    path = _write(tmp_path, groups)
    wb = openpyxl.load_workbook(path)
    ws = wb["Tables"]
    start = next(r for r in range(1, 20) if ws.cell(r, 1).value == "Source")
    for r in range(start + 1, start + 4):
        for c in (3, 4):  # SS and MS
            cell = ws.cell(r, c)
            if isinstance(cell.value, float):
                assert _has_digits(_shown(cell.value, cell.number_format)), (cell.coordinate, cell.value, cell.number_format)
    g = wb["Groups"]
    for r in range(5, 5 + len(groups)):
        for c in (3, 4):  # mean and SD
            cell = g.cell(r, c)
            assert _has_digits(_shown(cell.value, cell.number_format)), (cell.coordinate, cell.value, cell.number_format)
    ow = oneway(groups)
    want = {"SS between": ow.ss_between, "SS within (residual)": ow.ss_within, "SS total": ow.ss_total,
            "MS between": ow.ms_between, "MS within": ow.ms_within}
    seen = 0
    for row in wb["Audit"].iter_rows(min_row=7, max_col=2):
        if row[0].value in want:  # the Audit's formula cells are formatted for the Python value
            assert _has_digits(_shown(want[row[0].value], row[1].number_format)), row[0].value
            seen += 1
    assert seen == 5
    text = _findings_sheet(path)
    spread = text[text.index("a spread of "):].split()[3].rstrip(".")
    assert _has_digits(spread), spread
    assert "a spread of 0.000000." not in text


def test_float_path_decimals_follow_the_spread(tmp_path):
    # invented: formula-result weights (g) around 250 with SD about 2: decimals from the SD,
    # two more for means (common practice), not a fixed four
    rng = np.random.default_rng(3)
    g = {f"Cell {i}": (250 + 2 * rng.standard_normal(8)).tolist() for i in range(3)}
    an = prepare(g)
    assert not an.exact
    assert an.precision.value == 2 and an.precision.mean == 4
    from sheetfuncs.report.formats import Precision, format_measure, spread_decimals

    assert spread_decimals(0.0195) == 4 and spread_decimals(None) is None
    assert Precision(None).value == 4  # no spread known: four decimals
    assert Precision(6).square_format(7e-14) == "0.000E+00" and Precision(6).square_format(0.5) == "0." + "0" * 12
    assert format_measure(4.4e-8, 6) == "0.00000004400" and format_measure(0.25, 3) == "0.250"
    assert format_measure(0.0, 6) == "0.000000"


# ---------------------------------------------------------------------------------------------
# numbers equal the core's


def test_tables_equal_the_core(demo):
    g, _, wb = demo
    ws = wb["Tables"]
    rows = [[c.value for c in r] for r in ws.iter_rows()]
    ow = oneway(g).table(DEMO_FACTOR)
    start = next(i for i, r in enumerate(rows) if r[0] == "Source")
    for got, want in zip(rows[start:start + 4], ow):
        assert got[:6] == [w for w in want]
    chk = checks(g, 0.05)
    wel, kw = chk.welch, chk.kruskal
    welch_row = next(r for r in rows if r[0] == "Welch F")
    assert welch_row[1:5] == [wel.statistic, wel.df1, wel.df2, wel.p]
    kw_row = next(r for r in rows if r[0] == "Kruskal–Wallis H")
    assert kw_row[1] == kw.statistic and kw_row[4] == kw.p
    # Kruskal–Wallis against scipy.stats.kruskal (reference library)
    assert kw_row[4] == pytest.approx(stats.kruskal(*g.arrays).pvalue, rel=1e-9)
    eff = effect_sizes(g, 0.95)
    eta_row = next(r for r in rows if r[0] == "Eta squared")
    assert eta_row[1:4] == [eff.eta_squared, *eff.eta_squared_ci]


def test_groups_and_comparisons_equal_the_core(demo):
    g, _, wb = demo
    got = [[c.value for c in r][:10] for r in wb["Groups"].iter_rows(min_row=5, max_row=4 + g.k)]
    want = describe(g, 0.95).table()[1:]
    assert got == want
    comp = [[c.value for c in r] for r in wb["Comparisons"].iter_rows()]
    pw = pairwise(g, "tukey", 0.05)
    for row in pw.rows:
        line = next(r for r in comp if r[0] == row.group_a and r[1] == row.group_b and r[7] == row.p)
        assert line[2:8] == [row.difference, row.se, row.ci.low, row.ci.high, row.statistic, row.p]
        assert line[8] == ("yes" if row.differs else "no")
    dn = dunnett(g, "Zone 1", 0.05)
    for row in dn.rows:
        assert any(r[0] == row.group_a and r[1] == "Zone 1" and r[7] == row.p for r in comp)
    let = letters(g, "tukey", 0.05)
    for label in g.labels:
        assert any(r[0] == label and r[2] == let[label] for r in comp)


def test_oneway_on_nist_smls09_equals_certified(tmp_path):
    # NIST StRD SmLs09 (certified values): the written Tables figures.
    ds = nist.load("SmLs09")
    path = _write(tmp_path, ds.groups)
    wb = openpyxl.load_workbook(path)
    cert = ds.certified
    assert _name_cell(wb, "ss_between").value == pytest.approx(cert.ss_between, rel=1e-12)
    assert _name_cell(wb, "ss_within").value == pytest.approx(cert.ss_within, rel=1e-12)
    assert _name_cell(wb, "f_ratio").value == pytest.approx(cert.f, rel=1e-12)
    assert _name_cell(wb, "df_within").value == cert.df_within
    # the centred column holds value - constant as the exact decimal difference
    c = Decimal(str(wb["Audit"]["C5"].value).removeprefix("exactly "))
    for row in wb["Data"].iter_rows(min_row=2, max_row=60, max_col=4, values_only=True):
        assert row[3] == float(Decimal(repr(row[2])) - c)
        assert abs(row[3]) < 1  # 13 constant leading digits removed


# ---------------------------------------------------------------------------------------------
# centring: exact decimal differences


def test_centring_constant_is_round_and_near_the_mean():
    g = as_groups(nist.load("SmLs09").groups)
    mom = compute_moments(g)
    c = centring_constant(mom, oneway(g))
    assert c == Decimal("1000000000000.4")  # SmLs09 values are 1000000000000.2 ... .6 (NIST)
    g2 = demo_groups()
    assert centring_constant(compute_moments(g2), oneway(g2)) == Decimal("62")


@given(st.lists(st.integers(-10**12, 10**12), min_size=4, max_size=30), st.integers(0, 6),
       st.integers(-10**9, 10**9))
def test_centred_values_are_exact_decimal_differences(ints, scale, shift):
    # Reference: Python's decimal module (exact decimal arithmetic), common practice.
    vals = [float(Decimal(i + shift * 10**scale).scaleb(-scale)) for i in ints]
    half = len(vals) // 2
    g = as_groups({"a": vals[:half], "b": vals[half:]})
    mom = compute_moments(g)
    centre = Decimal(shift)
    for a in g.arrays:
        got = centred_values(a, mom, centre)
        want = [float(Decimal(repr(v)) - centre) for v in a.tolist()]
        assert got.tolist() == want


def test_centred_values_on_the_float_path():
    g = as_groups({"a": [0.1 + 0.2, 0.7 + 0.1, 1 / 3], "b": [2 / 3, 0.5, 0.25]})
    mom = compute_moments(g)
    assert not mom.exact
    centre = centring_constant(mom, oneway(g))
    assert float(centre) == float(centre).__round__()  # a whole number, held exactly
    for a in g.arrays:
        # the IEEE difference of two doubles is the exact difference rounded once
        want = [float(Decimal(v) - centre) for v in a.tolist()]
        assert centred_values(a, mom, centre).tolist() == want


# ---------------------------------------------------------------------------------------------
# Findings: right for three invented scenarios


def _findings_sheet(path: Path) -> str:
    return _cells_text(openpyxl.load_workbook(path)["Findings"])


def test_findings_clear_difference(tmp_path):
    an = prepare(CLEAR, factor="Filling line", response="fill weight", unit="g")
    fi = findings(an)
    assert fi.verdict == "differs" and fi.read == "oneway"
    assert fi.headline.startswith("Yes: Filling line matters")
    text = _findings_sheet(_write(tmp_path, CLEAR, factor="Filling line", response="fill weight", unit="g"))
    assert fi.headline in text
    assert '"Line B" is higher than "Line A"' in text and '"Line B" is higher than "Line C"' in text
    assert "2 of the 3 pairs of groups differ clearly" in text
    assert "Read the one-way F test" in text
    assert "large by Cohen's (1988) conventions" in text


def test_findings_no_difference(tmp_path):
    fi = findings(prepare(NONE, factor="Lot", response="assay"))
    assert fi.verdict == "no difference"
    assert fi.headline.startswith("No clear effect")
    assert "does not prove the groups equal" in fi.headline
    text = _findings_sheet(_write(tmp_path, NONE, factor="Lot", response="assay"))
    assert "No pair of groups differs clearly" in text
    assert "is not ruled out by these data" in text or "not ruled out by these data" in text


def test_findings_unequal_variances_reads_welch(tmp_path):
    an = prepare(UNEQUAL, factor="Supplier", response="bore diameter", unit="mm")
    fi = findings(an)
    assert an.checks.variances_unequal
    assert fi.read == "welch"
    assert "Welch's test" in fi.headline
    w = an.welch
    assert f"{w.p:.4f}"[:4] in fi.headline or "p < 0.0001" in fi.headline
    text = _findings_sheet(_write(tmp_path, UNEQUAL, factor="Supplier", response="bore diameter", unit="mm"))
    assert "Read Welch's test (it does not assume equal variances)" in text
    assert "Games–Howell" in text  # the safer reading of pairs is named


def test_findings_unequal_variances_lead_with_games_howell_and_do_not_contradict():
    # The invented UNEQUAL scenario: Welch's p is about 0.0001, far from alpha, and the pooled
    # Tukey–Kramer comparisons find no pair while Games–Howell finds one (scipy.stats'
    # tukey_hsd is not needed: the report's own pairs are what the text must follow).
    an = prepare(UNEQUAL, factor="Supplier", response="bore diameter", unit="mm")
    fi = findings(an)
    assert fi.read == "welch" and fi.verdict == "differs" and an.welch.p < 0.001
    differ = dict(fi.sections)["Which groups differ"]
    assert differ[0].startswith("The group spreads look unequal and Welch's test is the result to read")
    assert "Games–Howell" in differ[0] and "1 of the 3 pairs of groups differs clearly" in differ[0]
    assert differ[1].startswith('• "Supplier 2" is higher than "Supplier 1"')
    pooled = next(i for i, t in enumerate(differ) if "Tukey–Kramer" in t)
    assert pooled > 1 and "pool the group variances" in differ[pooled]
    assert "near the threshold" not in fi.text()  # p = 0.0001 is not near alpha = 0.05
    letters_line = next(t for t in differ if "share a letter" in t)
    assert "pooled Tukey–Kramer" in letters_line
    text = fi.text()
    assert "about less than" not in text and "1 of the 3 pairs differ " not in text
    notes = dict(fi.sections)["Notes on the data"]
    consistent = [t for t in notes if "consistent with no difference" in t]
    assert consistent and all("not from Welch's test" in t for t in consistent)


def test_findings_near_threshold_sentence_only_near_alpha():
    # invented: three lots, the third a little higher; F's p is just below alpha (0.04) and
    # Scheffé's pairwise comparisons (never more significant than the F test) find no pair
    lots = {"Lot 1": [10.0, 10.4, 9.7, 10.2, 9.9, 10.3], "Lot 2": [10.1, 9.8, 10.3, 10.0, 10.4, 9.9],
            "Lot 3": [10.51, 10.21, 10.71, 10.41, 10.11, 10.61]}
    an = prepare(lots, method="scheffe")
    fi = findings(an)
    assert fi.verdict == "differs" and fi.read == "oneway" and 0.01 <= an.oneway.p < 0.05
    assert not any(r.differs for r in an.pairwise.rows)
    assert "No pair of groups differs clearly (Scheffé comparisons" in fi.text()
    assert "disagree near the threshold" in fi.text()


def test_findings_typo_notes_appear_once(tmp_path):
    g = groups_from_range([["Lot a", "Lot A", "Lot b"], [1.0, 2.0, 1.5], [1.2, 2.2, 1.4], [1.1, 2.1, 1.6]])
    fi = findings(prepare(g))
    assert len(fi.typo_notes) == 1
    assert fi.text().count(fi.typo_notes[0]) == 1
    sheet = _findings_sheet(_write(tmp_path, g))
    assert sheet.count(fi.typo_notes[0]) == 1


def test_findings_percent_wording():
    from sheetfuncs.report.findings import percent_words

    assert percent_words(0.004) == "less than 1%"
    assert percent_words(0.25) == "about 25%"
    fi = findings(prepare(NONE))
    assert "accounts for less than 1%" in fi.text()


def test_findings_rank_test_read_and_disagreeing(tmp_path):
    # invented: cure time (min) of three ovens, each with one slow outlier -> non-normal
    # residuals in small groups: the checks read Kruskal–Wallis alongside the F test, and here
    # the two disagree
    ovens = {"Oven 1": [5.1, 5.2, 5.0, 5.3, 5.1, 5.2, 5.0, 7.9],
             "Oven 2": [5.6, 5.5, 5.7, 5.6, 5.4, 5.5, 5.7, 8.3],
             "Oven 3": [5.2, 5.1, 5.3, 5.2, 5.0, 5.3, 5.1, 8.0]}
    an = prepare(ovens, factor="Oven", response="cure time")
    fi = findings(an)
    assert fi.read == "kruskal"
    assert (an.oneway.p < 0.05) != (an.kruskal.p < 0.05)
    assert fi.verdict == "unsettled" and fi.headline.startswith("Unsettled: the two tests disagree")
    text = _findings_sheet(_write(tmp_path, ovens, factor="Oven", response="cure time"))
    assert "Read the Kruskal–Wallis rank test, alongside the one-way F test" in text


def test_case_only_label_differences_are_flagged(tmp_path):
    g = groups_from_range([["Lot a", "Lot A", "Lot b"], [1.0, 2.0, 1.5], [1.2, 2.2, 1.4], [1.1, 2.1, 1.6]])
    text = _findings_sheet(_write(tmp_path, g))
    assert "Possible typo" in text and '"Lot a", "Lot A"' in text


# ---------------------------------------------------------------------------------------------
# safety: text is text, nothing lost, nothing overwritten


FORMULA_LIKE = ["=SUM(A1:A3)", "+cmd", "-1+1", "@A1", "=HYPERLINK(\"http://x\")"]


def test_formula_like_labels_read_back_as_text(tmp_path):
    g = {lab: [1.0 + i, 1.5 + i, 1.25 + i] for i, lab in enumerate(FORMULA_LIKE)}
    path = _write(tmp_path, g, factor="=1+1", response="@resp", unit="-u", title="+title")
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


def test_tab_and_cr_text_stays_text(tmp_path):
    rows = [["A", "B"], [1.0, 2.0], ["\t=1", 2.5], ["\r=2", 2.2], [1.2, 2.1]]
    path = _write(tmp_path, groups_from_range(rows))
    ws = openpyxl.load_workbook(path)["Data"]
    content = [ws.cell(r, 8) for r in (2, 3)]
    assert [c.data_type for c in content] == ["s", "s"]
    assert content[0].value == "\t=1"
    # a carriage return is stored as the format's escape _x000D_ (ECMA-376 ST_Xstring), which
    # spreadsheet programs show as CR; openpyxl shows the escape itself
    assert content[1].value == "_x000D_=2"
    assert safe_text("a\x01b") == "a\u2401b" and safe_text("_x000D_") == "_x005F_x000D_"


def test_control_characters_everywhere_still_give_a_readable_workbook(tmp_path):
    # labels, factor, response and title end up in cells, chart titles and series names
    g = {"Head 1\x01": [1.0, 1.2, 1.1], "Head\x022": [1.5, 1.4, 1.6]}
    path = _write(tmp_path, g, factor="\x03Head", response="fill\x04", title="t\x05")
    wb = openpyxl.load_workbook(path)  # would fail on invalid XML
    assert wb["Groups"]["A5"].value == "Head 1\u2401"
    assert len(wb["Chart"]._charts) == 2


def test_existing_output_kept_unless_force(tmp_path):
    path = _write(tmp_path, CLEAR)
    before = path.read_bytes()
    with pytest.raises(InputError, match="already exists and is kept; use --force"):
        write_report(NONE, path)
    assert path.read_bytes() == before
    write_report(NONE, path, force=True)
    assert path.read_bytes() != before
    assert "Lot 1" in _cells_text(openpyxl.load_workbook(path)["Groups"])


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
    real_replace = os.replace

    def spy(src, dst):
        moves.append((Path(src), Path(dst)))
        return real_replace(src, dst)

    monkeypatch.setattr(writer_mod.os, "replace", spy)
    path = _write(tmp_path, CLEAR)
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


def test_impossible_analysis_writes_nothing(tmp_path):
    with pytest.raises(InputError, match="all values are identical"):
        write_report({"a": [1.0, 1.0], "b": [1.0, 1.0]}, tmp_path / "r.xlsx")
    assert list(tmp_path.iterdir()) == []


# ---------------------------------------------------------------------------------------------
# infinite and undefined values, unavailable analyses


def test_infinite_and_undefined_are_words_with_notes(tmp_path):
    # no variation within groups: F = +inf, p = 0 (GUIDE: shown as text in a cell)
    path = _write(tmp_path, {"a": [1.0, 1.0, 1.0], "b": [2.0, 2.0, 2.0], "c": [3.0]})
    wb = openpyxl.load_workbook(path)
    f_cell = _name_cell(wb, "f_ratio")
    assert f_cell.value == "infinite" and f_cell.comment is not None
    assert _name_cell(wb, "p_value").value == 0
    sd = wb["Groups"]["D7"]  # group "c" has one value: no SD
    assert sd.value == "undefined" and sd.comment is not None
    text = _cells_text(wb["Findings"])
    assert "not available" in text  # Welch needs within-group variation


def test_unavailable_pairwise_method_is_reported_not_fatal(tmp_path):
    path = _write(tmp_path, {"a": [1.0, 1.2, 1.1], "b": [2.0], "c": [1.5, 1.6, 1.4]}, method="games-howell")
    text = _cells_text(openpyxl.load_workbook(path)["Comparisons"])
    assert "not available" in text


# ---------------------------------------------------------------------------------------------
# Data sheets: long form, log of unused cells, split beyond the row limit


def test_data_long_form_and_log_with_addresses(demo):
    g, _, wb = demo
    ws = wb["Data"]
    rows = list(ws.iter_rows(min_row=2, max_col=4, values_only=True))
    values = [r[2] for r in rows if r[2] is not None]
    assert values == [v for a in g.arrays for v in a.tolist()]
    assert [r[1] for r in rows] == [lab for lab, a in g for _ in range(a.size)]
    # the demo's "retest" note is row 7, column 2 of the range, which starts at B3
    assert [ws["F2"].value, ws["G2"].value, ws["H2"].value, ws["I2"].value] == [
        "'Lot data'!D10", "text", "retest", "ignored"]


def test_data_continue_on_more_sheets(tmp_path):
    g = demo_groups()  # 30 values; 9 rows of data per sheet below
    path = write_report(g, tmp_path / "split.xlsx", _row_limit=10)
    wb = openpyxl.load_workbook(path)
    assert wb.sheetnames == ["Findings", "Tables", "Comparisons", "Groups", "Data", "Data 2",
                             "Data 3", "Data 4", "Chart", "Audit", "About"]
    values = []
    for name in ("Data", "Data 2", "Data 3", "Data 4"):
        ws = wb[name]
        assert ws.max_row <= 10 and ws["C1"].value == "Response"
        values += [r[0] for r in ws.iter_rows(min_row=2, min_col=3, max_col=3, values_only=True)]
    assert values == [v for a in g.arrays for v in a.tolist()]
    formulas = " ".join(str(c.value) for row in wb["Audit"].iter_rows() for c in row)
    for name in ("Data!", "'Data 2'!", "'Data 3'!", "'Data 4'!$D$2:$D$4"):
        assert name in formulas


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
