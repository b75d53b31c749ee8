"""The report's context: one analysis with the report's names and the decimals figures are shown
with (the centring itself is checked in tests/stats/test_centring.py)."""

from __future__ import annotations

import numpy as np

from sheetfuncs.report.context import prepare


def test_float_path_decimals_follow_the_spread():
    # invented: formula-result weights (g) around 250 with SD about 2: decimals from the SD,
    # two more for means (common practice), not a fixed four
    rng = np.random.default_rng(3)
    g = {f"Cell {i}": (250 + 2 * rng.standard_normal(8)).tolist() for i in range(3)}
    an = prepare(g)
    assert not an.exact
    assert an.precision.value == 2 and an.precision.mean == 4
