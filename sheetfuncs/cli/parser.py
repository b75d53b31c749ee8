"""The command line's parser: the commands, their options and the usage errors.

One builder per command (``report``, ``demo``, ``table``, ``plan``, ``calc`` and its actions) on
shared option groups: the
reading options, the names of the factor and the response, the significance level, progress and
help. A usage error is two short lines on stderr: the command's usage, then one line that says
what is wrong (exit code 2). The commands themselves live in their own modules and are run by
:func:`sheetfuncs.cli.commands.main`.
"""

from __future__ import annotations

import argparse
import math
import re
import sys
from typing import Any

from ..errors import message
from ..input import DEFAULT_MAX_CELLS, DEFAULT_MAX_FIELDS, DEFAULT_SIZE_LIMIT

__all__ = [
    "UsageError", "CommandParser", "DEFAULT_DEMO_OUTPUT", "build_parser", "parse_args",
    "read_options", "add_engine_options", "positive_mb", "real", "whole", "count", "REPORT_MAX_GROUPS",
    "TEMPLATE_KINDS",
]

DEFAULT_DEMO_OUTPUT = "sheetfuncs-demo.xlsx"
DASH_HINT = '; for a value that starts with "-", write {opt}=-2+3'


class UsageError(Exception):
    """A usage problem found after parsing (exit code 2)."""


class CommandParser(argparse.ArgumentParser):
    """argparse with usage errors as two short lines: the command's usage, then one line that
    says what is wrong (with a hint for values that start with a minus sign)."""

    def error(self, problem: str) -> None:  # type: ignore[override]
        text = " ".join(str(problem).split())
        opt = re.match(r"argument (-\w|--[\w-]+)(?:/(--[\w-]+))?: expected one argument", text)
        if opt:
            name = opt.group(2) or opt.group(1)
            text += f'; for a value that starts with "-", write {name}=VALUE (e.g. {name}=-2+3)'
        cmd = self.prog[len("sheetfuncs"):].strip()
        where = f"{cmd}: " if cmd else ""
        self.print_usage(sys.stderr)
        self.exit(2, message(f"{where}{text} (see: {self.prog} --help)") + "\n")


#: The report writer's default limit on groups (sheetfuncs.report.DEFAULT_MAX_GROUPS, which the
#: tests compare), for the help text: the report layer is imported only when a report is written.
REPORT_MAX_GROUPS = 100


# --------------------------------------------------------------------------------------------
# option types


def positive_mb(text: str) -> float:
    """A size limit in megabytes: a finite number above zero."""
    try:
        v = float(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f'must be a number of megabytes, not "{text}"') from None
    if not math.isfinite(v) or v <= 0:
        raise argparse.ArgumentTypeError(f'must be a positive number of megabytes, not "{text}"')
    return v


def real(text: str) -> float:
    """A number (its range is checked by the command, with the core's message)."""
    try:
        return float(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f'must be a number, not "{text}"') from None


def count(text: str) -> int:
    """A limit on a count (cells, fields, groups): a whole number of at least 1."""
    try:
        v = int(text.replace("_", "").replace(",", ""))
    except ValueError:
        raise argparse.ArgumentTypeError(f'must be a whole number, not "{text}"') from None
    if v < 1:
        raise argparse.ArgumentTypeError(f'must be at least 1, not "{text}"')
    return v


def whole(text: str) -> int:
    """A whole number (its range is checked by the command, with the core's message)."""
    try:
        return int(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f'must be a whole number, not "{text}"') from None


def method_names() -> tuple[str, ...]:
    """The names of the pairwise comparison methods, for the help text."""
    from ..stats import METHODS

    return tuple(METHODS)


# --------------------------------------------------------------------------------------------
# shared option groups


def add_help(group: Any) -> None:
    group.add_argument("-h", "--help", action="help", help="show this help and exit")


def add_other(parser: argparse.ArgumentParser, *, progress: bool) -> None:
    """The last group of every command: ``--progress`` (where the command reads or writes
    files) and ``--help``."""
    group = parser.add_argument_group("other")
    if progress:
        group.add_argument(
            "--progress", action=argparse.BooleanOptionalAction, default=None,
            help="show progress on stderr, or never (default: only on a terminal, and only for "
                 "inputs above about a million cells or several files)")
    add_help(group)


