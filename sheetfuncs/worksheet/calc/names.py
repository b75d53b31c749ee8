"""How the worksheet functions are named inside LibreOffice Calc.

Calc knows an add-in function by its *programmatic name*: the add-in's service name, a dot, and
the method name of its UNO interface (``org.sheetfuncs.calc.Functions.sfP``). The user types and
sees the display name (``SF_P``), but Calc stores the programmatic name, upper-cased, in the files
it saves: ``ORG.SHEETFUNCS.CALC.FUNCTIONS.SFP(A1:C7)`` in an ``.xlsx`` and in an ``.ods``
(``of:=ORG.SHEETFUNCS.CALC.FUNCTIONS.SFP([.A1:.C7])``). Excel with xlwings stores the display
name itself (``SF_P(A1:C7)``). Calc 7.4 maps neither form to the other, so a workbook moving
between the two programs needs its formula text rewritten (see the ``workbook`` module).

UNO identifiers may not hold an underscore before a lower-case letter, so method and argument
names are camelCase (``SF_BROWNFORSYTHE`` → ``sfBrownforsythe``, ``factor_name`` →
``factorName``); the display names keep the registry's spelling.
"""

from __future__ import annotations

from typing import Any

from ..registry import formula_literal

__all__ = ["MODULE", "SERVICE", "INTERFACE", "method_name", "argument_name", "stored_name",
           "calc_literal", "calc_formula"]

#: The UNO module of the extension's types.
MODULE = "org.sheetfuncs.calc"
#: The add-in's service (and implementation) name.
SERVICE = f"{MODULE}.Functions"
#: The UNO interface that holds one method per worksheet function.
INTERFACE = f"{MODULE}.XFunctions"


def method_name(name: str) -> str:
    """The UNO method of worksheet function ``name``: ``SF_P`` → ``sfP``,
    ``SF_BROWNFORSYTHE`` → ``sfBrownforsythe``."""
    head, _, rest = name.partition("_")
    return head.lower() + rest[:1].upper() + rest[1:].lower()


def argument_name(name: str) -> str:
    """An argument's name in the UNO interface: ``factor_name`` → ``factorName``."""
    first, *others = name.split("_")
    return first + "".join(w[:1].upper() + w[1:] for w in others)


def stored_name(name: str) -> str:
    """What Calc writes into a saved file for worksheet function ``name``:
    ``SF_P`` → ``ORG.SHEETFUNCS.CALC.FUNCTIONS.SFP``."""
    return f"{SERVICE}.{method_name(name)}".upper()


def calc_literal(value: Any) -> str:
    """An argument as typed in Calc's formula syntax for the API (``setFormula``): text quoted,
    ``TRUE()``/``FALSE()``, the shortest number, an inline array with ``;`` between columns and
    ``|`` between rows (``{1;-0.5;-0.5}`` is one row), a reference as its A1 address."""
    return formula_literal(value, columns=";", rows="|", logicals=("FALSE()", "TRUE()"))


def calc_formula(name: str, args: tuple[Any, ...]) -> str:
    """A call of worksheet function ``name`` in Calc's API syntax: ``=SF_P(A1:C7;"long")``."""
    return f"={name}({';'.join(calc_literal(a) for a in args)})"
