"""``sheetfuncs table``: the one-way table, the checks and the group summary of one input.

The results come from the same core call :func:`sheetfuncs.stats.analyse` the report makes
(moments, one-way table, checks, group summary, effect sizes), and are printed as aligned text
(default), JSON (``--json``, for pipelines) or CSV (``--csv``). The JSON output also holds the
pairwise comparisons (``--method``, Tukey–Kramer by default), the compact letters and the effect
sizes with their intervals (:mod:`~sheetfuncs.cli.results`); the text and CSV outputs keep to
the three tables, so the comparisons, which grow with the square of the number of groups, are
computed only for ``--json``.
"""

from __future__ import annotations

import argparse
import csv
import json
import sys
from pathlib import Path
from typing import Any

from ..input import LoadedGroups, group_sizes, read_groups
from .output import aligned, cell_log, csv_safe, json_ready, records
from .engine import by_column, engine_analysis, engine_inputs, origin_record, origin_lines
from .parser import UsageError, read_options
from .progress import Progress
from .results import analysis_records

__all__ = ["CAUTION", "DEFAULT_METHOD", "LEFT_OUT_SHOWN", "read_table", "run_table"]

#: How many left-out entries the text output names (all are in the JSON output).
LEFT_OUT_SHOWN = 8

CAUTION = (
    "Statistics support but do not replace engineering judgement: check the assumptions "
    "listed, follow your organisation's quality procedures and applicable standards, and "
    "validate this tool under your software-validation procedure before regulated use."
)


DEFAULT_METHOD = "tukey"
#: The most groups whose pairwise comparisons --json holds (the report's default limit; the
#: comparisons grow with the square of the number of groups).
MAX_PAIRED_GROUPS = 100


def method_option(args: argparse.Namespace) -> str:
    """The pairwise method: ``--method`` (only with ``--json``, the one output that shows the
    comparisons), else Tukey–Kramer; an unknown name is the core's one-line input error."""
    from ..stats import parse_method

    if args.method is None:
        return DEFAULT_METHOD
    if args.fmt != "json":
        raise UsageError("--method chooses the pairwise comparisons, which only --json prints; "
                         "add --json, or leave --method out")
    return parse_method(args.method)


def analysis(loaded: LoadedGroups, alpha: float, method: str, comparisons: bool) -> Any:
    """Every result of the core's one call (:func:`sheetfuncs.stats.analyse`); the pairwise
    comparisons and letters only when ``comparisons``."""
    from ..stats import analyse

    # group and effect-size intervals at 95 %, whatever alpha
    return analyse(loaded.groups, alpha=alpha, method=method, conf=0.95, comparisons=comparisons)


def run_table(args: argparse.Namespace) -> int:
    method = method_option(args)
    if by_column(args):
        return run_engine_table(args, method)
    prog = Progress(args.progress, sys.stderr)
    prog.start(1, Path(args.input).name)
    try:
        loaded = read_groups(args.input, progress=prog, **read_options(args))
    finally:
        prog.finish()
    paired = args.fmt == "json" and loaded.groups.k <= MAX_PAIRED_GROUPS
    an = analysis(loaded, args.alpha, method, paired)
    ck, desc, one = an.checks, an.describe, an.oneway.table(args.factor)
    g = loaded.groups
    print(f"{Path(args.input).name}: {loaded.reading.summary(g.labels, g.counts)}", file=sys.stderr)
    if args.fmt == "json":
        table_json(args, loaded, an, one)
    elif args.fmt == "csv":
        table_csv(loaded, ck, desc, one)
    else:
        table_text(args, loaded, ck, desc, one)
    return 0


def run_engine_table(args: argparse.Namespace, method: str = DEFAULT_METHOD) -> int:
    """``table`` for an input read by column: the sums computed inside the engine."""
    (inp,) = engine_inputs(args)
    prog = Progress(args.progress, sys.stderr)
    prog.start(1, inp.name)
    try:
        res = engine_analysis(args, inp, prog, comparisons=args.fmt == "json", conf=0.95,
                              method=method)
    finally:
        prog.finish()
    an = res.analysis
    one = an.oneway.table(args.factor)
    print(f"{inp.name}: {an.n_total} values in {an.k} groups ({group_sizes(an.labels, an.counts)})",
          file=sys.stderr)
    if args.fmt == "json":
        doc = {
            "input": origin_record(inp, res, an),
            "oneway": oneway_record(args.factor, an.oneway, one),
            "checks": checks_record(an.checks),
            "groups": records(an.describe.table()),
            **analysis_records(an),
            "caution": CAUTION,
        }
        sys.stdout.write(json.dumps(json_ready(doc), allow_nan=False, indent=2) + "\n")
    elif args.fmt == "csv":
        w = csv.writer(sys.stdout, lineterminator="\n")
        read = [["Read", "Item", "Rows"], *([["source", line, None] for line in origin_lines(inp, res)]),
                *([["group", lab, n] for lab, n in zip(an.labels, an.counts)])]
        for i, table in enumerate((read, one, an.checks.table(), an.describe.table())):
            if i:
                w.writerow([])
            for row in table:
                w.writerow([csv_safe(v) for v in row])
    else:
        _engine_text(inp, res, one)
    return 0


def _engine_text(inp: Any, res: Any, one: list[list[Any]]) -> None:
    an = res.analysis
    out = [*origin_lines(inp, res), "", *result_lines(an.checks, an.describe, one), "", CAUTION]
    sys.stdout.write("\n".join(out) + "\n")


