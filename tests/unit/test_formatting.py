"""Numbers in the report's locale, against CLDR data as published through Babel."""

from __future__ import annotations

import pytest
from babel.numbers import format_decimal

from service import formatting

NARROW_NBSP = "\u202f"


@pytest.mark.parametrize(
    ("locale", "expected"),
    [("en-GB", "1,234.5"), ("de-DE", "1.234,5"), ("fr-FR", f"1{NARROW_NBSP}234,5")],
)
def test_grouping_and_decimal_separators(locale: str, expected: str) -> None:
    assert formatting.number(1234.5, locale) == expected


@pytest.mark.parametrize("value", [1234.5, 1234567.0, -98765.25, 0.5, 12.0, 1000000.0])
def test_fr_fr_matches_babel_reference(value: float) -> None:
    # Reference: babel.numbers.format_decimal (CLDR data), with an up-to-two-decimals pattern.
    # fr-FR groups with U+202F NARROW NO-BREAK SPACE and uses a decimal comma.
    reference = format_decimal(value, format="#,##0.##", locale="fr_FR")
    assert formatting.number(value, "fr-FR") == reference
    if abs(value) >= 1000:
        assert NARROW_NBSP in formatting.number(value, "fr-FR")
        assert " " not in formatting.number(value, "fr-FR")


def test_fr_fr_default_babel_format_agrees() -> None:
    # Reference: babel.numbers.format_decimal with the locale's own default pattern.
    assert formatting.number(1234.5, "fr-FR") == format_decimal(1234.5, locale="fr_FR")


def test_whole_numbers_have_no_decimals() -> None:
    assert formatting.number(1234567, "en-GB") == "1,234,567"
    assert formatting.number(12.0, "de-DE") == "12"
    assert formatting.number(0, "en-GB") == "0"


def test_up_to_two_decimals_by_default() -> None:
    assert formatting.number(1234.567, "en-GB") == "1,234.57"
    assert formatting.number(0.5, "en-GB") == "0.5"
    assert formatting.number(-1234.5, "de-DE") == "-1.234,5"


@pytest.mark.parametrize(
    ("digits", "expected"), [(0, "1,235"), (1, "1,234.6"), (2, "1,234.56"), (3, "1,234.560")]
)
def test_fixed_digits(digits: int, expected: str) -> None:
    assert formatting.number(1234.56, "en-GB", digits=digits) == expected


def test_fixed_digits_round_ties_as_babel_does() -> None:
    # Reference: babel.numbers.format_decimal rounds half to even (CLDR default rounding mode).
    assert formatting.number(1234.5, "en-GB", digits=0) == format_decimal(
        1234.5, format="#,##0", locale="en_GB"
    )
    assert formatting.number(1235.5, "en-GB", digits=0) == "1,236"


def test_fixed_digits_in_german() -> None:
    assert formatting.number(5, "de-DE", digits=1) == "5,0"


@pytest.mark.parametrize("value", [None, float("nan"), float("inf"), float("-inf")])
def test_no_data(value: float | None) -> None:
    assert formatting.number(value, "en-GB") == "no data"


def test_with_unit() -> None:
    assert formatting.with_unit(85, "%", "en-GB") == "85%"
    assert formatting.with_unit(2.5, "pp", "en-GB") == "2.5pp"
    assert formatting.with_unit(1234, "journeys", "de-DE") == "1.234 journeys"
    assert formatting.with_unit(3, "", "en-GB") == "3"
    assert formatting.with_unit(None, "%", "en-GB") == "no data"


def test_decimals_for() -> None:
    assert formatting.decimals_for([1.0, 2.0]) == 0
    assert formatting.decimals_for([93.4, 88.0]) == 1
    assert formatting.decimals_for([4.21, 3.9]) == 2
    assert formatting.decimals_for([1.255]) == 2


def test_known_locale() -> None:
    assert formatting.known_locale("en-GB")
    assert formatting.known_locale("fr-FR")
    assert not formatting.known_locale("xx-YY")


@pytest.mark.parametrize(
    ("name", "unit", "expected"),
    [
        ("on_time", "%", "on_time (%)"),
        ("revenue", "GBP", "revenue (GBP)"),
        ("boardings", "boardings", "boardings"),
        ("Boardings ", "boardings", "Boardings "),
        ("rating", None, "rating"),
        ("rating", "", "rating"),
    ],
)
def test_titled(name: str, unit: str | None, expected: str) -> None:
    assert formatting.titled(name, unit) == expected
