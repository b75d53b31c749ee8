"""The worksheet functions (sheetfuncs.worksheet.functions) and the module xlwings loads
(sheetfuncs.udfs): catalog, records, recorded xlwings options, Python signatures, the
registry's order.

The numbers in these tests are invented; where a value is checked, the expectation comes from
the core (the same call a report makes) or is marked as common practice.
"""

from __future__ import annotations

import inspect
import sys
from pathlib import Path
from typing import Any

import pytest

import sheetfuncs
from sheetfuncs import udfs
from sheetfuncs.worksheet import functions
from sheetfuncs.worksheet.functions import REGISTRY, checks, comparisons, effects, oneway
from sheetfuncs.worksheet.registry import CATEGORY, DIALOG_LIMIT, KINDS

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
    assert 20 <= len(rec.description) <= DIALOG_LIMIT
    assert rec.result in ("scalar", "table")
    if name in CATALOG:  # the analyses' result kinds: tests/test_udfs_analyses.py
        assert (rec.result == "table") == (name in TABLES)
    if rec.result == "table":
        assert rec.columns, "a table documents its header"
    assert rec.returns
    for a in rec.args:
        assert a.kind in KINDS
        assert a.help.endswith(".") and len(a.dialog_text) <= DIALOG_LIMIT
    # data first, options after: once an argument is optional, all later ones are too
    optional = [not a.required for a in rec.args]
    assert optional == sorted(optional)


@pytest.mark.parametrize("name", sorted(REGISTRY))
def test_recorded_xlwings_options(name: str) -> None:
    rec = REGISTRY[name]
    assert dict(rec.func_options) == {"category": CATEGORY}
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


def test_importing_the_module_works_in_a_fresh_interpreter() -> None:
    # common practice: the module a user points xlwings at must import on any system
    import subprocess

    code = "import sheetfuncs.udfs as u; print(len(u.REGISTRY))"
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True,
                         cwd=str(Path(sheetfuncs.__file__).resolve().parents[1]))
    assert int(out.stdout) == len(REGISTRY)


def test_wrappers_take_raw_tuples_and_lists_alike() -> None:
    rows = (("A", "B"), (1.0, 2.0), (1.5, 2.5), (1.25, None))
    as_lists = [list(r) for r in rows]
    assert udfs.SF_TABLE(rows) == udfs.SF_TABLE(as_lists)
    assert udfs.SF_F(rows, "wide", True) == udfs.SF_F(as_lists, layout="wide", labels=True)


# --------------------------------------------------------------------------------------------
# the module xlwings loads, and the registry's order


def test_udfs_holds_every_function_and_the_registry_and_nothing_else() -> None:
    # xlwings' "Import Functions" scans dir() of the module, and its call path looks each
    # function up by name (xlwings 0.37 source, udfs.py)
    public = {n for n in dir(udfs) if not n.startswith("_")}
    assert public == set(REGISTRY) | {"REGISTRY"}
    assert udfs.REGISTRY is REGISTRY
    for name, rec in REGISTRY.items():
        # the very objects the decorators made, carrying their records
        assert getattr(udfs, name) is rec.call is getattr(functions, name)
    assert "sheetfuncs.udfs" in (udfs.__doc__ or "") and "nothing else" in (udfs.__doc__ or "")


def test_registry_order_is_topic_by_topic() -> None:
    topics = (oneway, checks, comparisons, effects)
    assert list(REGISTRY) == [name for module in topics for name in module.__all__]
    for module in topics:  # each module exports exactly the functions it defines
        defined = [n for n, v in vars(module).items() if hasattr(v, "__sheetfuncs__")]
        assert defined == list(module.__all__)
    assert list(REGISTRY)[:3] == ["SF_TABLE", "SF_SSB", "SF_SSW"] and list(REGISTRY)[-1] == "SF_VARCOMP"
    assert len(REGISTRY) == 33