def result_lines(ck: Any, desc: Any, one: list[list[Any]]) -> list[str]:
    """The text output's one-way table, checks with their reasons, and group summary."""
    ow = ck.oneway
    path = "decimal-exact" if ow.exact else "floating-point"
    return [
        f"One-way analysis of variance: {ow.n_total} values in {ow.k} groups, {path} arithmetic",
        "",
        *aligned(one),
        "",
        f"Checks (alpha = {ck.alpha:g}); read: {ck.read_name}",
        *aligned(ck.table()),
        "",
        *("  - " + r for r in ck.reasons),
        "",
        "Groups",
        *aligned(desc.table()),
    ]


def input_record(args: argparse.Namespace, loaded: LoadedGroups) -> dict[str, Any]:
    """What was read, for the JSON output: the file, sheet and range, the groups and every
    cell left out."""
    g = loaded.groups
    r = loaded.reading
    return {
        "path": str(args.input),
        "sheet": loaded.source.sheet,
        "range": loaded.block.ref,
        "block": r.where,
        "detected": r.detected,
        "layout": g.layout,
        "labels": list(g.labels),
        "counts": list(g.counts),
        "n_total": g.n_total,
        "cells_read": r.cells_read,
        "cells_used": r.cells_used,
        "cells_left_out": r.cells_left_out,
        "missing": r.missing,
        "left_out": [
            {"ref": x.ref, "address": r.address(x.ref), "reason": x.reason, "kind": x.kind,
             "content": x.content, "cells": len(x.cells)}
            for x in r.left_out
        ],
        "ignored_cells": cell_log(loaded),
        "notes": list(r.notes),
    }


def oneway_record(factor: str, ow: Any, one: list[list[Any]]) -> dict[str, Any]:
    """The one-way results and table, for the JSON output."""
    return {
        "factor": factor,
        "k": ow.k, "n_total": ow.n_total,
        "df_between": ow.df_between, "df_within": ow.df_within, "df_total": ow.df_total,
        "ss_between": ow.ss_between, "ss_within": ow.ss_within, "ss_total": ow.ss_total,
        "ms_between": ow.ms_between, "ms_within": ow.ms_within,
        "f": ow.f, "p": ow.p, "r_squared": ow.r_squared, "residual_sd": ow.residual_sd,
        "exact": ow.exact,
        "table": records(one),
    }


def checks_record(ck: Any) -> dict[str, Any]:
    """The assumption checks and the reading they lead to, for the JSON output."""
    return {
        "alpha": ck.alpha,
        "read": ck.read,
        "read_name": ck.read_name,
        "reasons": list(ck.reasons),
        "variances_unequal": ck.variances_unequal,
        "residuals_nonnormal": ck.residuals_nonnormal,
        "sd_ratio": ck.sd_ratio,
        "smallest_n": ck.smallest_n,
        "not_available": [{"test": t, "reason": r} for t, r in ck.not_available],
        "table": records(ck.table()),
    }


def table_json(args: argparse.Namespace, loaded: LoadedGroups, an: Any,
               one: list[list[Any]]) -> None:
    k = loaded.groups.k
    skipped = (f"not computed: {k:,} groups, more than the {MAX_PAIRED_GROUPS} whose pairwise "
               "comparisons table --json holds (they grow with the square of the number of "
               "groups); compare fewer groups at a time" if k > MAX_PAIRED_GROUPS else None)
    doc = {
        "input": input_record(args, loaded),
        "oneway": oneway_record(args.factor, an.oneway, one),
        "checks": checks_record(an.checks),
        "groups": records(an.describe.table()),
        **analysis_records(an, skipped),
        "caution": CAUTION,
    }
    sys.stdout.write(json.dumps(json_ready(doc), allow_nan=False, indent=2) + "\n")


def read_table(loaded: LoadedGroups) -> list[list[Any]]:
    """What was read, as a table: the block, each group with its n, each entry left out."""
    r = loaded.reading
    g = loaded.groups
    rows: list[list[Any]] = [["Read", "Item", "Cells"], ["block", r.where, r.cells_read]]
    rows += [["group", lab, n] for lab, n in zip(g.labels, g.counts)]
    rows += [["left out", f"{r.address(x.ref)}: {x.described}", len(x.cells)] for x in r.left_out]
    rows += [["note", note, None] for note in r.notes]
    return rows


def table_csv(loaded: LoadedGroups, ck: Any, desc: Any, one: list[list[Any]]) -> None:
    w = csv.writer(sys.stdout, lineterminator="\n")
    for i, table in enumerate((read_table(loaded), one, ck.table(), desc.table())):
        if i:
            w.writerow([])
        for row in table:
            w.writerow([csv_safe(v) for v in row])


def table_text(args: argparse.Namespace, loaded: LoadedGroups, ck: Any, desc: Any,
               one: list[list[Any]]) -> None:
    g = loaded.groups
    r = loaded.reading
    out = [
        f"Read {r.where} of {Path(args.input).name}"
        + (" (found on the sheet; no range given)" if r.detected else "")
        + f": {g.n_total} values in {g.k} groups ("
        + group_sizes(g.labels, g.counts) + ")",
        *(f"  left out {r.address(x.ref)}: {x.described}" for x in r.left_out[:LEFT_OUT_SHOWN]),
        *([f"  and {len(r.left_out) - LEFT_OUT_SHOWN} more left out (see --json)"]
          if len(r.left_out) > LEFT_OUT_SHOWN else []),
        *(f"  note: {n}" for n in r.notes if n not in g.notes),
        "",
        *result_lines(ck, desc, one),
    ]
    for note in g.notes:
        out += [f"Note: {note}"]
    out += ["", CAUTION]
    sys.stdout.write("\n".join(out) + "\n")