def add_read_options(p: argparse.ArgumentParser) -> None:
    g = p.add_argument_group("reading the input")
    g.add_argument("--sheet", metavar="NAME",
                   help="worksheet to read (default: the first worksheet)")
    g.add_argument("--range", dest="cell_range", metavar="A1:F40",
                   help="cells to read: A1:F40, B:E, 'Lot data'!B2:F40 or a defined name "
                        "(default: all the used cells of the sheet or CSV file)")
    g.add_argument("--layout", choices=("wide", "long", "rowwise"), default="wide",
                   help="wide: one group per column (default); long: a label column and a "
                        "value column; rowwise: one group per row")
    g.add_argument("--labels", choices=("auto", "yes", "no"), default="auto",
                   help="does the first row (first column for rowwise) hold the group labels? "
                        "auto (default): yes when all of it is text")
    g.add_argument("--decimal-comma", action="store_true",
                   help="CSV files only: numbers are written with a decimal comma (1,5) "
                        "(default: decimal point)")
    g.add_argument("--size-limit", type=positive_mb, default=DEFAULT_SIZE_LIMIT / 2**20,
                   metavar="MB",
                   help="refuse files that unpack to more than this many megabytes "
                        f"(default {DEFAULT_SIZE_LIMIT // 2**20}); raise it only for a file you "
                        "trust")
    g.add_argument("--max-cells", type=count, default=DEFAULT_MAX_CELLS, metavar="N",
                   help=f"refuse to read more than N cells (default {DEFAULT_MAX_CELLS:,})")
    g.add_argument("--max-fields", type=count, default=DEFAULT_MAX_FIELDS, metavar="N",
                   help="CSV files only: refuse a line with more than N fields "
                        f"(default {DEFAULT_MAX_FIELDS:,})")
    f = p.add_argument_group("missing values and labels")
    f.add_argument("--errors", choices=("stop", "missing"), default="stop",
                   help="stop (default): an error cell such as #N/A stops the run and is named; "
                        "missing: error cells are missing values, each one logged")
    f.add_argument("--merge-case", action="store_true",
                   help="merge labels that differ only in case or surrounding spaces into their "
                        "first spelling (logged)")
    f.add_argument("--rename", action="append", metavar="OLD=NEW",
                   help="rename a group label (repeatable); a label renamed to another group's "
                        "label joins that group")


def add_engine_options(p: argparse.ArgumentParser) -> None:
    """Reading by column through the embedded database engine: a Parquet or CSV file, or a
    DuckDB database file with a query."""
    g = p.add_argument_group(
        "reading by column (Parquet, CSV or a DuckDB database, through DuckDB)")
    g.add_argument("--group", metavar="COL",
                   help="the column that holds the group labels (needed for a .parquet input, "
                        "a --duckdb query, or a .csv read by column)")
    g.add_argument("--value", metavar="COL",
                   help="the column that holds the measurements (with --group)")
    g.add_argument("--where", metavar="SQL",
                   help="a filter on the rows, in SQL: \"line = 'A' AND lot > 40\" (default: "
                        "all rows)")
    g.add_argument("--duckdb", metavar="FILE.db",
                   help="a DuckDB database file, opened read-only; give the rows with --query")
    g.add_argument("--query", metavar="SQL",
                   help="with --duckdb: a table name or a query (SELECT ...) that gives the "
                        "rows")
    g.add_argument("--missing", choices=("stop", "drop"), default="stop",
                   help="stop (default): a NULL or NaN value stops the run and is named; drop: "
                        "leave them out and count them per group")


def read_options(args: argparse.Namespace) -> dict[str, Any]:
    """The reading options of :func:`add_read_options` as keyword arguments of
    :func:`sheetfuncs.input.read_groups`."""
    return dict(
        layout=args.layout,
        labels=args.labels,
        sheet=args.sheet,
        cell_range=args.cell_range,
        decimal_comma=args.decimal_comma,
        size_limit=int(args.size_limit * 2**20),
        max_cells=args.max_cells,
        max_fields=args.max_fields,
        errors=args.errors,
        merge_case=args.merge_case,
        rename=args.rename,
    )


