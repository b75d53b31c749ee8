"""sheetfuncs.stats.linear: the general linear test (pooling) and single-df contrasts."""

from __future__ import annotations

import math

import numpy as np
import pytest
import statsmodels.api as sm

import sheetfuncs as sf
from sheetfuncs import InputError, as_groups
from sheetfuncs.stats.linear import per_group_argument

ZONES = {  # invented cure-oven zone readings, for argument handling only
    "Zone 1": [181.2, 180.7, 182.0, 181.5],
    "Zone 2": [181.9, 182.4, 181.6],
    "Zone 3": [184.0, 183.1, 183.8, 184.4, 183.5],
    "Zone 4": [183.9, 184.2, 183.0],
}


def indicator_ols(groups):
    values = np.concatenate([np.asarray(g, float) for g in groups])
    codes = np.concatenate([np.full(len(g), i) for i, g in enumerate(groups)])
    design = np.column_stack([(codes == i).astype(float) for i in range(len(groups))])
    return sm.OLS(values, design).fit()


def test_pooling_result_and_table():
    r = sf.linear_test(ZONES, ["low", "low", "high", "high"])
    assert r.pools == (("low", ("Zone 1", "Zone 2")), ("high", ("Zone 3", "Zone 4")))
    assert r.df_full == 15 - 4 and r.df_reduced == 15 - 2 and r.df_difference == 2
    assert r.exact
    t = r.table()
    assert t[0] == ["Model", "df", "SS", "MS", "F", "p"]
    assert [row[0] for row in t[1:]] == ["Reduced residual", "Full residual", "Difference"]
    assert t[3][4] == r.f and t[3][5] == r.p
    assert t[3][2] == pytest.approx(r.ss_reduced - r.ss_full, rel=1e-15)


def test_pooling_against_statsmodels():
    # statsmodels OLS compare_f_test (reference library)
    groups = list(ZONES.values())
    full = indicator_ols(groups)
    reduced = indicator_ols([groups[0] + groups[1], groups[2] + groups[3]])
    f_ref, p_ref, _ = full.compare_f_test(reduced)
    r = sf.linear_test(ZONES, ["low", "low", "high", "high"])
    assert r.f == pytest.approx(f_ref, rel=1e-10) and r.p == pytest.approx(p_ref, rel=1e-10)


def test_pooling_labels_may_be_numbers_and_a_spreadsheet_row():
    a = sf.linear_test(ZONES, [[1, 1, 2, 2]])
    b = sf.linear_test(ZONES, [1.0, 1.0, 2.0, 2.0, None, ""])  # trailing blanks are dropped
    assert a.f == b.f
    assert a.pools[0][0] == "1"


def test_per_group_arguments_as_a_column_drawn_wider_or_a_row_drawn_taller():
    # common practice: a range drawn larger than its values, the extra cells blank
    plain = sf.contrast(ZONES, [1, -1, 0, 0]).estimate
    wider = [[1, None], [-1, ""], [0, None], [0, None], [None, None]]
    taller = [[1, -1, 0, 0, None], [None, None, None, None, None]]
    assert sf.contrast(ZONES, wider).estimate == plain
    assert sf.contrast(ZONES, taller).estimate == plain
    assert sf.linear_test(ZONES, [["a", None], ["a", None], ["b", None], ["b", None]]).f == \
        sf.linear_test(ZONES, ["a", "a", "b", "b"]).f


@pytest.mark.parametrize("block", [
    [[1, -1], [0, 0]],                   # 2 x 2 for four groups: which order?
    [[1, -1, None], [None, 0, None]],
    np.array([[1.0, -1.0], [0.0, 0.0]]),
])
def test_per_group_argument_as_a_block_is_an_input_error(block):
    with pytest.raises(InputError, match="^sheetfuncs: weights fill a block of 2 rows and 2 columns; "
                       "give one per group in a single row or column$"):
        sf.contrast(ZONES, block)


def test_a_gap_in_a_per_group_column_is_kept():
    # a blank inside the column is not dropped (that would shift the weights silently)
    with pytest.raises(InputError):
        sf.contrast(ZONES, [[1], [None], [-1], [0], [0]])


def test_pooling_everything_is_the_one_way_test():
    r = sf.linear_test(ZONES, ["all"] * 4)
    one = sf.oneway(ZONES)
    assert r.f == one.f and r.p == one.p


def test_pooling_length_mismatch_names_both_lengths():
    with pytest.raises(InputError) as e:
        sf.linear_test(ZONES, ["a", "a", "b"])
    assert str(e.value) == (
        "sheetfuncs: 3 pooling labels for 4 groups; give one per group, in the order of the "
        "groups (Zone 1, Zone 2, Zone 3, Zone 4)"
    )


def test_pooling_blank_label_and_full_model():
    with pytest.raises(InputError, match='^sheetfuncs: the pooling label for group "Zone 2" is blank'):
        sf.linear_test(ZONES, ["a", " ", "b", "b"])
    with pytest.raises(InputError, match="^sheetfuncs: every group has its own pooling label"):
        sf.linear_test(ZONES, ["a", "b", "c", "d"])


def test_pooling_identical_pools():
    with pytest.raises(InputError, match="^sheetfuncs: all values within each pool are identical"):
        sf.linear_test([[1.0, 1.0], [1.0], [2.0, 2.0]], ["x", "x", "y"])


