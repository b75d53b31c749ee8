"""The component that LibreOffice loads: the SF_ functions as a Calc add-in.

This file runs inside LibreOffice's own Python, never in sheetfuncs' process: ``calc build``
copies it into the extension with :data:`SETTINGS` filled in (the add-in's service name, the
site-packages folders of the Python environment that holds sheetfuncs, and each UNO method's
worksheet function). It imports only LibreOffice's ``uno`` bridge at load time, so that Calc
always finds the functions; sheetfuncs itself is imported at the first call. When that import
fails, every function shows one line saying what to do instead of a bare #NAME?.

Its own work is reading what Calc hands over: for a cell-range argument the cell values
(``getDataArray``), the error cells (``queryFormulaCells``) and the cells formatted as
logicals or dates (Calc holds them as numbers); for any other argument the value as it
arrives. Everything else, the cleaning, the call and the shaping of the result, is done by
:mod:`sheetfuncs.worksheet.calc.host`, which is tested without LibreOffice.
"""

import gc
import site
import sys

import unohelper
from com.sun.star.lang import Locale, XLocalizable, XServiceInfo, XServiceName
from org.sheetfuncs.calc import XFunctions

SETTINGS: dict = {}  # filled in by the build

#: The loaded host module, or the one line that says why it could not be loaded.
_LOADED: dict = {}
_ERROR = 4  # com.sun.star.sheet.FormulaResult.ERROR
_KIND_TYPES = ((1024, "logical"), (2, "date"), (4, "time"))  # com.sun.star.util.NumberFormat


def _host():
    """sheetfuncs' Calc host module, imported once from the environment named in SETTINGS."""
    if "host" not in _LOADED:
        try:
            before = list(sys.path)
            for folder in SETTINGS.get("site_dirs", ()):
                site.addsitedir(folder)
            sys.path[:] = [p for p in sys.path if p not in before] + before
            from sheetfuncs.worksheet.calc import host
            _LOADED["host"] = host
        except Exception as err:  # one line in the cell, never a traceback
            _LOADED["host"] = (
                "sheetfuncs: LibreOffice's Python could not import sheetfuncs "
                f"({type(err).__name__}: {' '.join(str(err).split())[:200]}); "
                "run sheetfuncs calc install again from the environment that holds it"
            )
    return _LOADED["host"]


def _kinds(document, rng):
    """Cells of ``rng`` formatted as logicals, dates or times: {(row, col): kind}."""
    found = {}
    if document is None:
        return found
    formats = document.getNumberFormats()
    origin = rng.getRangeAddress()
    parts = rng.getCellFormatRanges()
    for i in range(parts.getCount()):
        part = parts.getByIndex(i)
        key = part.getPropertyValue("NumberFormat")
        kind_of = formats.getByKey(key).getPropertyValue("Type")
        kind = next((k for flag, k in _KIND_TYPES if kind_of & flag), None)
        if kind is None:
            continue
        a = part.getRangeAddress()
        for r in range(a.StartRow, a.EndRow + 1):
            for c in range(a.StartColumn, a.EndColumn + 1):
                found[(r - origin.StartRow, c - origin.StartColumn)] = kind
    return found


def _errors(rng):
    """Error cells of ``rng``: {(row, col): Calc's error code}."""
    found = {}
    origin = rng.getRangeAddress()
    ranges = rng.queryFormulaCells(_ERROR)
    if ranges.getCount() == 0:
        return found
    cells = ranges.getCells().createEnumeration()
    while cells.hasMoreElements():
        cell = cells.nextElement()
        a = cell.getCellAddress()
        found[(a.Row - origin.StartRow, a.Column - origin.StartColumn)] = cell.getError()
    return found


def _read_range(document, rng):
    """A cell-range argument as the host module takes it."""
    values = rng.getDataArray()
    blanks = rng.queryEmptyCells().getCount() > 0  # else the rows go on as they are
    return _host().CalcRange(values, _errors(rng), _kinds(document, rng), _null_date(document), blanks)


def _null_date(document):
    try:
        d = document.getPropertyValue("NullDate")
        return (d.Year, d.Month, d.Day)
    except Exception:
        return (1899, 12, 30)


def _function(name):
    def call(self, document, *args):
        host = _host()
        if isinstance(host, str):
            return host
        paused = gc.isenabled()
        gc.disable()  # the range's cells are many new objects: no collection while they live
        try:
            try:
                given = [_read_range(document, a) if hasattr(a, "getDataArray") else a for a in args]
            except Exception as err:  # a failure reading the cells: one line, never a traceback
                return host.read_failure(name, err)
            return host.call(name, given)
        finally:
            if paused:
                gc.enable()
    call.__name__ = name
    return call


class Functions(unohelper.Base, XFunctions, XServiceName, XServiceInfo, XLocalizable):
    """The add-in: one method per worksheet function (added below from SETTINGS)."""

    def __init__(self, ctx):
        self.ctx = ctx
        self.locale = Locale("en", "US", "")

    def getServiceName(self):
        return SETTINGS["service"]

    def getImplementationName(self):
        return SETTINGS["service"]

    def supportsService(self, name):
        return name in self.getSupportedServiceNames()

    def getSupportedServiceNames(self):
        return (SETTINGS["service"], "com.sun.star.sheet.AddIn")

    def setLocale(self, locale):
        self.locale = locale

    def getLocale(self):
        return self.locale


for _method, _name in SETTINGS.get("functions", {}).items():
    setattr(Functions, _method, _function(_name))

g_ImplementationHelper = unohelper.ImplementationHelper()
g_ImplementationHelper.addImplementation(
    Functions, SETTINGS.get("service", ""), (SETTINGS.get("service", ""), "com.sun.star.sheet.AddIn")
)
