"""Tests of ``sheetfuncs plan`` (sheetfuncs.cli.plan).

Numeric checks name their source: Cohen (1988) power tables, statsmodels as a reference library.
"""

from __future__ import annotations

import numpy as np
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


def test_plan_in_units_says_what_was_planned_and_agrees_with_statsmodels(capsys):
    # reference library: statsmodels FTestAnovaPower; f from the means 0, 1.25, 1.25, 2.5 (SD 1.8)
    from statsmodels.stats.power import FTestAnovaPower

    code, out, err = run(["plan", "--groups", "4", "--difference", "2.5", "--sd", "1.8"], capsys)
    assert code == 0 and err == ""
    lines = out.splitlines()
    assert lines[0] == (
        "Groups: 4; two group means 2.5 apart, the other 2 means midway between them (the least "
        "favourable configuration for that difference); SD within groups 1.8 (difference and SD "
        "in the response's units)")
    assert lines[1] == "Effect size f = D / (S x sqrt(2 x 4)) = 2.5 / (1.8 x sqrt(8)) = 0.491"
    assert lines[2] == "Alpha = 0.05; target power = 0.8"
    f_means = float(np.std([0.0, 1.25, 1.25, 2.5]) / 1.8)
    ref = FTestAnovaPower().power(effect_size=f_means, nobs=4 * 13, alpha=0.05, k_groups=4)
    assert lines[3] == "Values per group: 13 (total 52)"
    assert lines[4] == f"Achieved power: {ref:.4f}"
    assert FTestAnovaPower().power(effect_size=f_means, nobs=4 * 12, alpha=0.05, k_groups=4) < 0.8
    assert "procedures for study design" in lines[5]


def test_plan_power_at_given_n(capsys):
    # reference library: statsmodels FTestAnovaPower; two groups 1 apart with SD 1: f = 0.5 (from memory: D / 2S)
    from statsmodels.stats.power import FTestAnovaPower

    code, out, err = run(["plan", "--groups", "2", "--difference", "1", "--sd", "1", "--n", "20"], capsys)
    assert code == 0 and err == ""
    ref = FTestAnovaPower().power(effect_size=0.5, nobs=40, alpha=0.05, k_groups=2)
    assert out.splitlines()[:4] == [
        "Groups: 2; the two group means 1 apart; SD within groups 1 (difference and SD in the "
        "response's units)",
        "Effect size f = D / (S x sqrt(2 x 2)) = 1 / (1 x sqrt(4)) = 0.5",
        "Alpha = 0.05; values per group: 20 (total 40), given",
        f"Power: {ref:.4f} (the chance that the F test at alpha 0.05 finds this effect)",
    ]
    code, out, _ = run(["plan", "--groups", "3", "--effect", "0.4", "--n", "10", "--alpha", "0.01"], capsys)
    ref = FTestAnovaPower().power(effect_size=0.4, nobs=30, alpha=0.01, k_groups=3)
    assert code == 0 and f"Power: {ref:.4f} " in out and "Groups: 3; effect size f = 0.4\n" in out
    code, out, _ = run(["plan", "--groups", "3", "--difference", "1", "--sd", "1"], capsys)
    assert "two group means 1 apart, the third mean midway between them" in out


@pytest.mark.parametrize(
    ("argv", "problem"),
    [
        ([], "give the effect to detect: --effect F (Cohen's f), or --difference D with --sd S "
             "(in the response's units)"),
        (["--effect", "0.2", "--difference", "1", "--sd", "1"],
         "give the effect either as --effect F or as --difference D with --sd S, not both"),
        (["--effect", "0.2", "--sd", "1"],
         "give the effect either as --effect F or as --difference D with --sd S, not both"),
        (["--difference", "1"], "--difference needs --sd S, the SD within groups in the same units"),
        (["--sd", "1"], "--sd goes with --difference D, the difference between group means to "
                        "detect (in the same units)"),
        (["--effect", "0.2", "--n", "5", "--power", "0.8"],
         "give --power P (to find the values per group) or --n N (to get the power of N per "
         "group), not both"),
    ],
)
def test_plan_option_mixtures_are_usage_errors(argv, problem, capsys):
    code, out, err = run(["plan", "--groups", "3", *argv], capsys)
    assert code == 2 and out == ""
    usage, line = err.splitlines()
    assert usage.startswith("usage: sheetfuncs plan --groups K (--effect F | --difference D --sd S)")
    assert line == f"sheetfuncs: plan: {problem} (see: sheetfuncs plan --help)"


@pytest.mark.parametrize(
    ("argv", "line"),
    [
        (["--difference", "-1", "--sd", "1"], "sheetfuncs: the difference to detect must be greater than 0, not -1"),
        (["--difference", "0", "--sd", "1"], "sheetfuncs: the difference to detect must be greater than 0, not 0"),
        (["--difference", "1", "--sd", "0"], "sheetfuncs: the SD within groups must be greater than 0, not 0"),
        (["--difference", "inf", "--sd", "1"], "sheetfuncs: the difference to detect must be a finite number, not inf"),
        (["--effect", "0.2", "--n", "1"], "sheetfuncs: n (values per group) must be a whole number from 2 to "
                                          "100,000,000,000, not 1"),
    ],
)
def test_plan_bad_values_are_one_line(argv, line, capsys):
    code, out, err = run(["plan", "--groups", "3", *argv], capsys)
    assert code == 1 and out == ""
    assert err == line + "\n"
