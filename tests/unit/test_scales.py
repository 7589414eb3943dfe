"""Honest, designed scales: nice axis ends, percentages to 100, deviations scaled to the data, a
partial period that never decides the scale, and one colour per measure across the pack."""

from __future__ import annotations

from pathlib import Path

import pytest
from factories import Json, intake, make_dataset, make_definition, make_report, make_trend_chart
from matplotlib.colors import to_hex
from matplotlib.lines import Line2D

from service import pipeline
from service.checks import scale
from service.checks.outcome import Checked
from service.checks.registry import Context
from service.config import Limits
from service.definition.model import local_wall_time
from service.intents import colours, scales
from service.intents import partial as off_scale
from service.intents.plan import ChartPlan
from service.render import charts

DEMO = Path(__file__).resolve().parents[2] / "sample_requests" / "bus-cooperative-monthly.json"


@pytest.fixture(scope="module")
def demo() -> Checked:
    return pipeline.check(pipeline.intake(DEMO.read_bytes(), Limits()))


def _plan(checked: Checked, chart_id: str) -> ChartPlan:
    return next(c.plan for c in checked.charts if c.plan.chart_id == chart_id)


# -- 1. percentages stop at 100 ----------------------------------------------------------------


def test_percent_bars_stop_at_100_unless_a_value_is_above_it() -> None:
    assert scales.fit([88.9, 94.6], include_zero=True, unit="%") == (0.0, 100.0)
    assert scales.fit([99.6, 100.0], include_zero=True, unit="%") == (0.0, 100.0)
    assert scales.fit([90.0, 104.0], include_zero=True, unit="%")[1] > 104.0
    assert scales.fit([88.9, 94.6], include_zero=True, unit="journeys") == (0.0, 100.0)


def test_the_demo_punctuality_bars_end_at_100(demo: Checked) -> None:
    axis = _plan(demo, "on-time-by-route").value_axis
    assert (axis.lo, axis.hi) == (0.0, 100.0)  # was 0 to 120


# -- 2. axes end at the next nice number ---------------------------------------------------------


@pytest.mark.parametrize(
    ("values", "include_zero", "expected"),
    [
        ([28040.0, 118420.0], True, (0.0, 120000.0)),
        ([48210.0, 57120.0], True, (0.0, 60000.0)),
        ([5580.0, 6240.0], False, (5500.0, 6250.0)),
        ([3.86, 4.32], False, (3.8, 4.4)),
        ([-60.0, 14.0], True, (-60.0, 20.0)),
        ([5.0], True, (0.0, 5.0)),
    ],
)
def test_a_range_ends_at_the_next_nice_number_beyond_the_data(
    values: list[float], include_zero: bool, expected: tuple[float, float]
) -> None:
    lo, hi = scales.fit(values, include_zero=include_zero)
    assert (lo, hi) == expected
    ticks = scales.ticks(lo, hi)
    assert (ticks[0], ticks[-1]) == (lo, hi)
    assert scales.MIN_INTERVALS <= len(ticks) - 1 <= scales.MAX_INTERVALS
    step = ticks[1] - ticks[0]
    assert hi - max(values) < step
    assert min([*values, 0.0] if include_zero else values) - lo < step


def test_the_demo_share_axis_ends_at_120000_not_160000(demo: Checked) -> None:
    plan = _plan(demo, "revenue-share")
    assert plan.value_axis.hi == 120000.0
    figure = charts.figure_for(plan)
    figure.canvas.draw()
    ticks = [t for t in figure.axes[0].get_xticks() if t >= 0]
    assert max(ticks) == 120000.0  # the drawn axis ends where the plan's does


def test_every_demo_chart_passes_the_nice_end_check(demo: Checked) -> None:
    statuses = {c.plan.chart_id: r.status for c in demo.charts for r in c.results if r.check == END}
    assert len(statuses) == 10
    assert set(statuses.values()) == {"passed"}


END = scale.END.id


