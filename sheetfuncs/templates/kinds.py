"""The ready template kinds: what each shows, its data block and its invented example data.

Four kinds, each a record sheet and a data sheet (see :mod:`.layout`):

* ``compare-groups``: the one-way table, the checks and which result to read, pairwise
  comparisons with letters, a group summary and the decision;
* ``lot-homogeneity``: variance components with their intervals, the intraclass correlation,
  the one-way table and the decisions (lots differ; ICC within a limit the user sets);
* ``study-plan``: power, values needed per group and the detectable effect, with a pilot block
  from which the effect size and the spread within groups are estimated;
* ``summary-compare``: the one-way table from each group's n, mean and SD (a cells block).

Formulas are in the Excel form (``SF_P(``); :mod:`.writer` converts to the Calc form. Every
data function gets ``"wide",TRUE``: one group per column, the first row holds the labels
whatever they are (lot numbers too). The sizes of the array areas come from the Python call on
the example data (:func:`sheetfuncs.worksheet.harness.call`); the examples use every column of
their block, so the areas also hold the largest result the block can give.
"""

from __future__ import annotations

from collections.abc import Callable, Mapping
from dataclasses import dataclass
from types import MappingProxyType
from typing import Any

from openpyxl.styles import Font
from openpyxl.utils import get_column_letter

from ..worksheet import harness
from .layout import (
    CAUTIONS, HEADER_FIELDS, SPARE_ROWS_NOTE, Block, Page, absolute, local, write_block,
)
from .examples import LOTS, MEASUREMENTS, PILOT, SUMMARY

__all__ = ["KINDS", "Kind", "METHODS", "KIND_SPECS", "RECORD_SHEET", "DATA_SHEET",
           "DATA_FIRST_ROW", "write_data_sheet"]

RECORD_SHEET = "Record"
DATA_SHEET = "Data"
WIDE = '"wide",TRUE'
METHODS = ("tukey", "games-howell", "bonferroni", "holm", "sidak", "scheffe")
_SUBTITLE = ("Template written by sheetfuncs. The example data on the Data sheet are invented: "
             "replace them with your own.")
#: The row of the block's header on every data sheet (fixed, so that the record sheet can
#: refer to the block's columns).
DATA_FIRST_ROW = 9
_NOTE = Font(italic=True, color="5A5A5A")


@dataclass(frozen=True)
class Kind:
    """One template kind: its name, title, one-line description, data block and record builder
    (which writes the record sheet and returns nothing; the page records what it wrote)."""

    name: str
    title: str
    description: str
    block: Block
    entry: tuple[str, ...]
    build: Callable[[Page, Block], None]


def shape(name: str, block: Block, *options: Any) -> tuple[int, int]:
    """Rows and columns of ``name``'s result on the block's example data (the Python call)."""
    shown = harness.call(name, block.grid(), "wide", True, *options)
    if not isinstance(shown, list):
        raise RuntimeError(f"{name} gives no table on the example data: {shown!r}")
    return len(shown), len(shown[0])


def at(top: tuple[int, int], row: int, col: int) -> str:
    """The address of the cell ``row``, ``col`` (1-based) of an area whose top left is ``top``."""
    return f"{get_column_letter(top[1] + col - 1)}{top[0] + row - 1}"


def opening(page: Page, title: str, how: tuple[str, ...]) -> None:
    """Title, header fields and the short instructions every record sheet starts with."""
    page.title(title, _SUBTITLE)
    page.section("Record")
    page.fields(HEADER_FIELDS)
    page.section("How to use this sheet")
    page.lines(how + (
        "Result tables are array formulas: edit the data and settings, not single cells in them.",
        "A cell that shows a line starting \"sheetfuncs:\" says what is wrong with the input; "
        "the decisions then say \"check the data\".",
        SPARE_ROWS_NOTE,
    ), _NOTE)


def closing(page: Page) -> None:
    """The cautions and a sign-off line."""
    page.section("Cautions")
    page.lines(CAUTIONS)
    page.section("Sign-off")
    page.fields(("Analyst: signature and date", "Reviewer: signature and date"))


def verdict(p: str, alpha: str, yes: str, no: str) -> str:
    """The guarded decision on a p-value cell."""
    return (f'IF(AND(ISNUMBER({p}),ISNUMBER({alpha})),IF({p}<{alpha},"{yes}","{no}"),'
            f'"check the data and alpha")')


