"""Files the commands write: the report's name, the report writer, and file-system errors.

``report`` and ``demo`` both write report workbooks (.xlsx only) through
:func:`sheetfuncs.report.write_report`; a file-system error becomes one line that names the file.
"""

from __future__ import annotations

import os
from pathlib import Path
from typing import Any

from ..errors import InputError
from ..input import InputSource
from .parser import UsageError

__all__ = [
    "check_output_folder", "check_report_name", "os_reason", "write_report_file",
]


def os_reason(e: OSError, what: str | os.PathLike[str] | None = None) -> str:
    """A file-system error as the text of one message: the file, then what went wrong."""
    where = e.filename if e.filename is not None else what
    reason = e.strerror or str(e) or type(e).__name__
    return f"{where}: {reason}" if where is not None else reason


def check_report_name(given: str | os.PathLike[str], *, out_dir: bool = False) -> Path:
    """The report's path from ``-o``: an .xlsx file name. A folder or any other name is refused
    in one line; ``out_dir`` says whether the command has ``--out-dir`` to suggest. A name
    ending in a slash, or not in .xlsx, is a usage error (exit code 2); an existing folder an
    input error (exit code 1: the file system decides it)."""
    text = os.fspath(given)
    path = Path(text)
    seps = tuple(s for s in (os.sep, os.altsep, "/") if s)
    if text.endswith(seps) or path.is_dir():
        hint = (f", or give --out-dir {text} to write the report into that folder" if out_dir
                else f", such as {path / 'report.xlsx'}")
        problem = f"-o {text} names a folder; give -o a file name ending in .xlsx{hint}"
        raise UsageError(problem) if text.endswith(seps) else InputError(problem)
    if path.suffix.lower() != ".xlsx":
        raise UsageError(
            f'the report must be an .xlsx file, not "{path.name}"; give -o a name ending in .xlsx'
        )
    return path


def check_output_folder(out: Path) -> None:
    """The folder a report goes into must exist (``--out-dir`` folders are made before)."""
    if not out.parent.exists():
        raise InputError(
            f"the folder {out.parent} does not exist; create it or choose another "
            "output"
        )


def write_report_file(groups: Any, out: Path, *, source: InputSource | None, progress: Any,
                      **opts: Any) -> Path:
    """Write the report of ``groups`` to ``out`` (the report layer's options in ``opts``)."""
    from ..report import write_report

    return Path(write_report(groups, out, source=source, progress=progress, **opts))
