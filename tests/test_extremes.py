"""Extreme but valid inputs give an answer (or a clear message), never a traceback or a silently
wrong number."""

from __future__ import annotations

import math

import pytest

import sheetfuncs as sf
from sheetfuncs import harness

# Invented data.
GROUPS = {"A": [1.0, 2.0, 3.0, 2.5], "B": [2.0, 3.0, 4.0, 3.1], "C": [5.0, 6.0, 5.5, 6.2]}


def test_f_beyond_the_largest_double_is_infinite():
    # SSW ~ 1e-200 against SSB ~ 1e200: the exact ratio exceeds the double range (common practice:
    # an F ratio too large to represent is reported as infinite, p = 0).
    data = [[0.0, 1e-100], [1e100, 1e100], [1e100, 1e100]]
    res = sf.oneway(data)
    assert res.exact and res.f == math.inf and res.p == 0.0
    assert sf.linear_test(data, ["x", "x", "y"]).f == math.inf
    assert sf.oneway_from_summary([3, 4], [1, 2], [1e-200, 1e-200]).f == math.inf
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