def add_paper(group: Any) -> None:
    group.add_argument("--paper", choices=("a4", "letter"), default="a4",
                       help="paper size of every printed page (default a4)")


def add_alpha(group: Any) -> None:
    group.add_argument("--alpha", type=real, default=0.05, metavar="A",
                       help="significance level, between 0 and 1 (default 0.05)")


def add_names(a: Any, *, response: bool) -> None:
    a.add_argument("--factor", default="Factor", metavar="NAME",
                   help="what the groups are, e.g. \"Oven zone\" (default Factor)"
                        + DASH_HINT.format(opt="--factor"))
    if not response:
        return
    a.add_argument("--response", default="Response", metavar="NAME",
                   help="the measured quantity, e.g. Hardness (default Response)"
                        + DASH_HINT.format(opt="--response"))
    a.add_argument("--unit", metavar="UNIT",
                   help="unit of the measurements, e.g. \"Shore A\" (default: none)"
                        + DASH_HINT.format(opt="--unit"))
    a.add_argument("--title", metavar="TEXT",
                   help="report title (default: \"RESPONSE by FACTOR\")"
                        + DASH_HINT.format(opt="--title"))


# --------------------------------------------------------------------------------------------
# one builder per command


def add_command(sub: Any, name: str, *, summary: str, usage: str,
                description: str) -> argparse.ArgumentParser:
    """A command's parser, named ``sheetfuncs NAME`` in its usage and messages, and kept in the
    parsed arguments (``args.parser``) for usage errors found later; its help option is added
    last, by :func:`add_other`."""
    command = sub.add_parser(name, prog=f"sheetfuncs {name}", help=summary, usage=usage,
                             description=description, add_help=False)
    command.set_defaults(parser=command)
    return command


def add_report_command(sub: Any) -> None:
    rep = add_command(
        sub, "report", summary="write a formatted result workbook (.xlsx) for each input file",
        usage="sheetfuncs report INPUT... (-o OUT.xlsx | --out-dir DIR) [options]",
        description="Write a formatted result workbook for each input file: .xlsx/.xlsm "
                    "workbooks (the saved values only; macros are never run) or .csv files. "
                    "Rows in a .parquet or .csv file or a DuckDB database are read by column "
                    "(DATA.parquet --group COL --value COL, or --duckdb FILE.db --query SQL "
                    "--group COL --value COL): the exact sums are computed inside DuckDB. "
                    "An existing report is kept unless --force; an input is never "
                    "overwritten.",
    )
    io_ = rep.add_argument_group("input and output")
    io_.add_argument("inputs", nargs="*", metavar="INPUT",
                     help="one or more .xlsx, .xlsm or .csv files, or a .parquet or .csv file "
                          "read by column (--group, --value)")
    out = io_.add_mutually_exclusive_group(required=True)
    out.add_argument("-o", "--output", metavar="OUT.xlsx",
                     help="the report to write (for one input)")
    out.add_argument("--out-dir", metavar="DIR",
                     help="folder for the reports, one INPUT-report.xlsx per input (the folder "
                          "is created if it does not exist)")
    io_.add_argument("--force", action="store_true",
                     help="replace a report that already exists (default: keep it and stop)")
    io_.add_argument("--max-groups", type=count, default=None, metavar="N",
                     help="refuse to write a report on more than N groups (default "
                          f"{REPORT_MAX_GROUPS}; the comparisons grow with the square of N)")
    add_read_options(rep)
    add_engine_options(rep)
    a = rep.add_argument_group("analysis")
    add_alpha(a)
    a.add_argument("--method", default="tukey", metavar="NAME",
                   help="pairwise comparison method: " + ", ".join(method_names())
                        + " (default tukey)")
    a.add_argument("--control", metavar="LABEL",
                   help="label of a control group: adds Dunnett's comparisons with it "
                        "(default: none)")
    add_names(a, response=True)
    add_paper(io_)
    add_other(rep, progress=True)


