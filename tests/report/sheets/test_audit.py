"""The Audit sheet: formulas only, with the host's own functions over the centred column, and
checks that allow rounding noise at the scale of the analysis."""

from __future__ import annotations

import openpyxl

from sheetfuncs import oneway

from tests.support.scenarios import EQUAL_MEANS, write_in


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
    wb = openpyxl.load_workbook(write_in(tmp_path, EQUAL_MEANS))
    checks_ = {row[0].value: row[4].value for row in wb["Audit"].iter_rows(min_row=7, max_col=5)
               if isinstance(row[4].value, str) and row[4].value.startswith("=IF(")}
    ss_total_row = next(r[0].row for r in wb["Audit"].iter_rows(min_row=7, max_col=1) if r[0].value == "SS total")
    for name in ("SS between", "SS within (residual)", "SS total"):
        assert f"1E-9*ABS(C{ss_total_row})" in checks_[name]
    assert "1E-9*MAX(ABS(C" in checks_["MS between"] and "1E-9*MAX(ABS(C" in checks_["MS within"]
    assert "MAX(1E-9*ABS(C" in checks_["F"] and ",1E-9)" in checks_["F"]
    assert ",1E-12)" in checks_["p"]
    assert "MAX(1E-9*ABS(C" in checks_["df between"] and ",0)" in checks_["df between"]
