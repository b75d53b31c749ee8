"""The worksheet-function registry: catalog, recorded xlwings options, docs, shaping of results.

The numbers in these tests are invented; where a value is checked, the expectation comes from
the core (the same call a report makes) or is marked as common practice.
"""

from __future__ import annotations

import inspect
import sys
from pathlib import Path
from fractions import Fraction
from typing import Any

import pytest

import sheetfuncs

from sheetfuncs.worksheet import registry as udfs
from sheetfuncs.worksheet.registry import KINDS, REGISTRY, Arg, Example, Ref, worksheet_function

#: The catalog of issue 3, exactly as the issue writes the signatures.
CATALOG = {
    "SF_TABLE": "SF_TABLE(data, [layout], [labels], [factor_name])",
    **{
        name: f"{name}(data, [layout], [labels])"
        for name in ("SF_SSB", "SF_SSW", "SF_SST", "SF_DFB", "SF_DFW", "SF_DFT", "SF_MSB",
                     "SF_MSW", "SF_F", "SF_P", "SF_R2")
    },
    "SF_GROUPS": "SF_GROUPS(data, [layout], [labels], [conf])",
    "SF_FROMSTATS": "SF_FROMSTATS(counts, means, sds, [names])",
    "SF_GLT": "SF_GLT(data, pooling, [layout], [labels])",
    "SF_CONTRAST": "SF_CONTRAST(data, weights, [layout], [labels], [conf])",
    "SF_FTAIL": "SF_FTAIL(x, df1, df2)",
    "SF_FCRIT": "SF_FCRIT(alpha, df1, df2)",
}
TABLES = {"SF_TABLE", "SF_GROUPS", "SF_FROMSTATS", "SF_GLT", "SF_CONTRAST"}

# A few functions the host already has; worksheet functions must never reuse these names
# (common practice: a user-defined function that shadows a built-in is unreachable).
HOST_BUILTINS = {"F.TEST", "F.DIST", "F.DIST.RT", "F.INV", "F.INV.RT", "FDIST", "FINV", "FTEST",
                 "AVERAGE", "STDEV", "VAR", "TTEST", "T.TEST", "COUNT", "MEDIAN"}


# --------------------------------------------------------------------------------------------
# the catalog


def test_every_catalog_function_is_registered_with_its_signature() -> None:
    assert set(CATALOG) <= set(REGISTRY)
    for name, signature in CATALOG.items():
        assert REGISTRY[name].signature == signature
        assert getattr(udfs, name).__sheetfuncs__ is REGISTRY[name]


@pytest.mark.parametrize("name", sorted(REGISTRY))
def test_description_and_argument_help(name: str) -> None:
    rec = REGISTRY[name]
    assert rec.name.startswith("SF_") and rec.name.isupper() and rec.name not in HOST_BUILTINS
    # one sentence that the function dialog keeps whole (it keeps 255 characters)
    assert rec.description.endswith(".") and rec.description.count(". ") == 0
    assert 20 <= len(rec.description) <= udfs.DIALOG_LIMIT
    assert rec.result in ("scalar", "table")
    if name in CATALOG:  # the analyses' result kinds: tests/test_udfs_analyses.py
        assert (rec.result == "table") == (name in TABLES)
    if rec.result == "table":
        assert rec.columns, "a table documents its header"
    assert rec.returns
    for a in rec.args:
        assert a.kind in KINDS
        assert a.help.endswith(".") and len(a.dialog_text) <= udfs.DIALOG_LIMIT
    # data first, options after: once an argument is optional, all later ones are too
    optional = [not a.required for a in rec.args]
    assert optional == sorted(optional)


@pytest.mark.parametrize("name", sorted(REGISTRY))
def test_recorded_xlwings_options(name: str) -> None:
    rec = REGISTRY[name]
    assert dict(rec.func_options) == {"category": udfs.CATEGORY}
    assert dict(rec.ret_options) == {}
    for a in rec.args:
        opts = a.xlwings_options
        assert opts["doc"] == a.dialog_text
        # without err_to_str xlwings hands an error cell over as a blank (xlwings 0.37 source)
        assert opts["err_to_str"] is True
        if a.kind == "range":
            assert opts["ndim"] == 2  # one cell, one row or one column still arrives as rows
        else:
            assert "ndim" not in opts


