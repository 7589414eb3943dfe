"""A chart's key lists exactly the kinds of mark it draws, in the report's words."""

from __future__ import annotations

from typing import Any

import pytest
from factories import (
    Json,
    make_column,
    make_dataset,
    make_definition,
    make_monthly,
    make_trend_chart,
    only_chart,
    run_checks,
)

from service.render import charts, key, layout
from service.wording import say
from tests.quality.kinds import kinds_in_plan

MONTHS = ["2026-06-01", "2026-07-01", "2026-08-01", "2026-09-01", "2026-10-01", "2026-11-01"]


def _trend(values: list[float | None], column: Json | None = None, **chart: Any) -> Json:
    dataset = make_monthly(MONTHS[: len(values)], values)
    if column:
        dataset["columns"][1].update(column)
    return make_definition(datasets=[dataset], charts=[make_trend_chart(**chart)])


def _targets() -> Json:
    dataset = make_dataset(
        name="budget",
        columns=[
            make_column("depot", "text"),
            make_column("spend", "number", "GBP"),
            make_column("plan", "number", "GBP"),
        ],
        rows=[
            {"depot": "North", "spend": 12000.0, "plan": 10800.0},
            {"depot": "South", "spend": 9700.0, "plan": 10000.0},
        ],
    )
    for drop in ("time_column", "frequency"):
        dataset.pop(drop)
    chart = {
        "id": "spend",
        "intent": "target",
        "title": "Spend against plan",
        "dataset": "budget",
        "category": "depot",
        "actual": "spend",
        "target": "plan",
    }
    return make_definition(datasets=[dataset], charts=[chart])


GENERATED = {
    "complete months": _trend([50.0, 52.0, 51.0, 55.0, 57.0]),
    "partial month": _trend([50.0, 52.0, 51.0, 55.0, 57.0, 16.0]),
    "partial month, projected": _trend(
        [50.0, 52.0, 51.0, 55.0, 57.0, 16.0],
        {"projectable": True},
        projection={"method": "run_rate"},
    ),
    "estimates": _trend([50.0, 52.0, 51.0, 55.0, 57.0, 16.0], {"estimate": True}),
    "a missing month": _trend([50.0, 52.0, None, 55.0, 57.0, 16.0]),
    "targets": _targets(),
}


@pytest.mark.parametrize("name", list(GENERATED))
def test_the_key_lists_exactly_the_mark_kinds_drawn(name: str) -> None:
    plan = only_chart(run_checks(GENERATED[name])).plan
    figure = charts.figure_for(plan)
    report = layout.mend(figure, locale=plan.locale)
    expected = kinds_in_plan(plan)
    assert set(key.drawn_kinds(figure)) == expected
    assert set(report.key_kinds) == expected
    assert key.entries(figure) == [say(f"key.{k}", plan.locale) for k in key.KINDS if k in expected]


def test_the_key_speaks_the_report_language() -> None:
    definition = GENERATED["partial month, projected"]
    definition["report"]["locale"] = "de-DE"
    plan = only_chart(run_checks(definition)).plan
    figure = charts.figure_for(plan)
    assert key.entries(figure) == [
        "Istwert bisher, Zeitraum nicht abgeschlossen",
        "Hochrechnung für den ganzen Zeitraum",
    ]


def test_a_chart_that_draws_only_plain_marks_has_no_key() -> None:
    plan = only_chart(run_checks(GENERATED["complete months"])).plan
    assert key.entries(charts.figure_for(plan)) == []
