"""What makes a report traceable and printable: the input's fingerprint, the call, the paper and
the report identifier.

The identifier is the first 12 hex digits of a SHA-256 over the data's fingerprint (the input
file's SHA-256; for data passed from Python a SHA-256 of the labels and values; for rows analysed
inside a database, the origin and the per-group figures, with the file's SHA-256 when the origin
is a file), the options that change what the report says (alpha, pairwise method, control,
names, title, reading options) and the sheetfuncs version. The paper, the output name and the
time of writing do not enter it: the same inputs, options and version give the same identifier.
"""

from __future__ import annotations

import hashlib
import json
import os
import struct
from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import Any

import numpy as np

from ..errors import InputError
from .context import ReportContext

__all__ = ["PAPER_SIZES", "Trace", "check_paper", "file_digest", "values_digest", "report_identifier",
           "python_call", "make_trace", "header_text", "FOOTER_TEXT"]

#: Paper names and their codes in the spreadsheet file format (ECMA-376 paperSize).
PAPER_SIZES = {"a4": 9, "letter": 1}

#: The footer of every printed page (``&P`` the page, ``&N`` the number of pages).
FOOTER_TEXT = "page &P of &N"

_CHUNK = 1 << 20


@dataclass(frozen=True)
class Trace:
    """The traceability of one report: ``identifier`` (12 hex digits), ``input_path`` (absolute,
    or ``None`` when no file was read), ``input_size`` (bytes) and ``input_sha256`` of that file,
    ``data_sha256`` (what the identifier hashes for the data), ``call`` (the command line or
    the Python call), ``reading_options`` (name, value), ``paper`` (``"a4"`` or ``"letter"``)
    and ``version`` (of sheetfuncs)."""

    identifier: str
    input_path: str | None
    input_size: int | None
    input_sha256: str | None
    data_sha256: str
    call: str
    reading_options: tuple[tuple[str, str], ...]
    paper: str
    version: str


def check_paper(paper: Any) -> str:
    """``"a4"`` or ``"letter"`` (any case); anything else is an :class:`InputError`."""
    if isinstance(paper, str) and paper.strip().lower() in PAPER_SIZES:
        return paper.strip().lower()
    raise InputError(f"the paper must be a4 or letter, not {paper!r}")


def file_digest(path: str | os.PathLike[str]) -> tuple[int, str]:
    """The size in bytes and the SHA-256 (hex) of a file, read in 1 MiB pieces."""
    h = hashlib.sha256()
    size = 0
    with open(path, "rb") as f:
        while chunk := f.read(_CHUNK):
            h.update(chunk)
            size += len(chunk)
    return size, h.hexdigest()


def values_digest(labels: Sequence[str], arrays: Sequence[np.ndarray]) -> str:
    """SHA-256 (hex) of groups passed from Python: each label (UTF-8) and its values as
    little-endian doubles, every part preceded by its length."""
    h = hashlib.sha256()
    for label, arr in zip(labels, arrays):
        text = str(label).encode("utf-8")
        data = np.ascontiguousarray(arr, dtype="<f8").tobytes()
        h.update(struct.pack("<QQ", len(text), len(data)))
        h.update(text)
        h.update(data)
    return h.hexdigest()


def _sums_digest(an: ReportContext, file_sha: str | None) -> str:
    """SHA-256 (hex) of rows analysed inside a database: the origin, the file's SHA-256 when
    there is one, and each group's label, n, mean and SS as the analysis has them."""
    o = an.origin
    parts: dict[str, Any] = {
        "engine": o.engine, "source": o.source, "from": o.from_sql, "where": o.where,
        "rows": o.rows_read, "file_sha256": file_sha,
        "groups": [[s.label, s.n, repr(float(s.mean))] for s in an.describe],
        "ss": [repr(float(an.oneway.ss_between)), repr(float(an.oneway.ss_within))],
    }
    return hashlib.sha256(json.dumps(parts, sort_keys=True).encode("utf-8")).hexdigest()


def _options(an: ReportContext, reading: Sequence[tuple[str, str]]) -> dict[str, Any]:
    """The options that change what the report says."""
    return {"alpha": repr(float(an.alpha)), "method": an.method, "control": an.control,
            "factor": an.factor, "response": an.response, "unit": an.unit, "title": an.title,
            "reading": [list(x) for x in reading]}


def report_identifier(data_sha256: str, options: Mapping[str, Any], version: str) -> str:
    """The first 12 hex digits of the SHA-256 of the data's fingerprint, the options and the
    version (as canonical JSON)."""
    text = json.dumps({"data": data_sha256, "options": dict(options), "version": version},
                      sort_keys=True, default=str)
    return hashlib.sha256(text.encode("utf-8")).hexdigest()[:12]


def python_call(function: str, options: Mapping[str, Any]) -> str:
    """The words for a report written from Python: ``write_report(...) called from Python with
    alpha=0.05, method='tukey', ...`` (options left at ``None`` are not named)."""
    given = ", ".join(f"{k}={v!r}" for k, v in options.items() if v is not None)
    return f"{function}(...) called from Python" + (f" with {given}" if given else "")


def _input_file(an: ReportContext, source_path: str | None) -> Path | None:
    """The file the data came from (absolute), when there is one."""
    if an.origin is not None:
        path = an.origin.path
    elif an.reading is not None and an.reading.path:
        path = an.reading.path
    else:
        path = source_path
    if not path:
        return None
    p = Path(os.fspath(path)).expanduser()
    if an.origin is not None and not p.is_file():  # a table or a query, not a file
        return None
    return p.resolve()


def make_trace(an: ReportContext, *, source_path: str | None, call: str, version: str,
               reading_options: Mapping[str, Any] | None = None, paper: str = "a4") -> Trace:
    """The traceability of the report of ``an``; the input file, if any, is hashed now."""
    paper = check_paper(paper)
    reading = tuple((str(k), repr(v)) for k, v in sorted((reading_options or {}).items()))
    path = _input_file(an, source_path)
    size = sha = None
    if path is not None and path.is_file():
        try:
            size, sha = file_digest(path)
        except OSError as err:
            raise InputError(f"could not read {str(path)!r} to compute its SHA-256: "
                             f"{err.strerror or err}") from None
    if an.origin is not None:
        data = _sums_digest(an, sha)
    elif sha is not None:
        data = sha
    else:
        data = values_digest(an.groups.labels, an.groups.arrays)
    ident = report_identifier(data, _options(an, reading), version)
    return Trace(ident, None if path is None else str(path), size, sha, data, call, reading,
                 paper, version)


def header_text(title: str, identifier: str) -> tuple[str, str]:
    """The page header's left part (the title, ``&`` doubled so that it is not read as a code,
    cut to 100 characters) and right part (``Report`` and the identifier)."""
    t = title if len(title) <= 100 else title[:99] + "…"
    return t.replace("&", "&&"), f"Report {identifier}"
