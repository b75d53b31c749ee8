"""``sheetfuncs template`` and ``sheetfuncs fill``: ready QA templates, and filling them headless.

A front only: templates are written by :func:`sheetfuncs.templates.write_template` and filled by
:func:`sheetfuncs.templates.fill_template` (one data file, ``-o``) or
:func:`sheetfuncs.templates.fill_batch` (several, ``--out-dir``: one filled workbook per data
file, with progress on a terminal). An existing output is kept unless ``--force``.
"""

from __future__ import annotations

import argparse
import sys
from pathlib import Path

from ..errors import PREFIX, InputError, message
from .parser import UsageError, read_options
from .progress import Progress

__all__ = ["run_template", "run_fill"]


def _keep(target: Path, force: bool) -> None:
    if target.exists() and not force:
        raise InputError(f"{target} already exists and is kept; add --force to replace it")


def run_template(args: argparse.Namespace) -> int:
    from ..templates import write_template

    target = Path(args.output)
    if target.suffix.lower() != ".xlsx":
        raise UsageError(f"a template is written as .xlsx, not {target.name!r}")
    _keep(target, args.force)
    written = write_template(args.kind, target, host=args.host)
    form = "LibreOffice Calc" if args.host == "calc" else "Excel"
    print(f"wrote {written.path} ({args.kind}, formulas in the {form} form); replace the invented "
          "example data on its Data sheet with your own, or fill it: sheetfuncs fill "
          f"{written.path.name} --data FILE -o OUT.xlsx")
    return 0


def _read_opts(args: argparse.Namespace) -> dict:
    opts = read_options(args)
    opts.pop("sheet"), opts.pop("cell_range")
    return opts


def run_fill(args: argparse.Namespace) -> int:
    from ..templates import fill_batch, fill_template

    template = Path(args.template)
    common = dict(into=args.into, sheet=args.sheet, cell_range=args.cell_range, **_read_opts(args))
    if args.output is not None:
        if len(args.data) > 1:
            raise UsageError(f"-o names one output but {len(args.data)} data files were given; "
                             "use --out-dir DIR for several")
        target = Path(args.output)
        _keep(target, args.force)
        done = fill_template(template, Path(args.data[0]), target, **common)
        _said(done)
        return 0
    folder = Path(args.out_dir)
    if folder.exists() and not folder.is_dir():
        raise InputError(f"{folder} exists and is not a folder; choose another")
    folder.mkdir(parents=True, exist_ok=True)
    if not args.force:
        for data in args.data:
            _keep(folder / (Path(data).stem + template.suffix), False)
    prog = Progress(args.progress, sys.stderr, batch=len(args.data))
    batch = fill_batch(template, args.data, folder,
                       progress=lambda i, n, p: prog.start(i + 1, p.name) if i < n else prog.finish(),
                       **common)
    for done in batch.filled:
        _said(done)
    for path, line in batch.failed:
        reason = line[len(PREFIX):] if line.startswith(PREFIX) else line
        print(message(reason if path.name in reason else f"{path.name}: {reason}"), file=sys.stderr)
    return 1 if batch.failed else 0


def _said(done) -> None:
    print(f"{done.target.name}: {done.cells_written} cells written into {done.name} "
          f"({done.block}), {len(done.computed)} SF_ cells computed, {len(done.dependents)} other "
          "formula cells evaluated", file=sys.stderr)
    for note in done.notes:
        print(message(note), file=sys.stderr)
    print(f"wrote {done.target}")
