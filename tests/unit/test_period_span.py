"""A time series may span at most ``max_periods`` periods from its first row to its last.

Two rows dated 0001-01-01 and 9999-12-30 at frequency ``day`` (772 bytes; such dates are now
refused on their own as out of range) span 3.65 million days: every check and chart works period
by period, so such a definition once held a process for minutes and gigabytes. The span is
counted from the two ends, before anything per period is built.
"""

from __future__ import annotations

import time

from factories import find, intake, make_daily, problems_of, run_checks

from service.config import Limits


def test_ten_thousand_years_of_days_are_refused_at_once() -> None:
    started = time.monotonic()
    problems = problems_of(make_daily("0001-01-01", "9999-12-30"))
    assert time.monotonic() - started < 5
    assert {(p.code, p.path) for p in problems} >= {
        ("date_out_of_range", "report.period.start"),
        ("date_out_of_range", "report.as_of"),
    }


def test_six_centuries_of_days_past_the_cap_are_refused_at_once_naming_the_dataset_and_setting() -> (
    None
):
    started = time.monotonic()
    problems = problems_of(make_daily("1678-01-01", "2261-12-30"), Limits(max_rows=50_000))
    assert time.monotonic() - started < 5
    problem = find(problems, "limit_exceeded")
    assert problem.path == "datasets[0]"
    assert problem.value == 213_300  # days from 1678-01-01 to 2261-12-30, both included (datetime)
    assert "'readings'" in problem.message
    assert "1678-01-01" in problem.message
    assert "2261-12-30" in problem.message
    assert "PLUMBLINE_LIMITS__MAX_PERIODS" in problem.hint
    assert problem.context == {"limit": 100_000, "setting": "max_periods"}


def test_the_default_follows_max_rows_and_a_setting_overrides_it() -> None:
    assert Limits().periods_limit == 2 * Limits().max_rows
    assert Limits(max_rows=2_000_000).periods_limit == 4_000_000
    assert Limits(max_periods=10).periods_limit == 10
    days = ("2026-01-01", "2026-01-11")  # eleven days
    assert run_checks(make_daily(*days)).results
    problem = find(problems_of(make_daily(*days), Limits(max_periods=10)), "limit_exceeded")
    assert problem.value == 11
    assert problem.context == {"limit": 10, "setting": "max_periods"}


def test_a_span_of_exactly_the_limit_is_taken() -> None:
    taken = intake(make_daily("2026-01-01", "2026-01-10"), Limits(max_periods=10))
    assert len(taken.tables["readings"].frame) == 2
