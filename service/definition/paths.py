"""Paths into a definition, in the form users read: ``sections[2].charts[0].measure``."""

from __future__ import annotations

from collections.abc import Iterable

from service.definition.model import INTENTS

#: Tags of the chart union, which pydantic inserts into error locations after the list index.
_UNION_TAGS = frozenset(INTENTS)


def join(loc: Iterable[int | str]) -> str:
    parts = list(loc)
    out = ""
    for i, part in enumerate(parts):
        if isinstance(part, int):
            out += f"[{part}]"
        elif part in _UNION_TAGS and i >= 2 and parts[i - 2] == "charts":
            continue
        else:
            out += f".{part}" if out else part
    return out
