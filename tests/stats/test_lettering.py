"""Compact letter display (insert-and-absorb with sweeping, Piepho 2004).

The checks are properties of any correct letter display, tested on hand-made cases and with
hypothesis on random separation patterns and random data: two groups share a letter exactly
when the comparisons do not separate them; no letter of any group can be dropped without
breaking that; "a" belongs to the group with the highest mean.
"""

from __future__ import annotations

import dataclasses
import itertools
from collections.abc import Mapping

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from sheetfuncs.errors import InputError
from sheetfuncs.stats.lettering import LettersResult, letter_sets, letters, name_letters
from sheetfuncs.stats.comparisons import pairwise

# Invented data: tensile strength (MPa) of test bars from five suppliers.
SUPPLIERS = {
    "North": [412.0, 415.5, 410.8, 414.2, 413.1],
    "Harbour": [405.2, 407.9, 404.6, 406.8, 405.5],
    "Valley": [413.4, 416.0, 414.9, 412.7, 415.3],
    "Ridge": [409.1, 411.8, 408.7, 410.5, 410.0],
    "Mill": [398.2, 400.5, 397.6, 399.9, 398.8],
}


def shares(strings: list[str], i: int, j: int) -> bool:
    return bool(set(strings[i].split() if " " in strings[i] else strings[i])
                & set(strings[j].split() if " " in strings[j] else strings[j]))


def check_display(k: int, separated: set[frozenset[int]], cols: list[frozenset[int]]) -> None:
    """Every property a letter display must have (raises AssertionError otherwise)."""
    def covered(cs: list[frozenset[int]]) -> bool:
        return all(
            any(i in c and j in c for c in cs) == (frozenset((i, j)) not in separated)
            for i, j in itertools.combinations(range(k), 2)
        ) and all(any(g in c for c in cs) for g in range(k))

    assert covered(cols)
    for n, c in enumerate(cols):
        for g in c:
            trial = list(cols)
            trial[n] = c - {g}
            trial = [x for x in trial if x]
            assert not covered(trial), f"group {g} in letter {sorted(c)} is redundant"


# ------------------------------------------------------------------------------------------
# hand-made cases


def test_no_differences_gives_one_letter():
    assert name_letters(letter_sets(4, []), [1, 2, 3, 4]) == ["a", "a", "a", "a"]


def test_every_pair_different_gives_one_letter_each_by_mean():
    pairs = list(itertools.combinations(range(4), 2))
    assert name_letters(letter_sets(4, pairs), [2.0, 4.0, 1.0, 3.0]) == ["c", "a", "d", "b"]


def test_chain_of_overlaps():
    # means fall from group 0 to group 3; only the extremes differ
    cols = letter_sets(4, [(0, 3)])
    assert name_letters(cols, [4.0, 3.0, 2.0, 1.0]) == ["a", "ab", "ab", "b"]


def test_sweep_removes_a_letter_that_insert_and_absorb_leaves():
    # insert-and-absorb alone gives {0,2,4}, {1,2,3}, {2,3,4}; group 2's share of the third
    # letter is redundant (its pairs with 3 and 4 are covered by the other two letters)
    sep = [(0, 1), (0, 3), (1, 4)]
    cols = letter_sets(5, sep)
    assert sorted(map(sorted, cols)) == [[0, 2, 4], [1, 2, 3], [3, 4]]
    check_display(5, {frozenset(p) for p in sep}, cols)


def test_a_goes_to_the_highest_mean_and_letters_are_alphabetical():
    cols = letter_sets(3, [(0, 2)])
    assert name_letters(cols, [1.0, 2.0, 3.0]) == ["b", "ab", "a"]


def test_many_letters_stay_readable():
    k = 60
    pairs = list(itertools.combinations(range(k), 2))
    out = name_letters(letter_sets(k, pairs), list(range(k, 0, -1)))
    assert out[0] == "a" and out[25] == "z" and out[26] == "A" and out[51] == "Z"
    assert len(set(out)) == k and all(len(s) == 2 for s in out[52:])


# ------------------------------------------------------------------------------------------
# the result object


