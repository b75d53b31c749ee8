"""The one exception type that every front turns into a one-line message, and that message's prefix.

Messages are written once, without the prefix: ``InputError("group \\"Head 3\\" has no numbers")``.
``str(err)`` is the line a user sees (``sheetfuncs: group "Head 3" has no numbers``) and
``err.reason`` the bare text, for fronts that put it into a sentence of their own.
:func:`message` gives any other line the fronts print (usage problems, file-system errors) the
same form.
"""

from __future__ import annotations

__all__ = ["PREFIX", "InputError", "message"]

#: What every line of text the product shows about a problem starts with.
PREFIX = "sheetfuncs: "


def message(reason: str) -> str:
    """``reason`` as the product shows it: the prefix, then the text on one line."""
    return PREFIX + " ".join(str(reason).split())


class InputError(ValueError):
    """Bad input: ``reason`` says what is wrong and how to fix it, in one line (no prefix).

    ``cells`` optionally lists the offending cells as ``(row, col)`` pairs, 0-based within the
    range that was given, so that a front can point at them.
    """

    def __init__(self, reason: str, *, cells: tuple[tuple[int, int], ...] = ()) -> None:
        super().__init__(PREFIX + reason)
        self.reason = reason
        self.cells = cells
