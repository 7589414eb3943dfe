"""Calendar periods, checked against the Python standard library calendar/datetime as reference."""

from __future__ import annotations

import calendar
from datetime import date, datetime, timedelta

import pandas as pd
import pytest

from service.data import periods
from service.definition.model import Frequency


def period(value: str, frequency: Frequency) -> pd.Period:
    return pd.Period(value, freq=periods.pandas_freq(frequency))


def test_days_of_every_month_1999_to_2030() -> None:
    for year in range(1999, 2031):
        for month in range(1, 13):
            got = periods.days(period(f"{year}-{month:02d}", Frequency.month))
            # Python standard library calendar/datetime as reference.
            assert got == calendar.monthrange(year, month)[1], (year, month)


@pytest.mark.parametrize(
    ("year", "leap"), [(2000, True), (1900, False), (2024, True), (2100, False)]
)
def test_leap_years(year: int, leap: bool) -> None:
    # Python standard library calendar/datetime as reference (Gregorian rule: 2000 leap, 1900 not).
    assert calendar.isleap(year) is leap
    assert periods.days(period(f"{year}-02", Frequency.month)) == (29 if leap else 28)
    assert periods.days(period(str(year), Frequency.year)) == (
        366 if calendar.isleap(year) else 365
    )


def test_start_and_end_bound_the_period() -> None:
    november = period("2026-11", Frequency.month)
    assert periods.start(november) == datetime(2026, 11, 1)
    assert periods.end(november) == datetime(2026, 12, 1)
    december = period("2026-12", Frequency.month)
    assert periods.end(december) == datetime(2027, 1, 1)


def test_iso_weeks_of_every_day_2019_12_20_to_2027_01_10() -> None:
    days = pd.date_range("2019-12-20", "2027-01-10", freq="D")
    found = periods.to_periods(pd.Series(days), Frequency.week)
    assert len(found) == len(days)
    for day, week in zip(days, found, strict=True):
        d = day.date()
        # Python standard library calendar/datetime as reference: ISO 8601 year, week, weekday.
        iso_year, iso_week, iso_day = d.isocalendar()
        monday = d - timedelta(days=iso_day - 1)
        assert periods.start(week).date() == monday, d
        assert periods.start(week).date() == date.fromisocalendar(iso_year, iso_week, 1), d
        assert periods.days(week) == 7
        assert periods.label(week, Frequency.week, "en-GB") == f"{iso_year}-W{iso_week:02d}", d


def test_iso_week_53_and_year_boundaries() -> None:
    # Python standard library calendar/datetime as reference: 2020-12-31 is in 2020-W53 and
    # 2021-01-03 (a Sunday) still in 2020-W53; 2024-12-30 (a Monday) is in 2025-W01.
    times = pd.Series(pd.to_datetime(["2020-12-31", "2021-01-03", "2021-01-04", "2024-12-30"]))
    labels = [
        periods.label(p, Frequency.week, "en-GB") for p in periods.to_periods(times, Frequency.week)
    ]
    assert labels == ["2020-W53", "2020-W53", "2021-W01", "2025-W01"]
    assert [date(2021, 1, 3).isocalendar()[:2], date(2024, 12, 30).isocalendar()[:2]] == [
        (2020, 53),
        (2025, 1),
    ]


def test_quarter_days() -> None:
    for year in (2023, 2024, 2100):
        for quarter in range(1, 5):
            months = range(3 * quarter - 2, 3 * quarter + 1)
            # Python standard library calendar/datetime as reference.
            expected = sum(calendar.monthrange(year, m)[1] for m in months)
            assert periods.days(period(f"{year}Q{quarter}", Frequency.quarter)) == expected
    assert periods.days(period("2024Q1", Frequency.quarter)) == 91
    assert periods.days(period("2023Q1", Frequency.quarter)) == 90


def test_to_periods_of_months_and_quarters() -> None:
    times = pd.Series(pd.to_datetime(["2026-01-31 23:59", "2026-02-01 00:00", "2026-12-31 12:00"]))
    months = periods.to_periods(times, Frequency.month)
    assert [str(p) for p in months] == ["2026-01", "2026-02", "2026-12"]
    quarters = periods.to_periods(times, Frequency.quarter)
    assert [periods.label(q, Frequency.quarter, "en-GB") for q in quarters] == [
        "Q1 2026",
        "Q1 2026",
        "Q4 2026",
    ]


def test_completeness_part_way_through_november() -> None:
    done = periods.completeness(period("2026-11", Frequency.month), datetime(2026, 11, 9, 7, 30))
    assert done is not None
    assert (done.elapsed_days, done.total_days) == (8, 30)
    assert done.text() == "8 of 30 days"
    assert done.fraction == pytest.approx(8 / 30)


def test_completeness_counts_whole_days_only() -> None:
    november = period("2026-11", Frequency.month)
    just_before = periods.completeness(november, datetime(2026, 11, 30, 23, 59))
    assert just_before is not None
    assert just_before.text() == "29 of 30 days"
    first_instant = periods.completeness(november, datetime(2026, 11, 1))
    assert first_instant is not None
    assert first_instant.elapsed_days == 0


def test_completeness_single_day_uses_singular() -> None:
    day = period("2026-11-09", Frequency.day)
    done = periods.completeness(day, datetime(2026, 11, 9, 12))
    assert done is not None
    assert done.text() == "0 of 1 day"


@pytest.mark.parametrize("as_of", [datetime(2026, 12, 1), datetime(2027, 3, 5, 10)])
def test_completeness_at_or_after_the_end_is_complete(as_of: datetime) -> None:
    assert periods.completeness(period("2026-11", Frequency.month), as_of) is None


def test_missing_finds_absent_months_between_first_and_last() -> None:
    present = pd.PeriodIndex(
        [
            period(m, Frequency.month)
            for m in ["2025-12", "2026-01", "2026-04", "2026-02", "2026-07"]
        ]
    )
    assert [str(p) for p in periods.missing(present)] == ["2026-03", "2026-05", "2026-06"]


def test_missing_is_empty_for_a_complete_run_and_for_nothing() -> None:
    run = pd.period_range("2026-01", "2026-06", freq="M")
    assert periods.missing(run) == []
    assert periods.missing(pd.PeriodIndex([], freq="M")) == []


def test_expected_spans_inclusive() -> None:
    full = periods.expected(period("2025-11", Frequency.month), period("2026-02", Frequency.month))
    assert [str(p) for p in full] == ["2025-11", "2025-12", "2026-01", "2026-02"]
