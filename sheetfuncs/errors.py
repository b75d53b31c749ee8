"""The one exception type that every front turns into a one-line message."""

from __future__ import annotations


class InputError(ValueError):
    """Bad input: the message says what is wrong and how to fix it, in one line.

    ``cells`` optionally lists the offending cells as ``(row, col)`` pairs, 0-based within the
    range that was given, so that a front can point at them.
    """

    def __init__(self, message: str, *, cells: tuple[tuple[int, int], ...] = ()) -> None:
        super().__init__(message)
        self.cells = cells
