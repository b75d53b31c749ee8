"""The ``sheetfuncs`` command line: ``report``, ``demo``, ``table`` and ``plan``.

A front only: inputs are read by :mod:`sheetfuncs.readers` (which cleans every range with
``groups_from_range``), numbers come from the core, reports from
:func:`sheetfuncs.report.write_report`. Exit codes: 0 done, 1 an input problem (one line on
stderr, no traceback), 2 a usage error.
"""

from __future__ import annotations

import argparse
import csv
import json
import math
import os
import re
import sys
import time
from collections.abc import Sequence
from fractions import Fraction
from pathlib import Path
from typing import Any, TextIO

from ..errors import InputError, message
from ..input import DEFAULT_SIZE_LIMIT, LoadedGroups, read_groups, workbook_properties
from ..input import InputSource

__all__ = ["main", "build_parser", "DEMO_SHEET", "DEFAULT_DEMO_OUTPUT", "BIG_INPUT_CELLS",
           "csv_safe", "json_ready"]

#: Sheet name of the demo data in ``workbooks/demo.xlsx`` (also used for the demo's addresses).
DEMO_SHEET = "Hardness"
DEFAULT_DEMO_OUTPUT = "sheetfuncs-demo.xlsx"
#: Inputs above about this many cells show progress on a terminal.
BIG_INPUT_CELLS = 1_000_000
_FORMULA_LEAD = ("=", "+", "-", "@", "\t", "\r")
_CAUTION = (
    "Statistics support but do not replace engineering judgement: check the assumptions "
    "listed, follow your organisation's quality procedures and applicable standards, and "
    "validate this tool under your software-validation procedure before regulated use."
)


class _UsageError(Exception):
    """A usage problem found after parsing (exit code 2)."""


class _Parser(argparse.ArgumentParser):
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


# --------------------------------------------------------------------------------------------
# parser


def _positive_mb(text: str) -> float:
    try:
        v = float(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f'must be a number of megabytes, not "{text}"') from None
    if not math.isfinite(v) or v <= 0:
        raise argparse.ArgumentTypeError(f'must be a positive number of megabytes, not "{text}"')
    return v


def _real(text: str) -> float:
    try:
        return float(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f'must be a number, not "{text}"') from None


def _whole(text: str) -> int:
    try:
        return int(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f'must be a whole number, not "{text}"') from None


def _methods() -> tuple[str, ...]:
    from ..stats import METHODS

    return tuple(METHODS)


_DASH = '; for a value that starts with "-", write {opt}=-2+3'


def _add_help(g) -> None:
    g.add_argument("-h", "--help", action="help", help="show this help and exit")


def _add_read_options(p: argparse.ArgumentParser) -> None:
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
    g.add_argument("--size-limit", type=_positive_mb, default=DEFAULT_SIZE_LIMIT / 2**20,
                   metavar="MB",
                   help="refuse files that unpack to more than this many megabytes "
                        f"(default {DEFAULT_SIZE_LIMIT // 2**20}); raise it only for a file you "
                        "trust")


def _add_progress(p) -> None:
    p.add_argument("--progress", action=argparse.BooleanOptionalAction, default=None,
                   help="show progress on stderr, or never (default: only on a terminal, and "
                        "only for inputs above about a million cells or several files)")


def _add_names(a, *, response: bool) -> None:
    a.add_argument("--factor", default="Factor", metavar="NAME",
                   help="what the groups are, e.g. \"Oven zone\" (default Factor)"
                        + _DASH.format(opt="--factor"))
    if not response:
        return
    a.add_argument("--response", default="Response", metavar="NAME",
                   help="the measured quantity, e.g. Hardness (default Response)"
                        + _DASH.format(opt="--response"))
    a.add_argument("--unit", metavar="UNIT",
                   help="unit of the measurements, e.g. \"Shore A\" (default: none)"
                        + _DASH.format(opt="--unit"))
    a.add_argument("--title", metavar="TEXT",
                   help="report title (default: \"RESPONSE by FACTOR\")"
                        + _DASH.format(opt="--title"))


