"""Checks ``series-count`` (too many colour-coded series) and ``no-dual-axis``, through the pipeline
and on deliberately broken plans."""

from __future__ import annotations

import pytest
from factories import (
    Json,
    context_for,
    find,
    intake,
    make_column,
    make_compare_definition,
    make_definition,
    make_waiver,
    only_chart,
    plan_of,
    problems_of,
    result_of,
    run_checks,
)
from pydantic import ValidationError

from service.checks import missing, partial, series
from service.checks.results import Status
from service.intents.plan import ChartPlan, Panel, Scale
from service.render import charts

AREAS = ["north", "south", "east", "west", "centre"]
# Jun to Nov 2026, as_of 9 November: Aug has no row at all, Nov is 8 of 30 days old.
MONTHS = ["2026-06-01", "2026-07-01", "2026-09-01", "2026-10-01", "2026-11-01"]


def areas(names: list[str]) -> Json:
    """Monthly boardings for each named area (one unit), with a missing month and a partial one."""
    rows = [
        {"month": m, **{n: 1000 + 100 * i + 10 * j for i, n in enumerate(names)}}
        for j, m in enumerate(MONTHS)
    ]
    return {
        "name": "ridership",
        "source": "Ticketing system",
        "columns": [
            make_column("month", "date"),
            *(make_column(n, "integer", "boardings") for n in names),
        ],
        "time_column": "month",
        "frequency": "month",
        "rows": rows,
    }


def trend(count: int, *, waivers: list[Json] | None = None, **chart: object) -> Json:
    names = AREAS[:count]
    spec: Json = {
        "id": "by-area",
        "intent": "trend",
        "title": "Boardings by area",
        "dataset": "ridership",
        "measures": names,
    }
    spec.update(chart)
    return make_definition(datasets=[areas(names)], charts=[spec], waivers=waivers)


# --- series-count ----------------------------------------------------------------------------------


def test_four_series_pass() -> None:
    checked = run_checks(trend(4))
    found = result_of(checked, "series-count")
    assert (found.status, found.measured, found.measured_text) == (Status.passed, 4, "4 series")
    assert found.threshold == "at most 4"
    assert only_chart(checked).plan.form == "lines"


def test_five_series_are_split_into_panels_on_one_shared_scale() -> None:
    definition = trend(5)
    before = plan_of(definition)
    checked = run_checks(definition)
    found = result_of(checked, "series-count")
    assert (found.status, found.measured) == (Status.corrected, 5)
    assert found.corrected_to == "split into 5 panels on one shared scale"
    plan = only_chart(checked).plan
    assert plan.form == "panels"
    assert plan.series == []
    assert [p.title for p in plan.panels] == [a.capitalize() for a in AREAS]  # the columns in words
    assert [[s.name for s in p.series] for p in plan.panels] == [[a] for a in AREAS]
    assert {p.value_axis for p in plan.panels} == {before.value_axis}  # one shared scale
    assert series.SHARED_NOTE in plan.notes


def test_five_series_with_a_focus_highlight_it() -> None:
    checked = run_checks(trend(5, focus="east"))
    found = result_of(checked, "series-count")
    assert found.status is Status.corrected
    assert found.corrected_to == "highlighted East, 4 others in grey"
    plan = only_chart(checked).plan
    assert plan.form == "lines"
    assert [s.name for s in plan.series if not s.muted] == ["east"]
    assert [s.name for s in plan.series] == AREAS  # nothing dropped


def test_waived_series_count_keeps_the_plan() -> None:
    waiver = make_waiver(
        "series-count",
        "by-area",
        reason="The operations board compares all five areas on one chart every month.",
    )
    definition = trend(5, waivers=[waiver])
    found = result_of(run_checks(definition), "series-count")
    assert found.status is Status.waived
    assert found.waiver is not None
    assert found.waiver.reason == waiver["reason"]
    plan = only_chart(run_checks(definition)).plan
    before = plan_of(definition)
    assert (plan.form, plan.series, plan.panels) == (before.form, before.series, before.panels)


def test_series_count_fails_on_broken_plans() -> None:
    definition = trend(5)
    ctx = context_for(intake(definition))
    plan = plan_of(definition)
    assert not series.SERIES_COUNT.measure(plan, ctx).ok
    split = series.SERIES_COUNT.correct
    assert split is not None
    panels = split(plan, ctx)
    assert series.SERIES_COUNT.measure(panels, ctx).ok
    # panels on different scales cannot be compared by height: not the correction's promise
    other = Scale(lo=0.0, hi=5000.0, unit="boardings", label="boardings")
    uneven = [panels.panels[0].model_copy(update={"value_axis": other}), *panels.panels[1:]]
    broken = panels.model_copy(update={"panels": uneven})
    finding = series.SERIES_COUNT.measure(broken, ctx)
    assert not finding.ok
    assert finding.shown == "split into 5 panels on different scales"


