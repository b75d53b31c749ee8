"""What the worksheet functions share: the data and option arguments most of them take, and the
example sheet (invented data) that most documentation examples point at.
"""

from __future__ import annotations

from typing import Any

from ..registry import Arg, Example, Ref

__all__ = [
    "DATA", "LAYOUT", "LABELS", "CONF", "DATA_REF", "ON_SHEET", "ON_SHEET_EXAMPLE", "EXAMPLE_NOTE",
    "EXAMPLE_SHEET",
]

DATA = Arg(
    "data", "range",
    "The measurements: one group per column (layout \"wide\"), label and value columns "
    "(\"long\") or one group per row (\"rowwise\"). Blanks, text and logical values are ignored.",
)
LAYOUT = Arg(
    "layout", "text",
    "How the range holds the groups: \"wide\" (one per column), \"long\" (label column, value "
    "column) or \"rowwise\" (one per row).",
    default="wide",
)
LABELS = Arg(
    "labels", "logical",
    "Does the first row (first column when rowwise) hold group labels? TRUE, FALSE, or \"auto\" "
    "(yes when all its non-blank cells are text).",
    default="auto",
)
CONF = Arg("conf", "number", "Confidence level of the intervals, between 0 and 1.", default=0.95)

#: The data block of the example sheet, and the note of the examples that use it as it is.
DATA_REF = Ref("A1:C7")
ON_SHEET = "On the example sheet (invented data)"
#: The example of most functions that take data: the example sheet's block, options left out.
ON_SHEET_EXAMPLE = Example(ON_SHEET, (DATA_REF,))

#: The shared example sheet (invented data), laid out from cell A1, and what it holds: the cells
#: of every example that lays out no cells of its own (``Example.cells`` is ``None``).
EXAMPLE_NOTE = (
    "Invented data: cap removal torque (N·m) of caps from three capping heads of a bottling "
    "line. One cap was lost (its cell holds a note, which is ignored) and one cell is blank."
)
EXAMPLE_SHEET: tuple[tuple[Any, ...], ...] = (
    ("Head A", "Head B", "Head C"),
    (1.52, 1.61, 1.47),
    (1.49, 1.66, 1.45),
    (1.55, 1.58, 1.50),
    (1.51, 1.63, 1.44),
    (1.48, "cap lost", 1.46),
    (1.53, 1.65, None),
)
