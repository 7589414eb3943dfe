"""A time series may span at most ``max_periods`` periods from its first row to its last.

Two rows dated 0001-01-01 and 9999-12-30 at frequency ``day`` are 772 bytes, yet span 3.65 million
days: every check and chart works period by period, so such a definition once held a process for
minutes and gigabytes. The span is counted from the two ends, before anything per period is built.
"""

from __future__ import annotations

import time
from typing import Any

from factories import (
    find,
    intake,
    make_column,
    make_dataset,
    make_definition,
    make_report,
    make_trend_chart,
    problems_of,
    run_checks,
)

from service.config import Limits

Json = dict[str, Any]


def daily(*days: str) -> Json:
    """A daily series with one reading on each of ``days``, as of noon of the last one."""
    dataset = make_dataset(
        name="readings",
        columns=[make_column("day", "date"), make_column("level", "number", "m")],
        time_column="day",
        frequency="day",
        rows=[{"day": d, "level": float(n)} for n, d in enumerate(days)],
    )
    report = make_report(
        period={"start": days[0], "end": days[-1]}, as_of=f"{days[-1]}T12:00:00+00:00"
    )
    chart = make_trend_chart(dataset="readings", measures=["level"])
    return make_definition(datasets=[dataset], charts=[chart], report=report)


def test_ten_thousand_years_of_days_are_refused_at_once_naming_the_dataset_and_setting() -> None:
    started = time.monotonic()
    problem = find(problems_of(daily("0001-01-01", "9999-12-30")), "limit_exceeded")
    assert time.monotonic() - started < 5
    assert problem.path == "datasets[0]"
    assert problem.value == 3_652_058
    assert "'readings'" in problem.message
    assert "0001-01-01" in problem.message
    assert "9999-12-30" in problem.message
    assert "PLUMBLINE_LIMITS__MAX_PERIODS" in problem.hint
    assert problem.context == {"limit": 400_000, "setting": "max_periods"}


def test_the_default_follows_max_rows_and_a_setting_overrides_it() -> None:
    assert Limits().periods_limit == 2 * Limits().max_rows
    assert Limits(max_rows=2_000_000).periods_limit == 4_000_000
    assert Limits(max_periods=10).periods_limit == 10
    days = ("2026-01-01", "2026-01-11")  # eleven days
    assert run_checks(daily(*days)).results
    problem = find(problems_of(daily(*days), Limits(max_periods=10)), "limit_exceeded")
    assert problem.value == 11
    assert problem.context == {"limit": 10, "setting": "max_periods"}


def test_a_span_of_exactly_the_limit_is_taken() -> None:
    taken = intake(daily("2026-01-01", "2026-01-10"), Limits(max_periods=10))
    assert len(taken.tables["readings"].frame) == 2
