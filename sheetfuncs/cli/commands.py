"""The ``sheetfuncs`` command line: ``report``, ``demo``, ``table``, ``plan``, ``template``,
``fill`` and ``calc``.

A front only: inputs are read by :func:`sheetfuncs.input.read_groups` (which cleans every range
with ``groups_from_range``), numbers come from the core, reports from
:func:`sheetfuncs.report.write_report`. :func:`main` parses the command line
(:mod:`~sheetfuncs.cli.parser`), runs the command's module (:mod:`~sheetfuncs.cli.report`,
:mod:`~sheetfuncs.cli.demo`, :mod:`~sheetfuncs.cli.table`, :mod:`~sheetfuncs.cli.plan`) and
turns every problem into an exit code: 0 done, 1 an input problem (one line on stderr, no
traceback), 2 a usage error, 3 an unforeseen error (a bug: one line asking for a report;
``SHEETFUNCS_DEBUG=1`` shows the traceback), 130 Ctrl-C (one line).
"""

from __future__ import annotations

import argparse
import gc
import os
import sys
import traceback
from collections.abc import Callable, Sequence
from types import MappingProxyType
from typing import Any

from ..errors import InputError, message
from .calc import run_calc
from .demo import run_demo
from .files import os_reason
from .parser import UsageError, build_parser, parse_args
from .plan import run_plan
from .report import run_report
from .table import run_table
from .templates import run_fill, run_template

__all__ = ["COMMANDS", "DEBUG_VARIABLE", "EXIT_BUG", "EXIT_INTERRUPTED", "bug_line", "main"]

#: The function that runs each command; it returns the exit code.
COMMANDS: MappingProxyType[str, Callable[[argparse.Namespace], int]] = MappingProxyType({
    "report": run_report,
    "demo": run_demo,
    "table": run_table,
    "plan": run_plan,
    "template": run_template,
    "fill": run_fill,
    "calc": run_calc,
})


#: The exit code of an unforeseen error (a bug): one line on stderr asks for a report.
EXIT_BUG = 3
#: The exit code after Ctrl-C (128 + SIGINT, as shells report it).
EXIT_INTERRUPTED = 130
#: Set this environment variable to 1 to see the traceback of an unforeseen error.
DEBUG_VARIABLE = "SHEETFUNCS_DEBUG"


def main(argv: Sequence[str] | None = None) -> int:
    """Run the command line; returns the exit code.

    Exit codes: 0 done; 1 an input problem (one line on stderr, no traceback); 2 a usage error;
    3 an unforeseen error, i.e. a bug (one line on stderr naming the command and asking for a
    report; with the environment variable ``SHEETFUNCS_DEBUG=1`` the traceback is printed
    first); 130 interrupted by Ctrl-C (one line on stderr; no output file is left behind).
    """
    previous = sys.unraisablehook
    try:
        parser = build_parser()
        try:
            args = parse_args(parser, None if argv is None else list(argv))
        except SystemExit as e:  # --help, --version (0) and usage errors (2)
            return e.code if isinstance(e.code, int) else (0 if e.code is None else 2)
        return _run(parser, args)
    except KeyboardInterrupt:
        # Generators left open by the interrupted writer (openpyxl's write-only sheets) are
        # finalised when this handler drops the traceback; their complaints about the closed
        # file are noise after Ctrl-C, so they are silenced until they are collected.
        sys.unraisablehook = _silent
    return _interrupted(previous)


def _run(parser: argparse.ArgumentParser, args: argparse.Namespace) -> int:
    """The command, with every foreseen problem turned into its exit code and one line."""
    try:
        return int(COMMANDS[args.command](args))
    except UsageError as e:
        sub = getattr(args, "parser", parser)
        try:
            sub.error(str(e))
        except SystemExit as done:
            return done.code if isinstance(done.code, int) else 2
        return 2
    except InputError as e:
        print(message(e.reason), file=sys.stderr)
        return 1
    except OSError as e:
        print(message(os_reason(e)), file=sys.stderr)
        return 1
    except Exception as e:  # the last guard: a bug, told in one line (or in full when debugging)
        if os.environ.get(DEBUG_VARIABLE, "") not in ("", "0"):
            traceback.print_exc(file=sys.stderr)
        print(message(bug_line(args.command, e)), file=sys.stderr)
        return EXIT_BUG


def bug_line(command: str, err: BaseException) -> str:
    """The one line for an unforeseen error in ``command`` (without the prefix)."""
    return (
        f"{command} stopped on an unexpected error ({type(err).__name__}); please report it as "
        f"a bug with the command line and the input file (set {DEBUG_VARIABLE}=1 to see the details)"
    )


def _silent(unraisable: Any) -> None:
    """An unraisable-exception hook that says nothing (used only while cleaning up after Ctrl-C)."""


def _interrupted(previous: Callable[[Any], Any]) -> int:
    """After Ctrl-C: collect what the interrupted command left, restore the hook, one line."""
    try:
        gc.collect()
    finally:
        sys.unraisablehook = previous
    print(message("interrupted"), file=sys.stderr)
    return EXIT_INTERRUPTED
