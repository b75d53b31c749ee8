"""The ``sheetfuncs`` command line (the console script ``sheetfuncs.cli:main``).

``parser`` (the commands, their options and the usage errors), ``commands`` (:func:`main`: parse,
run one command, exit code), one module per command (``report``, ``demo``, ``table``, ``plan``),
``files`` (the report's name and writer, file-system errors), ``output`` (JSON, CSV and aligned
text) and ``progress`` (progress on stderr). Other modules import from this package.
"""

from .commands import main
from .demo import DEMO_SHEET
from .output import csv_safe, json_ready
from .parser import DEFAULT_DEMO_OUTPUT, build_parser
from .progress import BIG_INPUT_CELLS, Progress

__all__ = [
    "main", "build_parser", "DEMO_SHEET", "DEFAULT_DEMO_OUTPUT", "BIG_INPUT_CELLS", "Progress",
    "csv_safe", "json_ready",
]
