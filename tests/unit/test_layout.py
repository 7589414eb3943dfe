"""Label layout is measured on the drawn chart: overlapping tick labels, text cut off at the edge."""

from __future__ import annotations

from datetime import date

from factories import (
    make_category_dataset,
    make_definition,
    make_monthly,
    make_trend_chart,
    make_waiver,
    run_checks,
)

from service.checks import engine
from service.checks.results import Status
from service.definition.model import Waiver
from service.intents.plan import ChartPlan
from service.render import charts, layout
from service.render.measured import LayoutReport

MONTHS = [f"2026-{m:02d}-01" for m in range(1, 11)]
TODAY = date(2026, 11, 9)


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
    long = [f"{label} (provisional figures)" for label in plan.periods]
    report = layout.mend(charts.figure_for(plan.model_copy(update={"periods": long})))
    assert report.overlaps_before > 0
    assert report.actions == ["showed every other label on the horizontal axis"]
    result = engine.finish_chart(plan, report, [], TODAY)
    assert result.status is Status.corrected
    assert (
        result.measured_text == f"{report.overlaps_before} overlaps, 0 cut off, 0 texts over data"
    )
    assert result.corrected_to == "0 overlaps, 0 cut off, 0 texts over data"


def test_text_cut_off_at_the_edge_fails_and_can_be_waived() -> None:
    plan = _trend_plan()
    figure = charts.figure_for(plan)
    # A drawer that placed text beyond the right edge: thinning tick labels cannot mend it.
    figure.text(0.98, 0.5, "a label placed past the edge", parse_math=False)
    report = layout.mend(figure)
    assert report.clipped > 0
    assert engine.finish_chart(plan, report, [], TODAY).status is Status.failed
    waiver = Waiver(
        check="label-layout",
        chart=plan.chart_id,
        by="A. Reviewer",
        reason="The label is the statutory title of the measure and must appear in full.",
    )
    waived = engine.finish_chart(plan, report, [waiver], TODAY)
    assert waived.status is Status.waived
    assert waived.waiver is not None
    assert waived.waiver.by == "A. Reviewer"


def test_long_notes_and_category_labels_wrap_instead_of_running_off() -> None:
    plan = _trend_plan()
    noted = plan.model_copy(update={"notes": ["A note that runs on and on " * 12]})
    report = layout.mend(charts.figure_for(noted))
    assert report.clean


def test_an_expired_waiver_does_not_hide_a_layout_failure() -> None:
    plan = _trend_plan()
    figure = charts.figure_for(plan)
    figure.text(0.98, 0.5, "a label placed past the edge", parse_math=False)
    report = layout.mend(figure)
    waiver = Waiver(
        check="label-layout",
        chart=plan.chart_id,
        by="A. Reviewer",
        reason="Accepted for the September pack only, while the feed was renamed.",
        expires=date(2026, 10, 31),
    )
    result = engine.finish_chart(plan, report, [waiver], TODAY)
    assert result.status is Status.failed
    assert "expired on 2026-10-31" in result.explanation


def test_a_pie_draws_no_axis_labels_to_collide() -> None:
    definition = make_definition(
        datasets=[make_category_dataset({"Buses": 50.0, "Trams": 30.0, "Ferries": 20.0})],
        charts=[
            {
                "id": "modes",
                "intent": "share",
                "title": "Journeys by mode",
                "dataset": "punctuality",
                "category": "route",
                "measure": "on_time",
                "allow_pie": True,
            }
        ],
    )
    plan = run_checks(definition).charts[0].plan
    assert plan.form == "pie"
    report = layout.mend(charts.figure_for(plan))
    assert report.clean
    assert not report.actions


def test_finishing_adds_label_layout_last_and_uses_its_waiver_once_drawn() -> None:
    """Before drawing, a label-layout waiver waives nothing; once the drawn chart's labels are
    cut off, the engine's waiver lookup finds it, and it is no longer listed as unused."""
    values: list[float | None] = [float(40 + i) for i in range(len(MONTHS))]
    definition = make_definition(
        datasets=[make_monthly(MONTHS, values)],
        charts=[make_trend_chart()],
        waivers=[make_waiver("label-layout", "boardings-trend")],
    )
    checked = run_checks(definition)
    assert checked.unused_waivers == ["label-layout on boardings-trend"]
    cut = LayoutReport(clipped_before=1, clipped=1)
    finished = engine.finish(checked, [cut])
    last = finished.charts[0].results[-1]
    assert (last.check, last.status) == ("label-layout", Status.waived)
    assert finished.charts[0].results[:-1] == checked.charts[0].results
    assert finished.unused_waivers == []
    clean = engine.finish(checked, [LayoutReport()])
    assert clean.charts[0].results[-1].status is Status.passed
    assert clean.unused_waivers == ["label-layout on boardings-trend"]


def test_notes_over_a_plot_set_far_right_are_wrapped_to_the_room_left() -> None:
    """The German demo's rating chart: long route names push the plot (and the notes over it,
    which start at its left edge) to the right, and the German notes are longer; they once ran
    past the figure's edge, and label-layout failed with "1 cut off"."""
    import json
    from pathlib import Path

    from service import pipeline
    from service.config import Limits

    demo = Path(__file__).resolve().parents[2] / "sample_requests" / "bus-cooperative-monthly.json"
    definition = json.loads(demo.read_text())
    definition["report"]["locale"] = "de-DE"
    checked = pipeline.check(pipeline.intake(json.dumps(definition).encode(), Limits()))
    plan = next(c.plan for c in checked.charts if c.plan.chart_id == "rating-by-route")
    figure = charts.figure_for(plan)
    title = figure.axes[0].get_title(loc="left")
    report = layout.mend(figure, locale=plan.locale)
    assert (report.overlaps, report.clipped) == (0, 0)
    assert figure.axes[0].get_title(loc="left") != title  # wrapped again, narrower
    longest = max(len(line) for line in figure.axes[0].get_title(loc="left").splitlines())
    assert longest < max(len(line) for line in title.splitlines())