def build_compare(page: Page, block: Block) -> None:
    """Length: one record sheet written top to bottom (settings, decision, five areas), easier
    to follow as one sequence than split up."""
    opening(page, "Comparing groups: one-way analysis of variance", (
        "Enter the measurements on the Data sheet: one group per column, its label in the "
        "first row (the block is named Measurements).",
        "Set alpha and the comparison method below; the decision reads the result the checks "
        "say to read.",
    ))
    page.section("Settings")
    page.setting("Alpha", "Alpha", 0.05, "significance level, between 0 and 1")
    page.setting("Method", "Comparison method", "tukey", ", ".join(METHODS), METHODS)
    page.section("Decision")
    decision_row = page.skip(4)
    data = f"{block.name},{WIDE}"
    page.section("Checks: which result to read")
    checks = page.array(f"SF_CHECKS({data},Alpha)", shape("SF_CHECKS", block, 0.05))
    page.section("One-way analysis of variance")
    page.array(f'SF_TABLE({data},"Sealing jaw")', shape("SF_TABLE", block, "Sealing jaw"))
    page.section("Pairwise comparisons")
    pairs_shape = shape("SF_PAIRS", block, "tukey", 0.05)
    pairs = page.array(f"SF_PAIRS({data},Method,Alpha)", pairs_shape)
    page.section("Letters: groups that share a letter are not separated")
    page.array(f"SF_LETTERS({data},Method,Alpha)", shape("SF_LETTERS", block, "tukey", 0.05))
    page.section("Groups")
    page.array(f"SF_GROUPS({data})", shape("SF_GROUPS", block))
    closing(page)
    p, reading = at(checks, 2, 4), at(checks, 2, 5)
    differs = local((pairs[0] + 1, pairs[1] + pairs_shape[1] - 1),
                    (pairs[0] + pairs_shape[0] - 1, pairs[1] + pairs_shape[1] - 1))
    end = page.goto(decision_row)
    page.value("Group means", verdict(p, "Alpha", "means differ", "no difference shown"),
               "at alpha, on the result read", decision=True)
    page.value("Result read", f'IF(ISNUMBER({p}),{reading},"check the data")')
    page.value("p-value read", f'IF(ISNUMBER({p}),{p},"check the data")')
    first_p = at(pairs, 2, 8)
    page.value("Pairs that differ",
               f'IF(ISNUMBER({first_p}),COUNTIF({differs},TRUE),"check the data")',
               "by the comparison method, at alpha")
    page.goto(end)


def build_lots(page: Page, block: Block) -> None:
    """Length: one record sheet written top to bottom, as :func:`build_compare`."""
    opening(page, "Lot homogeneity: variance components and intraclass correlation", (
        "Enter the results on the Data sheet: one lot per column, the lot's name in the first "
        "row, its replicate results below (the block is named Lots).",
        "Set the ICC limit your procedure gives; the example limit is invented.",
    ))
    page.section("Settings")
    page.setting("Alpha", "Alpha", 0.05, "significance level of the F test")
    page.setting("Confidence", "Confidence level", 0.95, "of the intervals")
    page.setting("IccLimit", "ICC limit", 0.2, "invented example: use the limit your procedure sets")
    page.section("Decision")
    decision_row = page.skip(4)
    data = f"{block.name},{WIDE}"
    page.section("Variance components")
    comp = page.array(f"SF_VARCOMP({data},Confidence)", shape("SF_VARCOMP", block, 0.95))
    page.section("One-way analysis of variance")
    table = page.array(f'SF_TABLE({data},"Lot")', shape("SF_TABLE", block, "Lot"))
    page.section("Lots")
    page.array(f"SF_GROUPS({data},Confidence)", shape("SF_GROUPS", block, 0.95))
    closing(page)
    p, icc, upper = at(table, 2, 6), at(comp, 5, 2), at(comp, 5, 4)
    end = page.goto(decision_row)
    page.value("Lot means", verdict(p, "Alpha", "lots differ", "no difference between lots shown"),
               "F test at alpha", decision=True)
    page.value("Intraclass correlation", f'IF(ISNUMBER({icc}),{icc},"check the data")',
               "share of the total variance that lies between lots")
    page.value("Homogeneity", f'IF(AND(ISNUMBER({upper}),ISNUMBER(IccLimit)),IF({upper}<=IccLimit,'
               f'"upper limit of the ICC within the limit","ICC not shown within the limit"),'
               f'"check the data and the limit")',
               "the ICC's upper confidence limit against the ICC limit", decision=True)
    page.goto(end)


