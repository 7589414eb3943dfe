"""Numbers in the report's locale (CLDR data through Babel), shared by plans, charts and tables.

One writer for every number the pack prints: :func:`show` writes a value in a :class:`Style` (its
unit, decimals, percent / currency / plain, thousands grouping), which a dataset column resolves
from its type, unit and ``format`` (``definition.model.Column.style``). The house rules on top of
CLDR: negative numbers carry the minus sign U+2212 (CLDR's ``en`` and ``de`` write a hyphen-minus),
"-0" is never printed, a difference of two percentages is in percentage points, and counts
(integer columns) never get decimals. Percent and currency follow the locale's own CLDR patterns
(``de-DE`` writes "94,6 %" and "84.000 £"; ``en-GB`` "94.6%" and "£84,000").
"""

from __future__ import annotations

import math
import re
from datetime import date, datetime
from functools import lru_cache
from typing import Literal

from babel import Locale, UnknownLocaleError
from babel.dates import format_date, format_time
from babel.numbers import format_currency, format_decimal, get_currency_name
from pydantic import BaseModel, ConfigDict

from service import wording

MINUS = "\u2212"
"""The minus sign every negative number is written with."""

Kind = Literal["plain", "percent", "currency"]

#: Currency symbols a unit may be written with, and the ISO 4217 code each stands for.
_SYMBOLS = {
    "£": "GBP",
    "€": "EUR",
    "$": "USD",
    "US$": "USD",
    "¥": "JPY",
    "CHF": "CHF",
    "Fr.": "CHF",
}

#: Units that name percentage points rather than percent.
_POINTS = frozenset({"pp", "percentage points", "percentage point", "%-points"})


class Style(BaseModel):
    """How the values of one measure are written (resolved: nothing left to a default)."""

    model_config = ConfigDict(extra="forbid", frozen=True)

    unit: str = ""
    kind: Kind = "plain"
    decimals: int | None = None
    """Fixed decimals; ``None``: as many as the value needs, up to two (none for a whole value)."""
    grouping: bool = True
    currency: str | None = None
    """The ISO 4217 code of a currency style."""
    points: bool = False
    """Percentage points (a difference of two percentages)."""


def currency_code(unit: str) -> str | None:
    """The ISO 4217 code a unit names (``"GBP"``, ``"£"``), or ``None`` when it names no currency."""
    text = unit.strip()
    if text in _SYMBOLS:
        return _SYMBOLS[text]
    if re.fullmatch(r"[A-Z]{3}", text) and _known_currency(text):
        return text
    return None


@lru_cache(maxsize=64)
def _known_currency(code: str) -> bool:
    return get_currency_name(code, locale="en") != code


def style_for(
    unit: str | None,
    *,
    integer: bool = False,
    decimals: int | None = None,
    kind: Kind | None = None,
    grouping: bool = True,
) -> Style:
    """The style of a measure: ``kind`` and ``decimals`` as given, else from its unit and type.

    A ``%`` unit is percent, a currency code or symbol is currency, ``pp`` is percentage points;
    an integer (count) column never gets decimals."""
    text = (unit or "").strip()
    code = currency_code(text)
    if kind is None:
        kind = "percent" if text == "%" else "currency" if code else "plain"
    if integer:
        decimals = 0
    return Style(
        unit=text,
        kind=kind,
        decimals=decimals,
        grouping=grouping,
        currency=code if kind == "currency" else None,
        points=text.lower() in _POINTS,
    )


@lru_cache(maxsize=64)
def known_locale(locale: str) -> bool:
    try:
        Locale.parse(locale.replace("-", "_"))
    except (UnknownLocaleError, ValueError):
        return False
    return True


def _babel(locale: str) -> str:
    return locale.replace("-", "_")


def _minus(text: str) -> str:
    """Every hyphen-minus of a formatted number as the minus sign U+2212."""
    return text.replace("-", MINUS)


def _pattern(digits: int | None, value: float, grouping: bool) -> str:
    whole = "#,##0" if grouping else "0"
    if digits is not None:
        return whole + ("." + "0" * digits if digits > 0 else "")
    if float(value).is_integer() and abs(value) >= 1:
        return whole
    return whole + ".##"


