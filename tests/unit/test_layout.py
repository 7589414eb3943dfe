"""Label layout is measured on the drawn chart: overlapping tick labels, text cut off at the edge."""

from __future__ import annotations

from factories import make_definition, make_monthly, make_trend_chart, run_checks

from service.checks import layout as layout_check
from service.checks.results import Status
from service.definition.model import Waiver
from service.intents.plan import ChartPlan
from service.render import charts, layout

MONTHS = [f"2026-{m:02d}-01" for m in range(1, 11)]


def _trend_plan(**chart: object) -> ChartPlan:
    values: list[float | None] = [float(40 + i) for i in range(len(MONTHS))]
    definition = make_definition(
        datasets=[make_monthly(MONTHS, values)], charts=[make_trend_chart(**chart)]
    )
    return run_checks(definition).charts[0].plan


def test_a_plain_chart_has_room_for_every_label() -> None:
    report = layout.mend(charts.figure_for(_trend_plan()))
    assert (report.overlaps_before, report.clipped_before) == (0, 0)
    assert report.clean
    assert not report.actions


def test_colliding_time_labels_are_thinned_and_recorded() -> None:
    plan = _trend_plan()
    long = [f"{label} (week-ending figures, provisional)" for label in plan.periods]
    report = layout.mend(charts.figure_for(plan.model_copy(update={"periods": long})))
    assert report.overlaps_before > 0
    assert report.actions  # something was done about it
    result = layout_check.result(plan, report, [])
    assert result.status in {Status.corrected, Status.failed}
    assert result.measured_text.startswith(f"{report.overlaps_before} overlaps")
    if result.status is Status.corrected:
        assert result.corrected_to == "0 overlaps, 0 cut off"


def test_text_cut_off_at_the_edge_fails_and_can_be_waived() -> None:
    plan = _trend_plan()
    figure = charts.figure_for(plan)
    # A drawer that placed text beyond the right edge: thinning tick labels cannot mend it.
    figure.text(0.98, 0.5, "a label placed past the edge", parse_math=False)
    report = layout.mend(figure)
    assert report.clipped > 0
    assert layout_check.result(plan, report, []).status is Status.failed
    waiver = Waiver(
        check="label-layout",
        chart=plan.chart_id,
        by="A. Reviewer",
        reason="The label is the statutory title of the measure and must appear in full.",
    )
    waived = layout_check.result(plan, report, [waiver])
    assert waived.status is Status.waived
    assert waived.waiver is not None
    assert waived.waiver.by == "A. Reviewer"


def test_long_notes_and_category_labels_wrap_instead_of_running_off() -> None:
    plan = _trend_plan()
    noted = plan.model_copy(update={"notes": ["A note that runs on and on " * 12]})
    report = layout.mend(charts.figure_for(noted))
    assert report.clean
