"""The records of the worksheet functions and the decorator that registers a wrapper.

Each worksheet function (``=SF_TABLE(B2:F40)`` and its siblings) is one record
(:class:`Function`: name, one-sentence description, arguments with kind, default and help text,
scalar or table result, an example on invented data) plus a thin wrapper that converts the cells
in, makes one core call and hands the core's result back. The same record

* applies xlwings' decorators (``xw.arg(name, ndim=2, err_to_str=True, doc=...)`` for ranges,
  ``xw.arg(name, doc=...)`` for single values, ``xw.ret(...)``, then ``xw.func(category=...)``
  last, because xlwings' ``func`` sets the category and ``arg``/``ret`` would reset it), so the
  spreadsheet's function dialog shows the description and the help of every argument;
* drives :mod:`sheetfuncs.worksheet.harness`, which calls the functions as xlwings does on
  Windows;
* generates ``docs/functions.md`` (:mod:`sheetfuncs.worksheet.docs`:
  ``python -m sheetfuncs.worksheet.docs --markdown``; ``--check`` fails when the file is out of
  date);
* is what the tests walk through (``REGISTRY`` of :mod:`sheetfuncs.worksheet.functions`).

The wrappers live in :mod:`sheetfuncs.worksheet.functions`, one module per topic; users point
xlwings at :mod:`sheetfuncs.udfs`, which exposes every one of them. This is the only module of
the package that imports xlwings. Off Windows, xlwings' decorators are no-ops and its conversion
code needs a running spreadsheet, so the options are recorded here as well
(:attr:`Arg.xlwings_options`), where tests can check them.

Conventions every wrapper gets from :func:`worksheet_function` (see the project guide; the
conversion itself is :mod:`sheetfuncs.worksheet.convert`):

* a missing optional argument arrives as ``None`` (the Python default of every optional
  parameter), as does a blank cell given as an option; both mean "use the documented default";
* options arrive as cell values: text (``layout``, ``factor_name``), a logical or the text
  ``"auto"`` (``labels``), numbers (``conf``, ``alpha``, degrees of freedom);
* tables come back as rows (header row first); scalars as plain numbers; infinity as the largest
  double, 1.7976931348623157E+308, so that comparisons still work; ``None`` as a blank cell;
* an :class:`~sheetfuncs.errors.InputError` comes back as its one line of text
  (``sheetfuncs: ...``) in the cell;
* the last guard: any other exception, and a NaN where a number is promised (never shown as a
  blank), comes back as one line that names the function and asks for a report
  (``sheetfuncs: SF_PAIRS could not compute this (OverflowError); please report it with the
  cell values``); no traceback ever reaches the cell.

Adding a function
-----------------
Write the wrapper in the topic's module of :mod:`sheetfuncs.worksheet.functions`, with one
parameter per argument (optional ones default to ``None``; annotate with ``Any`` only, since
xlwings reads annotations as converters) and decorate it::

    @worksheet_function(
        description="Spills ... for the groups in a range.",      # one sentence, <= 255 chars
        args=(DATA, Arg("conf", "number", "Confidence level ...", default=0.95), LAYOUT, LABELS),
        result="table",                                           # or "scalar"
        columns=NewResult.HEADER,                                 # table header, for the docs
        returns="One row per ...",
        example=Example("On the example sheet", (Ref("A1:C7"),)),
    )
    def SF_NEWTHING(data: Any, conf: Any = None, layout: Any = None, labels: Any = None) -> Any:
        return new_core_call(groups_from_range(data, layout, labels), conf).table()

The wrapper receives values already normalised by kind (defaults filled in, numbers as floats,
text trimmed) and returns the core's ``table()`` or one number. Export it from the package
(``functions/__init__.py``) and from :mod:`sheetfuncs.udfs`, then regenerate the docs:
``python -m sheetfuncs.worksheet.docs --markdown > docs/functions.md``. The tests pick the new
function up from ``REGISTRY`` (registry checks, docs sync); add its harness tests and a check
against an outside source.
"""

from __future__ import annotations

import functools
import inspect
from collections.abc import Callable, Mapping
from dataclasses import dataclass, field
from types import MappingProxyType, ModuleType
from typing import Any

import xlwings as xw

from ..errors import InputError
from ..input import format_label
from .convert import bug_message, cell_message, normalise, shape_result