def _zeroed(value: float, digits: int | None) -> float:
    """``value``, or plain 0 where it would print as zero (never "−0")."""
    return 0.0 if round(value, 2 if digits is None else digits) == 0 else value


def _missing(value: float | None) -> bool:
    return value is None or (isinstance(value, float) and not math.isfinite(value))


def number(
    value: float | None, locale: str, *, digits: int | None = None, grouping: bool = True
) -> str:
    """``value`` with the locale's separators; ``digits`` fixes the decimals (else up to 2)."""
    if _missing(value):
        return wording.say("text.no_data", locale)
    assert value is not None
    value = _zeroed(value, digits)
    try:
        text = str(
            format_decimal(value, format=_pattern(digits, value, grouping), locale=_babel(locale))
        )
    except (ArithmeticError, ValueError):  # beyond the 28 digits CLDR decimals carry
        text = f"{value:.4g}"
    return _minus(text)


def percent(value: float | None, locale: str, *, digits: int | None = None) -> str:
    """A value already in percent (``94.6``) the way the locale writes percent ("94.6%", "94,6 %")."""
    if _missing(value):
        return number(value, locale)
    pattern = Locale.parse(_babel(locale)).percent_formats[None]
    prefix, suffix = pattern.prefix[0], pattern.suffix[0]
    return f"{prefix}{number(value, locale, digits=digits)}{suffix}"


def currency(value: float | None, code: str, locale: str, *, digits: int | None = None) -> str:
    """An amount in the locale's currency pattern ("£84,000" in en-GB, "84.000 £" in de-DE).

    Whole amounts are written without decimals unless ``digits`` asks for them; other amounts
    with the currency's usual two."""
    if _missing(value):
        return number(value, locale)
    assert value is not None
    if digits is None:
        digits = 0 if float(value).is_integer() else 2
    value = _zeroed(value, digits)
    pattern = Locale.parse(_babel(locale)).currency_formats["standard"].pattern
    fraction = "." + "0" * digits if digits > 0 else ""
    pattern = re.sub(r"0(?:\.0+)?(?=[^0#.,]*(;|$))", "0" + fraction, pattern)
    try:
        text = str(
            format_currency(
                value, code, format=pattern, locale=_babel(locale), currency_digits=False
            )
        )
    except (ArithmeticError, ValueError):
        return f"{value:.4g} {code}"
    return _minus(text)


def points(
    value: float | None, locale: str, *, digits: int | None = None, short: bool = False
) -> str:
    """A difference of two percentages, in percentage points ("−4.8 percentage points", "−4.8 pp")."""
    if _missing(value):
        return number(value, locale)
    key = "text.pp_short" if short else "text.pp_long"
    return wording.say(key, locale, value=number(value, locale, digits=digits))


def show(value: float | None, style: Style, locale: str, *, short: bool = False) -> str:
    """``value`` written in ``style``: the one way the pack writes a measure's value."""
    digits = style.decimals
    if style.points:
        return points(value, locale, digits=digits, short=short)
    if style.kind == "percent":
        return percent(value, locale, digits=digits)
    if style.kind == "currency" and style.currency:
        return currency(value, style.currency, locale, digits=digits)
    text = number(value, locale, digits=digits, grouping=style.grouping)
    if _missing(value) or not style.unit or style.kind != "plain":
        return text
    return f"{text} {style.unit}"


def with_unit(
    value: float | None, unit: str, locale: str, *, digits: int | None = None, short: bool = False
) -> str:
    """``value`` in the style its unit implies (percent, currency, points, or "1,234 journeys")."""
    return show(value, style_for(unit, decimals=digits), locale, short=short)


def change(
    value: float | None, style: Style, locale: str, *, short: bool = False, signed: bool = True
) -> str:
    """A difference of two values of ``style``: percentage points for percentages, a sign always."""
    if style.kind == "percent" or style.points:
        diff = style.model_copy(update={"kind": "plain", "points": True})
    else:
        diff = style
    text = show(value, diff, locale, short=short)
    if signed and value is not None and math.isfinite(value) and _zeroed(value, style.decimals) > 0:
        return "+" + text
    return text


