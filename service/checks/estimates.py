"""Estimates and forecasts always look different from actuals, and are listed as such.

A series is an estimate when its column is declared ``estimate: true`` or when it is a projection of
a partial period (``projection`` on a trend, only for columns declared ``projectable``). Estimates are
separate series, so they are never joined into the actual line; they are drawn dashed (or as hollow
diamonds when they are single points), labelled "estimate", and named in a note on the chart.
"""

from __future__ import annotations

from service import wording
from service.checks.missing import measures_of
from service.checks.registry import CheckSpec, Context, Finding, register
from service.definition.model import OVER_TIME
from service.intents.plan import ChartPlan, Series, all_series
from service.intents.trend import estimate_titles, listed
from service.intents.trend import estimates_note as note_for


def _expected(plan: ChartPlan, ctx: Context) -> set[str]:
    """Names of the series that must be drawn as estimates."""
    declared = {m for m in measures_of(ctx.chart) if m in ctx.table.estimates}
    projected = {s.name for s in all_series(plan) if s.name.endswith("(estimate)")}
    return declared | projected


def _measure(plan: ChartPlan, ctx: Context) -> Finding:
    expected = sorted(_expected(plan, ctx))
    if not expected:
        return Finding(True, 0, wording.say("finding.actuals_only", plan.locale), "none")
    series = all_series(plan)
    flagged = {s.name for s in series if s.estimate}
    unmarked = estimate_titles(series, {n for n in expected if n not in flagged})
    titles = estimate_titles(series, set(expected))
    noted = note_for(titles, plan.locale) in plan.notes
    shown = wording.say("finding.estimate_series", plan.locale, count=len(expected))
    if not unmarked and noted:
        detail = wording.say("finding.estimates_ok", plan.locale, names=listed(titles, plan.locale))
        return Finding(True, len(expected), wording.sentence(detail), shown)
    if unmarked:
        what = wording.say(
            "finding.estimates_unmarked", plan.locale, names=listed(unmarked, plan.locale)
        )
    else:
        what = wording.say("finding.estimates_unlisted", plan.locale)
    return Finding(False, len(expected), wording.sentence(what), shown)


def _correct(plan: ChartPlan, ctx: Context) -> ChartPlan:
    expected = _expected(plan, ctx)

    def marked(series: Series) -> Series:
        return series.model_copy(update={"estimate": series.estimate or series.name in expected})

    panels = [p.model_copy(update={"series": [marked(s) for s in p.series]}) for p in plan.panels]
    series = [marked(s) for s in plan.series] + [s for p in panels for s in p.series]
    note = note_for(estimate_titles(series, expected), plan.locale)
    notes = plan.notes if note in plan.notes else [*plan.notes, note]
    return plan.model_copy(
        update={"series": [marked(s) for s in plan.series], "panels": panels, "notes": notes}
    )


SPEC = register(
    CheckSpec(
        id="estimates-distinct",
        title="Estimates look different from actuals",
        intents=OVER_TIME,
        forms=frozenset({"lines", "panels", "control"}),
        measures="series declared as estimates or projected, and whether each is drawn dashed, "
        "labelled, listed and kept apart from the actuals",
        threshold="every estimate dashed, labelled and listed",
        source="common practice (no source)",
        waivable=False,
        correction="The estimates were drawn dashed, labelled and listed on the chart.",
        measure=_measure,
        correct=_correct,
    )
)