def test_the_nice_end_check_fails_an_axis_stretched_past_a_step(demo: Checked) -> None:
    plan = _plan(demo, "revenue-share")
    ctx = _ctx_of(demo, "revenue-share")
    stretched = plan.model_copy(
        update={"value_axis": plan.value_axis.model_copy(update={"hi": 160000.0})}
    )
    finding = scale.END.measure(stretched, ctx)
    assert not finding.ok
    assert "160,000" in finding.detail
    percent = _plan(demo, "on-time-by-route")
    wide = percent.model_copy(
        update={"value_axis": percent.value_axis.model_copy(update={"hi": 120.0})}
    )
    finding = scale.END.measure(wide, _ctx_of(demo, "on-time-by-route"))
    assert not finding.ok
    assert "past 100" in finding.detail


def _ctx_of(checked: Checked, chart_id: str) -> Context:
    definition = checked.definition
    chart = next(c for _, c in definition.charts() if c.id == chart_id)
    return Context(
        chart=chart,
        table=checked.tables[chart.dataset],
        as_of=local_wall_time(definition.report.as_of),
        locale=definition.report.locale,
    )


# -- 3. deviation scaled to the data -------------------------------------------------------------


def test_the_demo_deviation_is_scaled_to_the_data_not_symmetric(demo: Checked) -> None:
    axis = _plan(demo, "depot-target").value_axis
    assert (axis.lo, axis.hi) == (-60.0, 20.0)  # values −60 to +14; was −100 to 100


# -- 4. a partial period never decides the scale -------------------------------------------------


def test_the_demo_partial_month_does_not_squeeze_the_complete_months(demo: Checked) -> None:
    plan = _plan(demo, "journeys-trend")
    assert off_scale.complete_share(plan) >= scales.MIN_COMPLETE_SHARE  # was 0.11
    assert plan.value_axis.lo > 1620.0  # Nov's 1,601 and 1,620 journeys lie below the scale
    assert plan.partial is not None
    assert plan.partial.off_scale is not None
    assert "1,601 journeys" in plan.partial.off_scale
    assert "8 of 30 days" in plan.partial.off_scale


def test_the_complete_months_fill_the_drawn_plot(demo: Checked) -> None:
    """Measured on the drawing: the complete months' lines span at least 60 % of the plot height,
    and the partial month is drawn at the edge with its values written beside it."""
    plan = _plan(demo, "journeys-trend")
    figure = charts.figure_for(plan)
    figure.canvas.draw()
    ax = figure.axes[0]
    bottom, top = ax.get_ylim()
    partial = plan.partial
    assert partial is not None
    complete = [
        y
        for line in ax.get_lines()
        if line.get_linestyle() == "-" and len(line.get_xdata()) > 1
        for x, y in zip(line.get_xdata(), line.get_ydata(), strict=True)
        if x != partial.index
    ]
    assert (max(complete) - min(complete)) / (top - bottom) >= 0.6
    edge = [
        line
        for line in ax.get_lines()
        if list(line.get_xdata()) == [partial.index] and line.get_marker() == "v"
    ]
    assert edge
    assert all(line.get_ydata()[0] == bottom for line in edge)
    texts = [t.get_text().replace("\n", " ") for t in ax.texts]
    assert any("1,601 journeys" in t and "below the scale" in t for t in texts)


def _monthly(values: list[float], **chart: object) -> Json:
    months = [f"2026-{m:02d}-01" for m in range(1, len(values) + 1)]
    rows = [{"month": m, "boardings": v} for m, v in zip(months, values, strict=True)]
    return make_definition(
        datasets=[make_dataset(rows=rows)],
        charts=[make_trend_chart(**chart)],
        report=make_report(period={"start": months[0], "end": "2026-11-30"}),
    )


def test_a_partial_value_that_fits_is_drawn_on_the_scale() -> None:
    months = [5600.0, 6100.0, 6250.0, 5900.0, 6000.0, 6100.0, 6200.0, 6000.0, 5800.0, 6100.0]
    definition = _monthly([*months, 5950.0], from_zero=False)
    plan = pipeline.check(intake(definition)).charts[0].plan
    assert plan.partial is not None
    assert plan.partial.off_scale is None
    axis = plan.value_axis
    assert axis.lo <= 5950.0 <= axis.hi


