"""The ``sheetfuncs`` command line: ``report``, ``demo``, ``table`` and ``plan``.

A front only: inputs are read by :func:`sheetfuncs.input.read_groups` (which cleans every range
with ``groups_from_range``), numbers come from the core, reports from
:func:`sheetfuncs.report.write_report`. :func:`main` parses the command line
(:mod:`~sheetfuncs.cli.parser`), runs the command's module (:mod:`~sheetfuncs.cli.report`,
:mod:`~sheetfuncs.cli.demo`, :mod:`~sheetfuncs.cli.table`, :mod:`~sheetfuncs.cli.plan`) and
turns every problem into an exit code: 0 done, 1 an input problem (one line on stderr, no
traceback), 2 a usage error.
"""

from __future__ import annotations

import argparse
import sys
from collections.abc import Callable, Sequence
from types import MappingProxyType

from ..errors import InputError, message
from .demo import run_demo
from .files import os_reason
from .parser import UsageError, build_parser, parse_args
from .plan import run_plan
from .report import run_report
from .table import run_table

__all__ = ["COMMANDS", "main"]

#: The function that runs each command; it returns the exit code.
COMMANDS: MappingProxyType[str, Callable[[argparse.Namespace], int]] = MappingProxyType({
    "report": run_report,
    "demo": run_demo,
    "table": run_table,
    "plan": run_plan,
})


def main(argv: Sequence[str] | None = None) -> int:
    """Run the command line; returns the exit code (0 done, 1 input problem, 2 usage)."""
    parser = build_parser()
    try:
        args = parse_args(parser, None if argv is None else list(argv))
    except SystemExit as e:  # --help, --version (0) and usage errors (2)
        return e.code if isinstance(e.code, int) else (0 if e.code is None else 2)
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
    except KeyboardInterrupt:
        print(message("interrupted"), file=sys.stderr)
        return 130
