"""f_critical against published tables of upper critical values of the F distribution.

Two published tables, each compared at its own rounding (half a unit in the last printed place):

* "F Distribution table" of the atozmath.com distribution tables
  (https://www.atozmath.com/CONM/DistributionTables.aspx?q=f), four decimals, rows by
  denominator df and upper-tail area, columns numerator df 1-10, 15, 20, 25, 30, 40, 60, 100, 1000.
* "Statistical Table - F Distribution", LibreTexts Statistics, Las Positas College Math 40,
  appendix 13.4 (https://stats.libretexts.org/, section 13.04), two decimals (four or six
  significant figures in the first rows), upper-tail areas .100, .050, .025, .010, .001.
"""

from __future__ import annotations

import math

import pytest

from sheetfuncs import f_critical, f_tail

NUM_DF = (1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 15, 20, 25, 30, 40, 60, 100, 1000)

# atozmath.com F distribution table, four decimals: (denominator df, upper-tail area) -> row
ATOZ_4DP = {
    (1, 0.10): (39.8635, 49.5000, 53.5932, 55.8330, 57.2401, 58.2044, 58.9060, 59.4390, 59.8576,
                60.1950, 61.2203, 61.7403, 62.0545, 62.2650, 62.5291, 62.7943, 63.0073, 63.2960),
    (1, 0.05): (161.4476, 199.5000, 215.7073, 224.5832, 230.1619, 233.9860, 236.7684, 238.8827,
                240.5433, 241.8817, 245.9499, 248.0131, 249.2601, 250.0951, 251.1432, 252.1957,
                253.0411, 254.1868),
    (1, 0.025): (647.7890, 799.5000, 864.1630, 899.5833, 921.8479, 937.1111, 948.2169, 956.6562,
                 963.2846, 968.6274, 984.8668, 993.1028, 998.0808, 1001.4144, 1005.5981,
                 1009.8001, 1013.1748, 1017.7488),
    (1, 0.01): (4052.1807, 4999.5000, 5403.3520, 5624.5833, 5763.6496, 5858.9861, 5928.3557,
                5981.0703, 6022.4732, 6055.8467, 6157.2846, 6208.7302, 6239.8251, 6260.6486,
                6286.7821, 6313.0301, 6334.1100, 6362.6817),
    (2, 0.10): (8.5263, 9.0000, 9.1618, 9.2434, 9.2926, 9.3255, 9.3491, 9.3668, 9.3805, 9.3916,
                9.4247, 9.4413, 9.4513, 9.4579, 9.4662, 9.4746, 9.4812, 9.4902),
    (2, 0.05): (18.5128, 19.0000, 19.1643, 19.2468, 19.2964, 19.3295, 19.3532, 19.3710, 19.3848,
                19.3959, 19.4291, 19.4458, 19.4558, 19.4624, 19.4707, 19.4791, 19.4857, 19.4947),
    (2, 0.025): (38.5063, 39.0000, 39.1655, 39.2484, 39.2982, 39.3315, 39.3552, 39.3730, 39.3869,
                 39.3980, 39.4313, 39.4479, 39.4579, 39.4646, 39.4729, 39.4812, 39.4879, 39.4969),
    (2, 0.01): (98.5025, 99.0000, 99.1662, 99.2494, 99.2993, 99.3326, 99.3564, 99.3742, 99.3881,
                99.3992, 99.4325, 99.4492, 99.4592, 99.4658, 99.4742, 99.4825, 99.4892, 99.4982),
    (3, 0.10): (5.5383, 5.4624, 5.3908, 5.3426, 5.3092, 5.2847, 5.2662, 5.2517, 5.2400, 5.2304,
                5.2003, 5.1845, 5.1747, 5.1681, 5.1597, 5.1512, 5.1443, 5.1348),
    (3, 0.05): (10.1280, 9.5521, 9.2766, 9.1172, 9.0135, 8.9406, 8.8867, 8.8452, 8.8123, 8.7855,
                8.7029, 8.6602, 8.6341, 8.6166, 8.5944, 8.5720, 8.5539, 8.5292),
}

