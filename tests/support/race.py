"""A file that appears at a report's output path while the report is being written."""

from __future__ import annotations

from pathlib import Path
from typing import Any

import sheetfuncs.report.writer as writer_mod

__all__ = ["appear_while_writing"]


def appear_while_writing(monkeypatch: Any, path: Path, data: bytes) -> None:
    """Make ``path`` appear (holding ``data``) while the workbook is built: another program,
    or a second run with the same output."""
    real_build = writer_mod.build_workbook

    def build_then_someone_writes(*args: Any, **kw: Any) -> Any:
        wb = real_build(*args, **kw)
        path.write_bytes(data)
        return wb

    monkeypatch.setattr(writer_mod, "build_workbook", build_then_someone_writes)
