"""The worksheet functions through xlwings' own Windows code (xlwings 0.37.8, ``udfs``,
``com_server``, ``conversion``), with stand-ins only for pywin32 and one COM Range object
(tests/support/xlwings_com.py): its "Import Functions" VBA generation, and every example called
through its real call path, compared with the harness. The real path is the reference.
"""

from __future__ import annotations

import re
import types
from pathlib import Path
from typing import Any

import pytest

from sheetfuncs.worksheet import harness
from sheetfuncs.worksheet.docs import resolve
from sheetfuncs.worksheet.functions import EXAMPLE_SHEET, REGISTRY
from sheetfuncs.worksheet.registry import DIALOG_LIMIT, MISSING, Ref
from tests.support.xlwings_com import MODULE, VBA_MISSING, ComRange, real_xlwings_com
from tests.support.xlwings_engine import com_value

# VBA reserved words (keywords and statements that cannot name a procedure or an argument), from
# the VBA language reference (from memory; the words a short function or argument name could hit).
VBA_RESERVED = frozenset("""
and as boolean byref byte byval call case const currency date decimal declare dim do double each
else elseif empty end enum eqv erase error event exit false for friend function get global gosub
goto if imp implements in integer is let lib like long loop lset me mod new next not nothing null
on option optional or paramarray preserve private property public raiseevent redim rem resume
return rset select set single static step stop string sub then to true type typeof until variant
wend while with withevents xor
""".split())
# Excel built-in worksheet functions whose names a statistics function or argument could take,
# from Excel's function reference (from memory).
EXCEL_BUILTINS = frozenset("""
average avedev count counta f.dist f.dist.rt f.inv f.inv.rt f.test fdist finv ftest devsq stdev
stdev.s stdev.p var var.s var.p t.test ttest t.dist t.inv t.inv.2t chisq.test confidence
confidence.t index match sum sumsq min max median mode rank percentile quartile norm.dist
norm.s.inv linest trend growth forecast correl pearson rsq slope intercept steyx skew kurt
standardize z.test ztest large small frequency power sqrt exp ln log sort unique filter sequence let lambda value text
n t na na error.type type
""".split())
# Argument names that are also Excel function names, known and harmless: a VBA parameter lives in
# its procedure's own scope, and Excel's N() and POWER() are reached from VBA only through
# WorksheetFunction, so the wrappers compile and call as usual (renaming them would change
# public argument names). Any other clash fails.
ALLOWED_ARGUMENTS = frozenset({"n", "power"})
# 0.37.8 is the release these tests ran on; pyproject allows only it, so that pip never installs
# a release nobody verified (widen both together after running these tests on another).
VERIFIED = "0.37.8"


class _Components:
    """The workbook's VBComponents: ``VBComponents("xlwings_udfs")`` finds one, ``Remove`` and
    ``Import`` (which keeps the text of the VBA module it is given)."""

    def __init__(self, seen: dict[str, Any]) -> None:
        self.seen = seen

    def __call__(self, name: str) -> str:
        return name

    def Remove(self, component: str) -> None:
        self.seen["removed"] = component

    def Import(self, path: str) -> None:
        with open(path, encoding="utf-8") as fh:
            self.seen["vba"] = fh.read()


@pytest.fixture(scope="module")
def imported(xlwings_com) -> dict[str, Any]:
    """What xlwings' "Import Functions" (``udfs.import_udfs``) writes for ``sheetfuncs.udfs``
    into a stand-in workbook: the VBA module and every MacroOptions call."""
    seen: dict[str, Any] = {"options": []}
    app = types.SimpleNamespace(Version="16.0", MacroOptions=lambda macro, **kw: seen["options"].append((macro, kw)))
    book = types.SimpleNamespace(
        Name="sheetfuncs.xlsm", VBProject=types.SimpleNamespace(VBComponents=_Components(seen)), Application=app,
    )
    xlwings_com.udfs.import_udfs(MODULE, book)
    assert seen["removed"] == "xlwings_udfs"
    return seen


