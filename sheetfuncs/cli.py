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
import sys
import time
from collections.abc import Sequence
from fractions import Fraction
from pathlib import Path
from typing import Any, TextIO

from .errors import InputError
from .readers import DEFAULT_SIZE_LIMIT, LoadedGroups, read_groups
from .source import InputSource

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


# --------------------------------------------------------------------------------------------
# parser


def _positive_mb(text: str) -> float:
    try:
        v = float(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"must be a number of megabytes, not {text!r}") from None
    if not math.isfinite(v) or v <= 0:
        raise argparse.ArgumentTypeError(f"must be a positive number of megabytes, not {text!r}")
    return v


def _methods() -> tuple[str, ...]:
    from .comparisons import METHODS

    return tuple(METHODS)


def _add_read_options(p: argparse.ArgumentParser) -> None:
    g = p.add_argument_group("reading the input")
    g.add_argument("--sheet", metavar="NAME", help="worksheet to read (default: the first)")
    g.add_argument("--range", dest="cell_range", metavar="A1:F40",
                   help="cells to read, or a defined name (default: the sheet's used range)")
    g.add_argument("--layout", choices=("wide", "long", "rowwise"), default="wide",
                   help="one group per column (wide, default), label and value columns (long), "
                        "or one group per row (rowwise)")
    g.add_argument("--labels", choices=("auto", "yes", "no"), default="auto",
                   help="does the first row (column for rowwise) hold the group labels? "
                        "(default: auto, when it is all text)")
    g.add_argument("--decimal-comma", action="store_true",
                   help="CSV numbers use a decimal comma (1,5)")
    g.add_argument("--size-limit", type=_positive_mb, default=DEFAULT_SIZE_LIMIT / 2**20,
                   metavar="MB",
                   help="refuse workbooks that unpack to more than this many megabytes "
                        f"(default {DEFAULT_SIZE_LIMIT // 2**20})")


def _add_progress(p: argparse.ArgumentParser) -> None:
    p.add_argument("--progress", action=argparse.BooleanOptionalAction, default=None,
                   help="show progress on stderr (default: on a terminal, for inputs above "
                        "about a million cells or batches of several files)")