__all__ = [
    "CATEGORY", "KINDS", "RESULTS", "DIALOG_LIMIT", "REQUIRED", "MISSING",
    "Arg", "Ref", "Example", "Function", "formula_literal", "formula_text",
    "apply_xlwings", "worksheet_function", "collect",
]

#: The category the function dialog lists the functions under.
CATEGORY = "sheetfuncs"
#: Argument kinds: a range of cells, or one number, text or logical value.
KINDS = ("range", "number", "text", "logical")
#: Result kinds: one value in the cell, or a table that spills with one header row.
RESULTS = ("scalar", "table")
#: The host keeps at most 255 characters of a function or argument description.
DIALOG_LIMIT = 255


class _Required:
    """Marks an argument without a default."""

    def __repr__(self) -> str:
        return "REQUIRED"


REQUIRED: Any = _Required()


class _Missing:
    """An argument left out of a formula in an example, e.g. ``=SF_TABLE(A1:C7,,,"Head")``."""

    def __repr__(self) -> str:
        return "MISSING"


MISSING: Any = _Missing()


@dataclass(frozen=True)
class Arg:
    """One argument of a worksheet function.

    ``kind`` is ``range`` (a block of cells, always read as rows), ``number``, ``text`` or
    ``logical`` (one value; ``labels`` also takes the text ``"auto"``). ``default`` is the value
    used when the argument is left out or its cell is blank; :data:`REQUIRED` when it must be
    given (``None`` for an optional range means "not given").
    """

    name: str
    kind: str
    help: str
    default: Any = REQUIRED

    def __post_init__(self) -> None:
        if self.kind not in KINDS:
            raise ValueError(f"argument {self.name}: kind must be one of {KINDS}, not {self.kind!r}")

    @property
    def required(self) -> bool:
        return self.default is REQUIRED

    @property
    def default_text(self) -> str:
        """The default as a spreadsheet user would type it."""
        if self.required:
            return "required"
        if self.default is None:
            return "none"
        return formula_literal(self.default)

    @property
    def dialog_text(self) -> str:
        """What the function dialog shows for this argument (help plus the default)."""
        if self.required:
            return self.help
        if self.default is None:
            return f"{self.help} Optional."
        return f"{self.help} Optional; default {self.default_text}."

    @property
    def xlwings_options(self) -> dict[str, Any]:
        """Keyword options for ``xw.arg``: error cells arrive as their text (without
        ``err_to_str`` xlwings would hand them over as blanks); ranges always arrive 2-D."""
        opts: dict[str, Any] = {"doc": self.dialog_text, "err_to_str": True}
        if self.kind == "range":
            opts["ndim"] = 2
        return opts


@dataclass(frozen=True)
class Ref:
    """A cell reference in an example formula, e.g. ``Ref("A1:C7")``."""

    address: str


@dataclass(frozen=True)
class Example:
    """A short example for the docs: cells laid out from A1 and the arguments of one formula.

    ``args`` holds :class:`Ref` references into ``cells``, literal values (text, numbers,
    logicals, a tuple of rows for an array constant such as ``{1,-0.5,-0.5}``) or
    :data:`MISSING`. ``cells`` is ``None`` (the default) for the shared example sheet
    (``EXAMPLE_SHEET`` of :mod:`sheetfuncs.worksheet.functions`).
    """

    note: str
    args: tuple[Any, ...]
    cells: tuple[tuple[Any, ...], ...] | None = None

    @property
    def shared(self) -> bool:
        """Does the example use the shared example sheet?"""
        return self.cells is None


@dataclass(frozen=True)
class Function:
    """The record of one worksheet function (see the module docstring)."""

    name: str
    description: str
    args: tuple[Arg, ...]
    result: str
    returns: str
    example: Example
    columns: tuple[str, ...] = ()
    func_options: Mapping[str, Any] = field(default_factory=lambda: MappingProxyType({"category": CATEGORY}))
    ret_options: Mapping[str, Any] = field(default_factory=dict)
    call: Callable[..., Any] = field(default=None, compare=False, repr=False)  # type: ignore[assignment]

    @property
    def signature(self) -> str:
        """``SF_TABLE(data, [layout], [labels], [factor_name])``."""
        parts = [a.name if a.required else f"[{a.name}]" for a in self.args]
        return f"{self.name}({', '.join(parts)})"

    @property
    def example_formula(self) -> str:
        return formula_text(self.name, self.example.args)


