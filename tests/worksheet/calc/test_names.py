"""How the worksheet functions are named inside Calc (sheetfuncs/worksheet/calc/names.py)."""

from __future__ import annotations

import re

from sheetfuncs.udfs import REGISTRY
from sheetfuncs.worksheet.calc.names import INTERFACE, MODULE, SERVICE, argument_name, method_name, stored_name

# A UNO identifier: letters, digits and underscores, starting with a letter, and (unoidl-write
# refuses it; measured with LibreOffice 7.4's SDK, see test_build.py) no underscore before a
# lower-case letter.
_IDENTIFIER = re.compile(r"[A-Za-z][A-Za-z0-9_]*")


def _valid(name: str) -> bool:
    return bool(_IDENTIFIER.fullmatch(name)) and re.search(r"_[a-z]", name) is None


def test_every_function_gets_a_distinct_valid_method_name() -> None:
    methods = {name: method_name(name) for name in REGISTRY}
    bad = {n: m for n, m in methods.items() if not _valid(m)}
    assert not bad, f"method names unoidl-write refuses: {bad}"
    assert len(set(methods.values())) == len(REGISTRY), "two functions share a method name"
    # Calc compares add-in names without case: distinct when upper-cased too
    assert len({m.upper() for m in methods.values()}) == len(REGISTRY)


def test_method_names_by_hand() -> None:
    # the documented spelling (names.py's docstring)
    assert method_name("SF_P") == "sfP"
    assert method_name("SF_BROWNFORSYTHE") == "sfBrownforsythe"
    assert method_name("SF_R2") == "sfR2"


def test_every_argument_gets_a_distinct_valid_name() -> None:
    for name, rec in REGISTRY.items():
        args = [argument_name(a.name) for a in rec.args]
        assert all(map(_valid, args)), f"{name}: argument names unoidl-write refuses: {args}"
        # 'document' is the first parameter of every method (the calling document)
        assert len(set(args + ["document"])) == len(args) + 1, f"{name}: argument names clash: {args}"


def test_argument_names_by_hand() -> None:
    assert argument_name("factor_name") == "factorName"
    assert argument_name("cohens_f") == "cohensF"
    assert argument_name("data") == "data"
    # every argument of the registry with an underscore becomes camelCase, none keeps one
    assert all("_" not in argument_name(a.name) for rec in REGISTRY.values() for a in rec.args)


def test_stored_name_is_what_calc_writes() -> None:
    # measured in LibreOffice 7.4 (an .xlsx saved by Calc with =SF_P(A1:C7) in a cell)
    assert stored_name("SF_P") == "ORG.SHEETFUNCS.CALC.FUNCTIONS.SFP"
    assert stored_name("SF_BROWNFORSYTHE") == "ORG.SHEETFUNCS.CALC.FUNCTIONS.SFBROWNFORSYTHE"
    stored = [stored_name(n) for n in REGISTRY]
    assert len(set(stored)) == len(REGISTRY)
    assert all(s == s.upper() and s.startswith(SERVICE.upper() + ".") for s in stored)


def test_service_and_interface_live_in_the_module() -> None:
    assert SERVICE == "org.sheetfuncs.calc.Functions"
    assert INTERFACE.rsplit(".", 1) == [MODULE, "XFunctions"]
    assert all(_valid(part) for part in (SERVICE + "." + INTERFACE).split("."))
