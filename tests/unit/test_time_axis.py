"""time-proportional and log-scale-noted: on pipeline plans, on broken plans, and rendered."""

from __future__ import annotations

import pytest
from factories import (
    Json,
    context_for,
    find,
    guarded,
    intake,
    make_compare_definition,
    make_definition,
    make_monthly,
    make_trend_chart,
    make_waiver,
    only_chart,
    plan_of,
    problems_of,
    result_of,
    run_checks,
    status_of,
)

from service.checks import time_axis
from service.checks.registry import CHECKS
from service.checks.results import Status
from service.intents.trend import LOG_NOTE
from service.render import charts

# Mar, Apr, (no May), Jun, Jul, (no Aug, Sep), Oct 2026: eight months, three without a row.
GAPPY = ["2026-03-01", "2026-04-01", "2026-06-01", "2026-07-01", "2026-10-01"]
VALUES = [48210.0, 45120.0, 47390.0, 51880.0, 50100.0]


def _gappy() -> Json:
    return make_definition(datasets=[make_monthly(GAPPY, VALUES)])


def _log_trend() -> Json:
    return make_definition(
        datasets=[make_monthly(GAPPY, [12.0, 150.0, 1900.0, 23000.0, 41000.0])],
        charts=[make_trend_chart(scale="log", from_zero=False)],
    )


# --- time-proportional ---------------------------------------------------------------------------


def test_monthly_series_with_gaps_is_proportional() -> None:
    checked = run_checks(_gappy())
    found = result_of(checked, "time-proportional")
    assert (found.status, found.measured, found.measured_text) == (
        Status.passed,
        8,
        "8 of 8 periods",
    )
    # Mar–Oct 2026: May, Aug and Sep have no row but keep their place (common practice, no source)
    plan = only_chart(checked).plan
    assert plan.periods[2] == "May 2026"
    assert plan.periods[5:7] == ["Aug 2026", "Sept 2026"]  # CLDR en-GB: "Sept"
    assert [g.index for g in plan.gaps] == [2, 5, 6]
    assert "a month of 28 days takes the width of one of 31" in found.explanation


def test_a_plan_that_drops_a_gap_period_fails() -> None:
    definition = _gappy()
    plan = plan_of(definition)
    ctx = context_for(intake(definition))
    keep = [i for i in range(len(plan.periods)) if i != 2]  # drop May 2026, the first gap
    (series,) = plan.series
    broken = plan.model_copy(
        update={
            "periods": [plan.periods[i] for i in keep],
            "series": [
                series.model_copy(
                    update={
                        "values": [series.values[i] for i in keep],
                        "segments": [(0, 1), (2, 3), (6, 6)],
                    }
                )
            ],
        }
    )
    finding = time_axis.SPEC_PROPORTIONAL.measure(broken, ctx)
    assert not finding.ok
    assert finding.shown == "7 of 8 periods"
    assert "missing: May 2026" in finding.detail


def test_points_out_of_time_order_fail_through_the_engine() -> None:
    definition = _gappy()
    plan = plan_of(definition)
    (series,) = plan.series
    present = [(i, v) for i, v in enumerate(series.values) if v is not None]
    xs = [i for i, _ in present]
    xs[0], xs[1] = xs[1], xs[0]  # the first two points swapped in time
    broken = plan.model_copy(
        update={
            "series": [
                series.model_copy(
                    update={
                        "values": [v for _, v in present],
                        "xs": xs,
                        "segments": [(0, 1), (2, 3), (4, 4)],
                    }
                )
            ]
        }
    )
    guard = guarded(definition, broken)
    assert status_of(guard, "time-proportional") is Status.failed
    assert any(f.startswith("time-proportional:") for f in guard.plan.flags)


@pytest.mark.parametrize("check", ["time-proportional", "log-scale-noted"])
def test_time_axis_checks_cannot_be_waived(check: str) -> None:
    definition = _log_trend()
    definition["waivers"] = [make_waiver(check, "boardings-trend")]
    assert find(problems_of(definition), "not_waivable").path == "waivers[0].check"
    assert not CHECKS[check].waivable


# --- log-scale-noted -----------------------------------------------------------------------------


def test_a_linear_axis_is_not_applicable() -> None:
    found = result_of(run_checks(_gappy()), "log-scale-noted")
    assert (found.status, found.measured_text) == (Status.not_applicable, "linear")


def test_a_log_trend_says_so_and_passes() -> None:
    checked = run_checks(_log_trend())
    found = result_of(checked, "log-scale-noted")
    plan = only_chart(checked).plan
    assert plan.value_axis.log
    assert LOG_NOTE in plan.notes
    assert (found.status, found.measured_text) == (Status.passed, "log")


def test_a_log_trend_without_its_note_is_corrected() -> None:
    definition = _log_trend()
    plan = plan_of(definition)
    broken = plan.model_copy(update={"notes": [n for n in plan.notes if n != LOG_NOTE]})
    assert LOG_NOTE not in broken.notes
    guard = guarded(definition, broken)
    assert status_of(guard, "log-scale-noted") is Status.corrected
    assert LOG_NOTE in guard.plan.notes
    found = next(r for r in guard.results if r.check == "log-scale-noted")
    assert found.measured_text == "log, not noted"
    assert found.corrected_to == "log"


def test_bars_on_a_log_axis_fail() -> None:
    definition = make_compare_definition({"North": 40.0, "South": 400.0, "East": 4000.0})
    plan = plan_of(definition)
    assert plan.form == "bars"
    axis = plan.value_axis.model_copy(update={"lo": 1.0, "hi": 10_000.0, "log": True})
    broken = plan.model_copy(update={"value_axis": axis, "baseline": 1.0})
    finding = time_axis.SPEC_LOG.measure(broken, context_for(intake(definition)))
    assert not finding.ok
    assert "length of a bar on a log axis" in finding.detail
    guard = guarded(definition, broken)
    assert status_of(guard, "log-scale-noted") is Status.failed  # a note cannot mend a length
    assert any(f.startswith("log-scale-noted:") for f in guard.plan.flags)


def test_a_log_trend_renders_with_a_log_axis() -> None:
    plan = only_chart(run_checks(_log_trend())).plan
    figure = charts.figure_for(plan)
    assert figure.axes[0].get_yscale() == "log"
    assert LOG_NOTE in figure.axes[0].get_title(loc="left")
    assert charts.draw(plan).startswith(b"%PDF")
