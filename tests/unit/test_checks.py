"""Each integrity check on plans from the pipeline, and on plans corrupted on purpose."""

from __future__ import annotations

from factories import (
    MONTHS,
    Json,
    context_for,
    intake,
    make_column,
    make_compare_definition,
    make_dataset,
    make_definition,
    make_monthly,
    make_report,
    make_trend_chart,
    make_waiver,
    only_chart,
    result_of,
    run_checks,
)

from service import intents, pipeline
from service.checks import CHECKS, baseline, engine, missing, partial, scale_note
from service.checks.results import Status
from service.intents.compare import scale_note as scale_note_text
from service.intents.plan import ChartPlan, PartialMark
from service.render.forms import DRAWERS

# Jun, Jul, (no Aug), Sep, Oct, Nov 2026 — as_of 9 November 2026 07:30.
GAPPY = ["2026-06-01", "2026-07-01", "2026-09-01", "2026-10-01", "2026-11-01"]


def trend_with_gap() -> Json:
    return make_definition(datasets=[make_monthly(GAPPY, [48210, 45120, 47390, 51880, 15480])])


def guarded(definition: Json, plan: ChartPlan) -> engine.Guarded:
    taken = intake(definition)
    return engine.guard(plan, context_for(taken), taken.definition.waivers)


def plan_of(definition: Json) -> ChartPlan:
    """The plan the encoder makes, before any check runs."""
    taken = intake(definition)
    _, chart = taken.definition.charts()[0]
    ctx = context_for(taken)
    return intents.ENCODERS[chart.intent].encode(chart, ctx.table, ctx.locale, ctx.as_of)


def status_of(guard: engine.Guarded, check: str) -> Status:
    return next(r.status for r in guard.results if r.check == check)


def test_missing_month_is_a_gap_with_broken_line() -> None:
    checked = run_checks(trend_with_gap())
    found = result_of(checked, "missing-periods")
    assert (found.status, found.measured, found.measured_text) == (Status.passed, 1, "1 period")
    assert "Aug 2026" in found.explanation
    plan = only_chart(checked).plan
    assert plan.periods[2] == "Aug 2026"
    (series,) = plan.series
    assert series.values[2] is None  # missing is never 0
    assert series.segments == [(0, 1), (3, 5)]
    assert [(g.index, g.series) for g in plan.gaps] == [(2, ["boardings"])]


def test_complete_run_has_no_gaps() -> None:
    checked = run_checks(make_definition())
    found = result_of(checked, "missing-periods")
    assert (found.measured, found.status) == (0, Status.passed)
    assert only_chart(checked).plan.gaps == []


def test_null_value_in_a_present_row_is_a_gap_for_that_series_only() -> None:
    columns = [
        make_column("month", "date"),
        make_column("scheduled", "integer", "journeys"),
        make_column("operated", "integer", "journeys"),
    ]
    rows = [
        {"month": m, "scheduled": 6100, "operated": None if i == 2 else 6000}
        for i, m in enumerate(MONTHS)
    ]
    definition = make_definition(
        datasets=[make_dataset(columns=columns, rows=rows)],
        charts=[make_trend_chart(measures=["scheduled", "operated"])],
    )
    checked = run_checks(definition)
    assert result_of(checked, "missing-periods").measured == 1
    plan = only_chart(checked).plan
    scheduled, operated = plan.series
    assert scheduled.values[2] == 6100.0
    assert scheduled.segments == [(0, 4)]
    assert operated.values[2] is None
    assert operated.segments == [(0, 1), (3, 4)]
    assert [(g.index, g.series) for g in plan.gaps] == [(2, ["operated"])]


def test_joining_across_a_gap_fails_and_is_corrected() -> None:
    definition = trend_with_gap()
    plan = plan_of(definition)
    (series,) = plan.series
    joined = series.model_copy(
        update={"values": [*series.values[:2], 46000.0, *series.values[3:]], "segments": [(0, 5)]}
    )
    bad = plan.model_copy(update={"series": [joined], "gaps": []})
    finding = missing.SPEC.measure(bad, context_for(intake(definition)))
    assert not finding.ok
    assert "has a value drawn at Aug 2026" in finding.detail
    assert "joined across Aug 2026" in finding.detail
    result = guarded(definition, bad)
    assert status_of(result, "missing-periods") is Status.corrected
    assert result.plan.series[0].values[2] is None
    assert result.plan.series[0].segments == [(0, 1), (3, 5)]
    assert [g.index for g in result.plan.gaps] == [2]


