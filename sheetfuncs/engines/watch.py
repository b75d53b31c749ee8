"""Progress of long DuckDB queries: a connection whose queries report how far they are.

DuckDB tracks a running query's progress when its progress bar is enabled (printing switched
off); :meth:`Watched.execute` runs the query on a worker thread (DuckDB releases the GIL) and
polls ``query_progress()`` from the calling thread, which calls ``progress("query N", percent,
100)`` (N counts the queries) once the query has run for a second. Ctrl-C interrupts it. Spark sessions are not watched.
"""

from __future__ import annotations

import threading
import time
from collections.abc import Callable, Sequence
from typing import Any

__all__ = ["Watched", "QUIET_SECONDS"]

#: Queries shorter than this show no progress.
QUIET_SECONDS = 1.0
_POLL = 0.2


class _Rows:
    """The fetched rows of a finished query (what ``execute(...).fetchall()`` returns)."""

    def __init__(self, rows: list[tuple[Any, ...]]) -> None:
        self._rows = rows

    def fetchall(self) -> list[tuple[Any, ...]]:
        return self._rows


class Watched:
    """A DuckDB connection whose queries report their progress to ``progress(stage, done,
    total)``; everything else is the connection's own (``con``)."""

    def __init__(self, con: Any, progress: Callable[[str, int, int], None],
                 quiet: float = QUIET_SECONDS) -> None:
        self.con = con
        self.progress = progress
        self.quiet = quiet
        self.queries = 0
        con.execute("SET enable_progress_bar = true")
        con.execute("SET enable_progress_bar_print = false")

    def execute(self, sql: str, params: Sequence[Any] = ()) -> _Rows:
        """Run ``sql`` and fetch its rows, reporting progress while it runs."""
        out: dict[str, Any] = {}

        def work() -> None:
            try:
                out["rows"] = self.con.execute(sql, list(params)).fetchall()
            except BaseException as err:  # handed to the calling thread, raised there
                out["error"] = err

        worker = threading.Thread(target=work, name="sheetfuncs-query", daemon=True)
        self.queries += 1
        stage = f"query {self.queries}"
        start = time.monotonic()
        worker.start()
        try:
            while worker.is_alive():
                worker.join(_POLL)
                done = self.con.query_progress()
                if worker.is_alive() and done >= 0 and time.monotonic() - start >= self.quiet:
                    self.progress(stage, int(done), 100)
        except KeyboardInterrupt:
            self.con.interrupt()
            worker.join()
            raise
        if "error" in out:
            raise out["error"]
        return _Rows(out["rows"])

    def __getattr__(self, name: str) -> Any:
        return getattr(self.con, name)
