"""xlwings' own Windows code (``udfs``, ``com_server``, ``conversion``), run off Windows.

The fixture ``xlwings_com`` (registered in tests/conftest.py) puts small stand-ins for the
pywin32 modules into ``sys.modules``, imports xlwings' real ``udfs`` and ``com_server`` modules,
and yields a :class:`ComSide`: xlwings' real modules, the worksheet functions decorated by
xlwings' real decorators (``xlfunc``, ``xlarg``, ``xlret``, as ``import xlwings`` hands them out
on Windows) and cached as the UDF module ``sheetfuncs.udfs``, and :func:`com_call`, which calls
one function the way Excel's VBA wrapper does (``XLPython.CallUDF``). Afterwards ``sys.modules``,
xlwings' attributes and its UDF-module cache are as they were, so other tests are unaffected.

What is a stand-in: the pywin32 modules (no Windows here), and ``xlwings._xlwindows``, which
cannot be imported off Windows at all (``ctypes.windll``, ``PyDLL(pythoncom.__file__)``). Its
stand-in holds only what ``udfs.call_udf`` reaches: ``is_range_instance``, ``BOOK_CALLER`` and a
``Range`` that reads a :class:`ComRange`'s ``Value`` and cleans it with the Windows engine of
:mod:`tests.support.xlwings_engine` (its copy of the two per-cell functions of xlwings' Windows
engine).
"""

from __future__ import annotations

import importlib
import sys
import types
from collections.abc import Callable, Iterator
from contextlib import contextmanager
from dataclasses import dataclass
from typing import Any

import pytest
import xlwings
from xlwings import base_classes

from sheetfuncs.worksheet.functions import REGISTRY
from sheetfuncs.worksheet.registry import apply_xlwings
from tests.support.xlwings_engine import WindowsLikeEngine

__all__ = ["MODULE", "RANGE_IID", "VBA_MISSING", "ComRange", "ComSide", "real_xlwings_com", "xlwings_com"]

#: The UDF module name users give xlwings, and what the VBA wrapper passes for a left-out argument
#: (DISP_E_PARAMNOTFOUND, the code ``udfs.call_udf`` tests for).
MODULE = "sheetfuncs.udfs"
VBA_MISSING = -2147352572
#: The interface id of an Excel Range (what xlwings' ``is_range_instance`` compares).
RANGE_IID = "{00020846-0000-0000-C000-000000000046}"
_PYWIN32 = (
    "pythoncom", "pywintypes", "win32api", "win32con", "win32event", "win32gui", "win32process",
    "win32timezone", "win32com", "win32com.client", "win32com.server",
    "win32com.server.dispatcher", "win32com.server.exception", "win32com.server.policy",
    "win32com.server.util",
)
_REPLACED = _PYWIN32 + ("xlwings._xlwindows", "xlwings.udfs", "xlwings.com_server")
_ATTRS = ("_xlwindows", "udfs", "com_server")


class ComRange:
    """A stand-in for the COM Range object pywin32 hands to xlwings: its ``Value`` is what COM
    gives for the cells (one value, or a tuple of row tuples)."""

    def __init__(self, value: Any) -> None:
        self.Value = value
        rows = value if isinstance(value, tuple) else ((value,),)
        self.Row, self.Column = 1, 1
        self.Rows = types.SimpleNamespace(Count=len(rows))
        self.Columns = types.SimpleNamespace(Count=len(rows[0]))
        type_attr = types.SimpleNamespace(iid=RANGE_IID)
        type_info = types.SimpleNamespace(GetTypeAttr=lambda: type_attr)
        self._oleobj_ = types.SimpleNamespace(GetTypeInfo=lambda: type_info)


class _RangeImpl(base_classes.Range):
    """What ``udfs.call_udf`` and ``conversion.read`` use of ``xlwings._xlwindows.Range``."""

    def __init__(self, xl: Any) -> None:
        self.xl = xl

    api = property(lambda self: self.xl)
    raw_value = property(lambda self: self.xl.Value)
    shape = property(lambda self: (self.xl.Rows.Count, self.xl.Columns.Count))

    @property
    def sheet(self) -> Any:
        app = types.SimpleNamespace(engine=WindowsLikeEngine(), pid=0)
        return types.SimpleNamespace(book=types.SimpleNamespace(app=app))


def _stand_in(name: str, **attrs: Any) -> types.ModuleType:
    module = types.ModuleType(name)
    module.__dict__.update(attrs)
    return module


