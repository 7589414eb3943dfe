"""Every generated word of a pack, from one catalogue per language, chosen by ``report.locale``.

``say("cover.prepared", "de-DE", when=...)`` looks the key up in the catalogue of the locale's
language (``de``), falls back to English for a language without a catalogue, and fills the
placeholders with ``str.format``. Each catalogue is a flat mapping in ``wording/<language>.py``,
in sections by the part of the pack that prints it; English is complete by definition, and
``tests/unit/test_wording.py`` holds every other catalogue to the same keys and placeholders.

``sentence`` joins generated parts into one sentence with single spaces and single punctuation,
so no generated text reads "  " or "..".
"""

from __future__ import annotations

import re
from collections.abc import Mapping
from typing import Any

from service.wording import de, en

CATALOGUES: Mapping[str, Mapping[str, str]] = {"en": en.WORDS, "de": de.WORDS}
"""Catalogues by language (the part of the locale before ``-``)."""


def language(locale: str) -> str:
    """The catalogue language of a locale: ``"de-CH"`` → ``"de"``; English when there is none."""
    lang = locale.replace("_", "-").split("-", 1)[0].lower()
    return lang if lang in CATALOGUES else "en"


def say(key: str, locale: str, /, **values: Any) -> str:
    """The words for ``key`` in the locale's language, placeholders filled from ``values``."""
    words = CATALOGUES[language(locale)].get(key)
    if words is None:
        words = en.WORDS[key]  # a KeyError here is a missing English entry: a bug
    return words.format(**values) if values else words


_SPACES = re.compile(r"\s{2,}")
_SPACE_BEFORE_STOP = re.compile(r"\s+([.,;:!?])")
_REPEATED_STOP = re.compile(r"([.,;:!?])[.,;:!?]+")


def sentence(*parts: str) -> str:
    """Parts joined by single spaces, ending in exactly one full stop (or the part's own ``?``/``!``)."""
    text = " ".join(p.strip() for p in parts if p and p.strip())
    if not text:
        return ""
    text = _SPACES.sub(" ", text)
    text = _SPACE_BEFORE_STOP.sub(r"\1", text)
    text = _REPEATED_STOP.sub(r"\1", text)
    return text if text[-1] in ".!?" else text + "."
