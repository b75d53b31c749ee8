"""``sheetfuncs demo``: the report of the built-in demo data (invented numbers).

A rerun replaces, without asking, only the default output ``sheetfuncs-demo.xlsx`` or a workbook
that is itself a sheetfuncs demo report (its document properties say so); any other existing
file is kept unless ``--force``, also one that appears while the demo is written.
"""

from __future__ import annotations

import argparse
import sys
from pathlib import Path

from ..errors import InputError
from ..input import InputSource, workbook_properties
from .files import check_output_folder, check_report_name, write_report_file
from .parser import DEFAULT_DEMO_OUTPUT
from .progress import Progress

__all__ = ["DEMO_SHEET", "replaceable_demo", "run_demo"]

#: Sheet name of the demo data in ``workbooks/demo.xlsx`` (also used for the demo's addresses).
DEMO_SHEET = "Hardness"


def run_demo(args: argparse.Namespace) -> int:
    from ..input import DEMO_FACTOR, DEMO_RESPONSE, DEMO_TITLE, DEMO_UNIT, demo_groups

    out = check_report_name(args.output)
    if out.is_dir():
        raise InputError(f"{out} is a folder; give a file name such as demo.xlsx")
    check_output_folder(out)
    present = out.exists() or out.is_symlink()
    replace = args.force or (present and replaceable_demo(out))
    if present and not replace:
        raise InputError(
            f"{out} already exists and is not a sheetfuncs demo report, so it is "
            "kept; choose another name with -o, or add --force to replace it"
        )
    prog = Progress(args.progress, sys.stderr)
    prog.start(1, "demo")
    try:
        written = write_report_file(
            demo_groups(), out,
            factor=DEMO_FACTOR, response=DEMO_RESPONSE, unit=DEMO_UNIT, title=DEMO_TITLE,
            force=replace, source=InputSource(path=None, sheet=DEMO_SHEET), progress=prog,
            paper=args.paper, command=list(sys.argv),
        )
    finally:
        prog.finish()
    print(f"wrote {written.resolve()} (report of the built-in demo; invented data)")
    return 0


def replaceable_demo(path: Path) -> bool:
    """Whether ``demo`` may replace an existing file without ``--force``: the default output
    name, or a workbook that is itself a demo report (the report writer sets the document
    properties creator ``sheetfuncs`` and the demo's title). The properties are read through
    :func:`sheetfuncs.input.workbook_properties` (size limit, defusedxml); a file that cannot
    be read that way is not a demo report."""
    from ..input import DEMO_TITLE

    if path.name == DEFAULT_DEMO_OUTPUT:
        return True
    if path.is_symlink() or not path.is_file():
        return False
    try:
        props = workbook_properties(path)
    except InputError:
        return False
    return props.get("creator") == "sheetfuncs" and props.get("title") == DEMO_TITLE
