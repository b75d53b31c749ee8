"""Tests of the JSON records of comparisons, letters and effect sizes (sheetfuncs.cli.results).

Numeric checks: the in-memory sheetfuncs calls on the same invented values.
"""

from __future__ import annotations

import json

import sheetfuncs
from sheetfuncs.cli.output import json_ready
from sheetfuncs.cli.results import analysis_records, effects_record, letters_record, pairwise_record
from sheetfuncs.stats import Unavailable, analyse

# invented torque readings (N m) of three capping heads
HEADS = {"Cap 1": [2.31, 2.28, 2.35, 2.30], "Cap 2": [2.41, 2.44, 2.39, 2.46], "Cap 3": [2.33, 2.29, 2.36]}


def test_records_read_the_analysis_without_recomputing():
    an = analyse(HEADS)
    rec = analysis_records(an)
    assert [r["p"] for r in rec["pairwise"]["rows"]] == [r.p for r in sheetfuncs.pairwise(HEADS).rows]
    assert rec["letters"]["groups"][1] == {"group": "Cap 2", "mean": an.letters.means[1],
                                           "letters": sheetfuncs.letters(HEADS)["Cap 2"]}
    assert rec["effect_sizes"]["eta_squared"] == sheetfuncs.effect_sizes(HEADS, an.conf).eta_squared
    assert rec["unequal_variance_pairs"] is None or rec["unequal_variance_pairs"]["available"]
    json.dumps(json_ready(rec), allow_nan=False)  # strict JSON


def test_comparisons_not_computed_are_said_with_their_reason():
    an = analyse(HEADS, comparisons=False)
    rec = analysis_records(an)
    assert rec["pairwise"] == {"available": False, "what": "Tukey–Kramer",
                               "reason": "not computed: comparisons were not asked for"}
    assert rec["letters"]["available"] is False and rec["effect_sizes"]["available"] is True
    gone = Unavailable("effect sizes", "the groups hold one value each")
    for record in (pairwise_record, letters_record, effects_record):
        assert record(gone) == {"available": False, "what": "effect sizes",
                                "reason": "the groups hold one value each"}
