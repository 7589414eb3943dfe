"""Checks on compare charts (bars and dots) and waivers, through the pipeline and on plans."""

from __future__ import annotations

import pytest
from factories import (
    Json,
    context_for,
    guarded,
    intake,
    make_compare_definition,
    make_definition,
    make_trend_chart,
    make_waiver,
    only_chart,
    plan_of,
    result_of,
    run_checks,
    status_of,
)

from service.checks import baseline, scale_note
from service.checks.results import Status
from service.intents.compare import scale_note as scale_note_text


def truncated(waivers: list[Json] | None = None) -> Json:
    return make_compare_definition({"a": 93.4, "b": 88.9}, baseline=85, waivers=waivers)


def test_baseline_request_is_corrected_to_zero() -> None:
    checked = run_checks(truncated())
    found = result_of(checked, "bar-zero-baseline")
    assert (found.status, found.measured, found.measured_text) == (
        Status.corrected,
        85.0,
        "starts at 85%",
    )
    assert found.waiver is None
    plan = only_chart(checked).plan
    assert plan.baseline == 0.0
    assert plan.value_axis.lo == 0.0
    assert plan.notes == []


def test_baseline_measure_on_a_plan() -> None:
    definition = make_compare_definition({"a": 93.4, "b": 88.9})
    ctx = context_for(intake(definition))
    plan = plan_of(definition)
    assert baseline.SPEC.measure(plan, ctx).ok
    assert not baseline.SPEC.measure(plan.model_copy(update={"baseline": 80.0}), ctx).ok


def test_waived_baseline_is_kept() -> None:
    waiver = make_waiver("bar-zero-baseline", "on-time")
    checked = run_checks(truncated([waiver]))
    found = result_of(checked, "bar-zero-baseline")
    assert found.status is Status.waived
    assert found.waiver is not None
    assert (found.waiver.reason, found.waiver.by) == (waiver["reason"], waiver["by"])
    assert found.explanation.endswith("Waived by Head of operations.")
    plan = only_chart(checked).plan
    assert plan.baseline == 85.0
    assert plan.notes == ["Bars start at 85%, not zero: their lengths exaggerate the differences."]
    assert checked.unused_waivers == []


@pytest.mark.parametrize(
    ("expires", "status", "base"),
    [("2026-11-08", Status.corrected, 0.0), ("2026-11-09", Status.waived, 85.0)],
)
def test_waiver_expiry_against_as_of(expires: str, status: Status, base: float) -> None:
    # as_of is 2026-11-09: a waiver that expired the day before no longer applies.
    checked = run_checks(truncated([make_waiver("bar-zero-baseline", "on-time", expires=expires)]))
    found = result_of(checked, "bar-zero-baseline")
    assert found.status is status
    assert ("expired on 2026-11-08" in found.explanation) is (status is Status.corrected)
    assert only_chart(checked).plan.baseline == base


def test_waiver_not_needed_is_reported_unused() -> None:
    waiver = make_waiver("bar-zero-baseline", "on-time")
    checked = run_checks(make_compare_definition({"a": 93.4, "b": 88.9}, waivers=[waiver]))
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
    checks = [r.check for r in checked.results]
    assert "nonzero-scale-noted" in checks
    assert "bar-zero-baseline" not in checks  # dots encode position, not length
    assert "lie-factor" not in checks
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