def add_demo_command(sub: Any) -> None:
    demo = add_command(
        sub, "demo", summary="write the report of the built-in demo data (invented numbers)",
        usage="sheetfuncs demo [-o OUT.xlsx] [--force]",
        description="Write the report of the built-in demo: gasket hardness by cure-oven "
                    "zone, invented data. A rerun replaces the default file "
                    f"{DEFAULT_DEMO_OUTPUT} and any earlier demo report; any other existing "
                    "file is kept unless --force.",
    )
    dg = demo.add_argument_group("output")
    dg.add_argument("-o", "--output", metavar="OUT.xlsx", default=DEFAULT_DEMO_OUTPUT,
                    help=f"where to write it (default {DEFAULT_DEMO_OUTPUT} in the current "
                         "folder)")
    dg.add_argument("--force", action="store_true",
                    help="replace OUT.xlsx even when it is not a sheetfuncs demo report")
    add_paper(dg)
    add_other(demo, progress=True)


def add_table_command(sub: Any) -> None:
    tab = add_command(
        sub, "table", summary="print the one-way table, the checks and the group summary",
        usage="sheetfuncs table INPUT [--json | --csv] [options]",
        description="Print the one-way table, the assumption checks and the group summary of "
                    "one input file, as aligned text (default), JSON or CSV; the JSON also "
                    "holds the pairwise comparisons, the compact letters and the effect "
                    "sizes. Rows in a .parquet "
                    "or .csv file or a DuckDB database are read by column (DATA.parquet --group "
                    "COL --value COL, or --duckdb FILE.db --query SQL --group COL --value COL).",
    )
    tio = tab.add_argument_group("input and output")
    tio.add_argument("input", nargs="?", metavar="INPUT",
                     help="an .xlsx, .xlsm or .csv file, or a .parquet or .csv file read by "
                          "column (--group, --value)")
    fmt = tio.add_mutually_exclusive_group()
    fmt.add_argument("--json", dest="fmt", action="store_const", const="json",
                     help="print JSON (infinite values as \"inf\", undefined ones as null)")
    fmt.add_argument("--csv", dest="fmt", action="store_const", const="csv",
                     help="print the three tables as CSV, separated by a blank line (text that "
                          "could be taken for a formula gets a leading ')")
    add_read_options(tab)
    add_engine_options(tab)
    ta = tab.add_argument_group("analysis")
    add_alpha(ta)
    ta.add_argument("--method", default=None, metavar="NAME",
                    help="with --json: the pairwise comparison method, "
                         + ", ".join(method_names()) + " (default tukey)")
    add_names(ta, response=False)
    add_other(tab, progress=True)
    tab.set_defaults(fmt="text")


def add_plan_command(sub: Any) -> None:
    plan = add_command(
        sub, "plan", summary="values per group that a planned study needs",
        usage="sheetfuncs plan --groups K (--effect F | --difference D --sd S) "
              "[--power P | --n N] [--alpha A]",
        description="Values per group that a balanced one-way study needs to detect an "
                    "effect with the given power (noncentral F), or with --n the power of N "
                    "values per group. Give the effect as Cohen's size f, or in the response's "
                    "units: two group means D apart, the others midway between them (the least "
                    "favourable configuration), with S the SD within groups.",
    )
    pg = plan.add_argument_group("study")
    pg.add_argument("--groups", type=whole, required=True, metavar="K",
                    help="number of groups, 2 or more (required)")
    pg.add_argument("--effect", type=real, metavar="F",
                    help="Cohen's effect size f (0.10 small, 0.25 medium, 0.40 large)")
    pg.add_argument("--difference", type=real, metavar="D",
                    help="instead of --effect: the difference between two group means to "
                         "detect, in the response's units (with --sd)")
    pg.add_argument("--sd", type=real, metavar="S",
                    help="the SD within groups, in the response's units (with --difference)")
    pg.add_argument("--power", type=real, default=None, metavar="P",
                    help="chance of detecting the effect, between 0 and 1 (default 0.8)")
    pg.add_argument("--n", type=whole, default=None, metavar="N",
                    help="instead of --power: values per group; prints the power they give")
    add_alpha(pg)
    add_other(plan, progress=False)


