"""Value problems in the data itself: rows, CSV cells, periods and row limits, each with a path."""

from __future__ import annotations

from datetime import timedelta
from typing import Any

import pytest
from factories import (
    MONTHS,
    codes,
    intake,
    make_dataset,
    make_definition,
    make_monthly,
    make_report,
    problems_of,
)

from service.config import Limits


def test_duplicate_period_in_a_monthly_dataset() -> None:
    dataset = make_monthly(["2026-06-01", "2026-07-01", "2026-07-15"], [1, 2, 3])
    problems = problems_of(make_definition(datasets=[dataset]))
    assert codes(problems) == [("duplicate_period", "datasets[0].rows[2].month")]


def test_unparseable_values_in_records() -> None:
    dataset = make_monthly(MONTHS, [1, 2, 3, "12,5", "n/a"])
    problems = problems_of(make_definition(datasets=[dataset]))
    assert codes(problems) == [
        ("unparseable_value", "datasets[0].rows[3].boardings"),
        ("unparseable_value", "datasets[0].rows[4].boardings"),
    ]
    assert [p.value for p in problems] == ["12,5", "n/a"]


def test_unparseable_values_in_csv_name_the_line() -> None:
    csv = "month,boardings\n2026-06-01,5\n2026-07-01,abc\n2026-13-01,7\n"
    problems = problems_of(make_definition(datasets=[make_dataset(rows=None, csv=csv)]))
    assert codes(problems) == [
        ("unparseable_value", "datasets[0].csv"),
        ("unparseable_value", "datasets[0].csv"),
    ]
    by_column = {p.context["column"]: p for p in problems}
    assert by_column["boardings"].context["line"] == 3  # header is line 1
    assert by_column["boardings"].value == "abc"
    assert by_column["month"].context["line"] == 4


@pytest.mark.parametrize("bad", ["NaN", "nan", True, False, float("inf"), "Infinity"])
def test_nan_inf_and_bool_are_not_numbers(bad: Any) -> None:
    dataset = make_monthly(MONTHS, [1, bad, 3, 4, 5])
    problems = problems_of(make_definition(datasets=[dataset]))
    assert codes(problems) == [("unparseable_value", "datasets[0].rows[1].boardings")]


def test_csv_nan_and_true_are_not_numbers() -> None:
    csv = "month,boardings\n2026-06-01,5\n2026-07-01,NaN\n2026-08-01,true\n"
    problems = problems_of(make_definition(datasets=[make_dataset(rows=None, csv=csv)]))
    assert [(p.code, p.context["line"]) for p in problems] == [
        ("unparseable_value", 3),
        ("unparseable_value", 4),
    ]


def test_row_limit_for_records_and_csv() -> None:
    months = [*MONTHS, "2026-11-01"]
    csv = "month,boardings\n" + "".join(f"{m},1\n" for m in months)
    definition = make_definition(
        datasets=[make_monthly(months, [1] * 6), make_dataset(name="copy", rows=None, csv=csv)]
    )
    problems = problems_of(definition, Limits(max_rows=5))
    assert codes(problems) == [
        ("limit_exceeded", "datasets[0].rows"),
        ("limit_exceeded", "datasets[1].csv"),
    ]
    assert problems[0].value == 6
    assert problems[0].context == {"limit": 5, "setting": "max_rows"}


def test_period_after_as_of() -> None:
    dataset = make_monthly([*MONTHS, "2026-11-01", "2026-12-01"], [1] * 7)
    problems = problems_of(make_definition(datasets=[dataset]))
    assert codes(problems) == [("period_after_as_of", "datasets[0].rows[6].month")]


def test_as_of_is_read_on_the_senders_clock() -> None:
    # 00:30 on 9 November at +01:00 is 9 November for the sender: a row for that day is allowed.
    day = [make_monthly(["2026-11-09"], [1], frequency="day")]
    early = make_definition(report=make_report(as_of="2026-11-09T00:30:00+01:00"), datasets=day)
    assert intake(early).definition.report.as_of.utcoffset() == timedelta(hours=1)
    late = make_definition(report=make_report(as_of="2026-11-08T23:30:00+00:00"), datasets=day)
    assert codes(problems_of(late)) == [("period_after_as_of", "datasets[0].rows[0].month")]
