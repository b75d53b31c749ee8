"""The records of the worksheet functions and the decorator (sheetfuncs.worksheet.registry):
arguments, examples, formulas as typed, xlwings' decorators applied from the record, the
wrapper's signature checked against it, input problems as one line, collecting the records.

The numbers in these tests are invented; the rules checked are the worksheet-function
conventions of the project guide and common practice.
"""

from __future__ import annotations

import types
from fractions import Fraction
from typing import Any

import pytest

from sheetfuncs.worksheet import functions
from sheetfuncs.worksheet.functions import REGISTRY
from sheetfuncs.worksheet.registry import (
    CATEGORY, MISSING, REQUIRED, Arg, Example, Function, Ref, apply_xlwings, collect,
    formula_literal, formula_text, worksheet_function,
)


def test_arguments_as_the_dialog_and_the_docs_show_them() -> None:
    data = Arg("data", "range", "The measurements.")
    names = Arg("names", "range", "Group names.", default=None)
    conf = Arg("conf", "number", "Confidence level.", default=0.95)
    labels = Arg("labels", "logical", "Labels?", default="auto")
    assert data.required and data.default is REQUIRED and not conf.required
    assert [a.default_text for a in (data, names, conf, labels)] == ["required", "none", "0.95", '"auto"']
    assert data.dialog_text == "The measurements."
    assert names.dialog_text == "Group names. Optional."
    assert conf.dialog_text == "Confidence level. Optional; default 0.95."
    # xlwings 0.37 source: without err_to_str an error cell arrives as a blank; ndim=2 keeps rows
    assert data.xlwings_options == {"doc": "The measurements.", "err_to_str": True, "ndim": 2}
    assert conf.xlwings_options == {"doc": conf.dialog_text, "err_to_str": True}


def test_examples_use_the_shared_sheet_unless_they_lay_out_cells() -> None:
    assert Example("On the example sheet", (Ref("A1:C7"),)).shared
    own = Example("Invented data", (Ref("A1:B2"),), ((1.0, 2.0), (3.0, 4.0)))
    assert not own.shared and own.cells == ((1.0, 2.0), (3.0, 4.0))


class _Recorder:
    """Stands in for the xlwings module and records how the decorators are applied."""

    def __init__(self) -> None:
        self.calls: list[tuple[str, tuple, dict]] = []

    def _deco(self, kind: str, args: tuple, kwargs: dict):
        def apply(f):
            self.calls.append((kind, args, kwargs))
            return f
        return apply

    def arg(self, *args, **kwargs):
        return self._deco("arg", args, kwargs)

    def ret(self, *args, **kwargs):
        return self._deco("ret", args, kwargs)

    def func(self, *args, **kwargs):
        return self._deco("func", args, kwargs)


@pytest.mark.parametrize("name", sorted(REGISTRY))
def test_decorators_applied_from_the_record(name: str) -> None:
    rec = REGISTRY[name]
    fake = _Recorder()
    f = getattr(functions, name)
    assert apply_xlwings(f, rec, fake) is f
    kinds = [c[0] for c in fake.calls]
    # xlwings' func sets the category and arg/ret reset it on Windows, so func comes last
    assert kinds == ["arg"] * len(rec.args) + ["ret", "func"]
    for (kind, args, kwargs), a in zip(fake.calls, rec.args):
        assert args == (a.name,) and kwargs == a.xlwings_options
    assert fake.calls[-1][2] == {"category": CATEGORY}


def test_formula_text() -> None:
    assert formula_text("SF_X", (Ref("A1:C7"), MISSING, True, "long", 0.9, ((1, -0.5),))) == (
        '=SF_X(A1:C7,,TRUE,"long",0.9,{1,-0.5})'
    )
    assert formula_literal('say "hi"') == '"say ""hi"""'


def test_input_error_becomes_one_line_and_bugs_do_not() -> None:
    msg = functions.SF_P([["A"], [1.0], [2.0]])
    assert isinstance(msg, str) and msg.startswith("sheetfuncs: ") and "\n" not in msg

    @worksheet_function(
        description="Returns a value the host cannot hold.",
        args=(Arg("x", "number", "A number."),),
        result="scalar",
        returns="Nothing useful.",
        example=Example("none", (1,)),
    )
    def SF_BROKEN(x: Any) -> Any:
        return Fraction(1, 3) if x > 0 else object()

    assert SF_BROKEN(1.0) == 1 / 3
    # a bug becomes the last guard's one line, naming the function and asking for a report
    assert SF_BROKEN(-1.0) == (
        "sheetfuncs: SF_BROKEN could not compute this (TypeError); please report it with the "
        "cell values"
    )


def test_decorator_checks_the_wrapper_against_its_record() -> None:
    rec_args = (Arg("data", "range", "Data."), Arg("conf", "number", "Level.", default=0.95))
    deco = worksheet_function(
        description="Test.", args=rec_args, result="scalar", returns="x.", example=Example("n", ())
    )

    def wrong_names(data: Any, level: Any = None) -> Any:
        return 1

    def wrong_default(data: Any, conf: Any = 0.95) -> Any:
        return 1

    def wrong_annotation(data: Any, conf: float = None) -> Any:  # type: ignore[assignment]
        return 1

    for fn in (wrong_names, wrong_default, wrong_annotation):
        with pytest.raises(TypeError):
            deco(fn)
    with pytest.raises(ValueError):
        Arg("x", "matrix", "Not a kind.")
    with pytest.raises(ValueError):
        worksheet_function(description="T.", args=(), result="chart", returns="", example=Example("n", ()))


def test_collect_keeps_the_order_of_modules_and_definitions() -> None:
    def make(name: str) -> Any:
        def wrapper(x: Any) -> Any:
            return x

        wrapper.__name__ = wrapper.__qualname__ = name
        return worksheet_function(
            description="Returns x.", args=(Arg("x", "number", "A number."),), result="scalar",
            returns="x.", example=Example("n", (1,)),
        )(wrapper)

    first, second = types.ModuleType("first"), types.ModuleType("second")
    first.SF_B, first.helper, first.SF_A = make("SF_B"), len, make("SF_A")
    second.SF_C = make("SF_C")
    found = collect(second, first)
    assert list(found) == ["SF_C", "SF_B", "SF_A"]
    assert all(isinstance(r, Function) for r in found.values())
    assert found["SF_A"].call is first.SF_A
    with pytest.raises(TypeError):
        found["SF_D"] = found["SF_A"]  # type: ignore[index]  # read-only
