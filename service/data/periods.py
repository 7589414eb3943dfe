"""Calendar periods: mapping times to periods, the periods a series should have, and completeness.

Weeks are ISO 8601 weeks (Monday to Sunday). A period is *partial* when ``as_of`` falls inside it;
its completeness counts whole days elapsed before ``as_of`` out of the days in the period.
"""

from __future__ import annotations

from dataclasses import dataclass
from datetime import datetime, timedelta

import numpy as np
import pandas as pd
from babel.dates import format_date, get_month_names

from service import wording
from service.definition.model import Frequency

_PANDAS_FREQ: dict[Frequency, str] = {
    Frequency.day: "D",
    Frequency.week: "W-SUN",  # weeks ending on Sunday, i.e. starting on Monday (ISO 8601)
    Frequency.month: "M",
    Frequency.quarter: "Q-DEC",
    Frequency.year: "Y-DEC",
}


def pandas_freq(frequency: Frequency) -> str:
    return _PANDAS_FREQ[frequency]


def to_periods(times: pd.Series, frequency: Frequency) -> pd.PeriodIndex:
    """The period each (naive) timestamp falls in."""
    return pd.PeriodIndex(pd.DatetimeIndex(times).to_period(pandas_freq(frequency)))


def expected(first: pd.Period, last: pd.Period) -> pd.PeriodIndex:
    """Every period from ``first`` to ``last`` inclusive, at their frequency."""
    return pd.period_range(first, last, freq=first.freq)


def span(present: pd.PeriodIndex) -> int:
    """How many periods run from the first of ``present`` to the last, inclusive (0 if none):
    the length :func:`expected` would have, counted without building it."""
    if len(present) == 0:
        return 0
    ordinals = present.asi8
    return int(ordinals.max()) - int(ordinals.min()) + 1


def missing(present: pd.PeriodIndex) -> list[pd.Period]:
    """Periods between the first and last present one that have no row."""
    if len(present) == 0:
        return []
    full = expected(present.min(), present.max())
    return list(full.difference(present))


def start(period: pd.Period) -> datetime:
    return period.start_time.to_pydatetime()


def end(period: pd.Period) -> datetime:
    """The first instant after the period."""
    return (period + 1).start_time.to_pydatetime()


def days(period: pd.Period) -> int:
    return (end(period) - start(period)).days


@dataclass(frozen=True)
class Completeness:
    elapsed_days: int
    total_days: int

    @property
    def fraction(self) -> float:
        return self.elapsed_days / self.total_days

    def text(self, locale: str = "en-GB") -> str:
        """How much had elapsed, in words of the report's language ("8 of 30 days")."""
        key = "text.days_of_one" if self.total_days == 1 else "text.days_of"
        return wording.say(key, locale, elapsed=self.elapsed_days, total=self.total_days)


def completeness(period: pd.Period, as_of: datetime) -> Completeness | None:
    """How much of ``period`` had elapsed at ``as_of``; ``None`` when the period was complete."""
    begin, finish = start(period), end(period)
    if as_of >= finish:
        return None
    elapsed = max(0, (as_of - begin) // timedelta(days=1))
    return Completeness(elapsed_days=elapsed, total_days=(finish - begin).days)


def label(period: pd.Period, frequency: Frequency, locale: str) -> str:
    """A short label for an axis or a table, in the report's locale."""
    first = start(period).date()
    if frequency is Frequency.day:
        return str(format_date(first, "d MMM y", locale=_babel(locale)))
    if frequency is Frequency.week:
        year, week, _ = first.isocalendar()
        return f"{year}-W{week:02d}"
    if frequency is Frequency.month:
        return str(format_date(first, "MMM y", locale=_babel(locale)))
    if frequency is Frequency.quarter:
        return f"Q{period.quarter} {period.year}"
    return str(period.year)


def labels(index: pd.PeriodIndex, frequency: Frequency, locale: str) -> list[str]:
    """The :func:`label` of every period of ``index``, built column-wise.

    A time axis can hold a million days; formatting each through babel costs about 25 µs, so the
    month names are looked up once and the labels joined from the periods' fields. They are the
    patterns of :func:`label`: ``d MMM y`` and ``MMM y`` with the locale's abbreviated month names
    in the format context, ASCII digits, the day and the year unpadded.
    """
    if len(index) == 0:
        return []
    if frequency is Frequency.week:
        iso = index.start_time.isocalendar()
        return [
            f"{year}-W{week:02d}"
            for year, week in zip(iso["year"].tolist(), iso["week"].tolist(), strict=True)
        ]
    if frequency is Frequency.year:
        return [str(year) for year in index.year.tolist()]
    if frequency is Frequency.quarter:
        return [
            f"Q{quarter} {year}"
            for quarter, year in zip(index.quarter.tolist(), index.year.tolist(), strict=True)
        ]
    names = get_month_names("abbreviated", context="format", locale=_babel(locale))
    if frequency is Frequency.month:
        return [
            f"{names[m]} {year}"
            for m, year in zip(index.month.tolist(), index.year.tolist(), strict=True)
        ]
    # A daily period's ordinal counts days from 1970-01-01: numpy splits it into months and days.
    day = index.asi8.astype("datetime64[D]")
    month = day.astype("datetime64[M]")
    of_month = ((day - month.astype("datetime64[D]")).astype(np.int64) + 1).tolist()
    since = month.astype(np.int64)  # months from 1970-01
    first = int(since.min())
    tails = [f" {names[m % 12 + 1]} {m // 12 + 1970}" for m in range(first, int(since.max()) + 1)]
    digits = [str(d) for d in range(32)]
    return [digits[d] + tails[m] for d, m in zip(of_month, (since - first).tolist(), strict=True)]


def _babel(locale: str) -> str:
    return locale.replace("-", "_")
