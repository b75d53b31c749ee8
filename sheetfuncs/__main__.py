"""``python -m sheetfuncs`` and the ``sheetfuncs`` console script: the command line (see
:mod:`sheetfuncs.cli`).

:func:`run` imports the command line before it runs it, so that Ctrl-C while numpy and scipy
are still loading is one line too (exit code 130), like Ctrl-C at any later moment.
"""

from __future__ import annotations

import sys

__all__ = ["run"]


def run() -> int:
    """Load the command line and run it; returns the exit code."""
    try:
        from .cli import main

        return main()
    except KeyboardInterrupt:  # while loading (main handles its own run)
        from .errors import message

        print(message("interrupted"), file=sys.stderr)
        return 130


if __name__ == "__main__":
    raise SystemExit(run())
