"""Drive a headless LibreOffice Calc through its UNO bridge: the steps of a JSON job, results out.

Run by LibreOffice's own Python (the one that can ``import uno``), never imported by sheetfuncs::

    python3 driver.py JOB.json RESULT.json

The job names a profile folder (``-env:UserInstallation``) and a list of steps; the result maps
each step's ``key`` to what it read. It uses only the standard library and ``uno``, so that it
runs in an environment without sheetfuncs. Steps (``op``):

* ``new`` (an empty spreadsheet), ``load`` (``path``), ``save`` (``path``, ``filter``), ``close``;
* ``sheet`` (``name``, ``index``: add a sheet, or choose one, for the steps that follow; a step
  may also name its own ``sheet``, by name or index);
* ``cells`` (``at``: top-left cell, ``rows``: values, ``None`` for blank), ``formula``
  (``at``, ``formula`` in Calc's English API syntax, ``;`` between arguments), ``array``
  (``at``: a range, ``formula``: entered as an array formula), ``value`` (``at``, ``value``);
* ``recalc`` (everything), ``read`` (``at``, ``key``: values, formula text, error codes),
  ``wizard`` (``key``: the function wizard's texts of every function whose name starts with
  ``prefix``), ``time`` (``at``: a data cell changed ``repeat`` times, ``watch``: the formula
  cell read after each change; seconds per change).
"""

import json
import os
import subprocess
import sys
import time

import uno
from com.sun.star.beans import PropertyValue

_CONNECT_TIMEOUT = 90.0


def _prop(name, value):
    p = PropertyValue()
    p.Name, p.Value = name, value
    return p


def start(profile, pipe):
    """Start soffice headless on ``profile`` (the user's own when None) and connect; returns
    (process, component context)."""
    office = os.environ.get("SHEETFUNCS_SOFFICE", "soffice")
    own = [] if profile is None else ["-env:UserInstallation=" + uno.systemPathToFileUrl(profile)]
    proc = subprocess.Popen(
        [office, *own, "--headless", "--invisible", "--norestore", "--nolockcheck", "--nodefault", "--nologo",
         f"--accept=pipe,name={pipe};urp;"],
        stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL,
    )
    local = uno.getComponentContext()
    resolver = local.ServiceManager.createInstanceWithContext("com.sun.star.bridge.UnoUrlResolver", local)
    deadline = time.monotonic() + _CONNECT_TIMEOUT
    while True:
        try:
            return proc, resolver.resolve(f"uno:pipe,name={pipe};urp;StarOffice.ComponentContext")
        except Exception:
            if proc.poll() is not None or time.monotonic() > deadline:
                proc.kill()
                raise SystemExit("LibreOffice did not start (no connection within "
                                 f"{_CONNECT_TIMEOUT:.0f} s; exit code {proc.poll()})")
            time.sleep(0.1)


def stop(proc, ctx):
    try:
        ctx.ServiceManager.createInstanceWithContext("com.sun.star.frame.Desktop", ctx).terminate()
    except Exception:
        pass
    try:
        proc.wait(20)
    except subprocess.TimeoutExpired:
        proc.kill()
        proc.wait(10)


def _cell_rows(rows):
    return tuple(tuple("" if v is None else v for v in row) for row in rows)


def _read(sheet, at):
    rng = sheet.getCellRangeByName(at)
    a = rng.getRangeAddress()
    values, formulas, errors = [], [], []
    for r in range(a.EndRow - a.StartRow + 1):
        vrow, frow, erow = [], [], []
        for c in range(a.EndColumn - a.StartColumn + 1):
            cell = rng.getCellByPosition(c, r)
            err = cell.getError()
            kind = cell.getType().value
            erow.append(err)
            frow.append(cell.getFormula())
            if err:
                vrow.append(None)
            elif kind == "TEXT" or (kind == "FORMULA" and cell.FormulaResultType2 == 2):
                vrow.append(cell.getString())
            elif kind == "EMPTY":
                vrow.append(None)
            else:
                vrow.append(cell.getValue())
        values.append(vrow)
        formulas.append(frow)
        errors.append(erow)
    return {"values": values, "formulas": formulas, "errors": errors}


