"""Variance components of the one-way random-effects model (sheetfuncs.stats.varcomp)."""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy import stats

from sheetfuncs import InputError
from sheetfuncs.stats.varcomp import variance_components

# Dyestuff: yield of dyestuff (g, standard colour) in five preparations from each of six
# batches of an intermediate product; Davies (1947), *Statistical Methods in Research and
# Production*, as analysed by Box & Tiao (1973), ch. 5. Values from memory.
DYESTUFF = [
    [1545, 1440, 1440, 1520, 1580],
    [1540, 1555, 1490, 1560, 1495],
    [1595, 1550, 1605, 1510, 1560],
    [1445, 1440, 1595, 1465, 1545],
    [1595, 1630, 1515, 1635, 1625],
    [1520, 1455, 1450, 1480, 1445],
]


def test_dyestuff_published_mean_squares_and_components():
    # from memory: Box & Tiao (1973), ch. 5: MS between batches 11271.5 (5 df), within 2451.25
    # (24 df), so the ANOVA estimate of the between-batch variance is (11271.5 - 2451.25)/5
    v = variance_components(DYESTUFF)
    assert (v.df_between, v.df_within) == (5, 24)
    assert v.ms_between == 11271.5 and v.ms_within == 2451.25
    assert v.between == pytest.approx(1764.05, rel=1e-15)
    assert v.within == 2451.25
    assert v.total == pytest.approx(4215.3, rel=1e-15)
    assert v.icc == pytest.approx(1764.05 / 4215.3, rel=1e-15)
    assert v.n0 == 5.0 and v.balanced and v.exact


def test_within_interval_is_the_chi_square_interval():
    # common practice: the chi-square interval for a normal variance, (df s^2 / chi2_upper,
    # df s^2 / chi2_lower), written out with scipy.stats.chi2
    v = variance_components(DYESTUFF, conf=0.9)
    lo = 24 * 2451.25 / stats.chi2.ppf(0.95, 24)
    hi = 24 * 2451.25 / stats.chi2.ppf(0.05, 24)
    assert v.within_ci == pytest.approx((lo, hi), rel=1e-12)


def _shrout_fleiss_icc1(msb: float, msw: float, n0: float, d1: int, d2: int, conf: float):
    """Shrout & Fleiss (1979), ICC(1,1) interval, written out independently with scipy.stats.f."""
    a = 1 - conf
    f_obs = msb / msw
    fl = f_obs / stats.f.ppf(1 - a / 2, d1, d2)
    fu = f_obs * stats.f.ppf(1 - a / 2, d2, d1)  # 1 / F(a/2; d1, d2) = F(1 - a/2; d2, d1)
    return (fl - 1) / (fl + n0 - 1), (fu - 1) / (fu + n0 - 1)


@pytest.mark.parametrize("seed", [3, 4, 5])
def test_icc_interval_matches_shrout_fleiss(seed):
    # textbook formula: Shrout & Fleiss (1979), case 1, ICC(1,1) (Searle 1971, ch. 9)
    rng = np.random.default_rng(seed)
    y = rng.normal(0, 1.5, (7, 1)) + rng.normal(0, 1.0, (7, 4))
    v = variance_components(list(y), conf=0.95)
    lo, hi = _shrout_fleiss_icc1(v.ms_between, v.ms_within, 4, 6, 21, 0.95)
    assert v.icc_ci[0] == pytest.approx(max(lo, 0.0), rel=1e-12, abs=1e-15)
    assert v.icc_ci[1] == pytest.approx(min(hi, 1.0), rel=1e-12)
    # the point estimate of the ICC is (F - 1) / (F + n - 1) for balanced data (same source)
    f_obs = v.ms_between / v.ms_within
    assert v.icc == pytest.approx((f_obs - 1) / (f_obs + 3), rel=1e-12)


def test_unbalanced_n0_and_estimates():
    # Searle, Casella & McCulloch (1992), ch. 3: n0 = (N - sum n_i^2 / N) / (k - 1); with sizes
    # 3, 5, 8: N = 16, sum n_i^2 = 98, n0 = (16 - 6.125) / 2 = 4.9375 (by hand)
    groups = [[10.1, 10.4, 9.8], [11.0, 11.3, 10.7, 11.1, 10.9], [9.5, 9.9, 9.7, 9.2, 9.8, 9.6, 9.4, 10.0]]
    v = variance_components(groups)
    assert v.n0 == 4.9375 and not v.balanced
    allv = np.concatenate([np.asarray(g) for g in groups])
    msb = sum(len(g) * (np.mean(g) - allv.mean()) ** 2 for g in groups) / 2
    msw = sum(((np.asarray(g) - np.mean(g)) ** 2).sum() for g in groups) / 13
    assert v.between == pytest.approx((msb - msw) / 4.9375, rel=1e-12)
    assert v.within == pytest.approx(msw, rel=1e-12)
    assert any("approximate" in nt for nt in v.notes)


