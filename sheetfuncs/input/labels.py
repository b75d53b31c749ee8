"""Labels: how a cell becomes a label, and label fixes without editing the data.

:func:`format_label` writes any cell or key as a label; :func:`case_notes` finds labels that
differ only in case (possible typos). :func:`relabel` renames labels (``rename``: ``OLD=NEW``
texts or a mapping, read by :func:`parse_rename`) and, with ``merge_case``, merges labels that
differ only in case or surrounding spaces into their first spelling. Groups that end up with
one label are merged (their values joined in the order the groups came), each change recorded
as a note. Nothing else changes: the cells log stays as it was, so every cell keeps its address.

The rules, chosen for a QA analyst who may not edit the data file:

* renames are applied once, all at the same time, never chained: with ``A=B`` and ``B=C`` the
  group labelled ``A`` becomes ``B`` and the group labelled ``B`` becomes ``C`` (so ``A=B`` and
  ``B=A`` swap two labels);
* a rename to a label that another group has (or that another rename gives) merges the groups;
* renaming a label that no group has is an error that lists the labels;
* ``merge_case`` runs after the renames, on the new labels;
* labels read from cells are already trimmed of surrounding spaces, so two labels that differ
  only in spaces are one group from the start; ``merge_case`` also trims labels of groups built
  by hand.

This module needs nothing from the groups' module: :func:`relabel` asks the groups for
``regrouped(labels, notes)`` (:meth:`sheetfuncs.input.groups.Groups.regrouped`), so that the
Python inputs (``as_groups(..., relabel=...)``) can use it too.
"""

from __future__ import annotations

import datetime as _dt
import decimal
import math
import numbers
from collections.abc import Mapping, Sequence
from typing import Any, Protocol, TypeVar

from ..errors import InputError

__all__ = ["case_notes", "format_label", "parse_rename", "relabel"]

#: How many labels a message lists before it counts the rest.
LABELS_SHOWN = 12


class Regroupable(Protocol):
    """What :func:`relabel` needs of the groups: their labels, and the same groups relabelled."""

    @property
    def labels(self) -> tuple[str, ...]: ...

    def regrouped(self: G, labels: Sequence[str], notes: Sequence[str] = ()) -> G: ...


G = TypeVar("G", bound=Regroupable)


def format_label(value: Any) -> str:
    """A label as text: trimmed strings, shortest numbers (``3`` not ``3.0``), ISO dates."""
    if isinstance(value, str):
        return value.strip()
    if isinstance(value, bool):
        return "TRUE" if value else "FALSE"
    if isinstance(value, _dt.datetime):
        if value.time() == _dt.time(0, 0):
            return value.date().isoformat()
        return value.isoformat(sep=" ")
    if isinstance(value, (_dt.date, _dt.time)):
        return value.isoformat()
    if isinstance(value, decimal.Decimal):
        value = float(value)
    if isinstance(value, numbers.Integral):
        return str(int(value))
    if isinstance(value, numbers.Real):
        v = float(value)
        if math.isfinite(v) and v == int(v) and abs(v) < 1e16:
            return str(int(v))
        return repr(v)
    return str(value).strip()


def case_notes(labels: Sequence[str]) -> tuple[str, ...]:
    """A note for each set of labels that differ only in case (kept apart: possible typos)."""
    seen: dict[str, list[str]] = {}
    for lab in labels:
        seen.setdefault(lab.casefold(), []).append(lab)
    return tuple(
        f"labels {_quoted(same)} differ only in case and are kept as separate groups; check "
        "for a typo"
        for same in seen.values() if len(same) > 1
    )


def _quoted(labels: Sequence[str]) -> str:
    """``"A", "B", "C"`` (the first :data:`LABELS_SHOWN`, then how many more)."""
    shown = ", ".join(f'"{x}"' for x in labels[:LABELS_SHOWN])
    more = len(labels) - LABELS_SHOWN
    return shown + (f" and {more} more" if more > 0 else "")


def parse_rename(items: Any) -> dict[str, str]:
    """``OLD=NEW`` texts (or a mapping) as a dict of trimmed labels; one line for a bad entry.

    A text is split at its first ``=``, so an old label cannot hold ``=`` (a new one can).
    """
    if items is None:
        return {}
    if isinstance(items, Mapping):
        pairs = [(format_label(k), format_label(v)) for k, v in items.items()]
    elif isinstance(items, (str, Sequence)) and not isinstance(items, bytes):
        pairs = []
        for text in [items] if isinstance(items, str) else items:
            old, eq, new = str(text).partition("=")
            if not eq or not old.strip() or not new.strip():
                raise InputError(
                    f'cannot read the rename "{text}"; write it as OLD=NEW, e.g. '
                    '--rename "supplier B=Supplier B"'
                )
            pairs.append((old.strip(), new.strip()))
    else:
        raise InputError(
            "the renames must be a mapping of old label to new label, e.g. "
            f'{{"supplier B": "Supplier B"}}, not {type(items).__name__}'
        )
    out: dict[str, str] = {}
    for old, new in pairs:
        if not old or not new:
            raise InputError(
                f'cannot rename "{old}" to "{new}": a label cannot be empty; give both labels'
            )
        if old in out and out[old] != new:
            raise InputError(
                f'the label "{old}" is renamed twice ("{out[old]}" and "{new}"); give it one '
                "new label"
            )
        out[old] = new
    return out


def _renamed(labels: Sequence[str], mapping: dict[str, str]) -> tuple[list[str], list[str]]:
    """The labels after the renames (applied once, not chained), and a note for each."""
    unknown = [old for old in mapping if old not in labels]
    if unknown:
        folded = [lab for lab in labels if lab.casefold() == unknown[0].casefold()]
        hint = f' (labels are compared with their case: "{folded[0]}" differs)' if folded else ""
        raise InputError(
            f'no group is labelled "{unknown[0]}"{hint}, so it cannot be renamed; the labels '
            f"are {_quoted(labels)}"
        )
    final = [mapping.get(lab, lab) for lab in labels]
    notes = []
    for old, new in mapping.items():
        if old == new:
            continue
        merged = final.count(new) > 1
        notes.append(
            f'label "{old}" renamed to "{new}"'
            + (f' (merged with the other values labelled "{new}")' if merged else "")
        )
    return final, notes


def _case_merged(labels: Sequence[str]) -> tuple[list[str], list[str]]:
    """Labels that differ only in case or surrounding spaces, as their first spelling."""
    first: dict[str, str] = {}
    final, notes = [], []
    for lab in labels:
        keep = first.setdefault(lab.strip().casefold(), lab)
        if keep != lab:
            if lab.strip() == keep.strip():
                why = "surrounding spaces"
            elif lab == lab.strip() and keep == keep.strip():
                why = "case"
            else:
                why = "case and surrounding spaces"
            notes.append(f'label "{lab}" merged into "{keep}" (they differ only in {why})')
        final.append(keep)
    return final, notes


def relabel(groups: G, *, merge_case: bool = False, rename: Any = None) -> G:
    """``groups`` with labels renamed (``rename``: a mapping or ``OLD=NEW`` texts) and, with
    ``merge_case``, labels that differ only in case or surrounding spaces merged into their
    first spelling. Groups that end up with one label are merged; every change is a note. See
    the module docstring for the rules (renames are applied once, not chained)."""
    mapping = parse_rename(rename)
    if not mapping and not merge_case:
        return groups
    final, notes = _renamed(list(groups.labels), mapping)
    if merge_case:
        final, merged = _case_merged(final)
        notes += merged
    if final == list(groups.labels) and not notes:
        return groups
    return groups.regrouped(final, notes)
