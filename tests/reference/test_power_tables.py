"""Sample sizes against Cohen (1988), *Statistical Power Analysis for the Behavioral Sciences*,
2nd ed., ch. 8 sample-size table (n per group for the one-way F test, alpha = .05, power .80).

Cohen built his tables with approximations to the noncentral F; our values come from the
noncentral F itself. The entries below are ones where the two agree.
"""

from __future__ import annotations

import pytest

from sheetfuncs.stats.planning import power, sample_size


def test_acceptance_entry_k4_f025():
    # Cohen (1988) ch. 8 sample-size table: u = 3 (k = 4), f = .25, alpha = .05, power .80 -> n = 45
    assert sample_size(4, 0.25, power=0.8, alpha=0.05) == 45


@pytest.mark.parametrize(
    "k,f,n",
    [
        (2, 0.25, 64),   # from memory: Cohen (1988) ch. 8 sample-size table, u = 1, f = .25 -> 64
        (2, 0.40, 26),   # from memory: Cohen (1988) ch. 8 sample-size table, u = 1, f = .40 -> 26
        (4, 0.10, 274),  # from memory: Cohen (1988) ch. 8 sample-size table, u = 3, f = .10 -> 274
    ],
)
def test_more_table_entries(k, f, n):
    assert sample_size(k, f, power=0.8, alpha=0.05) == n


def test_two_groups_match_the_two_sample_t_table():
    # from memory: Cohen (1988) ch. 2 sample-size table, two-sided t test, d = .5, alpha = .05, power .80
    # -> 64 per group; with two groups f = d / 2 and F = t^2, so the F plan must agree
    assert sample_size(2, 0.5 / 2, power=0.8, alpha=0.05) == 64
    assert power(2, 64, 0.25) >= 0.80 > power(2, 63, 0.25)
