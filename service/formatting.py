"""Numbers in the report's locale (CLDR data through Babel), shared by plans, charts and tables."""

from __future__ import annotations

import math
from functools import lru_cache

from babel import Locale, UnknownLocaleError
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