def test_letters_on_data_are_a_read_only_mapping_in_group_order():
    res = letters(SUPPLIERS)
    assert isinstance(res, Mapping) and isinstance(res, LettersResult)
    assert list(res) == list(SUPPLIERS)
    assert len(res) == 5 and "North" in res and "Nowhere" not in res
    assert "a" in res["Valley"] and "a" in res["North"]
    assert res["Mill"] and "a" not in res["Mill"]
    with pytest.raises(KeyError):
        res["Nowhere"]
    with pytest.raises(TypeError):
        res["North"] = "z"  # type: ignore[index]
    with pytest.raises(dataclasses.FrozenInstanceError):
        res.method = "holm"  # type: ignore[misc]
    assert res.method == "tukey" and res.alpha == 0.05
    assert res.comparisons.method == "tukey"


def test_table_sorts_by_mean_highest_first():
    res = letters(SUPPLIERS, "bonferroni")
    tab = res.table()
    assert tab[0] == ["Group", "Mean", "Letters"]
    assert [row[0] for row in tab[1:]] == ["Valley", "North", "Ridge", "Harbour", "Mill"]
    assert tab[1][2].startswith("a")
    means = [row[1] for row in tab[1:]]
    assert means == sorted(means, reverse=True)


def test_letters_match_the_comparisons_on_data():
    for method in ("tukey", "holm", "games-howell"):
        res = letters(SUPPLIERS, method)
        labs = list(SUPPLIERS)
        strings = [res[x] for x in labs]
        for r in res.comparisons.rows:
            i, j = labs.index(r.group_a), labs.index(r.group_b)
            assert shares(strings, i, j) == (not r.differs), (method, r)


def test_dunnett_and_unknown_methods_are_refused():
    with pytest.raises(InputError, match="every pair"):
        letters(SUPPLIERS, "dunnett")
    with pytest.raises(InputError, match='"scheffe"'):
        letters(SUPPLIERS, "duncan")


# ------------------------------------------------------------------------------------------
# properties


@st.composite
def separation(draw):
    k = draw(st.integers(2, 8))
    pairs = list(itertools.combinations(range(k), 2))
    mask = draw(st.lists(st.booleans(), min_size=len(pairs), max_size=len(pairs)))
    means = draw(st.lists(st.floats(-100, 100), min_size=k, max_size=k))
    order = draw(st.permutations(pairs))
    sep = [p for p, m in zip(pairs, mask) if m]
    sep = [p for p in order if p in sep]
    return k, sep, means


@settings(max_examples=300)
@given(separation())
def test_share_a_letter_exactly_when_not_separated_and_none_redundant(case):
    k, sep, means = case
    cols = letter_sets(k, sep)
    check_display(k, {frozenset(p) for p in sep}, cols)
    strings = name_letters(cols, means)
    for i, j in itertools.combinations(range(k), 2):
        assert shares(strings, i, j) == ((i, j) not in sep)
    top = max(range(k), key=lambda g: (means[g], -g))
    assert "a" in strings[top]


@settings(max_examples=25)
@given(
    st.lists(
        st.lists(st.integers(0, 40).map(lambda v: 100 + v / 4), min_size=3, max_size=6),
        min_size=2, max_size=6,
    ),
    st.sampled_from(["bonferroni", "holm", "sidak", "scheffe"]),
)
def test_letters_on_random_data_follow_the_method(data, method):
    try:
        res = letters(data, method)
    except InputError:
        # every value identical: there is nothing to compare, and the message says so
        assert len({v for g in data for v in g}) == 1
        return
    labs = res.labels
    strings = [res[x] for x in labs]
    differ = {frozenset((r.group_a, r.group_b)) for r in pairwise(data, method).rows if r.differs}
    for i, j in itertools.combinations(range(len(labs)), 2):
        assert shares(strings, i, j) == (frozenset((labs[i], labs[j])) not in differ)


def test_the_documented_example_matches():
    # source: the worked example of docs/comparisons.md (keeps the page and the code in step)
    res = letters(SUPPLIERS, "games-howell")
    assert dict(res) == {"North": "ab", "Harbour": "c", "Valley": "a", "Ridge": "b", "Mill": "d"}
