"""Trend checks (missing and partial periods) on pipeline plans and on corrupted plans; the registry."""

from __future__ import annotations

import dataclasses

import pytest
from factories import (
    MONTHS,
    Json,
    context_for,
    guarded,
    intake,
    make_column,
    make_dataset,
    make_definition,
    make_monthly,
    make_report,
    make_trend_chart,
    only_chart,
    plan_of,
    result_of,
    run_checks,
    status_of,
)

from service import intents
from service.checks import CHECKS, missing, partial, registry
from service.checks.results import Status
from service.definition.model import INTENTS
from service.intents.forms import FORMS
from service.intents.plan import PartialMark
from service.render.registry import DRAWERS

# Jun, Jul, (no Aug), Sep, Oct, Nov 2026 — as_of 9 November 2026 07:30.
GAPPY = ["2026-06-01", "2026-07-01", "2026-09-01", "2026-10-01", "2026-11-01"]


def trend_with_gap() -> Json:
    return make_definition(datasets=[make_monthly(GAPPY, [48210, 45120, 47390, 51880, 15480])])


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


@pytest.mark.parametrize(
    ("fill", "marked", "detail"),
    [
        (0.0, True, "Boardings has a value drawn at Aug 2026"),  # missing filled as zero
        (None, False, "Aug 2026 is not marked 'no data' for Boardings"),
    ],
)
def test_filled_or_unmarked_gap_fails(fill: float | None, marked: bool, detail: str) -> None:
    definition = trend_with_gap()
    plan = plan_of(definition)
    (series,) = plan.series
    values = [*series.values[:2], fill, *series.values[3:]]
    bad = plan.model_copy(
        update={
            "series": [series.model_copy(update={"values": values})],
            "gaps": plan.gaps if marked else [],
        }
    )
    finding = missing.SPEC.measure(bad, context_for(intake(definition)))
    assert not finding.ok
    assert finding.measured == 1
    assert detail in finding.detail


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


def test_registry_is_complete_and_consistent() -> None:
    specs = list(CHECKS.values())
    assert all(key == spec.id for key, spec in CHECKS.items())
    with pytest.raises(ValueError, match="registered twice"):
        registry.register(dataclasses.replace(specs[0]))
    for spec in specs:
        for text in (spec.title, spec.measures, spec.threshold, spec.source):
            assert text.strip(), spec.id
        assert spec.intents <= set(INTENTS), spec.id
        built = [intents.ENCODERS[i] for i in spec.intents if i in intents.ENCODERS]
        assert spec.forms <= set(FORMS), spec.id
        assert spec.forms & set().union(*(e.forms for e in built)), spec.id
        assert (spec.correct is None) == (spec.correction is None), spec.id
    for name, encoder in intents.ENCODERS.items():
        assert encoder.intent == name
        assert encoder.forms <= set(DRAWERS), name
        for form in encoder.forms:
            assert any(name in s.intents and form in s.forms for s in specs), (name, form)
