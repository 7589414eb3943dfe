"""The ``precision`` check: what the drawn chart resolves against what readers need."""

from __future__ import annotations

from typing import Any

import pytest
from factories import (
    Json,
    context_for,
    intake,
    make_compare_definition,
    make_definition,
    make_monthly,
    make_trend_chart,
    make_waiver,
    only_chart,
    plan_of,
    result_of,
    run_checks,
)
from matplotlib.text import Annotation

from service.checks import precision
from service.checks.results import Status
from service.render import charts, style

CLOSE_VALUES = {"A": 1000.0, "B": 1001.0, "C": 1002.0, "D": 1003.0, "E": 1004.0}


def close_values(waivers: list[Json] | None = None, **chart: Any) -> Json:
    return make_compare_definition(CLOSE_VALUES, waivers=waivers, **chart)


def test_bars_too_coarse_for_the_precision_are_labelled() -> None:
    checked = run_checks(close_values(precision={"absolute": 0.1}))
    found = result_of(checked, "precision")
    plan = only_chart(checked).plan
    assert (plan.value_axis.lo, plan.value_axis.hi) == (0.0, 1200.0)
    # 1,200 % over 75 % of the 170 mm figure width, read to 0.5 mm (from memory)
    length_mm = style.WIDTH_IN * 0.75 * 25.4
    expected = (plan.value_axis.hi - plan.value_axis.lo) / length_mm * 0.5
    assert found.status is Status.corrected
    assert found.measured == pytest.approx(expected, rel=1e-3)
    assert found.measured_text == "about 4.7%"
    assert found.corrected_to == "labelled (chart alone about 4.7%)"
    assert "Readers need to tell apart 0.1%" in found.explanation
    assert plan.value_labels is True
    assert (
        "Values are labelled: the chart alone resolves only about 4.7%; readers need 0.1%."
        in plan.notes
    )


def test_a_coarse_requirement_passes() -> None:
    checked = run_checks(close_values(precision={"absolute": 10}))
    found = result_of(checked, "precision")
    assert (found.status, found.measured_text) == (Status.passed, "about 4.7%")
    plan = only_chart(checked).plan
    assert plan.value_labels is False
    assert plan.notes == []


def test_relative_precision_is_taken_of_the_smallest_value() -> None:
    definition = close_values(precision={"relative": 0.01})  # 1 % of 1,000 = 10
    plan = plan_of(definition)
    ctx = context_for(intake(definition))
    assert ctx.chart.precision is not None
    values = precision.shown_values(plan)
    assert precision.required(ctx.chart.precision, values) == pytest.approx(10.0)
    assert precision.SPEC.measure(plan, ctx).ok
    tight = close_values(precision={"relative": 0.001})  # 0.1 % of 1,000 = 1 < 4.9
    assert result_of(run_checks(tight), "precision").status is Status.corrected


def test_waived_precision_keeps_the_chart_as_asked() -> None:
    waiver = make_waiver("precision", "on-time")
    checked = run_checks(close_values(waivers=[waiver], precision={"absolute": 0.1}))
    found = result_of(checked, "precision")
    assert found.status is Status.waived
    assert only_chart(checked).plan.value_labels is False


def test_labels_that_round_too_much_fail() -> None:
    values = {"A": 1000.123, "B": 1000.456, "C": 1000.789}
    checked = run_checks(make_compare_definition(values, precision={"absolute": 0.001}))
    found = result_of(checked, "precision")
    assert found.status is Status.failed  # labels print two decimals: 0.005, not 0.001
    assert only_chart(checked).plan.flags[0].startswith("precision: ")


def test_the_measure_fails_on_an_unlabelled_plan_and_passes_when_labelled() -> None:
    definition = close_values(precision={"absolute": 0.1})
    plan = plan_of(definition)
    ctx = context_for(intake(definition))
    assert not precision.SPEC.measure(plan, ctx).ok
    assert precision.SPEC.measure(plan.model_copy(update={"value_labels": True}), ctx).ok


def test_chart_without_precision_is_not_applicable() -> None:
    found = result_of(run_checks(close_values()), "precision")
    assert (found.status, found.measured_text) == (Status.not_applicable, "not asked")


def test_lines_use_the_plot_height_and_get_labelled() -> None:
    months = ["2026-06-01", "2026-07-01", "2026-08-01", "2026-09-01", "2026-10-01"]
    definition = make_definition(
        datasets=[make_monthly(months, [53270, 50860, 52010, 55730, 57120])],
        charts=[make_trend_chart(precision={"absolute": 50})],
    )
    before = plan_of(definition)
    axis = before.value_axis
    length_mm = charts.size_in(before)[1] * 0.75 * 25.4  # 75 % of the figure height
    found = result_of(run_checks(definition), "precision")
    assert found.measured == pytest.approx((axis.hi - axis.lo) / length_mm * 0.5, rel=1e-3)
    assert found.status is Status.corrected
    plan = only_chart(run_checks(definition)).plan
    figure = charts.figure_for(plan)
    labels = [a.get_text() for a in figure.axes[0].texts if isinstance(a, Annotation)]
    assert "53,270" in labels  # the lines drawer prints each value when value_labels is set


def test_about_rounds_to_two_significant_figures() -> None:
    assert precision.about(0.01374, "%", "en-GB") == "0.014%"
    assert precision.about(1234.0, "GBP", "en-GB") == "£1,200"
    assert precision.about(0.1, "", "en-GB") == "0.1"
    assert precision.about(4.704, "journeys", "en-GB") == "4.7 journeys"
