"""sheetfuncs.stats.outcome: an analysis that cannot run is kept with its reason; bugs stay visible."""

from __future__ import annotations

import pytest

import sheetfuncs as sf
from sheetfuncs.stats import Unavailable, attempt


def test_unavailable_reads_as_false_and_keeps_its_reason():
    u = Unavailable("Welch", "a group has one value")
    assert not u and u.what == "Welch" and u.reason == "a group has one value"


def test_attempt_keeps_bugs_visible_unless_asked():
    def bad_input():
        raise sf.InputError("group \"A\" has no numbers")

    def overflow():
        raise OverflowError("math range error")

    got = attempt("Welch", bad_input)
    assert got == Unavailable("Welch", 'group "A" has no numbers')
    with pytest.raises(OverflowError):
        attempt("Welch", overflow)
    got = attempt("Welch", overflow, numerical=True)
    assert isinstance(got, Unavailable) and "math range error" in got.reason
    assert attempt("sum", lambda: 3) == 3