@pytest.mark.parametrize("name", sorted(REGISTRY))
def test_python_signature_is_what_xlwings_reads(name: str) -> None:
    """On Windows xlwings takes the function's name, docstring, parameter names and defaults
    (a missing optional argument arrives as the default) and reads annotations as converters."""
    f = getattr(udfs, name)
    rec = REGISTRY[name]
    assert f.__name__ == name and f.__doc__ == rec.description
    params = list(inspect.signature(f).parameters.values())
    assert [p.name for p in params] == [a.name for a in rec.args]
    for p, a in zip(params, rec.args):
        assert p.kind is inspect.Parameter.POSITIONAL_OR_KEYWORD
        if a.required:
            assert p.default is inspect.Parameter.empty
        else:
            assert p.default is None
    hints = {k: v for k, v in inspect.get_annotations(f, eval_str=True).items()}
    assert set(hints.values()) <= {Any}


# VBA keywords and statement names (from memory), plus "caller", which xlwings fills in itself:
# xlwings writes each argument name into the signature of a generated VBA function.
VBA_RESERVED = {
    "and", "as", "boolean", "byref", "byval", "call", "case", "close", "const", "currency", "date",
    "declare", "dim", "do", "double", "each", "else", "end", "enum", "erase", "error", "event",
    "exit", "false", "for", "function", "get", "global", "gosub", "goto", "if", "imp", "in",
    "input", "integer", "is", "len", "let", "like", "line", "lock", "long", "loop", "me", "mid",
    "mod", "name", "new", "next", "not", "nothing", "null", "object", "on", "open", "option",
    "optional", "or", "paramarray", "preserve", "print", "private", "property", "public", "put",
    "redim", "rem", "resume", "return", "seek", "select", "set", "single", "static", "step",
    "stop", "string", "sub", "then", "time", "to", "true", "type", "until", "variant", "wend",
    "while", "with", "write", "xor", "caller",
}


@pytest.mark.parametrize("name", sorted(REGISTRY))
def test_argument_names_are_safe_in_the_generated_vba(name: str) -> None:
    for a in REGISTRY[name].args:
        assert a.name.isascii() and a.name.isidentifier() and len(a.name) <= 31
        assert a.name.lower() not in VBA_RESERVED


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
    f = getattr(udfs, name)
    assert udfs.apply_xlwings(f, rec, fake) is f
    kinds = [c[0] for c in fake.calls]
    # xlwings' func sets the category and arg/ret reset it on Windows, so func comes last
    assert kinds == ["arg"] * len(rec.args) + ["ret", "func"]
    for (kind, args, kwargs), a in zip(fake.calls, rec.args):
        assert args == (a.name,) and kwargs == a.xlwings_options
    assert fake.calls[-1][2] == {"category": udfs.CATEGORY}


def test_importing_the_module_works_in_a_fresh_interpreter() -> None:
    # common practice: the module a user points xlwings at must import on any system
    import subprocess

    code = "import sheetfuncs.udfs as u; print(len(u.REGISTRY))"
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True,
                         cwd=str(Path(sheetfuncs.__file__).resolve().parents[1]))
    assert int(out.stdout) == len(REGISTRY)


def test_formula_text() -> None:
    assert udfs.formula_text("SF_X", (Ref("A1:C7"), udfs.MISSING, True, "long", 0.9, ((1, -0.5),))) == (
        '=SF_X(A1:C7,,TRUE,"long",0.9,{1,-0.5})'
    )
    assert udfs.formula_literal('say "hi"') == '"say ""hi"""'


# --------------------------------------------------------------------------------------------
# shaping results


def test_wrappers_take_raw_tuples_and_lists_alike() -> None:
    rows = (("A", "B"), (1.0, 2.0), (1.5, 2.5), (1.25, None))
    as_lists = [list(r) for r in rows]
    assert udfs.SF_TABLE(rows) == udfs.SF_TABLE(as_lists)
    assert udfs.SF_F(rows, "wide", True) == udfs.SF_F(as_lists, layout="wide", labels=True)


def test_input_error_becomes_one_line_and_bugs_do_not() -> None:
    msg = udfs.SF_P([["A"], [1.0], [2.0]])
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
    with pytest.raises(TypeError):
        SF_BROKEN(-1.0)  # a bug surfaces as a traceback, not as a message


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
