"""Typed builders of report-definition dicts for tests, and shortcuts through the pipeline.

Every builder returns a fresh plain dict (JSON-ready) with small, valid defaults; keyword overrides
replace top-level keys. ``make_definition`` assembles a whole definition around them.
"""

from __future__ import annotations

import json
from collections.abc import Callable
from typing import Any

import httpx
import pytest

from service import intents, pipeline
from service.checks import engine
from service.checks.outcome import Checked, CheckedChart
from service.checks.registry import Context
from service.checks.results import CheckResult, Status
from service.config import Limits
from service.definition.model import local_wall_time
from service.errors import InvalidDefinition, Problem
from service.intents.plan import ChartPlan

Json = dict[str, Any]

AS_OF = "2026-11-09T07:30:00+00:00"
"""The demo's as_of: 9 November 2026, so November is 8 of 30 days old."""

MONTHS = ["2026-06-01", "2026-07-01", "2026-08-01", "2026-09-01", "2026-10-01"]
BOARDINGS = [53270, 50860, 52010, 55730, 57120]


def make_column(name: str, type: str = "integer", unit: str | None = None) -> Json:
    column: Json = {"name": name, "type": type}
    if unit is not None:
        column["unit"] = unit
    return column


def make_dataset(**overrides: Any) -> Json:
    """A monthly dataset 'ridership' (month, boardings) with five complete months."""
    dataset: Json = {
        "name": "ridership",
        "columns": [make_column("month", "date"), make_column("boardings", "integer", "boardings")],
        "time_column": "month",
        "frequency": "month",
        "rows": [{"month": m, "boardings": b} for m, b in zip(MONTHS, BOARDINGS, strict=True)],
    }
    dataset.update(overrides)
    return dataset


def make_monthly(months: list[str], values: list[float | None], **overrides: Any) -> Json:
    """A 'ridership' dataset with one boardings value per given month (None: a null cell)."""
    rows = [{"month": m, "boardings": v} for m, v in zip(months, values, strict=True)]
    return make_dataset(rows=rows, **overrides)


def make_daily(*days: str) -> Json:
    """A definition of one daily series 'readings' (day, level) with a reading on each of
    ``days``, as of noon of the last one, drawn as a trend."""
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


def make_category_dataset(values: dict[str, float | None], **overrides: Any) -> Json:
    """A dataset 'punctuality' of routes (text) and on_time (number, '%')."""
    dataset: Json = {
        "name": "punctuality",
        "columns": [make_column("route", "text"), make_column("on_time", "number", "%")],
        "rows": [{"route": k, "on_time": v} for k, v in values.items()],
    }
    dataset.update(overrides)
    return dataset


def make_trend_chart(**overrides: Any) -> Json:
    chart: Json = {
        "id": "boardings-trend",
        "intent": "trend",
        "title": "Passenger boardings by month",
        "dataset": "ridership",
        "measures": ["boardings"],
        "from_zero": True,
    }
    chart.update(overrides)
    return chart


def make_compare_chart(**overrides: Any) -> Json:
    chart: Json = {
        "id": "on-time",
        "intent": "compare",
        "title": "Departures on time by route",
        "dataset": "punctuality",
        "category": "route",
        "measure": "on_time",
    }
    chart.update(overrides)
    return chart


def make_waiver(check: str, chart: str, **overrides: Any) -> Json:
    waiver: Json = {
        "check": check,
        "chart": chart,
        "reason": "The board asked to see the small differences between routes on this chart.",
        "by": "Head of operations",
    }
    waiver.update(overrides)
    return waiver


def make_report(**overrides: Any) -> Json:
    report: Json = {
        "id": "test-pack",
        "title": "Test pack",
        "period": {"start": "2026-06-01", "end": "2026-11-30"},
        "as_of": AS_OF,
        "owner": "Test desk",
        "locale": "en-GB",
    }
    report.update(overrides)
    return report


def make_definition(
    *,
    datasets: list[Json] | None = None,
    charts: list[Json] | None = None,
    waivers: list[Json] | None = None,
    report: Json | None = None,
    **overrides: Any,
) -> Json:
    """A valid definition: one section holding ``charts`` (default: one monthly trend)."""
    definition: Json = {
        "version": 1,
        "report": report if report is not None else make_report(),
        "datasets": datasets if datasets is not None else [make_dataset()],
        "sections": [
            {
                "heading": "Ridership",
                "charts": charts if charts is not None else [make_trend_chart()],
            }
        ],
        "waivers": waivers or [],
    }
    definition.update(overrides)
    return definition


def make_compare_definition(
    values: dict[str, float | None], *, waivers: list[Json] | None = None, **chart: Any
) -> Json:
    return make_definition(
        datasets=[make_category_dataset(values)],
        charts=[make_compare_chart(**chart)],
        waivers=waivers,
    )


def encode(definition: Json) -> bytes:
    return json.dumps(definition).encode()


def intake(definition: Json, limits: Limits | None = None) -> pipeline.Intake:
    return pipeline.intake(encode(definition), limits or Limits())


def run_checks(definition: Json) -> Checked:
    return pipeline.check(intake(definition))


def only_chart(checked: Checked) -> CheckedChart:
    assert len(checked.charts) == 1
    return checked.charts[0]


def result_of(checked: Checked, check: str) -> CheckResult:
    found = [r for r in checked.results if r.check == check]
    assert len(found) == 1, f"expected one '{check}' result, got {len(found)}"
    return found[0]


def context_for(taken: pipeline.Intake, index: int = 0) -> Context:
    """The check context of the ``index``-th chart, as the pipeline builds it."""
    definition = taken.definition
    _, chart = definition.charts()[index]
    return Context(
        chart=chart,
        table=taken.tables[chart.dataset],
        as_of=local_wall_time(definition.report.as_of),
        locale=definition.report.locale,
        tables=taken.tables,
    )


def guarded(definition: Json, plan: ChartPlan) -> engine.Guarded:
    taken = intake(definition)
    return engine.guard(plan, context_for(taken), taken.definition.waivers)


def status_of(guard: engine.Guarded, check: str) -> Status:
    return next(r.status for r in guard.results if r.check == check)


def plan_of(definition: Json) -> ChartPlan:
    """The plan the encoder makes, before any check runs."""
    taken = intake(definition)
    _, chart = taken.definition.charts()[0]
    ctx = context_for(taken)
    env = intents.Env(locale=ctx.locale, as_of=ctx.as_of)
    return intents.ENCODERS[chart.intent].encode(chart, ctx.table, env)


def problems_of(definition: Json | bytes, limits: Limits | None = None) -> list[Problem]:
    """Every problem ``pipeline.intake`` reports (it runs ``validate.parse`` first)."""
    raw = definition if isinstance(definition, bytes) else encode(definition)
    with pytest.raises(InvalidDefinition) as caught:
        pipeline.intake(raw, limits or Limits())
    assert caught.value.status == 422
    return caught.value.problems


def codes(problems: list[Problem]) -> list[tuple[str, str]]:
    return [(p.code, p.path) for p in problems]


def find(problems: list[Problem], code: str) -> Problem:
    found = [p for p in problems if p.code == code]
    assert len(found) == 1, codes(problems)
    return found[0]


Clients = Callable[[str], httpx.Client]
"""The API tests' ``people`` fixture: an HTTP client holding the key of the person named."""
