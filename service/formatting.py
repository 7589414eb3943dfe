"""Numbers in the report's locale (CLDR data through Babel), shared by plans, charts and tables."""

from __future__ import annotations

import math
from datetime import date, datetime
from functools import lru_cache

from babel import Locale, UnknownLocaleError
from babel.dates import format_date, format_time
from babel.numbers import format_decimal

#: Units written straight after the number with no space.
_TIGHT_UNITS = frozenset({"%", "pp"})


@lru_cache(maxsize=64)
def known_locale(locale: str) -> bool:
    try:
        Locale.parse(locale.replace("-", "_"))
    except (UnknownLocaleError, ValueError):
        return False
    return True


def number(value: float | None, locale: str, *, digits: int | None = None) -> str:
    """``value`` with the locale's separators; ``digits`` fixes the decimals (else up to 2)."""
    if value is None or (isinstance(value, float) and not math.isfinite(value)):
        return "no data"
    if round(value, 2 if digits is None else digits) == 0:
        value = 0.0  # never print "-0"
    pattern = None
    if digits is not None:
        pattern = "#,##0" + ("." + "0" * digits if digits > 0 else "")
    elif float(value).is_integer() and abs(value) >= 1:
        pattern = "#,##0"
    else:
        pattern = "#,##0.##"
    try:
        return str(format_decimal(value, format=pattern, locale=locale.replace("-", "_")))
    except (ArithmeticError, ValueError):  # beyond the 28 digits CLDR decimals carry
        return f"{value:.4g}"


def with_unit(value: float | None, unit: str, locale: str, *, digits: int | None = None) -> str:
    text = number(value, locale, digits=digits)
    if value is None or not unit:
        return text
    return f"{text}{unit}" if unit in _TIGHT_UNITS else f"{text} {unit}"


def decimals_for(values: list[float]) -> int:
    """Decimals needed to tell the given values apart on a label (0 to 2)."""
    for digits in (0, 1, 2):
        if all(abs(v * 10**digits - round(v * 10**digits)) < 1e-9 for v in values):
            return digits
    return 2


def titled(name: str, unit: str | None) -> str:
    """A column name with its unit, unless the unit only repeats the name."""
    if not unit or unit.strip().lower() == name.strip().lower():
        return name
    return f"{name} ({unit})"


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
