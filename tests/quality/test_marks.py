"""Every chart of the generated gallery is drawn with no text over data and a key that lists exactly
the kinds of mark it draws (slow: it draws all of them)."""

from __future__ import annotations

import json
from functools import cache

from service import pipeline
from service.checks.outcome import Checked
from service.config import Limits
from service.render import charts, key, layout
from service.wording import say
from tests.quality import gallery
from tests.quality.kinds import kinds_in_plan


@cache
def checked() -> Checked:
    return pipeline.check(pipeline.intake(json.dumps(gallery.build()).encode(), Limits()))


def test_no_gallery_chart_has_text_over_data_and_every_key_lists_what_is_drawn() -> None:
    over: dict[str, list[str]] = {}
    keys: dict[str, tuple[list[str], list[str]]] = {}
    for chart in checked().charts:
        plan = chart.plan
        figure = charts.figure_for(plan)
        report = layout.mend(figure, locale=plan.locale)
        if report.over_data or not report.clean:
            over[plan.chart_id] = report.over_data
        want = [say(f"key.{k}", plan.locale) for k in key.KINDS if k in kinds_in_plan(plan)]
        kinds = [say(f"key.{k}", plan.locale) for k in key.drawn_kinds(figure)]
        got = key.entries(figure)[: len(kinds)]  # then the labels that found no room, if any
        if (kinds, got) != (want, want):
            keys[plan.chart_id] = (want, got)
    assert over == {}
    assert keys == {}
