"""Files the commands write: the report's name, the report writer, and file-system errors.

``report`` and ``demo`` both write report workbooks (.xlsx only: reports never carry macros)
through :func:`sheetfuncs.report.write_report`; a file-system error becomes one line that names
the file.
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


def check_report_name(path: Path) -> None:
    """A report is an .xlsx file; any other name is a usage error."""
    if path.suffix.lower() != ".xlsx":
        raise UsageError(
            f'the report must be an .xlsx file, not "{path.name}" (reports never carry macros)'
        )


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