def test_gap_and_partial_checks_pass_on_the_split_panels() -> None:
    definition = trend(5)
    plan = only_chart(run_checks(definition)).plan
    ctx = context_for(intake(definition))
    assert plan.form == "panels"
    assert [g.index for g in plan.gaps] == [2]
    assert plan.partial is not None
    assert plan.partial.index == 5
    for spec in (missing.SPEC, partial.SPEC):
        assert spec.measure(plan, ctx).ok, spec.id


def test_split_panels_are_drawn_on_one_scale() -> None:
    plan = only_chart(run_checks(trend(5))).plan
    figure = charts.figure_for(plan)
    figure.canvas.draw()
    assert len(figure.axes) == len(plan.panels) == 5
    assert len({ax.get_ylim() for ax in figure.axes}) == 1
    assert len({ax.get_xlim() for ax in figure.axes}) == 1
    boxes = {tuple(round(b, 6) for b in ax.get_position().bounds) for ax in figure.axes}
    assert len(boxes) == 5
    assert charts.draw(plan).startswith(b"%PDF")


# --- no-dual-axis ----------------------------------------------------------------------------------


def spend(**chart: object) -> Json:
    rows = [
        {"month": "2026-01-01", "cost": 200.0, "cases": 40},
        {"month": "2026-02-01", "cost": 250.0, "cases": 44},
    ]
    dataset: Json = {
        "name": "spend",
        "source": "Finance ledger",
        "columns": [
            make_column("month", "date"),
            make_column("cost", "number", "GBP"),
            make_column("cases", "integer", "cases"),
        ],
        "time_column": "month",
        "frequency": "month",
        "rows": rows,
    }
    spec: Json = {
        "id": "cost-and-cases",
        "intent": "relative_change",
        "title": "Cost and cases",
        "dataset": "spend",
        "measures": ["cost", "cases"],
    }
    spec.update(chart)
    return make_definition(datasets=[dataset], charts=[spec])


@pytest.mark.parametrize(
    ("chart", "shown"),
    [
        ({}, "indexed to Jan 2026 = 100"),
        ({"index_as": "percent_change"}, "indexed as % change since Jan 2026"),
        ({"form": "panels"}, "aligned panels, each with its own scale"),
    ],
)
def test_relative_change_records_the_form_drawn_instead(chart: Json, shown: str) -> None:
    found = result_of(run_checks(spend(**chart)), "no-dual-axis")
    assert (found.status, found.measured, found.measured_text) == (Status.passed, 1, shown)
    assert "units differ (cost in GBP, cases in cases)" in found.explanation


@pytest.mark.parametrize(
    ("definition", "shown"),
    [
        (trend(3), "1 value axis"),
        (trend(5), "1 value axis in each of 5 panels"),  # measured after the split
        (make_compare_definition({"a": 1.0, "b": 2.0}), "1 value axis"),
    ],
)
def test_other_forms_have_one_value_axis(definition: Json, shown: str) -> None:
    """A form that cannot draw a second axis cannot fail the check: not applicable, not a pass."""
    found = result_of(run_checks(definition), "no-dual-axis")
    assert (found.status, found.measured_text) == (Status.not_applicable, shown)
    assert "impossible" in found.explanation


def test_no_dual_axis_cannot_be_waived() -> None:
    waiver = make_waiver("no-dual-axis", "cost-and-cases")
    definition = spend()
    definition["waivers"] = [waiver]
    assert find(problems_of(definition), "not_waivable").path == "waivers[0].check"


def test_a_plan_cannot_carry_a_second_value_axis() -> None:
    """The check cannot fail: a plan has no field for a second y-axis, so it cannot be asked for."""
    plan: ChartPlan = plan_of(spend(form="panels"))
    axis = plan.panels[0].value_axis
    with pytest.raises(ValidationError):
        ChartPlan.model_validate({**plan.model_dump(), "secondary_axis": axis.model_dump()})
    with pytest.raises(ValidationError):
        Panel.model_validate({**plan.panels[0].model_dump(), "right_axis": axis.model_dump()})
    assert not series.NO_DUAL_AXIS.waivable
    assert series.NO_DUAL_AXIS.correct is None