def build_parser() -> argparse.ArgumentParser:
    """The argument parser (exposed for documentation and tests)."""
    from .. import __version__

    parser = _Parser(
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
    _add_help(top)
    top.add_argument("--version", action="version", version=f"sheetfuncs {__version__}",
                     help="show the version and exit")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND", title="commands")
    sub.required = True

    rep = sub.add_parser(
        "report", prog="sheetfuncs report", help="write a formatted result workbook (.xlsx) for each input file",
        usage="sheetfuncs report INPUT... (-o OUT.xlsx | --out-dir DIR) [options]",
        description="Write a formatted result workbook for each input file: .xlsx/.xlsm "
                    "workbooks (the saved values only; macros are never run) or .csv files. "
                    "An existing report is kept unless --force; an input is never "
                    "overwritten.",
        add_help=False,
    )
    io_ = rep.add_argument_group("input and output")
    io_.add_argument("inputs", nargs="+", metavar="INPUT",
                     help="one or more .xlsx, .xlsm or .csv files")
    out = io_.add_mutually_exclusive_group(required=True)
    out.add_argument("-o", "--output", metavar="OUT.xlsx",
                     help="the report to write (for one input)")
    out.add_argument("--out-dir", metavar="DIR",
                     help="folder for the reports, one INPUT-report.xlsx per input (the folder "
                          "is created if it does not exist)")
    io_.add_argument("--force", action="store_true",
                     help="replace a report that already exists (default: keep it and stop)")
    _add_read_options(rep)
    a = rep.add_argument_group("analysis")
    a.add_argument("--alpha", type=_real, default=0.05, metavar="A",
                   help="significance level, between 0 and 1 (default 0.05)")
    a.add_argument("--method", default="tukey", metavar="NAME",
                   help="pairwise comparison method: " + ", ".join(_methods())
                        + " (default tukey)")
    a.add_argument("--control", metavar="LABEL",
                   help="label of a control group: adds Dunnett's comparisons with it "
                        "(default: none)")
    _add_names(a, response=True)
    other = rep.add_argument_group("other")
    _add_progress(other)
    _add_help(other)
    rep.set_defaults(func=_cmd_report, parser=rep)

    demo = sub.add_parser(
        "demo", prog="sheetfuncs demo", help="write the report of the built-in demo data (invented numbers)",
        usage="sheetfuncs demo [-o OUT.xlsx] [--force]",
        description="Write the report of the built-in demo: gasket hardness by cure-oven "
                    "zone, invented data. A rerun replaces the default file "
                    f"{DEFAULT_DEMO_OUTPUT} and any earlier demo report; any other existing "
                    "file is kept unless --force.",
        add_help=False,
    )
    dg = demo.add_argument_group("output")
    dg.add_argument("-o", "--output", metavar="OUT.xlsx", default=DEFAULT_DEMO_OUTPUT,
                    help=f"where to write it (default {DEFAULT_DEMO_OUTPUT} in the current "
                         "folder)")
    dg.add_argument("--force", action="store_true",
                    help="replace OUT.xlsx even when it is not a sheetfuncs demo report")
    dother = demo.add_argument_group("other")
    _add_progress(dother)
    _add_help(dother)
    demo.set_defaults(func=_cmd_demo, parser=demo)

    tab = sub.add_parser(
        "table", prog="sheetfuncs table", help="print the one-way table, the checks and the group summary",
        usage="sheetfuncs table INPUT [--json | --csv] [options]",
        description="Print the one-way table, the assumption checks and the group summary of "
                    "one input file, as aligned text (default), JSON or CSV.",
        add_help=False,
    )
    tio = tab.add_argument_group("input and output")
    tio.add_argument("input", metavar="INPUT", help="an .xlsx, .xlsm or .csv file")
    fmt = tio.add_mutually_exclusive_group()
    fmt.add_argument("--json", dest="fmt", action="store_const", const="json",
                     help="print JSON (infinite values as \"inf\", undefined ones as null)")
    fmt.add_argument("--csv", dest="fmt", action="store_const", const="csv",
                     help="print the three tables as CSV, separated by a blank line (text that "
                          "could be taken for a formula gets a leading ')")
    _add_read_options(tab)
    ta = tab.add_argument_group("analysis")
    ta.add_argument("--alpha", type=_real, default=0.05, metavar="A",
                    help="significance level, between 0 and 1 (default 0.05)")
    _add_names(ta, response=False)
    tother = tab.add_argument_group("other")
    _add_progress(tother)
    _add_help(tother)
    tab.set_defaults(func=_cmd_table, fmt="text", parser=tab)

    plan = sub.add_parser(
        "plan", prog="sheetfuncs plan", help="values per group that a planned study needs",
        usage="sheetfuncs plan --groups K --effect F [--power P] [--alpha A]",
        description="Values per group that a balanced one-way study needs to detect an "
                    "effect of Cohen's size f with the given power (noncentral F).",
        add_help=False,
    )
    pg = plan.add_argument_group("study")
    pg.add_argument("--groups", type=_whole, required=True, metavar="K",
                    help="number of groups, 2 or more (required)")
    pg.add_argument("--effect", type=_real, required=True, metavar="F",
                    help="Cohen's effect size f (required; 0.10 small, 0.25 medium, "
                         "0.40 large)")
    pg.add_argument("--power", type=_real, default=0.8, metavar="P",
                    help="chance of detecting the effect, between 0 and 1 (default 0.8)")
    pg.add_argument("--alpha", type=_real, default=0.05, metavar="A",
                    help="significance level, between 0 and 1 (default 0.05)")
    _add_help(plan.add_argument_group("other"))
    plan.set_defaults(func=_cmd_plan, parser=plan)
    return parser


# --------------------------------------------------------------------------------------------
# progress


class _Progress:
    """Progress on stderr: forced on/off, or (auto) on a terminal for big inputs and batches."""

    def __init__(self, mode: bool | None, stream: TextIO, batch: int = 1) -> None:
        self.mode = mode
        self.stream = stream
        try:
            self.tty = bool(stream.isatty())
        except Exception:
            self.tty = False
        self.batch = batch
        self.label = ""
        self.active = mode is True or (mode is None and self.tty and batch > 1)
        self._last = 0.0
        self._stage = ""
        self._dirty = False
        self._text = ""

    def start(self, index: int, name: str) -> None:
        self.label = f"[{index}/{self.batch}] {name}" if self.batch > 1 else name
        self._stage = ""
        if self.active:
            self._emit(f"{self.label}: starting", force=True)

    def consider_size(self, cells: int) -> None:
        if self.mode is None and self.tty and cells >= BIG_INPUT_CELLS:
            self.active = True

    def __call__(self, stage: str, done: int, total: int) -> None:
        if not self.active:
            self.consider_size(max(int(total or 0), int(done or 0)))
            if not self.active:
                return
        if total:
            text = f"{self.label}: {stage} {min(100, int(100 * done / total))}%"
        else:
            text = f"{self.label}: {stage} {done:,}"
        force = stage != self._stage or (total and done >= total)
        self._stage = stage
        self._emit(text, force=bool(force))

    def _emit(self, text: str, force: bool = False) -> None:
        if text == self._text:
            return
        now = time.monotonic()
        gap = 0.2 if self.tty else 1.0
        if not force and now - self._last < gap:
            return
        self._last = now
        self._text = text
        if self.tty:
            self.stream.write("\r" + text[:100].ljust(100))
            self._dirty = True
        else:
            self.stream.write(message(text) + "\n")
        self.stream.flush()

    def finish(self) -> None:
        if self._dirty:
            self.stream.write("\n")
            self.stream.flush()
            self._dirty = False


# --------------------------------------------------------------------------------------------
# helpers


def _with_file(reason: str, name: str) -> str:
    """Name the file in a message that does not already name it (for batches)."""
    return message(reason if name in reason else f"{name}: {reason}")


def _os_reason(e: OSError, what: str | os.PathLike[str] | None = None) -> str:
    where = e.filename if e.filename is not None else what
    reason = e.strerror or str(e) or type(e).__name__
    return f"{where}: {reason}" if where is not None else reason


def _read_kwargs(args: argparse.Namespace) -> dict[str, Any]:
    return dict(
        layout=args.layout,
        labels=args.labels,
        sheet=args.sheet,
        cell_range=args.cell_range,
        decimal_comma=args.decimal_comma,
        size_limit=int(args.size_limit * 2**20),
    )


def _same_file(a: Path, b: Path) -> bool:
    try:
        if a.exists() and b.exists():
            return os.path.samefile(a, b)
    except OSError:
        pass
    return os.path.normcase(str(a.resolve())) == os.path.normcase(str(b.resolve()))


def _check_xlsx_name(path: Path) -> None:
    if path.suffix.lower() != ".xlsx":
        raise _UsageError(
            f'the report must be an .xlsx file, not "{path.name}" (reports never carry macros)'
        )


def _write_report(groups, out: Path, *, source: InputSource | None, progress, **opts) -> Path:
    from ..report import write_report

    return Path(write_report(groups, out, source=source, progress=progress, **opts))


# --------------------------------------------------------------------------------------------
# report


def _report_outputs(args: argparse.Namespace) -> list[tuple[Path, Path]]:
    inputs = [Path(x) for x in args.inputs]
    if args.output is not None:
        if len(inputs) > 1:
            raise _UsageError(
                f"-o names one report but {len(inputs)} inputs were given; use "
                "--out-dir DIR for several inputs"
            )
        out = Path(args.output)
        _check_xlsx_name(out)
        pairs = [(inputs[0], out)]
    else:
        folder = Path(args.out_dir)
        pairs = [(inp, folder / f"{inp.stem}-report.xlsx") for inp in inputs]
    seen: dict[str, Path] = {}
    for inp, out in pairs:
        key = os.path.normcase(str(out.resolve()))
        if key in seen:
            raise _UsageError(
                f"{seen[key]} and {inp} would both be written to {out}; run them "
                "separately or rename one"
            )
        seen[key] = inp
    return pairs


def _cmd_report(args: argparse.Namespace) -> int:
    from ..stats import parse_method
    from ..input import check_alpha

    pairs = _report_outputs(args)
    check_alpha(args.alpha)  # options first: one message, before any file is read
    parse_method(args.method)
    if args.out_dir is not None:
        folder = Path(args.out_dir)
        if folder.exists() and not folder.is_dir():
            raise InputError(f"{folder} exists and is not a folder; choose another")
        folder.mkdir(parents=True, exist_ok=True)
    inputs = [inp for inp, _ in pairs]
    prog = _Progress(args.progress, sys.stderr, batch=len(pairs))
    failures = 0
    for i, (inp, out) in enumerate(pairs, 1):
        prog.start(i, inp.name)
        try:
            _report_one(args, inp, out, inputs, prog)
        except InputError as e:
            failures += 1
            prog.finish()
            print(_with_file(e.reason, inp.name), file=sys.stderr)
        except OSError as e:
            failures += 1
            prog.finish()
            print(_with_file(_os_reason(e), inp.name), file=sys.stderr)
        else:
            prog.finish()
            print(f"wrote {out}")
    return 1 if failures else 0


def _report_one(args, inp: Path, out: Path, inputs: Sequence[Path], prog: _Progress) -> None:
    for other in inputs:
        if _same_file(out, other):
            raise InputError(
                f"the report {out} would overwrite the input {other}; choose "
                "another output name"
            )
    if not out.parent.exists():
        raise InputError(
            f"the folder {out.parent} does not exist; create it or choose another "
            "output"
        )
    if out.is_dir():
        raise InputError(f"{out} is a folder; give the report a file name (.xlsx)")
    if out.exists() and not args.force:
        raise InputError(
            f"{out} already exists and is kept; add --force to replace it"
        )
    loaded = read_groups(inp, progress=prog, **_read_kwargs(args))
    prog.consider_size(loaded.groups.n_total)
    _write_report(
        loaded.groups, out,
        alpha=args.alpha, method=args.method, control=args.control,
        factor=args.factor, response=args.response, unit=args.unit, title=args.title,
        force=args.force, source=loaded.source, progress=prog,
    )


# --------------------------------------------------------------------------------------------
# demo


def _cmd_demo(args: argparse.Namespace) -> int:
    from ..input import DEMO_FACTOR, DEMO_RESPONSE, DEMO_TITLE, DEMO_UNIT, demo_groups

    out = Path(args.output)
    _check_xlsx_name(out)
    if out.is_dir():
        raise InputError(f"{out} is a folder; give a file name such as demo.xlsx")
    if not out.parent.exists():
        raise InputError(
            f"the folder {out.parent} does not exist; create it or choose another "
            "output"
        )
    if (out.exists() or out.is_symlink()) and not args.force and not _replaceable_demo(out):
        raise InputError(
            f"{out} already exists and is not a sheetfuncs demo report, so it is "
            "kept; choose another name with -o, or add --force to replace it"
        )
    prog = _Progress(args.progress, sys.stderr)
    prog.start(1, "demo")
    try:
        written = _write_report(
            demo_groups(), out,
            factor=DEMO_FACTOR, response=DEMO_RESPONSE, unit=DEMO_UNIT, title=DEMO_TITLE,
            force=True, source=InputSource(path=None, sheet=DEMO_SHEET), progress=prog,
        )
    finally:
        prog.finish()
    print(f"wrote {written.resolve()} (report of the built-in demo; invented data)")
    return 0


def _replaceable_demo(path: Path) -> bool:
    """Whether ``demo`` may replace an existing file without ``--force``: the default output
    name, or a workbook that is itself a demo report (the report writer sets the document
    properties creator ``sheetfuncs`` and the demo's title). The properties are read through
    :func:`sheetfuncs.readers.workbook_properties` (size limit, defusedxml); a file that cannot
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


# --------------------------------------------------------------------------------------------
# table


def json_ready(value: Any) -> Any:
    """A value for ``json.dumps(..., allow_nan=False)``: infinities as ``"inf"``/``"-inf"``,
    NaN (undefined) as ``None``, numpy scalars and tuples converted, fractions as floats."""
    if isinstance(value, dict):
        return {str(k): json_ready(v) for k, v in value.items()}
    if isinstance(value, (list, tuple)):
        return [json_ready(v) for v in value]
    if isinstance(value, bool) or value is None or isinstance(value, str):
        return value
    if hasattr(value, "item") and not isinstance(value, (list, tuple)):
        try:
            value = value.item()
        except Exception:
            pass
        if isinstance(value, bool):
            return value
    if isinstance(value, int):
        return value
    if isinstance(value, (float, Fraction)):
        v = float(value)
        if math.isnan(v):
            return None
        if math.isinf(v):
            return "inf" if v > 0 else "-inf"
        return v
    if hasattr(value, "isoformat"):
        return value.isoformat()
    return str(value)


def csv_safe(value: Any) -> str:
    """A cell for CSV output: text that a spreadsheet could take for a formula (starting with
    ``= + - @``, tab or carriage return) gets a leading single quote; numbers in shortest
    round-trip form, ``inf``/``nan`` for infinite/undefined, blank for ``None``."""
    if value is None:
        return ""
    if isinstance(value, bool):
        return "TRUE" if value else "FALSE"
    if isinstance(value, str):
        return "'" + value if value.startswith(_FORMULA_LEAD) else value
    if isinstance(value, int):
        return str(value)
    if isinstance(value, (float, Fraction)) or hasattr(value, "item"):
        try:
            v = float(value)
        except (TypeError, ValueError):
            return csv_safe(str(value))
        if math.isnan(v):
            return "nan"
        if math.isinf(v):
            return "inf" if v > 0 else "-inf"
        if v.is_integer() and abs(v) < 1e16:
            return str(int(v))
        return repr(v)
    return csv_safe(str(value))


def _records(table: list[list[Any]]) -> list[dict[str, Any]]:
    header = [str(h) for h in table[0]]
    return [dict(zip(header, row)) for row in table[1:]]


def _analysis(loaded: LoadedGroups, alpha: float, factor: str):
    from ..stats import analyse

    an = analyse(loaded.groups, alpha=alpha)
    return an.checks, an.describe, an.oneway.table(factor)


def _cell_log(loaded: LoadedGroups) -> list[dict[str, Any]]:
    src = loaded.source
    return [
        {"address": src.full_address(c.row, c.col), "kind": c.kind, "value": c.value,
         "action": c.action}
        for c in loaded.groups.cells
    ]


def _cmd_table(args: argparse.Namespace) -> int:
    prog = _Progress(args.progress, sys.stderr)
    prog.start(1, Path(args.input).name)
    try:
        loaded = read_groups(args.input, progress=prog, **_read_kwargs(args))
    finally:
        prog.finish()
    ck, desc, one = _analysis(loaded, args.alpha, args.factor)
    if args.fmt == "json":
        _table_json(args, loaded, ck, desc, one)
    elif args.fmt == "csv":
        _table_csv(ck, desc, one)
    else:
        _table_text(args, loaded, ck, desc, one)
    return 0


def _table_json(args, loaded: LoadedGroups, ck, desc, one) -> None:
    ow = ck.oneway
    g = loaded.groups
    doc = {
        "input": {
            "path": str(args.input),
            "sheet": loaded.source.sheet,
            "range": loaded.block.ref,
            "layout": g.layout,
            "labels": list(g.labels),
            "n_total": g.n_total,
            "ignored_cells": _cell_log(loaded),
            "notes": list(g.notes),
        },
        "oneway": {
            "factor": args.factor,
            "k": ow.k, "n_total": ow.n_total,
            "df_between": ow.df_between, "df_within": ow.df_within, "df_total": ow.df_total,
            "ss_between": ow.ss_between, "ss_within": ow.ss_within, "ss_total": ow.ss_total,
            "ms_between": ow.ms_between, "ms_within": ow.ms_within,
            "f": ow.f, "p": ow.p, "r_squared": ow.r_squared, "residual_sd": ow.residual_sd,
            "exact": ow.exact,
            "table": _records(one),
        },
        "checks": {
            "alpha": ck.alpha,
            "read": ck.read,
            "read_name": ck.read_name,
            "reasons": list(ck.reasons),
            "variances_unequal": ck.variances_unequal,
            "residuals_nonnormal": ck.residuals_nonnormal,
            "sd_ratio": ck.sd_ratio,
            "smallest_n": ck.smallest_n,
            "not_available": [{"test": t, "reason": r} for t, r in ck.not_available],
            "table": _records(ck.table()),
        },
        "groups": _records(desc.table()),
        "caution": _CAUTION,
    }
    sys.stdout.write(json.dumps(json_ready(doc), allow_nan=False, indent=2) + "\n")


def _table_csv(ck, desc, one) -> None:
    w = csv.writer(sys.stdout, lineterminator="\n")
    for i, table in enumerate((one, ck.table(), desc.table())):
        if i:
            w.writerow([])
        for row in table:
            w.writerow([csv_safe(v) for v in row])


def _fmt(v: Any) -> str:
    if v is None:
        return ""
    if isinstance(v, bool):
        return "TRUE" if v else "FALSE"
    if isinstance(v, int):
        return str(v)
    if isinstance(v, float):
        if math.isnan(v):
            return "undefined"
        if math.isinf(v):
            return "infinite" if v > 0 else "-infinite"
        return f"{v:.6g}"
    return str(v)


def _aligned(table: list[list[Any]]) -> list[str]:
    cells = [[_fmt(v) for v in row] for row in table]
    widths = [max(len(r[j]) for r in cells if j < len(r)) for j in range(len(cells[0]))]
    lines = []
    for row in cells:
        parts = []
        for j, c in enumerate(row):
            parts.append(c.ljust(widths[j]) if j == 0 or j == len(row) - 1 else c.rjust(widths[j]))
        lines.append("  ".join(parts).rstrip())
    return lines


_KIND_WORDS = {"logical": "logical value", "error": "error value"}


def _cell_shown(kind: str, value: Any) -> str:
    """An input cell as a spreadsheet user reads it: ``text "retest"`` (inner quotes doubled,
    as in a formula), ``logical value TRUE``, ``date 2024-03-05``."""
    word = _KIND_WORDS.get(kind, kind)
    if isinstance(value, str):
        text = " ".join(value.split()) if value.strip() else value
        if len(text) > 40:
            text = text[:39] + "…"
        return f'{word} "' + text.replace('"', '""') + '"'
    if isinstance(value, bool):
        return f"{word} {'TRUE' if value else 'FALSE'}"
    if hasattr(value, "isoformat"):
        return f"{word} {value.isoformat()}"
    from ..input import shown

    return f"{word} {shown(value)}"


def _table_text(args, loaded: LoadedGroups, ck, desc, one) -> None:
    g = loaded.groups
    ow = ck.oneway
    where = f"{Path(args.input).name}, {loaded.block.ref}"
    if loaded.source.sheet:
        where += f' of sheet "{loaded.source.sheet}"'
    path = "decimal-exact" if ow.exact else "floating-point"
    out = [
        f"One-way analysis of variance ({where}): {g.n_total} values in {g.k} groups, "
        f"{path} arithmetic",
        "",
        *_aligned(one),
        "",
        f"Checks (alpha = {ck.alpha:g}); read: {ck.read_name}",
        *_aligned(ck.table()),
        "",
        *("  - " + r for r in ck.reasons),
        "",
        "Groups",
        *_aligned(desc.table()),
    ]
    ignored = [c for c in g.cells if c.action == "ignored"]
    if ignored:
        shown = ", ".join(
            f"{loaded.source.address(c.row, c.col)} ({_cell_shown(c.kind, c.value)})"
            for c in ignored[:5]
        )
        more = f" and {len(ignored) - 5} more" if len(ignored) > 5 else ""
        out += ["", f"Ignored cells: {shown}{more}"]
    for note in g.notes:
        out += [f"Note: {note}"]
    out += ["", _CAUTION]
    sys.stdout.write("\n".join(out) + "\n")


# --------------------------------------------------------------------------------------------
# plan


def _cmd_plan(args: argparse.Namespace) -> int:
    from ..stats import power, sample_size

    n = sample_size(args.groups, args.effect, args.power, args.alpha)
    achieved = power(args.groups, n, args.effect, args.alpha)
    print(
        f"Groups: {args.groups}; effect size f = {args.effect:g}; alpha = {args.alpha:g}; "
        f"target power = {args.power:g}"
    )
    print(f"Values per group: {n} (total {n * args.groups})")
    print(f"Achieved power: {achieved:.4f}")
    print("Balanced one-way design, noncentral F (Cohen 1988, ch. 8). Plan with margin for "
          "lost samples, and follow your organisation's procedures for study design.")
    return 0


# --------------------------------------------------------------------------------------------
# entry point


def _parse(parser: argparse.ArgumentParser, argv: list[str] | None) -> argparse.Namespace:
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


def main(argv: Sequence[str] | None = None) -> int:
    """Run the command line; returns the exit code (0 done, 1 input problem, 2 usage)."""
    parser = build_parser()
    try:
        args = _parse(parser, None if argv is None else list(argv))
    except SystemExit as e:  # --help, --version (0) and usage errors (2)
        return e.code if isinstance(e.code, int) else (0 if e.code is None else 2)
    try:
        return int(args.func(args))
    except _UsageError as e:
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
        print(message(_os_reason(e)), file=sys.stderr)
        return 1
    except KeyboardInterrupt:
        print(message("interrupted"), file=sys.stderr)
        return 130
