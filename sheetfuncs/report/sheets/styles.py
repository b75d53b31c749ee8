"""The report's look: colours, cell styles, the marks of conditional formatting, sheet titles.

Every sheet builder takes its styles from here, so that the sheets share one look. The marks
(:func:`p_rule`, :func:`yes_rule`) only ever mark numbers below alpha or the word ``yes`` /
``differs``: a text such as ``undefined`` is never marked.
"""

from __future__ import annotations

import math
from typing import Any

import numpy as np
from openpyxl.formatting.rule import CellIsRule, FormulaRule
from openpyxl.styles import Font, PatternFill

from ..formats import P_FORMAT, fixed, sig_decimals
from ..grid import Grid, Style

__all__ = [
    "NAVY", "GREY", "TITLE", "SUBTITLE", "HEADING", "TH", "TEXT", "NOTE", "KEY", "ANSWER_FILL",
    "MARK_FILL", "MARK_FONT", "P_STYLE", "INT_STYLE", "p_rule", "yes_rule", "finish_rules",
    "put_title", "df_style", "stat_style",
]

NAVY = "1F3864"
GREY = "595959"
TITLE = Style(bold=True, size=15, color=NAVY)
SUBTITLE = Style(italic=True, color=GREY)
HEADING = Style(bold=True, size=12, color=NAVY, rule_below=True)
TH = Style(bold=True, fill="D9E1F2", rule_below=True, wrap=True, valign="bottom")
TEXT = Style(wrap=True, valign="top")
NOTE = Style(italic=True, color=GREY, wrap=True, valign="top")
KEY = Style(bold=True, valign="top")
ANSWER_FILL = {"differs": "E2EFDA", "no difference": "EDEDED", "unsettled": "FFF2CC"}
MARK_FILL = "FCE4D6"
MARK_FONT = "9C0006"

P_STYLE = Style(num=P_FORMAT, halign="right")
INT_STYLE = Style(num="0")


def p_rule(alpha: float, first_cell: str) -> FormulaRule:
    """Conditional format that marks p-values below alpha in a range whose top-left cell is
    ``first_cell``. Only numbers are marked: blank cells and texts such as "undefined" never are."""
    return FormulaRule(
        formula=[f"AND(ISNUMBER({first_cell}),{first_cell}<{float(alpha)!r})"],
        fill=PatternFill("solid", start_color=MARK_FILL, end_color=MARK_FILL),
        font=Font(bold=True, color=MARK_FONT),
    )


def yes_rule(word: str) -> CellIsRule:
    """Conditional format that marks the cells that hold exactly ``word``."""
    return CellIsRule(
        operator="equal", formula=[f'"{word}"'],
        fill=PatternFill("solid", start_color=MARK_FILL, end_color=MARK_FILL),
        font=Font(bold=True, color=MARK_FONT),
    )


def finish_rules(grid: Grid, alpha: float) -> None:
    """Give every range of p-values noted without a rule (``None``) its :func:`p_rule`."""
    grid.conditional = [
        (rng, rule if rule is not None else p_rule(alpha, rng.split(":")[0])) for rng, rule in grid.conditional
    ]


def put_title(grid: Grid, title: str, subtitle: str) -> None:
    """The sheet's title in A1 and its subtitle in A2."""
    grid.put(1, 1, title, TITLE)
    grid.put(2, 1, subtitle, SUBTITLE)


def df_style(v: Any) -> Style:
    """Degrees of freedom: whole numbers without decimals, Welch's fractional df with two."""
    if isinstance(v, (int, np.integer)) or (isinstance(v, float) and v.is_integer()):
        return INT_STYLE
    return Style(num="0.00")


def stat_style(v: Any) -> Style:
    """A test statistic: four significant digits (scientific below 1e-4), integers as such."""
    if isinstance(v, (int, np.integer)) and not isinstance(v, bool):
        return INT_STYLE
    if isinstance(v, (int, float)) and not isinstance(v, bool) and math.isfinite(float(v)):
        if v != 0 and abs(v) < 1e-4:
            return Style(num="0.000E+00")
        return Style(num=fixed(sig_decimals(float(v))))
    return Style()