def _calc_action(actions: Any, name: str, summary: str, usage: str) -> argparse.ArgumentParser:
    action = actions.add_parser(name, prog=f"sheetfuncs calc {name}", help=summary, usage=usage,
                                description=summary[:1].upper() + summary[1:] + ".",
                                add_help=False)
    action.set_defaults(parser=action)
    return action


def add_calc_command(sub: Any) -> None:
    calc = add_command(
        sub, "calc", summary="the LibreOffice Calc extension: build, install, check; convert "
                             "workbooks between Excel and Calc",
        usage="sheetfuncs calc {build,install,check,convert} [options]",
        description="The SF_ worksheet functions in LibreOffice Calc: build the extension from "
                    "this sheetfuncs, install it for LibreOffice, check it in a headless Calc, "
                    "and convert the SF_ formulas of an .xlsx between Excel's and Calc's form.",
    )
    actions = calc.add_subparsers(dest="calc_action", metavar="ACTION", title="actions")
    actions.required = True
    python_help = ("the Python whose environment holds sheetfuncs, numpy and scipy, for "
                   "LibreOffice to use (default: the Python running this command)")
    build = _calc_action(actions, "build", "write the extension (.oxt) without installing it",
                         "sheetfuncs calc build [-o FILE.oxt] [--python PATH]")
    build.add_argument("-o", "--output", metavar="FILE.oxt", default="sheetfuncs.oxt",
                       help="where to write it (default sheetfuncs.oxt)")
    build.add_argument("--python", metavar="PATH", help=python_help)
    install = _calc_action(actions, "install", "build the extension and install it for "
                           "LibreOffice", "sheetfuncs calc install [--python PATH] [--shared]")
    install.add_argument("--python", metavar="PATH", help=python_help)
    install.add_argument("--shared", action="store_true",
                         help="install it for every user of this machine (needs root)")
    check = _calc_action(actions, "check", "compute SF_P and SF_TABLE in a headless Calc and "
                         "compare them with the Python call", "sheetfuncs calc check")
    for action in (install, check):
        action.add_argument("--profile", metavar="DIR",
                            help="a LibreOffice profile folder to use instead of your own "
                                 "(for a throw-away test)")
    convert = _calc_action(actions, "convert", "rewrite the SF_ formulas of an .xlsx for the "
                           "other program", "sheetfuncs calc convert INPUT.xlsx -o OUT.xlsx "
                           "--to {calc,excel} [--force]")
    convert.add_argument("input", metavar="INPUT.xlsx", help="an .xlsx or .xlsm workbook")
    convert.add_argument("-o", "--output", metavar="OUT.xlsx", required=True,
                         help="the converted copy (the input is never changed)")
    convert.add_argument("--to", choices=("calc", "excel"), required=True,
                         help="calc: for LibreOffice Calc with the extension; excel: for "
                              "Excel with xlwings")
    convert.add_argument("--force", action="store_true",
                         help="replace OUT.xlsx when it exists (default: keep it and stop)")
    for action in (build, install, check, convert):
        add_other(action, progress=False)
    add_other(calc, progress=False)


#: The kinds of ready template (sheetfuncs.templates.KINDS, which the tests compare), for the
#: help text: the templates are imported only when one is written.
TEMPLATE_KINDS = ("compare-groups", "lot-homogeneity", "study-plan", "summary-compare")


