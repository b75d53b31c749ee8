"""Progress on stderr for the commands that read and write files.

Shown when forced (``--progress``), never when refused (``--no-progress``), and otherwise only on
a terminal, for batches of several files, for inputs above about a million cells
(:data:`BIG_INPUT_CELLS`) and for database queries that run longer than a second. On a terminal one line is redrawn in place; elsewhere each step is a
plain line that starts ``sheetfuncs:``.
"""

from __future__ import annotations

import time
from typing import TextIO

from ..errors import message

__all__ = ["BIG_INPUT_CELLS", "Progress"]

#: Inputs above about this many cells show progress on a terminal.
BIG_INPUT_CELLS = 1_000_000


class Progress:
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

    def long_work(self) -> None:
        """Work of unknown length follows (a database query): shown on a terminal (auto)."""
        if self.mode is None and self.tty:
            self.active = True

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