def build_parser() -> argparse.ArgumentParser:
    """The argument parser (exposed for documentation and tests)."""
    from . import __version__

    parser = argparse.ArgumentParser(
        prog="sheetfuncs",
        description="Exact one-way analysis of variance: formatted report workbooks, tables "
                    "for pipelines, and sample sizes.",
    )
    parser.add_argument("--version", action="version", version=f"sheetfuncs {__version__}")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND")
    sub.required = True

    rep = sub.add_parser("report", help="write a formatted result workbook for each input",
                         description="Write a formatted result workbook for each input file "
                                     "(.xlsx/.xlsm: saved values only, macros never run; .csv).")
    rep.add_argument("inputs", nargs="+", metavar="INPUT", help=".xlsx, .xlsm or .csv file(s)")
    out = rep.add_mutually_exclusive_group(required=True)
    out.add_argument("-o", "--output", metavar="OUT.xlsx", help="the report to write (one input)")
    out.add_argument("--out-dir", metavar="DIR",
                     help="folder for the reports, named INPUT-report.xlsx (created if needed)")
    _add_read_options(rep)
    a = rep.add_argument_group("analysis")
    a.add_argument("--alpha", type=float, default=0.05, help="significance level (default 0.05)")
    a.add_argument("--method", default="tukey",
                   help="pairwise comparison method: " + ", ".join(_methods())
                        + " (default tukey)")
    a.add_argument("--control", metavar="LABEL", help="control group: adds Dunnett's comparisons")
    a.add_argument("--factor", default="Factor", metavar="NAME", help="name of the factor")
    a.add_argument("--response", default="Response", metavar="NAME",
                   help="name of the measured quantity")
    a.add_argument("--unit", metavar="U", help="unit of the measurements")
    a.add_argument("--title", metavar="T", help="report title")
    rep.add_argument("--force", action="store_true", help="replace an existing report")
    _add_progress(rep)
    rep.set_defaults(func=_cmd_report)

    demo = sub.add_parser("demo", help="write the report of the built-in invented demo data",
                          description="Write the report of the built-in demo (invented data: "
                                      "gasket hardness by cure-oven zone). A rerun replaces it.")
    demo.add_argument("-o", "--output", metavar="OUT.xlsx", default=DEFAULT_DEMO_OUTPUT,
                      help=f"where to write it (default {DEFAULT_DEMO_OUTPUT})")
    _add_progress(demo)
    demo.set_defaults(func=_cmd_demo)

    tab = sub.add_parser("table", help="print the one-way table and the checks",
                         description="Print the one-way table, the assumption checks and the "
                                     "group summary of one input, for people or pipelines.")
    tab.add_argument("input", metavar="INPUT", help=".xlsx, .xlsm or .csv file")
    fmt = tab.add_mutually_exclusive_group()
    fmt.add_argument("--json", dest="fmt", action="store_const", const="json",
                     help="JSON (infinite values as \"inf\")")
    fmt.add_argument("--csv", dest="fmt", action="store_const", const="csv",
                     help="CSV tables separated by a blank line (formula-like text quoted)")
    _add_read_options(tab)
    tab.add_argument("--alpha", type=float, default=0.05, help="significance level (default 0.05)")
    tab.add_argument("--factor", default="Factor", metavar="NAME", help="name of the factor")
    _add_progress(tab)
    tab.set_defaults(func=_cmd_table, fmt="text")

    plan = sub.add_parser("plan", help="sample size per group for a planned study",
                          description="Values per group that a balanced one-way study needs to "
                                      "detect Cohen's effect size f with the given power.")
    plan.add_argument("--groups", type=int, required=True, metavar="K", help="number of groups")
    plan.add_argument("--effect", type=float, required=True, metavar="F",
                      help="Cohen's f (0.10 small, 0.25 medium, 0.40 large)")
    plan.add_argument("--power", type=float, default=0.8, help="target power (default 0.8)")
    plan.add_argument("--alpha", type=float, default=0.05, help="significance level (default 0.05)")
    plan.set_defaults(func=_cmd_plan)
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
            self.stream.write("sheetfuncs: " + text + "\n")
        self.stream.flush()

    def finish(self) -> None:
        if self._dirty:
            self.stream.write("\n")
            self.stream.flush()
            self._dirty = False


# --------------------------------------------------------------------------------------------
# helpers


def _one_line(msg: str) -> str:
    text = " ".join(str(msg).split())
    return text if text.startswith("sheetfuncs:") else f"sheetfuncs: {text}"


def _with_file(msg: str, name: str) -> str:
    """Name the file in a message that does not already name it (for batches)."""
    text = _one_line(msg)
    if name in text:
        return text
    return f"sheetfuncs: {name}: {text[len('sheetfuncs: '):]}"


def _os_message(e: OSError, what: str | os.PathLike[str] | None = None) -> str:
    where = e.filename if e.filename is not None else what
    reason = e.strerror or str(e) or type(e).__name__
    return _one_line(f"{where}: {reason}" if where is not None else reason)


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


def _check_xlsx_name(path: Path, parser_name: str) -> None:
    if path.suffix.lower() != ".xlsx":
        raise _UsageError(
            f"{parser_name}: the report must be an .xlsx file, not {path.name!r} (reports never "
            "carry macros)"
        )


def _write_report(groups, out: Path, *, source: InputSource | None, progress, **opts) -> Path:
    from .report import write_report

    return Path(write_report(groups, out, source=source, progress=progress, **opts))


# --------------------------------------------------------------------------------------------
# report


