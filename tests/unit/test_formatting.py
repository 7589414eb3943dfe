"""Numbers in the report's locale, against CLDR data as published through Babel."""

from __future__ import annotations

import itertools
import re

import pytest
from babel import Locale
from babel.numbers import format_currency, format_decimal

from service import formatting

NARROW_NBSP = "\u202f"
NBSP = "\u00a0"
MINUS = "\u2212"


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
    # The house writes the minus sign U+2212 where CLDR's fr data has a hyphen-minus.
    reference = format_decimal(value, format="#,##0.##", locale="fr_FR").replace("-", MINUS)
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
    assert formatting.number(-1234.5, "de-DE") == f"{MINUS}1.234,5"


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
    assert formatting.with_unit(2.5, "pp", "en-GB") == "2.5 percentage points"
    assert formatting.with_unit(2.5, "pp", "en-GB", short=True) == "2.5 pp"
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
        ("On-time journeys", "journeys", "On-time journeys"),
        ("revenue", "GBP", "revenue (GBP)"),
        ("boardings", "boardings", "boardings"),
        ("Boardings ", "boardings", "Boardings "),
        ("rating", None, "rating"),
        ("rating", "", "rating"),
    ],
)
def test_titled(name: str, unit: str | None, expected: str) -> None:
    assert formatting.titled(name, unit) == expected


# -- the house rules on top of CLDR (reference: CLDR via Babel) --------------------------------------


@pytest.mark.parametrize("locale", ["en-GB", "de-DE", "fr-FR"])
def test_negative_numbers_carry_the_minus_sign(locale: str) -> None:
    text = formatting.number(-28, locale)
    assert text == f"{MINUS}28"
    assert "-" not in formatting.with_unit(-1234.5, "GBP", locale)
    assert formatting.with_unit(-28, "journeys", locale) == f"{MINUS}28 journeys"


def test_minus_zero_is_never_printed() -> None:
    assert formatting.number(-0.001, "en-GB") == "0"
    assert formatting.with_unit(-0.004, "%", "en-GB", digits=2) == "0.00%"


def test_a_difference_of_percentages_is_in_percentage_points() -> None:
    percent = formatting.style_for("%")
    assert formatting.change(-4.8, percent, "en-GB") == f"{MINUS}4.8 percentage points"
    assert formatting.change(-4.8, percent, "en-GB", short=True) == f"{MINUS}4.8 pp"
    assert formatting.change(2.25, percent, "en-GB") == "+2.25 percentage points"
    assert formatting.change(-4.8, percent, "de-DE") == f"{MINUS}4,8 Prozentpunkte"


def test_a_change_of_other_measures_keeps_their_unit_and_a_sign() -> None:
    journeys = formatting.style_for("journeys", integer=True)
    assert formatting.change(-28, journeys, "en-GB") == f"{MINUS}28 journeys"
    assert formatting.change(12, journeys, "en-GB") == "+12 journeys"


@pytest.mark.parametrize(
    ("locale", "expected"),
    [("en-GB", "£84,000"), ("de-DE", f"84.000{NBSP}£"), ("en-US", "£84,000")],
)
def test_currency_follows_the_locale(locale: str, expected: str) -> None:
    # Reference: CLDR via Babel. Babel writes whole pounds with the currency's two decimals;
    # the house drops ".00" from a whole amount and otherwise keeps Babel's pattern.
    reference = format_currency(84000, "GBP", locale=locale.replace("-", "_"))
    assert re.sub(r"[.,]00(?=\D*$)", "", reference) == expected
    assert formatting.with_unit(84000, "GBP", locale) == expected
    assert formatting.with_unit(84000, "£", locale) == expected


def test_currency_with_pence_matches_babel() -> None:
    # Reference: CLDR via Babel, with the minus sign U+2212 for Babel's hyphen-minus.
    for locale in ("en_GB", "de_DE"):
        reference = format_currency(-1234.5, "EUR", locale=locale).replace("-", MINUS)
        assert formatting.with_unit(-1234.5, "EUR", locale.replace("_", "-")) == reference


@pytest.mark.parametrize(("locale", "expected"), [("en-GB", "94.6%"), ("de-DE", f"94,6{NBSP}%")])
def test_percent_uses_the_locales_percent_pattern(locale: str, expected: str) -> None:
    # Reference: CLDR via Babel: the spacing comes from the locale's percent pattern.
    pattern = Locale.parse(locale.replace("-", "_")).percent_formats[None].pattern
    assert pattern.endswith(expected[-2:] if NBSP in expected else "%")
    assert formatting.with_unit(94.6, "%", locale) == expected
    assert formatting.percent(85, locale) == expected.replace("94", "85").replace(".6", "").replace(
        ",6", ""
    )


def test_counts_never_get_decimals() -> None:
    loans = formatting.style_for("loans", integer=True)
    assert formatting.show(17739.47, loans, "en-GB") == "17,739 loans"
    assert formatting.show(17739.47, loans, "de-DE") == "17.739 loans"


def test_a_format_overrides_the_defaults() -> None:
    plain = formatting.style_for("%", kind="plain", decimals=1, grouping=False)
    assert formatting.show(1234, plain, "en-GB") == "1234.0 %"
    assert formatting.show(2026, formatting.style_for("", grouping=False), "en-GB") == "2026"


@pytest.mark.parametrize(
    ("lo", "hi", "bins"), [(5.5, 30.1, 9), (0.12, 0.95, 8), (17, 412, 12), (-3.3, 7.7, 6)]
)
def test_histogram_edges_are_round_numbers(lo: float, hi: float, bins: int) -> None:
    edges = formatting.nice_edges(lo, hi, bins)
    assert edges[0] <= lo
    assert edges[-1] >= hi
    widths = {round(b - a, 9) for a, b in itertools.pairwise(edges)}
    assert len(widths) == 1
    (width,) = widths
    digits = f"{width:.10g}".lstrip("0.").rstrip("0").replace(".", "")
    assert digits in {"1", "2", "25", "5"}
    assert all(round(e / width, 9).is_integer() for e in edges)


def test_humanise() -> None:
    assert formatting.humanise("operating_cost") == "Operating cost"
    assert formatting.humanise("boardings") == "Boardings"