def add_template_command(sub: Any) -> None:
    tpl = add_command(
        sub, "template", summary="write a ready QA template (.xlsx) with live SF_ formulas",
        usage="sheetfuncs template KIND -o FILE.xlsx [--for excel|calc] [--force]",
        description="Write a ready QA template: a record sheet with header fields, SF_ "
                    "formulas, decisions guarded by ISNUMBER(), instructions and cautions, and "
                    "a data sheet whose block (a defined name and a table) holds invented "
                    "example data. Kinds: compare-groups (one-way table, checks, pairwise "
                    "comparisons with letters, decision), lot-homogeneity (variance components, "
                    "ICC), study-plan (power, sample size, detectable difference from a pilot), "
                    "summary-compare (from n, mean and SD per group).",
    )
    g = tpl.add_argument_group("template")
    g.add_argument("kind", choices=TEMPLATE_KINDS, metavar="KIND",
                   help="one of: " + ", ".join(TEMPLATE_KINDS))
    g.add_argument("-o", "--output", metavar="FILE.xlsx", required=True,
                   help="where to write it")
    g.add_argument("--for", dest="host", choices=("excel", "calc"), default="excel",
                   help="excel (default): formulas for Excel with xlwings; calc: for "
                        "LibreOffice Calc with the sheetfuncs extension")
    g.add_argument("--force", action="store_true", help="replace FILE.xlsx when it exists")
    add_other(tpl, progress=False)


def add_fill_command(sub: Any) -> None:
    fill = add_command(
        sub, "fill", summary="fill a template's data block and store every result, headless",
        usage="sheetfuncs fill TEMPLATE --data FILE... (-o OUT.xlsx | --out-dir DIR) "
              "[--into NAME] [options]",
        description="Put the data of a file into a template's data block (a defined name or "
                    "a table), compute every SF_ formula with the same core as the live "
                    "functions, evaluate the formulas that depend on them, and store each "
                    "value with its formula, so that the filled workbook shows the numbers in "
                    "any spreadsheet program. Nothing else in the template changes.",
    )
    io_ = fill.add_argument_group("template, data and output")
    io_.add_argument("template", metavar="TEMPLATE", help="an .xlsx or .xlsm template")
    io_.add_argument("--data", nargs="+", required=True, metavar="FILE",
                     help="the data: .xlsx, .xlsm or .csv files (several with --out-dir)")
    out = io_.add_mutually_exclusive_group(required=True)
    out.add_argument("-o", "--output", metavar="OUT.xlsx", help="the filled workbook")
    out.add_argument("--out-dir", metavar="DIR",
                     help="folder for one filled workbook per data file, named after it")
    io_.add_argument("--into", metavar="NAME",
                     help="the data block: a defined name or a table (default: the "
                          "template's only defined name over a range of cells)")
    io_.add_argument("--force", action="store_true",
                     help="replace outputs that exist (default: keep them and stop)")
    add_read_options(fill)
    add_other(fill, progress=True)


def build_parser() -> argparse.ArgumentParser:
    """The argument parser (exposed for documentation and tests)."""
    from .. import __version__

    parser = CommandParser(
        prog="sheetfuncs",
        usage="sheetfuncs COMMAND [options]",
        description="Exact one-way analysis of variance: does a factor (a filling head, a lot, "
                    "an oven zone) change the mean of a measurement? Writes formatted report "
                    "workbooks, prints tables for pipelines, and plans sample sizes.",
        epilog="Start with: sheetfuncs demo. Run sheetfuncs COMMAND --help for a command's "
               "options. Exit codes: 0 done, 1 an input problem (one line on stderr), "
               "2 a usage error.",
        add_help=False,
    )
    top = parser.add_argument_group("options")
    add_help(top)
    top.add_argument("--version", action="version", version=f"sheetfuncs {__version__}",
                     help="show the version and exit")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND", title="commands")
    sub.required = True
    for add in (add_report_command, add_demo_command, add_table_command, add_plan_command,
                add_template_command, add_fill_command, add_calc_command):
        add(sub)
    return parser


def parse_args(parser: argparse.ArgumentParser, argv: list[str] | None) -> argparse.Namespace:
    """Parse, letting ``report`` take input files after its options too
    (``report a.csv --out-dir r b.csv``); anything else left over is a usage error."""
    args, extra = parser.parse_known_args(argv)
    if extra:
        sub = getattr(args, "parser", parser)
        if args.command == "report" and not any(x.startswith("-") for x in extra):
            args.inputs = list(args.inputs) + extra
        elif args.command == "table" and not any(x.startswith("-") for x in extra):
            sub.error(f"table reads one input, but more were given: {' '.join(extra)}; run it "
                      "once per file")
        else:
            sub.error(f"unrecognized arguments: {' '.join(extra)}")
    return args
