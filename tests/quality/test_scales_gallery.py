"""The scale properties held over the generated gallery: every value axis ends at the next nice
number beyond its data, percentages stop at 100, deviations are not made symmetric without reason,
the complete periods use at least 60 % of the plot height, and each measure keeps one colour."""

from __future__ import annotations

import json
from collections import defaultdict
from functools import cache

from service import pipeline
from service.checks import scale
from service.checks.outcome import Checked
from service.checks.results import Status
from service.config import Limits
from service.intents import colours, scales
from service.intents import partial as off_scale
from tests.quality import gallery


@cache
def checked() -> Checked:
    return pipeline.check(pipeline.intake(json.dumps(gallery.build()).encode(), Limits()))


def test_every_gallery_chart_passes_both_scale_checks_as_planned() -> None:
    for chart in checked().charts:
        for result in chart.results:
            if result.check in (scale.END.id, scale.PARTIAL.id):
                assert result.status is Status.passed, (chart.plan.chart_id, result)


def test_percent_axes_stop_at_100_unless_a_value_is_above_it() -> None:
    percent = [c.plan for c in checked().charts if c.plan.value_axis.unit == scales.PERCENT]
    assert len(percent) >= 4
    for plan in percent:
        values = [c.value for c in plan.categories if c.value is not None] + [
            p.y for p in plan.points
        ]
        if values and max(values) <= 100.0:
            assert plan.value_axis.hi <= 100.0, plan.chart_id


def test_deviation_axes_are_scaled_to_the_variances() -> None:
    deviations = [c.plan for c in checked().charts if c.plan.form == "deviation"]
    assert deviations
    for plan in deviations:
        values = [c.value for c in plan.categories if c.value is not None]
        ticks = scales.ticks(plan.value_axis.lo, plan.value_axis.hi)
        step = ticks[1] - ticks[0]
        assert plan.value_axis.hi - max(*values, 0.0) < step, plan.chart_id
        assert min(*values, 0.0) - plan.value_axis.lo < step, plan.chart_id


def test_the_complete_periods_use_at_least_60_percent_of_the_plot_height() -> None:
    done = checked()
    shares = {
        c.plan.chart_id: off_scale.complete_share(c.plan, zero=getattr(chart, "from_zero", False))
        for (_, chart), c in zip(done.definition.charts(), done.charts, strict=True)
        if c.plan.partial is not None
    }
    assert len(shares) >= 3
    assert min(shares.values()) >= scales.MIN_COMPLETE_SHARE, shares
    marked = [c.plan for c in checked().charts if c.plan.partial and c.plan.partial.off_scale]
    assert marked, "the gallery draws a partial value off the scale"
    assert all(off_scale.outside(p) for p in marked)


def test_each_measure_keeps_one_colour_across_the_gallery() -> None:
    seen: dict[str, set[str]] = defaultdict(set)
    done = checked()
    for (_, chart), checked_chart in zip(done.definition.charts(), done.charts, strict=True):
        plan = checked_chart.plan
        if plan.form == "pie":
            continue
        measures = colours.measures_of(chart)
        if plan.panels:
            drawn = [(p.series[0], 0) for p in plan.panels]
        else:
            drawn = list(zip(plan.series[: len(measures)], range(len(measures)), strict=False))
        if drawn:
            for measure, (series, index) in zip(measures, drawn, strict=False):
                if not series.muted:
                    seen[measure].add(colours.series_colour(plan, series, index))
        else:
            seen[measures[0]].add(colours.mark_colour(plan, 0))
    assert len(seen) >= 8
    assert {m: c for m, c in seen.items() if len(c) > 1} == {}
