"""The message catalogues: every language complete, placeholders matching, sentences clean."""

from __future__ import annotations

import string

import pytest

from service import wording
from service.wording import en


def _fields(text: str) -> set[str]:
    return {name for _, name, _, _ in string.Formatter().parse(text) if name}


@pytest.mark.parametrize("lang", sorted(set(wording.CATALOGUES) - {"en"}))
def test_every_catalogue_has_every_english_key_with_the_same_placeholders(lang: str) -> None:
    other = wording.CATALOGUES[lang]
    assert sorted(set(en.WORDS) - set(other)) == [], f"{lang} lacks these keys"
    assert sorted(set(other) - set(en.WORDS)) == [], f"{lang} has keys English lacks"
    wrong = {
        k: (_fields(en.WORDS[k]), _fields(v))
        for k, v in other.items()
        if _fields(v) != _fields(en.WORDS[k])
    }
    assert wrong == {}


def test_language_falls_back_to_english_for_a_language_without_a_catalogue() -> None:
    assert wording.language("de-CH") == "de"
    assert wording.language("fr-FR") in wording.CATALOGUES
    assert wording.language("xx") == "en"


@pytest.mark.parametrize(
    ("parts", "expected"),
    [
        (("Boardings rose", " ", "by 4 % ."), "Boardings rose by 4 %."),
        (("Two  spaces", "here.."), "Two spaces here."),
        (("Is it?",), "Is it?"),
        (("", "  "), ""),
    ],
)
def test_sentence_has_single_spaces_and_single_punctuation(
    parts: tuple[str, ...], expected: str
) -> None:
    assert wording.sentence(*parts) == expected


def test_counts_of_advice_take_the_plural_in_german() -> None:
    from service.assemble.appendix import counted
    from service.checks.results import Status

    # German nouns take a plural ("Hinweise"); the English "advice" has none (common practice)
    assert counted(3, Status.advice, "de-DE") == "3 Hinweise"
    assert counted(1, Status.advice, "de-DE") == "1 Hinweis"
    assert counted(2, Status.advice, "en-GB") == "2 advice"