def test_filling_a_gap_with_zero_fails() -> None:
    definition = trend_with_gap()
    plan = plan_of(definition)
    (series,) = plan.series
    zeroed = series.model_copy(update={"values": [*series.values[:2], 0.0, *series.values[3:]]})
    finding = missing.SPEC.measure(
        plan.model_copy(update={"series": [zeroed]}), context_for(intake(definition))
    )
    assert not finding.ok
    assert finding.measured == 1


def test_unmarked_gap_fails() -> None:
    definition = trend_with_gap()
    finding = missing.SPEC.measure(
        plan_of(definition).model_copy(update={"gaps": []}), context_for(intake(definition))
    )
    assert not finding.ok
    assert "Aug 2026 is not marked 'no data' for boardings" in finding.detail


def test_partial_last_month_is_marked() -> None:
    checked = run_checks(trend_with_gap())
    found = result_of(checked, "partial-period")
    assert found.status is Status.passed
    assert found.measured == round(8 / 30, 4)
    assert found.measured_text == "8 of 30 days"
    assert only_chart(checked).plan.partial == PartialMark(
        index=5, text="8 of 30 days", fraction=8 / 30
    )


def test_last_month_complete_after_as_of() -> None:
    definition = trend_with_gap()
    definition["report"] = make_report(as_of="2026-12-01T00:00:00+00:00")
    checked = run_checks(definition)
    found = result_of(checked, "partial-period")
    assert (found.status, found.measured_text) == (Status.passed, "complete")
    assert only_chart(checked).plan.partial is None


def test_removing_the_partial_mark_fails_and_is_corrected() -> None:
    definition = trend_with_gap()
    bad = plan_of(definition).model_copy(update={"partial": None})
    finding = partial.SPEC.measure(bad, context_for(intake(definition)))
    assert not finding.ok
    assert finding.shown == "8 of 30 days"
    result = guarded(definition, bad)
    assert status_of(result, "partial-period") is Status.corrected
    assert result.plan.partial is not None
    assert result.plan.partial.index == 5


def test_marking_a_complete_period_partial_fails() -> None:
    definition = make_definition()  # June to October, complete at as_of
    mark = PartialMark(index=4, text="8 of 31 days", fraction=8 / 31)
    bad = plan_of(definition).model_copy(update={"partial": mark})
    assert not partial.SPEC.measure(bad, context_for(intake(definition))).ok
    assert guarded(definition, bad).plan.partial is None


def test_baseline_request_is_corrected_to_zero() -> None:
    checked = run_checks(make_compare_definition({"a": 93.4, "b": 88.9}, baseline=85))
    found = result_of(checked, "bar-zero-baseline")
    assert (found.status, found.measured, found.measured_text) == (
        Status.corrected,
        85.0,
        "starts at 85%",
    )
    assert found.waiver is None
    plan = only_chart(checked).plan
    assert plan.bar_base == 0.0
    assert plan.value_axis.lo == 0.0
    assert plan.notes == []


def test_baseline_measure_on_a_plan() -> None:
    definition = make_compare_definition({"a": 93.4, "b": 88.9})
    ctx = context_for(intake(definition))
    plan = plan_of(definition)
    assert baseline.SPEC.measure(plan, ctx).ok
    assert not baseline.SPEC.measure(plan.model_copy(update={"bar_base": 80.0}), ctx).ok


def test_waived_baseline_is_kept() -> None:
    waiver = make_waiver("bar-zero-baseline", "on-time")
    checked = run_checks(
        make_compare_definition({"a": 93.4, "b": 88.9}, baseline=85, waivers=[waiver])
    )
    found = result_of(checked, "bar-zero-baseline")
    assert found.status is Status.waived
    assert found.waiver is not None
    assert (found.waiver.reason, found.waiver.by) == (waiver["reason"], waiver["by"])
    assert found.explanation.endswith("Waived by Head of operations.")
    plan = only_chart(checked).plan
    assert plan.bar_base == 85.0
    assert plan.notes == ["Bars start at 85%, not zero: their lengths exaggerate the differences."]
    assert checked.unused_waivers == []