def build_plan(page: Page, block: Block) -> None:
    """Length: one record sheet written top to bottom, as :func:`build_compare`."""
    opening(page, "Planning a study: power, sample size and detectable difference", (
        "Enter the plan below: number of groups, values per group, the effect to detect "
        "(Cohen's f) and the spread within groups.",
        "Optional: enter pilot data on the Data sheet (block Measurements); the pilot's f and "
        "SD are shown below to help choose the inputs.",
    ))
    page.section("Plan")
    page.setting("GroupCount", "Groups", 4, "number of groups, k")
    page.setting("PerGroup", "Values per group", 8, "n, equal group sizes")
    page.setting("EffectF", "Effect to detect (f)", 0.5, "SD of the group means / SD within")
    page.setting("WantedPower", "Wanted power", 0.8, "chance of detecting the effect")
    page.setting("Alpha", "Alpha", 0.05, "significance level of the F test")
    page.setting("WithinSD", "SD within groups", 0.9, "in the units of the measurement")
    page.section("Results")
    power = page.value("Power", "SF_POWER(GroupCount,PerGroup,EffectF,Alpha)", "of the plan above")
    page.value("Values needed per group", "SF_SAMPLESIZE(GroupCount,EffectF,WantedPower,Alpha)",
               "for the wanted power at the effect above")
    det = page.value("Detectable f", "SF_DETECTABLE(GroupCount,PerGroup,WantedPower,Alpha)",
                     "smallest f detected with the wanted power")
    page.value("Detectable range of means", f"IF(AND(ISNUMBER({det}),ISNUMBER(WithinSD)),"
               f"{det}*WithinSD*SQRT(2*GroupCount),\"check the inputs\")",
               "two groups at the extremes, the others midway (Cohen 1988, ch. 8)")
    page.value("Decision", f'IF(AND(ISNUMBER({power}),ISNUMBER(WantedPower)),'
               f'IF({power}>=WantedPower,"plan reaches the wanted power",'
               f'"plan falls short: see the values needed per group"),'
               f'"check the inputs")', decision=True)
    page.section("From the pilot data (Data sheet)")
    effect = page.array(f"SF_EFFECT({block.name},{WIDE})", shape("SF_EFFECT", block))
    msw = page.value("Mean square within", f"SF_MSW({block.name},{WIDE})")
    page.value("Pilot SD within groups", f'IF(ISNUMBER({msw}),SQRT({msw}),"check the pilot data")')
    page.value("Pilot f", f'IF(ISNUMBER({at(effect, 5, 2)}),{at(effect, 5, 2)},'
               f'"check the pilot data")', "an estimate with a wide interval: plan on a value "
               "you can defend")
    closing(page)


def build_summary(page: Page, block: Block) -> None:
    """The one-way table from each group's n, mean and SD, and the decision."""
    opening(page, "Comparing groups from a summary: n, mean and SD per group", (
        "Enter one group per row on the Data sheet: its name, n, mean and SD (n - 1 divisor); "
        "the block is named GroupSummary.",
        "Use this when the raw values are not at hand; no checks of the assumptions are "
        "possible from a summary.",
    ))
    page.section("Settings")
    page.setting("Alpha", "Alpha", 0.05, "significance level, between 0 and 1")
    page.section("Decision")
    decision_row = page.skip(2)
    first, last = DATA_FIRST_ROW, DATA_FIRST_ROW + block.rows
    col = {h: absolute(DATA_SHEET, (first, 2 + j), (last, 2 + j)) for j, h in enumerate(block.header)}
    page.section("One-way analysis of variance")
    formula = f"SF_FROMSTATS({col['n']},{col['Mean']},{col['SD']},{col['Group']})"
    grid = block.grid()
    shown = harness.call("SF_FROMSTATS", *([[r[j]] for r in grid] for j in (1, 2, 3, 0)))
    table = page.array(formula, (len(shown), len(shown[0])))
    closing(page)
    p = at(table, 2, 6)
    end = page.goto(decision_row)
    page.value("Group means", verdict(p, "Alpha", "means differ", "no difference shown"),
               "one-way F test at alpha", decision=True)
    page.value("p-value", f'IF(ISNUMBER({p}),{p},"check the data")')
    page.goto(end)


_SPECS = (
    Kind("compare-groups", "Comparing groups",
         "one-way table, checks and which result to read, pairwise comparisons with letters, "
         "decision", MEASUREMENTS, ("one group per column", "label in the first row"),
         build_compare),
    Kind("lot-homogeneity", "Lot homogeneity",
         "variance components with intervals, intraclass correlation, one-way table, decisions",
         LOTS, ("one lot per column", "lot name in the first row", "replicates below"),
         build_lots),
    Kind("study-plan", "Planning a study",
         "power, values needed per group, detectable effect and difference; pilot data block",
         PILOT, ("optional pilot data", "one group per column", "label in the first row"),
         build_plan),
    Kind("summary-compare", "Comparing groups from a summary",
         "one-way table from n, mean and SD per group, decision", SUMMARY,
         ("one group per row", "Group, n, Mean, SD"), build_summary),
)

#: The template kinds by name, in the order they are listed.
KIND_SPECS: Mapping[str, Kind] = MappingProxyType({k.name: k for k in _SPECS})
#: The names of the template kinds.
KINDS: tuple[str, ...] = tuple(KIND_SPECS)


def write_data_sheet(page: Page, kind: Kind) -> str:
    """The data sheet: title, entry notes, the block from :data:`DATA_FIRST_ROW`."""
    page.title(f"{kind.title}: data entry", _SUBTITLE)
    page.lines(("Enter the data in the table below: " + "; ".join(kind.entry) + ".",
                "Blank cells are ignored. Keep the data inside the table: the results read "
                f"the block named {kind.block.name} (table {kind.block.table}).",
                "Clear the example values before entering your own."), _NOTE)
    page.row = DATA_FIRST_ROW - 1
    return write_block(page, kind.block, "Example data: invented, for illustration only.")
