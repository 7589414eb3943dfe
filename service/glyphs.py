"""Can the pack's one typeface draw this text? Checked before anything is drawn.

A character missing from the font is drawn silently as an empty box, and right-to-left scripts need
shaping and reordering that neither matplotlib nor reportlab does: both would mislead a reader
without a word. So user text is checked against the font's character map (DejaVu Sans, shipped with
matplotlib, used for charts and text alike) and refused with a clear problem instead.
"""

from __future__ import annotations

import unicodedata
from collections.abc import Iterable
from functools import lru_cache
from pathlib import Path

import matplotlib
from fontTools.ttLib import TTFont

_FACES = ("DejaVuSans.ttf", "DejaVuSans-Bold.ttf", "DejaVuSans-Oblique.ttf")


@lru_cache(maxsize=1)
def covered() -> frozenset[int]:
    """Code points every face of the house typeface can draw."""
    folder = Path(matplotlib.get_data_path()) / "fonts" / "ttf"
    sets = []
    for face in _FACES:
        font = TTFont(folder / face, lazy=True)
        sets.append(frozenset(font.getBestCmap()))
        font.close()
    return frozenset.intersection(*sets)


BMP_END = 0xFFFF
"""Characters past the Basic Multilingual Plane are refused even where the typeface has them:
matplotlib puts them at code 0 of a second font subset, which PDF/A validators read as .notdef."""


def missing(text: str) -> list[str]:
    """Characters of ``text`` the typeface cannot draw (those :func:`controls` reports aside), or
    cannot draw into an archival PDF (beyond the Basic Multilingual Plane)."""
    have = covered()
    return list(
        dict.fromkeys(
            c
            for c in text
            if (ord(c) not in have or ord(c) > BMP_END)
            and c not in _LAYOUT
            and unicodedata.category(c) not in _UNPRINTABLE
        )
    )


CHART_TEXT = "datasets["
"""Paths of text that matplotlib draws on charts: column names, units and category values."""
_LAYOUT = frozenset("\n\r\t")
"""Control characters the page layout treats as white space; matplotlib draws only the line break
(a tab or carriage return on a chart is a glyph the typeface lacks, printed as nothing)."""


def controls(text: str, *, chart: bool) -> list[str]:
    """Characters of ``text`` that cannot be printed: control characters but the white space the
    layout understands (on chart text only the line break), and every invisible format character
    (zero-width spaces and joiners, byte-order marks, direction marks, soft hyphens: the typeface
    lacks most, matplotlib's PDF output breaks on some, and none shows a reader anything) and line
    or paragraph separators. One rule for every drawn field."""
    allowed = frozenset("\n") if chart else _LAYOUT
    return list(
        dict.fromkeys(
            c for c in text if unicodedata.category(c) in _UNPRINTABLE and c not in allowed
        )
    )


_UNPRINTABLE = frozenset({"Cc", "Cf", "Cs", "Zl", "Zp"})


def _name(c: str) -> str:
    named = {"\t": "a tab", "\r": "a carriage return"}
    if c in named:
        return named[c]
    return "a control character" if unicodedata.category(c) == "Cc" else "an invisible character"


def right_to_left(text: str) -> bool:
    return any(unicodedata.bidirectional(c) in {"R", "AL"} for c in text)


def problems_in(items: Iterable[tuple[str, str]]) -> Iterable[tuple[str, str, str, str]]:
    """(path, code, message, text) for each piece of text that cannot be drawn as written."""
    for path, text in items:
        if not text:
            continue
        if right_to_left(text):
            yield (
                path,
                "right_to_left_text",
                "right-to-left text cannot yet be laid out correctly in a pack",
                text,
            )
            continue
        on_chart = (
            path.startswith(CHART_TEXT) and not path.endswith((".source", ".description"))
        ) or ".expected_categories[" in path
        unprintable = controls(text, chart=on_chart)
        if unprintable:
            shown = ", ".join(f"{_name(c)} (U+{ord(c):04X})" for c in unprintable[:5])
            yield (
                path,
                "glyph_missing",
                f"the text holds {shown}, which cannot be printed; remove it or use a space",
                text,
            )
            continue
        absent = missing(text)
        if absent:
            shown = ", ".join(f"'{c}' (U+{ord(c):04X})" for c in absent[:5])
            yield (
                path,
                "glyph_missing",
                f"the typeface cannot draw {shown}; it would print as an empty box",
                text,
            )