def decimals_for(values: list[float]) -> int:
    """Decimals needed to tell the given values apart on a label (0 to 2)."""
    for digits in (0, 1, 2):
        if all(abs(v * 10**digits - round(v * 10**digits)) < 1e-9 for v in values):
            return digits
    return 2


def titled(name: str, unit: str | None) -> str:
    """A column's display name with its unit, unless the unit only repeats the name."""
    if not unit or unit.strip().lower() in name.strip().lower().split():
        return name
    if unit.strip().lower() == name.strip().lower():
        return name
    return f"{name} ({unit})"


def humanise(name: str) -> str:
    """A column identifier as words: ``"operating_cost"`` → ``"Operating cost"``."""
    words = re.sub(r"[_\s]+", " ", name).strip()
    if not words:
        return name
    return words[0].upper() + words[1:]


def nice_edges(lo: float, hi: float, bins: int) -> list[float]:
    """About ``bins`` equal-width bin edges at round numbers (a 1–2–2.5–5 step) covering lo..hi."""
    if not (math.isfinite(lo) and math.isfinite(hi)):
        return [0.0, 1.0]
    if hi <= lo:
        step = _nice_step(abs(lo) or 1.0, 1)
        start = math.floor(lo / step) * step
        return [_tidy(start), _tidy(start + step)]
    wanted = max(bins, 1)
    magnitude = 10.0 ** math.floor(math.log10((hi - lo) / wanted))
    candidates = [_span(lo, hi, f * magnitude) for f in (0.5, 1, 2, 2.5, 5, 10)]
    edges = min(candidates, key=lambda e: (abs(len(e) - 1 - wanted), -len(e)))
    return [_tidy(e) for e in edges]


def _span(lo: float, hi: float, step: float) -> list[float]:
    """Edges ``step`` apart, on multiples of ``step``, from at or below ``lo`` to at or above ``hi``."""
    first = math.floor(lo / step + 1e-9)
    last = max(math.ceil(hi / step - 1e-9), first + 1)
    return [k * step for k in range(first, last + 1)]


def _nice_step(span: float, count: int) -> float:
    raw = span / count
    magnitude = 10.0 ** math.floor(math.log10(raw))
    for factor in (1, 2, 2.5, 5, 10):
        if factor * magnitude >= raw * (1 - 1e-9):
            return float(factor * magnitude)
    return float(10 * magnitude)


def _tidy(value: float) -> float:
    return float(f"{value:.12g}")


def in_sentence(label: str, locale: str) -> str:
    """A display name inside a sentence: "On-time journeys" → "on-time journeys" in English.

    Acronyms ("NHS trust") keep their capitals, and languages that capitalise nouns (German)
    keep the label as written."""
    if not label or not locale.lower().startswith("en"):
        return label
    if len(label) > 1 and label[1].isupper():
        return label
    return label[0].lower() + label[1:]


def moment(value: datetime, locale: str) -> str:
    """A point in time as people write it in ``locale``: the long date and the short time on the
    sender's own clock, with its offset from UTC ("9 November 2026, 07:30 UTC";
    "9. November 2026, 07:30 UTC+01:00")."""
    babel_locale = locale.replace("-", "_")
    on = format_date(value.date(), "long", locale=babel_locale)
    time = format_time(value.time(), "short", locale=babel_locale)
    offset = value.utcoffset()
    zone = "UTC"
    if offset:
        minutes = int(offset.total_seconds() // 60)
        sign = "+" if minutes >= 0 else "−"
        zone += f"{sign}{abs(minutes) // 60:02d}:{abs(minutes) % 60:02d}"
    pattern = Locale.parse(babel_locale).datetime_formats["medium"]
    return str(pattern).replace("{1}", on).replace("{0}", f"{time} {zone}")


def day(value: date, locale: str) -> str:
    """A calendar day as people write it in ``locale`` ("30 November 2026")."""
    return str(format_date(value, "long", locale=locale.replace("-", "_")))
