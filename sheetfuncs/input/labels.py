"""Label fixes without editing the data: merge labels that differ only in case, rename labels.

:func:`relabel` takes cleaned :class:`~sheetfuncs.input.groups.Groups` and returns new ones in
which groups that end up with the same label are merged (their values joined in the order the
groups came), each change recorded as a note. Nothing else changes: the cells log stays as it
was, so every cell keeps its address.
"""

from __future__ import annotations

from collections.abc import Mapping
from typing import Any

import numpy as np

from ..errors import InputError
from .groups import Groups, build_groups, format_label

__all__ = ["parse_rename", "relabel"]


def parse_rename(items: Any) -> dict[str, str]:
    """``OLD=NEW`` texts (or a mapping) as a dict of trimmed labels; one line for a bad entry."""
    if items is None:
        return {}
    if isinstance(items, Mapping):
        pairs = [(format_label(k), format_label(v)) for k, v in items.items()]
    else:
        if isinstance(items, str):
            items = [items]
        pairs = []
        for text in items:
            old, eq, new = str(text).partition("=")
            if not eq or not old.strip() or not new.strip():
                raise InputError(
                    f'cannot read the rename "{text}"; write it as OLD=NEW, e.g. '
                    '--rename "supplier B=Supplier B"'
                )
            pairs.append((old.strip(), new.strip()))
    out: dict[str, str] = {}
    for old, new in pairs:
        if old in out and out[old] != new:
            raise InputError(f'the label "{old}" is renamed twice ("{out[old]}" and "{new}")')
        out[old] = new
    return out


def relabel(groups: Groups, *, merge_case: bool = False, rename: Any = None) -> Groups:
    """``groups`` with labels renamed (``rename``: a mapping or ``OLD=NEW`` texts) and, with
    ``merge_case``, labels that differ only in case or surrounding spaces merged into their
    first spelling. Groups that end up with one label are merged; every change is a note."""
    mapping = parse_rename(rename)
    if not mapping and not merge_case:
        return groups
    missing = [old for old in mapping if old not in groups.labels]
    if missing:
        shown = ", ".join(f'"{x}"' for x in groups.labels[:12])
        raise InputError(
            f'no group is labelled "{missing[0]}", so it cannot be renamed; the labels are '
            f"{shown}"
        )
    notes: list[str] = []
    final = [mapping.get(lab, lab) for lab in groups.labels]
    for old, new in mapping.items():
        notes.append(f'label "{old}" renamed to "{new}"')
    if merge_case:
        first: dict[str, str] = {}
        for i, lab in enumerate(final):
            key = lab.strip().casefold()
            keep = first.setdefault(key, lab)
            if keep != lab:
                notes.append(f'label "{lab}" merged into "{keep}" (they differ only in case)')
                final[i] = keep
    order: dict[str, list[np.ndarray]] = {}
    for lab, arr in zip(final, groups.arrays):
        order.setdefault(lab, []).append(arr)
    arrays = [parts[0] if len(parts) == 1 else np.concatenate(parts) for parts in order.values()]
    merged = build_groups(list(order), arrays, groups.cells, groups.layout, groups.label_source)
    kept_notes = tuple(n for n in merged.notes)
    return Groups(
        labels=merged.labels, arrays=merged.arrays, cells=merged.cells,
        notes=tuple(notes) + kept_notes, layout=merged.layout, label_source=merged.label_source,
    )