def _report_outputs(args: argparse.Namespace) -> list[tuple[Path, Path]]:
    inputs = [Path(x) for x in args.inputs]
    if args.output is not None:
        if len(inputs) > 1:
            raise _UsageError(
                f"report: -o names one report but {len(inputs)} inputs were given; use "
                "--out-dir DIR for several inputs"
            )
        out = Path(args.output)
        _check_xlsx_name(out, "report")
        pairs = [(inputs[0], out)]
    else:
        folder = Path(args.out_dir)
        pairs = [(inp, folder / f"{inp.stem}-report.xlsx") for inp in inputs]
    seen: dict[str, Path] = {}
    for inp, out in pairs:
        key = os.path.normcase(str(out.resolve()))
        if key in seen:
            raise _UsageError(
                f"report: {seen[key]} and {inp} would both be written to {out}; run them "
                "separately or rename one"
            )
        seen[key] = inp
    return pairs


def _cmd_report(args: argparse.Namespace) -> int:
    from .comparisons import parse_method
    from .validate import check_alpha

    pairs = _report_outputs(args)
    check_alpha(args.alpha)  # options first: one message, before any file is read
    parse_method(args.method)
    if args.out_dir is not None:
        folder = Path(args.out_dir)
        if folder.exists() and not folder.is_dir():
            raise InputError(f"sheetfuncs: {folder} exists and is not a folder; choose another")
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
            print(_with_file(str(e), inp.name), file=sys.stderr)
        except OSError as e:
            failures += 1
            prog.finish()
            print(_with_file(_os_message(e), inp.name), file=sys.stderr)
        else:
            prog.finish()
            print(f"wrote {out}")
    return 1 if failures else 0


def _report_one(args, inp: Path, out: Path, inputs: Sequence[Path], prog: _Progress) -> None:
    for other in inputs:
        if _same_file(out, other):
            raise InputError(
                f"sheetfuncs: the report {out} would overwrite the input {other}; choose "
                "another output name"
            )
    if not out.parent.exists():
        raise InputError(
            f"sheetfuncs: the folder {out.parent} does not exist; create it or choose another "
            "output"
        )
    if out.is_dir():
        raise InputError(f"sheetfuncs: {out} is a folder; give the report a file name (.xlsx)")
    if out.exists() and not args.force:
        raise InputError(
            f"sheetfuncs: {out} already exists and is kept; add --force to replace it"
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
    from .demo import DEMO_FACTOR, DEMO_RESPONSE, DEMO_TITLE, DEMO_UNIT, demo_groups

    out = Path(args.output)
    _check_xlsx_name(out, "demo")
    if out.is_dir():
        raise InputError(f"sheetfuncs: {out} is a folder; give a file name such as demo.xlsx")
    if not out.parent.exists():
        raise InputError(
            f"sheetfuncs: the folder {out.parent} does not exist; create it or choose another "
            "output"
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
    from .assumptions import checks
    from .describe import describe

    ck = checks(loaded.groups, alpha)
    desc = describe(loaded.groups)
    one = ck.oneway.table(factor)
    return ck, desc, one


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
            f"{loaded.source.address(c.row, c.col)} ({c.kind} {c.value!r})" for c in ignored[:5]
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
    from .planning import power, sample_size

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


def main(argv: Sequence[str] | None = None) -> int:
    """Run the command line; returns the exit code (0 done, 1 input problem, 2 usage)."""
    parser = build_parser()
    try:
        args = parser.parse_args(None if argv is None else list(argv))
    except SystemExit as e:  # --help, --version (0) and usage errors (2)
        return e.code if isinstance(e.code, int) else (0 if e.code is None else 2)
    try:
        return int(args.func(args))
    except _UsageError as e:
        parser.print_usage(sys.stderr)
        print(_one_line(str(e)), file=sys.stderr)
        return 2
    except InputError as e:
        print(_one_line(str(e)), file=sys.stderr)
        return 1
    except OSError as e:
        print(_os_message(e), file=sys.stderr)
        return 1
    except KeyboardInterrupt:
        print("sheetfuncs: interrupted", file=sys.stderr)
        return 130
