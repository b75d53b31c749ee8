"""The worksheet functions: ``=SF_TABLE(B2:F40)`` and its siblings, live in the spreadsheet.

``registry`` (the records of the functions and the decorator that registers a wrapper and
applies xlwings' decorators; the only module of the package that imports xlwings), ``convert``
(arguments in by kind, results out as cells, input problems as one line of text),
``functions`` (the wrappers, one module per topic, and ``REGISTRY``), ``harness`` (calls a
function as xlwings does on Windows, for tests and benchmarks) and ``docs`` (generates
docs/functions.md: ``python -m sheetfuncs.worksheet.docs``). The sub-package ``calc`` is the
LibreOffice Calc extension made from the same registry. Users point xlwings at the entry
module :mod:`sheetfuncs.udfs`, which holds every function; no other layer imports this one.
"""
