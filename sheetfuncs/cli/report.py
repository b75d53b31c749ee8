"""``sheetfuncs report``: one formatted result workbook per input file.

One input with ``-o OUT.xlsx``, or a batch with ``--out-dir DIR`` (``DIR/NAME-report.xlsx``). The
options are checked before any file is read; in a batch, a file with a problem gets its line on
stderr and the others are still written (exit code 1 when any failed). A report never overwrites
an input, and an existing report is kept unless ``--force``.
"""

from __future__ import annotations

import argparse
import os
import sys
from collections.abc import Sequence
from pathlib import Path

from ..errors import InputError, message
from ..input import group_sizes, read_groups, same_file
from .engine import EngineInput, by_column, engine_analysis, engine_inputs
from .files import (
    check_output_folder, check_report_name, os_reason, write_report_file,
)
from .parser import UsageError, read_options
from .progress import Progress

__all__ = ["report_outputs", "run_report", "with_file"]


def with_file(reason: str, name: str) -> str:
    """Name the file in a message that does not already name it (for batches)."""
    return message(reason if name in reason else f"{name}: {reason}")


def report_outputs(args: argparse.Namespace) -> list[tuple[Path, Path]]:
    """Each input with the report it gets; two inputs bound for the same report, or several
    inputs for ``-o``, are a usage error."""
    inputs = [Path(x) for x in args.inputs]
    if args.output is not None:
        if len(inputs) > 1:
            raise UsageError(
                f"-o names one report but {len(inputs)} inputs were given; use "
                "--out-dir DIR for several inputs"
            )
        out = check_report_name(args.output, out_dir=True)
        pairs = [(inputs[0], out)]
    else:
        folder = Path(args.out_dir)
        pairs = [(inp, folder / f"{inp.stem}-report.xlsx") for inp in inputs]
    seen: dict[str, Path] = {}
    for inp, out in pairs:
        key = os.path.normcase(str(out.resolve()))
        if key in seen:
            raise UsageError(
                f"{seen[key]} and {inp} would both be written to {out}; run them "
                "separately or rename one"
            )
        seen[key] = inp
    return pairs


def run_report(args: argparse.Namespace) -> int:
    from ..input import check_alpha
    from ..stats import parse_method

    engine_mode = by_column(args)
    pairs = engine_outputs(args) if engine_mode else report_outputs(args)
    check_alpha(args.alpha)  # options first: one message, before any file is read
    parse_method(args.method)
    if args.out_dir is not None:
        folder = Path(args.out_dir)
        if folder.exists() and not folder.is_dir():
            raise InputError(f"{folder} exists and is not a folder; choose another")
        folder.mkdir(parents=True, exist_ok=True)
    inputs = [Path(inp.path) for inp, _ in pairs] if engine_mode else [inp for inp, _ in pairs]
    prog = Progress(args.progress, sys.stderr, batch=len(pairs))
    failures = 0
    for i, (inp, out) in enumerate(pairs, 1):
        prog.start(i, inp.name)
        try:
            if engine_mode:
                summary = report_by_column(args, inp, out, inputs, prog)
            else:
                summary = report_one(args, inp, out, inputs, prog)
        except InputError as e:
            failures += 1
            prog.finish()
            print(with_file(e.reason, inp.name), file=sys.stderr)
        except OSError as e:
            failures += 1
            prog.finish()
            print(with_file(os_reason(e), inp.name), file=sys.stderr)
        else:
            prog.finish()
            print(f"{inp.name}: {summary}", file=sys.stderr)
            print(f"wrote {out}")
    return 1 if failures else 0


def engine_outputs(args: argparse.Namespace) -> list[tuple[EngineInput, Path]]:
    """Each input read by column with the report it gets (as :func:`report_outputs`)."""
    inputs = engine_inputs(args)
    if args.output is not None:
        if len(inputs) > 1:
            raise UsageError(
                f"-o names one report but {len(inputs)} inputs were given; use "
                "--out-dir DIR for several inputs"
            )
        return [(inputs[0], check_report_name(args.output, out_dir=True))]
    pairs = [(inp, Path(args.out_dir) / f"{inp.stem}-report.xlsx") for inp in inputs]
    if len({p for _, p in pairs}) < len(pairs):
        raise UsageError("two inputs have the same name and would share a report; run them "
                         "separately")
    return pairs


def _check_out(args: argparse.Namespace, out: Path, inputs: Sequence[Path]) -> None:
    """Where the report goes: never over an input, into an existing folder, not over an
    existing report unless --force."""
    for other in inputs:
        if same_file(out, other):
            raise InputError(
                f"the report {out} would overwrite the input {other}; choose "
                "another output name"
            )
    check_output_folder(out)
    if out.is_dir():
        raise InputError(f"{out} is a folder; give the report a file name (.xlsx)")
    if out.exists() and not args.force:
        raise InputError(
            f"{out} already exists and is kept; add --force to replace it"
        )


def report_one(args: argparse.Namespace, inp: Path, out: Path, inputs: Sequence[Path],
               prog: Progress) -> str:
    """Read one input and write its report, after checking where the report goes; returns
    the one-line summary of what was read."""
    _check_out(args, out, inputs)
    options = read_options(args)
    loaded = read_groups(inp, progress=prog, **options)
    prog.consider_size(loaded.groups.n_total)
    write_report_file(
        loaded.groups, out,
        alpha=args.alpha, method=args.method, control=args.control,
        factor=args.factor, response=args.response, unit=args.unit, title=args.title,
        force=args.force, source=loaded.source, reading=loaded.reading, progress=prog,
        paper=args.paper, command=list(sys.argv), reading_options=options,
        **({} if args.max_groups is None else {"max_groups": args.max_groups}),
    )
    return loaded.reading.summary(loaded.groups.labels, loaded.groups.counts)


def report_by_column(args: argparse.Namespace, inp: EngineInput, out: Path,
                     inputs: Sequence[Path], prog: Progress) -> str:
    """The report of one input read by column: the sums computed inside the engine."""
    from ..report import write_sums_report

    _check_out(args, out, inputs)
    res = engine_analysis(args, inp, prog, method=args.method, control=args.control)
    an = res.analysis
    write_sums_report(
        an, out, origin=res.origin,
        factor=args.factor, response=args.response, unit=args.unit, title=args.title,
        force=args.force, progress=prog, paper=args.paper, command=list(sys.argv),
        **({} if args.max_groups is None else {"max_groups": args.max_groups}),
    )
    return f"{an.n_total:,} values in {an.k} groups ({group_sizes(an.labels, an.counts)})"