def test_xlwings_requirement_is_bounded_to_the_verified_version() -> None:
    import xlwings

    pyproject = Path(__file__).resolve().parents[2] / "pyproject.toml"
    (req,) = re.findall(r'^\s*"(xlwings[^"]*)"', pyproject.read_text(encoding="utf-8"), flags=re.M)
    assert req == f"xlwings>={VERIFIED},<0.37.9", "bound xlwings to the versions these tests ran on"
    assert ".".join(xlwings.__version__.split(".")[:3]) == VERIFIED, (
        f"these tests were verified on xlwings {VERIFIED}, not {xlwings.__version__}; when they "
        "pass, add the version here and widen the bound in pyproject.toml"
    )


def test_vba_generated_for_every_function(imported) -> None:
    vba: str = imported["vba"]
    declared = re.findall(r"^Function (SF_\w+)\(", vba, flags=re.M)
    assert declared == sorted(REGISTRY), "xlwings declares the functions in dir() order"
    assert len(imported["options"]) == len(REGISTRY)
    assert sorted(m.split("!")[1] for m, _ in imported["options"]) == sorted(REGISTRY)
    for name in REGISTRY:
        assert f'{name} = XLPy.CallUDF("{MODULE}", "{name}", ' in vba
    print(f"\nxlwings {VERIFIED}: {len(declared)} functions, {len(vba.splitlines())} VBA lines, "
          f"{len(imported['options'])} MacroOptions calls")


def test_no_vba_reserved_word_or_excel_function_name(imported) -> None:
    vba: str = imported["vba"]
    for line in re.findall(r"^Function (SF_\w+)\((.*)\)$", vba, flags=re.M):
        name, params = line
        words = [name] + [p.replace("Optional ", "").strip() for p in params.split(",") if p.strip()]
        for w in words:
            assert w.lower() not in VBA_RESERVED, f"{name}: {w} is a VBA reserved word"
            if w == name or w not in ALLOWED_ARGUMENTS:
                assert w.lower() not in EXCEL_BUILTINS, f"{name}: {w} is an Excel worksheet function"
    assert VBA_RESERVED & {"function", "optional", "to", "error"} and "f.test" in EXCEL_BUILTINS


def test_descriptions_within_the_dialog_limit(xlwings_com, imported) -> None:
    # xlwings cuts at 255 without a word ([:255]); the registry must never need it
    longest_f = longest_a = 0
    for name in REGISTRY:
        info = xlwings_com.module.__dict__[name].__xlfunc__
        assert info["ret"]["doc"] == REGISTRY[name].description
        assert info["category"] == "sheetfuncs"
        docs = [a["doc"] for a in info["args"]]
        assert docs == [a.dialog_text for a in REGISTRY[name].args]
        assert len(info["ret"]["doc"]) <= DIALOG_LIMIT, f"{name}: description too long"
        for a, doc in zip(info["args"], docs):
            assert len(doc) <= DIALOG_LIMIT, f"{name}({a['name']}): argument help of {len(doc)} characters"
        longest_f = max(longest_f, len(info["ret"]["doc"]))
        longest_a = max(longest_a, *map(len, docs))
    for macro, kw in imported["options"]:
        name = macro.split("!")[1]
        assert kw["Description"] == REGISTRY[name].description and kw["Category"] == "sheetfuncs"
        assert kw["ArgumentDescriptions"] == [a.dialog_text for a in REGISTRY[name].args]
    print(f"\nlongest description {longest_f}, longest argument help {longest_a} characters")


# --------------------------------------------------------------------------------------------
# every example through xlwings' real call path, against the harness


