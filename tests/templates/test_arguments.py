"""Reading an SF_ call and its arguments from cells."""

from __future__ import annotations

import pytest

from sheetfuncs.errors import InputError
from sheetfuncs.templates.arguments import Call, is_sf_formula, parse_call, resolve
from sheetfuncs.worksheet.harness import MISSING

CELLS = {("Data", 1, 1): "A", ("Data", 2, 1): 1.5, ("Data", 1, 2): "B", ("Data", 2, 2): None,
         ("It's", 3, 3): 0.01}


def lookup(sheet: str, r: int, c: int) -> object:
    return CELLS.get((sheet, r, c))


def test_calls_and_their_arguments_are_split() -> None:
    assert parse_call('=SF_P(Meas, , "a,b""c", {1,2;3,4}, \'x, y\'!A1)', "E2") == Call(
        "SF_P", ("Meas", "", '"a,b""c"', "{1,2;3,4}", "'x, y'!A1"))
    assert parse_call("=_xludf.sf_table()", "E2") == Call("SF_TABLE", ())
    assert is_sf_formula('=ROUND(SF_P(A1:B3),2)') and not is_sf_formula('="SF_P(" & A1')


def test_nested_calls_are_refused_in_one_line() -> None:
    with pytest.raises(InputError, match=r"the formula in 'S'!E2 \(=ROUND\(SF_P\(A1:B3\),2\)\) is not one SF_ call"):
        parse_call("=ROUND(SF_P(A1:B3),2)", "'S'!E2")
    with pytest.raises(InputError, match="is not one SF_ call"):
        parse_call("=SF_P(SUM(A1:A3))", "E2")


def test_arguments_become_host_values() -> None:
    names = {"MEAS": "'Data'!$A$1:$B$2"}
    assert resolve("Meas", "Other", names, lookup, "E2") == [["A", "B"], [1.5, None]]
    assert resolve("A2", "Data", {}, lookup, "E2") == 1.5
    assert resolve("'It''s'!$C$3", "Data", {}, lookup, "E2") == 0.01
    assert resolve("", "Data", {}, lookup, "E2") is MISSING
    assert resolve("-1.5e-3", "Data", {}, lookup, "E2") == -0.0015
    assert resolve("true", "Data", {}, lookup, "E2") is True
    assert resolve('"say ""hi"""', "Data", {}, lookup, "E2") == 'say "hi"'
    assert resolve("{1,-0.5;2,\"x\"}", "Data", {}, lookup, "E2") == [[1.0, -0.5], [2.0, "x"]]
    with pytest.raises(InputError, match="the argument Table1\\[Head\\] of the formula in E2 is not a value"):
        resolve("Table1[Head]", "Data", {}, lookup, "E2")
    with pytest.raises(InputError, match="holds 'B2', which is not a number"):
        resolve("{1,B2}", "Data", {}, lookup, "E2")