def test_pooling_zero_within_variance_gives_infinite_f():
    r = sf.linear_test([[1.0, 1.0], [3.0, 3.0], [5.0]], ["x", "x", "y"])
    assert r.f == math.inf and r.p == 0.0


def test_per_group_argument_flattens_rows_and_columns():
    g = as_groups(ZONES)
    assert per_group_argument([[1], [2], [3], [4]], g, "weights") == [1, 2, 3, 4]
    assert per_group_argument(np.array([1.0, 2.0, 3.0, 4.0]), g, "weights") == [1.0, 2.0, 3.0, 4.0]
    with pytest.raises(InputError, match="^sheetfuncs: 1 weights for 4 groups"):
        per_group_argument(5, g, "weights")


# -- contrasts ---------------------------------------------------------------------------------


@pytest.mark.parametrize("exact", [None, False])
def test_contrast_against_statsmodels_t_test(exact):
    # statsmodels OLS t_test of the same contrast vector (reference library)
    w = [0.5, 0.5, -0.5, -0.5]
    fit = indicator_ols(list(ZONES.values()))
    ref = fit.t_test(np.array([w]))
    lo, hi = ref.conf_int(alpha=0.05)[0]
    c = sf.contrast(ZONES, w, exact=exact)
    assert c.estimate == pytest.approx(float(ref.effect[0]), rel=1e-12)
    assert c.se == pytest.approx(float(ref.sd[0, 0]), rel=1e-12)
    assert c.t == pytest.approx(float(ref.tvalue[0, 0]), rel=1e-12)
    assert c.p == pytest.approx(float(ref.pvalue), rel=1e-10)
    assert (c.ci.low, c.ci.high) == (pytest.approx(lo, rel=1e-12), pytest.approx(hi, rel=1e-12))
    assert c.df == 11
    assert c.table()[0] == ["Estimate", "SE", "t", "df", "p", "CI low", "CI high"]


def test_contrast_confidence_level():
    # reference library: statsmodels t_test conf_int at 90%
    w = [1, -1, 0, 0]
    fit = indicator_ols(list(ZONES.values()))
    lo, hi = fit.t_test(np.array([w], dtype=float)).conf_int(alpha=0.10)[0]
    c = sf.contrast(ZONES, w, conf=0.90)
    assert c.ci.low == pytest.approx(lo, rel=1e-12) and c.ci.high == pytest.approx(hi, rel=1e-12)


def test_contrast_weights_sum_tolerance():
    # weights may miss zero by 1e-12 of their absolute sum (issue 2), not more
    sf.contrast(ZONES, [1.0, -1.0 + 1e-13, 0.0, 0.0])
    with pytest.raises(InputError) as e:
        sf.contrast(ZONES, [1.0, -1.0 + 1e-11, 0.0, 0.0])
    assert str(e.value).startswith("sheetfuncs: contrast weights must sum to zero, but they sum to 1e-11")


@pytest.mark.parametrize("weights, message", [
    ([1, -1, 0], "3 weights for 4 groups; give one per group"),
    ([1, 1, 0, 0], "contrast weights must sum to zero, but they sum to 2"),
    ([0, 0, 0, 0], "all contrast weights are zero"),
    ([1, "x", 0, 0], 'the weight for group "Zone 2" is "x", not a number'),
    ([1, True, 0, 0], 'the weight for group "Zone 2" is TRUE, not a number'),
    ([1, -1, None, 0], 'the weight for group "Zone 3" is blank, not a number'),
    ([1, -1, float("inf"), 0], 'the weight for group "Zone 3" is not finite'),
])
def test_contrast_bad_weights(weights, message):
    with pytest.raises(InputError) as e:
        sf.contrast(ZONES, weights)
    assert str(e.value).startswith("sheetfuncs: " + message)


def test_contrast_bad_confidence_level():
    with pytest.raises(InputError, match=r"^sheetfuncs: the confidence level must lie strictly between 0 and 1 \(e.g. 0.95\), not 95"):
        sf.contrast(ZONES, [1, -1, 0, 0], conf=95)


def test_contrast_without_residual_variation():
    c = sf.contrast([[1.0, 1.0], [3.0, 3.0]], [1, -1])
    assert c.t == -math.inf and c.p == 0.0
    with pytest.raises(InputError, match="^sheetfuncs: the contrast and its standard error are both zero"):
        sf.contrast([[1.0, 1.0], [1.0, 1.0], [2.0, 2.0]], [1, -1, 0])


def test_contrast_keeps_digits_when_values_share_leading_digits():
    # values near 1e12 with decimals (as in NIST StRD SmLs07-09): the contrast of two group
    # means is 0.2 exactly on the exact path and to ~1e-4 relative (the binary rounding of
    # the data, not of the arithmetic) on the float path
    g = {"A": [1e12 + 0.4, 1e12 + 0.3, 1e12 + 0.5], "B": [1e12 + 0.2, 1e12 + 0.1, 1e12 + 0.3]}
    assert sf.contrast(g, [1, -1]).estimate == pytest.approx(0.2, rel=1e-15)
    assert sf.contrast(g, [1, -1], exact=False).estimate == pytest.approx(0.2, rel=1e-3)