def test_negative_between_is_truncated_with_a_note():
    groups = [[1.0, 5.0, 3.0, 2.0], [4.0, 2.0, 3.0, 3.0], [3.0, 2.0, 4.0, 3.2], [1.0, 4.0, 3.0, 3.1], [5.0, 1.0, 2.0, 4.0]]
    v = variance_components(groups)
    assert v.between_raw < 0
    assert v.between == 0.0 and v.icc == 0.0 and v.total == v.within
    assert any("negative" in nt and "shown as 0" in nt for nt in v.notes)
    assert v.between_ci[0] == 0.0 and v.between_ci[1] >= 0.0
    assert v.icc_ci[0] == 0.0


def test_no_within_variation_reduces_mls_to_the_chi_square_interval():
    # Burdick & Graybill (1992), ch. 3: with MSW = 0 the MLS interval for (theta1 - theta2)/n
    # becomes the exact chi-square interval for theta1/n (computed here with scipy.stats.chi2)
    groups = [[2.0, 2.0, 2.0], [5.0, 5.0, 5.0], [3.0, 3.0, 3.0], [7.0, 7.0, 7.0]]
    v = variance_components(groups)
    msb = v.ms_between
    lo = 3 * msb / stats.chi2.ppf(0.975, 3) / 3
    hi = 3 * msb / stats.chi2.ppf(0.025, 3) / 3
    assert v.within == 0.0 and v.within_ci == (0.0, 0.0)
    assert v.between_ci == pytest.approx((lo, hi), rel=1e-12)
    assert v.icc == 1.0 and v.icc_ci == (1.0, 1.0)
    assert any("no variation within groups" in nt for nt in v.notes)


def test_coverage_by_seeded_simulation():
    # within (chi-square) and ICC (F-based) are exact for balanced normal data; the MLS intervals
    # of Ting et al. (1990) and Graybill & Wang (1980) keep close to the stated level
    # (Burdick & Graybill 1992, ch. 3). 800 datasets: within 3 binomial SEs (common practice).
    rng = np.random.default_rng(20240604)
    reps, k, n, sb, sw, conf = 800, 6, 4, 1.2, 1.0, 0.95
    data = rng.normal(0, sb, (reps, k, 1)) + rng.normal(0, sw, (reps, k, n))
    hits = dict(within=0, between=0, total=0, icc=0)
    truth = dict(within=sw**2, between=sb**2, total=sw**2 + sb**2, icc=sb**2 / (sb**2 + sw**2))
    for y in data:
        v = variance_components(list(y), conf=conf)
        for name in hits:
            lo, hi = getattr(v, f"{name}_ci")
            hits[name] += lo <= truth[name] <= hi
    se = math.sqrt(conf * (1 - conf) / reps)
    for name, h in hits.items():
        assert abs(h / reps - conf) <= 3 * se, (name, h / reps)


def test_table_layout_and_shares():
    v = variance_components(DYESTUFF)
    t = v.table()
    assert t[0] == ["Component", "Estimate", "CI low", "CI high", "Share of total", "Note"]
    assert [r[0] for r in t[1:]] == [
        "Between groups", "Within groups", "Total", "Intraclass correlation", "Effective group size n0",
    ]
    assert all(len(r) == 6 for r in t)
    assert t[1][4] + t[2][4] == pytest.approx(1.0)
    assert t[1][1:4] == [v.between, *v.between_ci]
    for row in t[1:5]:
        assert row[2] <= row[1] <= row[3]
    # balanced Dyestuff (six batches): no remark on the components, n0 is the common size 5
    assert [r[5] for r in t[1:5]] == [None, None, None, None]
    assert t[5][1:5] == [5.0, None, None, None] and "common group size" in t[5][5]
    assert "Ting" in v.method and "Graybill & Wang" in v.method and "Searle" in v.method