def test_expired_waiver_does_not_apply() -> None:
    waiver = make_waiver("bar-zero-baseline", "on-time", expires="2026-11-08")
    checked = run_checks(
        make_compare_definition({"a": 93.4, "b": 88.9}, baseline=85, waivers=[waiver])
    )
    found = result_of(checked, "bar-zero-baseline")
    assert found.status is Status.corrected
    assert "expired on 2026-11-08" in found.explanation
    assert only_chart(checked).plan.bar_base == 0.0
    assert checked.unused_waivers == ["bar-zero-baseline on on-time"]


def test_waiver_expiring_on_the_as_of_day_still_applies() -> None:
    waiver = make_waiver("bar-zero-baseline", "on-time", expires="2026-11-09")
    checked = run_checks(
        make_compare_definition({"a": 93.4, "b": 88.9}, baseline=85, waivers=[waiver])
    )
    assert result_of(checked, "bar-zero-baseline").status is Status.waived


def test_waiver_not_needed_is_reported_unused() -> None:
    checked = run_checks(
        make_compare_definition(
            {"a": 93.4, "b": 88.9}, waivers=[make_waiver("bar-zero-baseline", "on-time")]
        )
    )
    assert result_of(checked, "bar-zero-baseline").status is Status.passed
    assert checked.unused_waivers == ["bar-zero-baseline on on-time"]


def test_focus_on_differences_draws_noted_dots() -> None:
    checked = run_checks(
        make_compare_definition({"a": 4.21, "b": 3.86, "c": 4.32}, focus="differences")
    )
    plan = only_chart(checked).plan
    assert plan.form == "dots"
    assert not plan.value_axis.includes_zero
    assert plan.notes == [scale_note_text(plan.value_axis, "en-GB")]
    assert [r.check for r in checked.results] == ["nonzero-scale-noted"]
    found = result_of(checked, "nonzero-scale-noted")
    assert found.status is Status.passed
    assert found.measured == plan.value_axis.lo


def test_removing_the_scale_note_fails_and_is_corrected() -> None:
    definition = make_compare_definition({"a": 4.21, "b": 3.86}, focus="differences")
    bad = plan_of(definition).model_copy(update={"notes": []})
    assert not scale_note.SPEC.measure(bad, context_for(intake(definition))).ok
    result = guarded(definition, bad)
    assert status_of(result, "nonzero-scale-noted") is Status.corrected
    assert result.plan.notes == [scale_note_text(bad.value_axis, "en-GB")]


def test_trend_not_from_zero_carries_a_note() -> None:
    checked = run_checks(make_definition(charts=[make_trend_chart(from_zero=False)]))
    plan = only_chart(checked).plan
    assert plan.value_axis.lo > 0
    assert plan.notes == [scale_note_text(plan.value_axis, "en-GB")]
    assert result_of(checked, "nonzero-scale-noted").status is Status.passed


def test_failed_checks_are_flagged_on_the_plan() -> None:
    definition = make_compare_definition(
        {"a": 50, "b": 55}, baseline=45, waivers=[make_waiver("bar-zero-baseline", "on-time")]
    )
    result = pipeline.check(intake(definition))
    assert result.blocked
    assert [r.check for r in result.failures()] == ["lie-factor"]
    assert result.charts[0].plan.flags[0].startswith("lie-factor: ")


def test_registry_is_complete_and_consistent() -> None:
    specs = list(CHECKS.values())
    assert len({s.id for s in specs}) == len(specs) == len(CHECKS)
    for spec in specs:
        assert spec.id == next(k for k, v in CHECKS.items() if v is spec)
        for text in (spec.title, spec.measures, spec.threshold, spec.source):
            assert text.strip(), spec.id
        assert spec.intents <= set(intents.ENCODERS), spec.id
        assert spec.forms <= set().union(*(intents.ENCODERS[i].forms for i in spec.intents))
        assert (spec.correct is None) == (spec.correction is None), spec.id
    for name, encoder in intents.ENCODERS.items():
        assert encoder.intent == name
        assert encoder.forms <= set(DRAWERS), name
        for form in encoder.forms:
            assert any(name in s.intents and form in s.forms for s in specs), (name, form)
