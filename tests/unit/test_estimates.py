"""Estimates and projections look different from actuals and are never joined to them."""

from __future__ import annotations

from typing import Any

from factories import (
    context_for,
    find,
    intake,
    make_definition,
    make_monthly,
    make_trend_chart,
    problems_of,
    result_of,
    run_checks,
)

from service.checks import estimates
from service.checks.results import Status
from service.render import charts

MONTHS = ["2026-07-01", "2026-08-01", "2026-09-01", "2026-10-01", "2026-11-01"]


def _projected(**chart: Any) -> dict[str, Any]:
    dataset = make_monthly(MONTHS, [50.0, 51.0, 52.0, 53.0, 16.0])
    dataset["columns"][1]["projectable"] = True
    return make_definition(
        datasets=[dataset], charts=[make_trend_chart(projection={"method": "run_rate"}, **chart)]
    )


def test_run_rate_projection_is_a_separate_dashed_estimate() -> None:
    checked = run_checks(_projected())
    plan = checked.charts[0].plan
    actual, estimate = plan.series
    # as_of 2026-11-09T07:30: 8 of 30 days elapsed, so the run rate is 16 / (8/30) = 60.
    assert estimate.estimate
    assert estimate.values[-1] == 16.0 / (8 / 30)
    assert estimate.segments == [(4, 4)]  # one point: never joined to the actual line
    assert actual.values[-1] == 16.0  # the actual value is kept as it is
    assert not actual.estimate
    assert result_of(checked, "estimates-distinct").status is Status.passed
    assert any(note.startswith("Estimates, not actuals") for note in plan.notes)


def test_projection_needs_a_projectable_column() -> None:
    dataset = make_monthly(MONTHS, [50.0, 51.0, 52.0, 53.0, 16.0])
    definition = make_definition(
        datasets=[dataset], charts=[make_trend_chart(projection={"method": "run_rate"})]
    )
    problem = find(problems_of(definition), "not_projectable")
    assert problem.path == "sections[0].charts[0].measures[0]"


def test_declared_estimate_column_is_drawn_dashed() -> None:
    dataset = make_monthly(MONTHS[:4], [50.0, 51.0, 52.0, 53.0])
    dataset["columns"][1]["estimate"] = True
    checked = run_checks(make_definition(datasets=[dataset]))
    plan = checked.charts[0].plan
    assert plan.series[0].estimate
    figure = charts.figure_for(plan)
    dashed = [line for line in figure.axes[0].get_lines() if line.get_linestyle() == "--"]
    assert dashed, "the estimate line is not dashed"


def test_unmarked_estimate_is_corrected_and_listed() -> None:
    definition = _projected()
    taken = intake(definition)
    plan = run_checks(definition).charts[0].plan
    broken = plan.model_copy(
        update={
            "series": [s.model_copy(update={"estimate": False}) for s in plan.series],
            "notes": [],
        }
    )
    ctx = context_for(taken)
    assert not estimates.SPEC.measure(broken, ctx).ok
    assert estimates.SPEC.correct is not None
    mended = estimates.SPEC.correct(broken, ctx)
    assert estimates.SPEC.measure(mended, ctx).ok
    assert [s.estimate for s in mended.series] == [False, True]


def test_estimates_cannot_be_waived() -> None:
    definition = _projected()
    definition["waivers"] = [
        {
            "check": "estimates-distinct",
            "chart": "boardings-trend",
            "by": "A. Reviewer",
            "reason": "We would like the estimate to look like an actual.",
        }
    ]
    assert find(problems_of(definition), "not_waivable").path == "waivers[0].check"