def _pywin32_modules() -> dict[str, types.ModuleType]:
    """Stand-ins with exactly the names xlwings' udfs and com_server use at import and call."""

    class PyIDispatch:
        pass

    def unwrap(obj: Any) -> Any:
        raise ValueError("not a wrapped Python object")  # what pywin32 does for a plain value

    mods = {name: _stand_in(name) for name in _PYWIN32}
    mods["pythoncom"].__dict__.update(
        IID_IDispatch="IDispatch", IID_IEnumVARIANT="IEnumVARIANT", TypeIIDs={"IDispatch": PyIDispatch},
        CoInitialize=lambda: None,
    )
    mods["pywintypes"].__dict__.update(com_error=OSError, IID=str)
    mods["win32com.client"].Dispatch = lambda *a, **k: None
    mods["win32com.server.util"].__dict__.update(unwrap=unwrap, wrap=lambda obj, iid=None: obj)
    for parent, child in (("win32com", "client"), ("win32com", "server"), ("win32com.server", "util"),
                          ("win32com.server", "policy"), ("win32com.server", "dispatcher"),
                          ("win32com.server", "exception")):
        setattr(mods[parent], child, mods[f"{parent}.{child}"])
    return mods


def _xlwindows_module() -> types.ModuleType:
    def is_range_instance(xl_range: Any) -> bool:
        pyid = getattr(xl_range, "_oleobj_", None)
        return pyid is not None and pyid.GetTypeInfo().GetTypeAttr().iid == RANGE_IID

    return _stand_in("xlwings._xlwindows", Range=_RangeImpl, is_range_instance=is_range_instance, BOOK_CALLER=None)


def _copy(f: Callable[..., Any]) -> Callable[..., Any]:
    """A fresh function object for ``f`` (so xlwings' ``__xlfunc__`` lands on the copy only)."""
    g = types.FunctionType(f.__code__, f.__globals__, f.__name__, f.__defaults__, f.__closure__)
    g.__dict__.update({k: v for k, v in f.__dict__.items() if k != "__xlfunc__"})
    g.__doc__, g.__annotations__, g.__qualname__ = f.__doc__, dict(f.__annotations__), f.__qualname__
    return g


def _udf_module(udfs: types.ModuleType) -> types.ModuleType:
    """``sheetfuncs.udfs`` as it is on Windows: every function through xlwings' real decorators."""
    xlw = types.SimpleNamespace(func=udfs.xlfunc, arg=udfs.xlarg, ret=udfs.xlret)
    module = types.ModuleType(MODULE)
    for name, record in REGISTRY.items():
        setattr(module, name, apply_xlwings(_copy(record.call), record, xlw))
    module.REGISTRY = REGISTRY
    return module


@dataclass(frozen=True)
class ComSide:
    """xlwings' real Windows modules and the UDF module they serve."""

    udfs: types.ModuleType
    com_server: types.ModuleType
    module: types.ModuleType

    def com_call(self, name: str, *args: Any) -> Any:
        """Call ``name`` as the VBA wrapper does: ``XLPy.CallUDF(module, name, Array(args...))``;
        every argument is given (left-out ones as :data:`VBA_MISSING`); what Excel gets back."""
        n = len(self.module.__dict__[name].__xlfunc__["args"])
        given = tuple(args) + (VBA_MISSING,) * (n - len(args))
        return self.com_server.XLPython().CallUDF(MODULE, name, given)


@contextmanager
def real_xlwings_com() -> Iterator[ComSide]:
    """xlwings' real ``udfs`` and ``com_server`` on pywin32 stand-ins, for the ``with`` block only:
    afterwards ``sys.modules`` and xlwings' attributes are as they were. Needs the Windows-like
    engine registered (the ``xlwings_pipeline`` fixture)."""
    saved = {name: sys.modules.get(name) for name in _REPLACED}
    saved_attrs = {name: getattr(xlwings, name) for name in _ATTRS if hasattr(xlwings, name)}
    xlwindows = _xlwindows_module()
    sys.modules.update(_pywin32_modules())
    sys.modules["xlwings._xlwindows"] = xlwindows
    xlwings._xlwindows = xlwindows  # type: ignore[attr-defined]
    try:
        for name in ("xlwings.udfs", "xlwings.com_server"):
            sys.modules.pop(name, None)
        udfs = importlib.import_module("xlwings.udfs")
        com_server = importlib.import_module("xlwings.com_server")
        module = _udf_module(udfs)
        udfs.udf_modules[MODULE] = {"filename": MODULE, "filetime": None, "module": module}
        yield ComSide(udfs, com_server, module)
        com_server.loop.close()
    finally:
        for name, mod in saved.items():
            if mod is None:
                sys.modules.pop(name, None)
            else:
                sys.modules[name] = mod
        for name in _ATTRS:
            if name in saved_attrs:
                setattr(xlwings, name, saved_attrs[name])
            elif hasattr(xlwings, name):
                delattr(xlwings, name)


@pytest.fixture(scope="module")
def xlwings_com(xlwings_pipeline: Any) -> Iterator[ComSide]:
    with real_xlwings_com() as side:
        yield side