def test_the_partial_scale_check_corrects_a_plan_the_partial_period_decided(demo: Checked) -> None:
    plan = _plan(demo, "journeys-trend")
    squeezed = plan.model_copy(
        update={
            "value_axis": plan.value_axis.model_copy(update={"lo": 1000.0, "hi": 7000.0}),
            "partial": plan.partial.model_copy(update={"off_scale": None})
            if plan.partial
            else None,
        }
    )
    ctx = _ctx_of(demo, "journeys-trend")
    finding = scale.PARTIAL.measure(squeezed, ctx)
    assert not finding.ok
    assert finding.measured == pytest.approx(660 / 6000, abs=0.01)
    assert scale.PARTIAL.correct is not None
    fixed = scale.PARTIAL.correct(squeezed, ctx)
    assert scale.PARTIAL.measure(fixed, ctx).ok
    assert fixed.value_axis == plan.value_axis
    assert fixed.partial == plan.partial


# -- 5. one colour per measure across the pack --------------------------------------------------


def _measure_colours(checked: Checked) -> dict[str, set[str]]:
    seen: dict[str, set[str]] = {}
    for (_, chart), checked_chart in zip(checked.definition.charts(), checked.charts, strict=True):
        plan = checked_chart.plan
        if plan.form == "pie":
            continue
        measures = colours.measures_of(chart)
        series = plan.series[: len(measures)] or [s for p in plan.panels for s in p.series]
        if series:
            for i, (measure, s) in enumerate(zip(measures, series, strict=False)):
                seen.setdefault(measure, set()).add(colours.series_colour(plan, s, i))
        else:
            seen.setdefault(measures[0], set()).add(colours.mark_colour(plan, 0))
    return seen


def test_each_measure_keeps_one_colour_across_the_demo(demo: Checked) -> None:
    seen = _measure_colours(demo)
    assert {m: len(c) for m, c in seen.items() if len(c) > 1} == {}
    assert {"boardings", "operated", "on_time"} <= set(seen)


def test_the_drawn_lines_of_boardings_have_one_colour(demo: Checked) -> None:
    drawn: set[str] = set()
    for chart_id, index in (("boardings-trend", 0), ("cost-vs-use", 1)):
        plan = _plan(demo, chart_id)
        figure = charts.figure_for(plan)
        lines = [
            line
            for line in figure.axes[0].get_lines()
            if isinstance(line, Line2D)
            and len(line.get_xdata()) > 1
            and line.get_linestyle() == "-"
        ]
        wanted = [v for v in plan.series[index].values if v is not None]
        drawn |= {
            to_hex(line.get_color()) for line in lines if list(line.get_ydata())[:2] == wanted[:2]
        }
    assert len(drawn) == 1  # blue on one page, orange on the next before


def test_measures_of_a_chart_never_share_a_colour_when_the_palette_runs_out() -> None:
    slots = {f"m{i}": i for i in range(10)}
    assert [s % 8 for s in colours._distinct([slots["m0"], slots["m8"]], 8)] == [0, 1]
    assert colours._distinct([3, 4], 8) == [3, 4]


def test_a_partial_value_never_decides_the_range_but_may_join_one_that_keeps_the_complete_share() -> (
    None
):
    complete = [5580.0, 6240.0]
    assert scales.fit_periods(complete, [1601.0], include_zero=False) == (5500.0, 6250.0)
    # a partial value just below the complete ones widens the range: they still fill most of it
    lo, hi = scales.fit_periods(complete, [5450.0], include_zero=False)
    assert lo <= 5450.0
    assert scales.complete_share(lo, hi, complete) >= scales.MIN_COMPLETE_SHARE
    # from zero, the zero line is shown either way, so a small partial value fits on the scale
    assert scales.fit_periods([48210.0, 57120.0], [15480.0], include_zero=True) == (0.0, 60000.0)
    assert scales.fit_periods([], [15480.0], include_zero=True) == (0.0, 16000.0)


def test_a_zero_the_partial_value_pulled_in_does_not_count_as_shown() -> None:
    complete = [15870.0, 29438.0]
    assert scales.complete_share(0.0, 30000.0, complete, zero=True) > 0.9
    assert scales.complete_share(0.0, 30000.0, complete, zero=False) < 0.5