# LibreTexts appendix table, numerator df 1-9: (denominator df, upper-tail area) -> (row, step)
LIBRETEXTS = {
    (1, 0.010): ((4052.2, 4999.5, 5403.4, 5624.6, 5763.6, 5859.0, 5928.4, 5981.1, 6022.5), 0.1),
    (1, 0.001): ((405284, 500000, 540379, 562500, 576405, 585937, 592873, 598144, 602284), 1),
    (2, 0.001): ((998.50, 999.00, 999.17, 999.25, 999.30, 999.33, 999.36, 999.37, 999.39), 0.01),
    (3, 0.025): ((17.44, 16.04, 15.44, 15.10, 14.88, 14.73, 14.62, 14.54, 14.47), 0.01),
    (3, 0.010): ((34.12, 30.82, 29.46, 28.71, 28.24, 27.91, 27.67, 27.49, 27.35), 0.01),
    (3, 0.001): ((167.03, 148.50, 141.11, 137.10, 134.58, 132.85, 131.58, 130.62, 129.86), 0.01),
    (4, 0.100): ((4.54, 4.32, 4.19, 4.11, 4.05, 4.01, 3.98, 3.95, 3.94), 0.01),
    (4, 0.050): ((7.71, 6.94, 6.59, 6.39, 6.26, 6.16, 6.09, 6.04, 6.00), 0.01),
    (4, 0.025): ((12.22, 10.65, 9.98, 9.60, 9.36, 9.20, 9.07, 8.98, 8.90), 0.01),
    (4, 0.010): ((21.20, 18.00, 16.69, 15.98, 15.52, 15.21, 14.98, 14.80, 14.66), 0.01),
    (4, 0.001): ((74.14, 61.25, 56.18, 53.44, 51.71, 50.53, 49.66, 49.00, 48.47), 0.01),
    (5, 0.100): ((4.06, 3.78, 3.62, 3.52, 3.45, 3.40, 3.37, 3.34, 3.32), 0.01),
    (5, 0.050): ((6.61, 5.79, 5.41, 5.19, 5.05, 4.95, 4.88, 4.82, 4.77), 0.01),
    (5, 0.025): ((10.01, 8.43, 7.76, 7.39, 7.15, 6.98, 6.85, 6.76, 6.68), 0.01),
    (5, 0.010): ((16.26, 13.27, 12.06, 11.39, 10.97, 10.67, 10.46, 10.29, 10.16), 0.01),
    (5, 0.001): ((47.18, 37.12, 33.20, 31.09, 29.75, 28.83, 28.16, 27.65, 27.24), 0.01),
    (6, 0.100): ((3.78, 3.46, 3.29, 3.18, 3.11, 3.05, 3.01, 2.98, 2.96), 0.01),
    (6, 0.050): ((5.99, 5.14, 4.76, 4.53, 4.39, 4.28, 4.21, 4.15, 4.10), 0.01),
    (6, 0.025): ((8.81, 7.26, 6.60, 6.23, 5.99, 5.82, 5.70, 5.60, 5.52), 0.01),
    (6, 0.010): ((13.75, 10.92, 9.78, 9.15, 8.75, 8.47, 8.26, 8.10, 7.98), 0.01),
    (6, 0.001): ((35.51, 27.00, 23.70, 21.92, 20.80, 20.03, 19.46, 19.03, 18.69), 0.01),
    (7, 0.100): ((3.59, 3.26, 3.07, 2.96, 2.88, 2.83, 2.78, 2.75, 2.72), 0.01),
    (7, 0.050): ((5.59, 4.74, 4.35, 4.12, 3.97, 3.87, 3.79, 3.73, 3.68), 0.01),
}


def _half_unit(step: float) -> float:
    # half a unit in the last printed place, plus a hair for the binary value of the entry
    return 0.5 * step * (1 + 1e-9)


@pytest.mark.parametrize("key", sorted(ATOZ_4DP))
def test_f_critical_matches_atozmath_table_4dp(key):
    # atozmath.com "F Distribution table", four decimals
    df2, area = key
    for df1, published in zip(NUM_DF, ATOZ_4DP[key]):
        got = f_critical(area, df1, df2)
        assert abs(got - published) <= _half_unit(1e-4), (df1, df2, area, got, published)


@pytest.mark.parametrize("key", sorted(LIBRETEXTS))
def test_f_critical_matches_libretexts_table(key):
    # LibreTexts Statistics, appendix 13.4 "Statistical Table - F Distribution"
    df2, area = key
    row, step = LIBRETEXTS[key]
    for df1, published in enumerate(row, start=1):
        got = f_critical(area, df1, df2)
        assert abs(got - published) <= _half_unit(step), (df1, df2, area, got, published)


@pytest.mark.parametrize("area", [0.1, 0.05, 0.025, 0.01, 1e-3, 1e-6, 1e-20, 1e-100, 1e-250, 1e-300])
@pytest.mark.parametrize("df", [(1, 3), (2, 12), (4, 20), (9, 45), (20, 200), (3, 1000), (60, 7)])
def test_f_critical_round_trips_with_f_tail(area, df):
    # common practice: the critical value is the inverse of the upper tail. The tail moves by
    # about (df2/2) relative units per relative unit of x, and a tail evaluated through its
    # logarithm carries |ln p| units of rounding, so the round trip is checked to that many
    # units of double rounding.
    df1, df2 = df
    x = f_critical(area, df1, df2)
    assert math.isfinite(x) and x > 0
    back = f_tail(x, df1, df2)
    units = 1 + df2 / 2 + df1 / 2 + abs(math.log(area))
    assert abs(back - area) <= 4 * 2.2e-16 * units * area, (x, back)


def test_f_critical_beyond_the_largest_double_is_infinite():
    # from memory: for F(1, 1) the tail at x is (2/pi) atan(1/sqrt(x)) ~ (2/pi) x^-1/2, so a
    # tail of 1e-200 needs x ~ 4e399, beyond the largest double
    assert f_critical(1e-200, 1, 1) == math.inf
    assert f_tail(1.7976931348623157e308, 1, 1) > 1e-200