def test_truncation_note_reaches_the_table():
    # the between estimate (MSB - MSW)/n0 is negative here (checked against the field), so the
    # sheet must say why Between and the ICC show 0
    groups = [[1.0, 5.0, 3.0, 2.0], [4.0, 2.0, 3.0, 3.0], [3.0, 2.0, 4.0, 3.2], [1.0, 4.0, 3.0, 3.1], [5.0, 1.0, 2.0, 4.0]]
    v = variance_components(groups)
    assert v.between_raw < 0
    rows = {r[0]: r for r in v.table()[1:]}
    assert rows["Between groups"][1] == 0.0
    assert "negative" in rows["Between groups"][5] and "shown as 0" in rows["Between groups"][5]
    assert rows["Intraclass correlation"][1] == 0.0
    assert "between-group estimate is shown as 0" in rows["Intraclass correlation"][5]
    assert rows["Within groups"][5] is None
    assert rows["Effective group size n0"][1] == 4.0


def test_unequal_sizes_and_few_groups_notes_reach_the_table():
    # sizes 3, 5, 8: n0 = 4.9375 (Searle, Casella & McCulloch 1992, ch. 3, as above)
    groups = [[10.1, 10.4, 9.8], [11.0, 11.3, 10.7, 11.1, 10.9], [9.5, 9.9, 9.7, 9.2, 9.8, 9.6, 9.4, 10.0]]
    rows = {r[0]: r for r in variance_components(groups).table()[1:]}
    assert rows["Effective group size n0"][1] == 4.9375
    assert "n0 = 4.9375" in rows["Effective group size n0"][5]
    for name in ("Between groups", "Total", "Intraclass correlation"):
        assert "approximate" in rows[name][5]
    assert "only 3 groups" in rows["Between groups"][5]
    assert rows["Within groups"][5] is None  # the chi-square interval is exact whatever the sizes


def test_every_note_cell_fits_a_spreadsheet_cell():
    # the Between groups row with all three of its notes (negative estimate, unequal sizes, few
    # groups) stays within the 255 characters a cell of an array result keeps (common practice)
    groups = [[1.0, 5.0, 3.0, 2.0], [4.0, 2.0, 3.0, 3.0, 3.0], [3.0, 2.0, 4.0]]
    v = variance_components(groups)
    assert v.between_raw < 0 and not v.balanced
    note = {r[0]: r[5] for r in v.table()[1:]}["Between groups"]
    assert "negative" in note and "approximate" in note and "only 3 groups" in note
    assert all(len(r[5] or "") <= 255 for r in v.table()[1:]), note
    assert any("vary no more than" in n for n in v.notes)  # the full wording stays in notes


def test_no_within_variation_note_reaches_the_table():
    groups = [[2.0, 2.0, 2.0], [5.0, 5.0, 5.0], [3.0, 3.0, 3.0], [7.0, 7.0, 7.0]]
    rows = {r[0]: r for r in variance_components(groups).table()[1:]}
    assert rows["Within groups"][1:4] == [0.0, 0.0, 0.0]
    assert "no variation within groups" in rows["Within groups"][5]


def test_few_groups_note():
    v = variance_components([[1.0, 2.0, 3.0], [4.0, 5.0, 6.5], [2.0, 2.5, 3.5]])
    assert any("only 3 groups" in nt for nt in v.notes)


def test_exact_path_with_a_large_constant():
    # decimal-exact mean squares: the 1e9 offset must not cost digits (by hand: group means
    # 0.2 and 0.5 above the offset, MSW = 0.01, MSB = 3 * 0.15^2 * 2 = 0.135)
    base = 1e9
    v = variance_components([[base + 0.1, base + 0.3, base + 0.2], [base + 0.4, base + 0.6, base + 0.5]])
    assert v.exact
    assert v.within == pytest.approx(0.01, rel=1e-14)
    assert v.between == pytest.approx((0.135 - 0.01) / 3, rel=1e-14)


@pytest.mark.parametrize(
    "groups,conf,match",
    [
        ([[1.0, 2.0, 3.0]], 0.95, "at least two groups"),
        ([[1.0], [2.0], [3.0]], 0.95, "residual degrees of freedom"),
        ([[4.0, 4.0], [4.0, 4.0]], 0.95, "identical"),
        ([[1.0, 2.0], [3.0, 4.0]], 95, "confidence level"),
        ([[1.0, 2.0], [3.0, 4.0]], None, "confidence level"),
    ],
)
def test_bad_input_messages(groups, conf, match):
    with pytest.raises(InputError, match=match) as info:
        variance_components(groups, conf=conf)
    msg = str(info.value)
    assert msg.startswith("sheetfuncs: ") and "\n" not in msg