def _wizard(ctx, prefix):
    descriptions = ctx.ServiceManager.createInstanceWithContext("com.sun.star.sheet.FunctionDescriptions", ctx)
    found = {}
    for i in range(descriptions.getCount()):
        entry = {p.Name: p.Value for p in descriptions.getByIndex(i)}
        if entry["Name"].startswith(prefix):
            found[entry["Name"]] = {
                "description": entry["Description"],
                "category": entry["Category"],
                "arguments": [[a.Name, a.Description, a.IsOptional] for a in entry["Arguments"]],
            }
    return found


def _time(sheet, step):
    cell = sheet.getCellRangeByName(step["at"])
    watch = sheet.getCellRangeByName(step["watch"])
    base = cell.getValue()
    times = []
    for i in range(int(step.get("repeat", 10))):
        t0 = time.perf_counter()
        cell.setValue(base + (i + 1) * 1e-3)
        watch.getValue()
        times.append(time.perf_counter() - t0)
    cell.setValue(base)
    return times


def _sheet(doc, which):
    """A sheet by name or by index."""
    if isinstance(which, str):
        return doc.Sheets.getByName(which)
    return doc.Sheets.getByIndex(int(which))


def _sheet_step(doc, sheet, step, out):
    """One step on a sheet; returns False when ``op`` is not a sheet step."""
    op = step["op"]
    if op == "cells":
        rows = _cell_rows(step["rows"])
        first = sheet.getCellRangeByName(step["at"]).getCellAddress()
        sheet.getCellRangeByPosition(first.Column, first.Row, first.Column + len(rows[0]) - 1,
                                     first.Row + len(rows) - 1).setDataArray(rows)
    elif op == "formula":
        sheet.getCellRangeByName(step["at"]).setFormula(step["formula"])
    elif op == "array":
        sheet.getCellRangeByName(step["at"]).setArrayFormula(step["formula"])
    elif op == "value":
        sheet.getCellRangeByName(step["at"]).setValue(step["value"])
    elif op == "read":
        out[step["key"]] = _read(sheet, step["at"])
    elif op == "time":
        out[step["key"]] = _time(sheet, step)
    else:
        return False
    return True


def run_steps(ctx, steps):
    desktop = ctx.ServiceManager.createInstanceWithContext("com.sun.star.frame.Desktop", ctx)
    out, doc, current = {}, None, 0
    for step in steps:
        op = step["op"]
        if op in ("new", "load"):
            url = "private:factory/scalc" if op == "new" else uno.systemPathToFileUrl(step["path"])
            doc = desktop.loadComponentFromURL(url, "_blank", 0, (_prop("Hidden", True),))
            current = 0
        elif op == "wizard":
            out[step["key"]] = _wizard(ctx, step.get("prefix", "SF_"))
        elif op == "sheet":
            if not doc.Sheets.hasByName(step["name"]):
                doc.Sheets.insertNewByName(step["name"], int(step.get("index", 0)))
            current = step["name"]
        elif op == "recalc":
            doc.calculateAll()
        elif op == "save":
            doc.storeToURL(uno.systemPathToFileUrl(step["path"]), (_prop("FilterName", step["filter"]),))
        elif op == "close":
            doc.close(True)
            doc = None
        elif not _sheet_step(doc, _sheet(doc, step.get("sheet", current)), step, out):
            raise SystemExit(f"unknown step {op!r}")
    return out


def main(argv):
    job = json.loads(open(argv[1], encoding="utf-8").read())
    t0 = time.perf_counter()
    proc, ctx = start(job.get("profile"), job.get("pipe", f"sheetfuncs{os.getpid()}"))
    started = time.perf_counter() - t0
    try:
        out = run_steps(ctx, job["steps"])
    finally:
        stop(proc, ctx)
    out["_started"] = started
    with open(argv[2], "w", encoding="utf-8") as f:
        json.dump(out, f)
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))
