"""Extreme but valid inputs give an answer (or a clear message), never a traceback or a silently
wrong number."""

from __future__ import annotations

import math

import numpy as np
import pytest

import sheetfuncs as sf
from sheetfuncs.worksheet import harness

# Invented data.
GROUPS = {"A": [1.0, 2.0, 3.0, 2.5], "B": [2.0, 3.0, 4.0, 3.1], "C": [5.0, 6.0, 5.5, 6.2]}


def test_f_beyond_the_largest_double_is_infinite():
    # SSW ~ 1e-200 against SSB ~ 1e200: the exact ratio exceeds the double range (common practice:
    # an F ratio too large to represent is reported as infinite, p = 0).
    data = [[0.0, 1e-100], [1e100, 1e100], [1e100, 1e100]]
    res = sf.oneway(data)
    assert res.exact and res.f == math.inf and res.p == 0.0
    assert sf.linear_test(data, ["x", "x", "y"]).f == math.inf
    assert sf.oneway_from_summary([3, 4], [0, 1e12], [1e-144, 1e-144]).f == math.inf
    cell = harness.call("SF_F", [["A", "B", "C"], [0.0, 1e100, 1e100], [1e-100, 1e100, 1e100]])
    assert cell == 1.7976931348623157e308  # GUIDE.md: infinity shows as the largest double


@pytest.mark.parametrize("scale", [1e308, 1e200, 1e-160, 1e-200, 1e-300])
@pytest.mark.parametrize("exact", [None, False])
def test_contrast_is_scale_free(scale, exact):
    # t and p of a contrast do not depend on the scale of its weights (common practice); the
    # estimate and SE scale with them.
    base = sf.contrast(GROUPS, [1.0, -0.5, -0.5], exact=exact)
    res = sf.contrast(GROUPS, [scale, -scale / 2, -scale / 2], exact=exact)
    assert res.t == pytest.approx(base.t, rel=1e-14)
    assert res.p == pytest.approx(base.p, rel=1e-12)
    est = base.estimate * scale
    if math.isfinite(est):
        assert res.estimate == pytest.approx(est, rel=1e-14)
        assert res.se == pytest.approx(base.se * scale, rel=1e-14)
    else:
        assert res.estimate == -math.inf


def test_message_quoting_a_huge_label_fits_a_cell():
    label = "L" * 32_767
    out = harness.call("SF_TABLE", [[label, "B"], [None, 1.0], [None, 2.0]])
    assert isinstance(out, str) and out.startswith("sheetfuncs: ") and len(out) <= 1000


def test_games_howell_with_variances_beyond_doubles_gives_a_message():
    # a variance near 1e597 cannot be held in a double: a clear message, not an OverflowError
    with pytest.raises(sf.InputError, match="too large"):
        sf.pairwise([[9.303, 9.18, 10.39], [8.95e298, 1.25, 3.0]], "games-howell")


def test_contrast_estimate_does_not_move_with_a_large_shift():
    # weights 1, -1/3, -1/3, -1/3 sum to 5.6e-17 as doubles; that residue must not multiply a
    # mean near 1e12 (common practice: a contrast is unchanged by adding a constant to the data)
    base = {"A": [1.0011, 1.0014, 1.0017], "B": [1.0, 1.0003, 0.9997], "C": [0.9999, 1.0001, 1.0],
            "D": [1.0002, 0.9998, 1.0]}
    w = [1.0, -1 / 3, -1 / 3, -1 / 3]
    ref = sf.contrast(base, w)
    for shift_text in ("1000000000", "10000000000"):  # 14 and 15 significant digits: exact path
        shifted = {k: [float(_add(shift_text, v)) for v in vals] for k, vals in base.items()}
        res = sf.contrast(shifted, w)
        assert res.exact
        assert res.estimate == pytest.approx(ref.estimate, rel=1e-12)
        assert res.t == pytest.approx(ref.t, rel=1e-12)


def _add(constant: str, v: float) -> str:
    """The decimal sum of a decimal constant and the shortest decimal of v, as text."""
    from decimal import Decimal
    return str(Decimal(constant) + Decimal(repr(v)))


def test_groups_built_by_hand_are_checked():
    with pytest.raises(sf.InputError, match='group "b" has no numbers'):
        sf.Groups(("a", "b"), (np.array([1.0, 2.0]), np.array([])))
    with pytest.raises(sf.InputError, match="NaN"):
        sf.Groups(("a", "b"), (np.array([1.0, 2.0]), np.array([1.0, np.nan])))
    g = sf.Groups(("a", "b"), ([1, 2, 3], [4, 5]))  # plain lists are converted
    assert sf.oneway(g).df_within == 3


def test_integers_beyond_doubles_get_a_message():
    with pytest.raises(sf.InputError, match="finite"):
        sf.oneway_from_summary([3, 3], [10**400, 1], [1, 1])
    with pytest.raises(sf.InputError):
        sf.contrast(GROUPS, [10**400, -10**400, 0])
    assert sf.f_tail(10**400, 2, 3) == 0.0


def test_exact_argument_is_checked():
    with pytest.raises(sf.InputError, match="exact must be"):
        sf.oneway(GROUPS, exact="no")