def _host_form(value: Any, cells: tuple[tuple[Any, ...], ...]) -> tuple[Any, Any]:
    """One example argument as the harness takes it and as the VBA wrapper hands it to COM:
    a reference as a COM Range, a one-row array constant as pywin32's flat tuple."""
    if isinstance(value, Ref):
        rows = resolve(value, cells)
        return rows, ComRange(com_value(rows))
    if value is MISSING:
        return MISSING, VBA_MISSING
    if isinstance(value, tuple):
        com = com_value([list(r) for r in value])
        return (value[0], com[0]) if len(value) == 1 else (value, com)
    return value, harness.host_value(value)


def _as_shown(res: Any) -> Any:
    """What ``CallUDF`` returns (one value, one row as a flat list, or rows) as the harness shows it."""
    if isinstance(res, list) and res and not isinstance(res[0], list):
        return [res]
    return res


def _same(real: Any, mine: Any) -> bool:
    """Equal and of the same type, cell by cell (numbers exactly, text equal)."""
    if isinstance(real, list):
        return isinstance(mine, list) and len(real) == len(mine) and all(map(_same, real, mine))
    return type(real) is type(mine) and real == mine


def _cases() -> list[tuple[str, str, tuple[Any, ...], tuple[tuple[Any, ...], ...]]]:
    """Every registry example (the docs' examples), then every function that takes data on the
    example sheet with each labels option, and on that sheet with labels of 300 characters."""
    cases = [(f"{n} example", n, r.example.args, r.example.cells or EXAMPLE_SHEET) for n, r in REGISTRY.items()]
    long_sheet = (tuple(f"{h} " + "x" * 293 for h in EXAMPLE_SHEET[0]),) + EXAMPLE_SHEET[1:]
    for name, rec in REGISTRY.items():
        if rec.args[0].name != "data":
            continue
        extra = tuple(a for a, spec in zip(rec.example.args[1:], rec.args[1:]) if spec.required)
        labels_at = [a.name for a in rec.args].index("labels")
        for labels in (True, False, "auto"):
            args = (Ref("A1:C7"),) + extra + (MISSING,) * (labels_at - 1 - len(extra)) + (labels,)
            cases.append((f"{name} labels={labels}", name, args, EXAMPLE_SHEET))
        cases.append((f"{name} long labels", name, (Ref("A1:C7"),) + extra, long_sheet))
    return cases


_CASES = _cases()


@pytest.mark.parametrize(("case", "name", "args", "cells"), _CASES, ids=[c[0] for c in _CASES])
def test_example_equals_harness(xlwings_com, case, name, args, cells) -> None:
    mine, com = zip(*(_host_form(a, cells) for a in args)) if args else ((), ())
    real = _as_shown(xlwings_com.com_call(name, *com))
    assert _same(real, harness.call(name, *mine)), f"{case}: harness differs from xlwings"
    texts = [v for row in (real if isinstance(real, list) else []) for v in row if isinstance(v, str)]
    assert all(len(t) <= 255 for t in texts), f"{case}: a table cell over 255 characters"  # common practice


def test_every_example_compared() -> None:
    assert sum(c[0].endswith(" example") for c in _CASES) == len(REGISTRY)
    print(f"\n{len(_CASES)} calls compared through xlwings {VERIFIED}'s com_server, udfs and conversion")


def test_stand_ins_leave_sys_modules_as_they_were(xlwings_pipeline) -> None:
    import sys

    import xlwings

    # (whether or not this module's fixture has its own stand-ins in place at the moment)
    names = ("pythoncom", "pywintypes", "win32com.client", "xlwings.udfs", "xlwings.com_server")
    before = {name: sys.modules.get(name) for name in names}
    attrs = {name: getattr(xlwings, name, None) for name in ("_xlwindows", "udfs", "com_server")}
    with real_xlwings_com() as side:
        assert sys.modules["xlwings.udfs"] is side.udfs and sys.modules["pythoncom"] is not before["pythoncom"]
        assert side.com_call("SF_FTAIL", 4.1, 2.0, 14.0) == harness.call("SF_FTAIL", 4.1, 2, 14)
    assert {name: sys.modules.get(name) for name in names} == before
    assert {name: getattr(xlwings, name, None) for name in attrs} == attrs