def formula_literal(value: Any, *, columns: str = ",", rows: str = ";",
                    logicals: tuple[str, str] = ("FALSE", "TRUE")) -> str:
    """A value as typed in a formula: text quoted, TRUE/FALSE, shortest numbers, array constants
    (Excel's separators by default: ``,`` between the columns of an array constant, ``;``
    between its rows; another host's separators and logicals can be given)."""
    if value is MISSING:
        return ""
    if isinstance(value, Ref):
        return value.address
    if isinstance(value, bool):
        return logicals[value]
    if isinstance(value, str):
        return '"' + value.replace('"', '""') + '"'
    if isinstance(value, tuple):
        same = {"columns": columns, "rows": rows, "logicals": logicals}
        return "{" + rows.join(columns.join(formula_literal(v, **same) for v in row) for row in value) + "}"
    return format_label(value)


def formula_text(name: str, args: tuple[Any, ...]) -> str:
    return f"={name}({','.join(formula_literal(a) for a in args)})"


# --------------------------------------------------------------------------------------------
# the registry


def apply_xlwings(f: Callable[..., Any], record: Function, xlw: Any = xw) -> Callable[..., Any]:
    """Apply xlwings' decorators from the record: ``arg`` for each argument, ``ret``, then ``func``
    last (on Windows ``arg`` and ``ret`` reset the category that ``func`` sets). ``xlw`` is the
    xlwings module; tests pass a recorder."""
    for a in record.args:
        f = xlw.arg(a.name, **a.xlwings_options)(f)
    f = xlw.ret(**dict(record.ret_options))(f)
    return xlw.func(**dict(record.func_options))(f)


def _check_signature(fn: Callable[..., Any], args: tuple[Arg, ...]) -> inspect.Signature:
    sig = inspect.signature(fn)
    params = list(sig.parameters.values())
    names = [p.name for p in params]
    if names != [a.name for a in args]:
        raise TypeError(f"{fn.__name__}: parameters {names} do not match the record {[a.name for a in args]}")
    for p, a in zip(params, args):
        if p.kind is not inspect.Parameter.POSITIONAL_OR_KEYWORD:
            raise TypeError(f"{fn.__name__}: parameter {p.name} must be positional-or-keyword")
        if a.required != (p.default is inspect.Parameter.empty):
            raise TypeError(f"{fn.__name__}: parameter {p.name} must be {'required' if a.required else 'optional'}")
        if not a.required and p.default is not None:
            raise TypeError(f"{fn.__name__}: optional parameter {p.name} must default to None")
        if p.annotation not in (inspect.Parameter.empty, "Any", Any):
            raise TypeError(f"{fn.__name__}: annotate {p.name} with Any (xlwings reads annotations as converters)")
    return sig


def worksheet_function(
    *,
    description: str,
    args: tuple[Arg, ...],
    result: str,
    returns: str,
    example: Example,
    columns: tuple[str, ...] = (),
    ret_options: Mapping[str, Any] | None = None,
) -> Callable[[Callable[..., Any]], Callable[..., Any]]:
    """Register a wrapper as a worksheet function named after it (see the module docstring)."""
    if result not in RESULTS:
        raise ValueError(f"result must be one of {RESULTS}, not {result!r}")

    def wrap(inner: Callable[..., Any]) -> Callable[..., Any]:
        sig = _check_signature(inner, args)

        @functools.wraps(inner)
        def cell_function(*values: Any, **named: Any) -> Any:
            bound = sig.bind(*values, **named)
            bound.apply_defaults()
            try:
                given = [normalise(bound.arguments[a.name], a) for a in args]
                return shape_result(inner(*given), result)
            except InputError as err:
                return cell_message(err)
            except Exception as err:  # the last guard: one line in the cell, never a traceback
                return bug_message(inner.__name__, err)

        cell_function.__doc__ = description
        record = Function(
            name=inner.__name__,
            description=description,
            args=args,
            result=result,
            returns=returns,
            example=example,
            columns=tuple(columns),
            ret_options=MappingProxyType(dict(ret_options or {})),
            call=cell_function,
        )
        cell_function.__sheetfuncs__ = record  # type: ignore[attr-defined]
        return apply_xlwings(cell_function, record)

    return wrap


def collect(*modules: ModuleType) -> Mapping[str, Function]:
    """The records of the worksheet functions defined in ``modules``, by name, module by module
    in the order given and in the order each module defines them."""
    found: dict[str, Function] = {}
    for module in modules:
        for value in vars(module).values():
            record = getattr(value, "__sheetfuncs__", None)
            if isinstance(record, Function):
                found[record.name] = record
    return MappingProxyType(found)
