"""Tests of ``sheetfuncs plan`` (sheetfuncs.cli.plan).

Numeric checks name their source: Cohen (1988) power tables, statsmodels as a reference library.
"""

from __future__ import annotations

import pytest

from tests.support.cli import run


def test_plan_matches_cohens_table_and_statsmodels(capsys):
    # Cohen (1988), Table 8.4.4: u = 3 (k = 4), f = 0.25, alpha = 0.05, power 0.80 -> n = 45
    code, out, err = run(["plan", "--groups", "4", "--effect", "0.25"], capsys)
    assert code == 0 and err == ""
    assert "Values per group: 45 (total 180)" in out
    from statsmodels.stats.power import FTestAnovaPower

    ref = FTestAnovaPower().power(effect_size=0.25, nobs=180, alpha=0.05, k_groups=4)
    achieved = float(out.split("Achieved power: ")[1].split()[0])
    assert achieved == pytest.approx(ref, abs=5e-5)
    assert achieved >= 0.8
    ref_44 = FTestAnovaPower().power(effect_size=0.25, nobs=176, alpha=0.05, k_groups=4)
    assert ref_44 < 0.8  # 44 per group would fall short (statsmodels)


def test_plan_input_problems(capsys):
    code, out, err = run(["plan", "--groups", "1", "--effect", "0.25"], capsys)
    assert code == 1 and out == ""
    assert err.startswith("sheetfuncs: ") and err.count("\n") == 1
    code, _, err = run(["plan", "--groups", "3", "--effect", "0.25", "--power", "1.5"], capsys)
    assert code == 1 and err.count("\n") == 1
