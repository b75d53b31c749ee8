"""A result that could not be computed on these data, and the one way of trying an analysis.

Several fronts run secondary analyses whose failure must not hide the others: the assumption
checks (a test that cannot run is recorded with its reason) and :func:`sheetfuncs.stats.analyse`
(an analysis the report shows as not available). Both go through :func:`attempt`.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass
from typing import TypeVar

from ..errors import InputError

__all__ = ["Unavailable", "attempt"]

T = TypeVar("T")


@dataclass(frozen=True)
class Unavailable:
    """An analysis that could not run on these data, with the reason in plain words."""

    what: str
    reason: str

    def __bool__(self) -> bool:  # lets ``if result:`` read naturally
        return False


def failure_reason(err: Exception) -> str:
    """The reason recorded for an analysis that failed on a numerical problem it did not foresee."""
    detail = str(err).strip() or type(err).__name__
    return (
        f"the computation failed on these data ({detail}); the other checks still answer, and "
        "this is worth reporting to the maintainers with the data"
    )


def attempt(what: str, call: Callable[[], T], *, numerical: bool = False) -> T | Unavailable:
    """``call()``, or :class:`Unavailable` with the reason when the data do not allow it.

    An :class:`~sheetfuncs.errors.InputError` (the data do not allow the analysis) always becomes
    ``Unavailable(what, err.reason)``. With ``numerical=True`` an unforeseen numerical failure
    (``ArithmeticError`` or another ``ValueError``) does too, with a reason that asks for it to be
    reported; otherwise it propagates, as a bug should.
    """
    try:
        return call()
    except InputError as err:
        return Unavailable(what, err.reason)
    except (ArithmeticError, ValueError) as err:
        if not numerical:
            raise
        return Unavailable(what, failure_reason(err))
