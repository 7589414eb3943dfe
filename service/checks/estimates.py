"""Estimates and forecasts always look different from actuals, and are listed as such.

A series is an estimate when its column is declared ``estimate: true`` or when it is a projection of
a partial period (``projection`` on a trend, only for columns declared ``projectable``). Estimates are
separate series, so they are never joined into the actual line; they are drawn dashed (or as hollow
diamonds when they are single points), labelled "estimate", and named in a note on the chart.
"""

from __future__ import annotations

from service.checks.missing import measures_of
from service.checks.registry import CheckSpec, Context, Finding, register
from service.definition.model import OVER_TIME
from service.intents.plan import ChartPlan, Series, all_series
from service.intents.trend import estimates_note as note_for


def _expected(plan: ChartPlan, ctx: Context) -> set[str]:
    """Names of the series that must be drawn as estimates."""
    declared = {m for m in measures_of(ctx.chart) if m in ctx.table.estimates}
    projected = {s.name for s in all_series(plan) if s.name.endswith("(estimate)")}
    return declared | projected


def _measure(plan: ChartPlan, ctx: Context) -> Finding:
    expected = sorted(_expected(plan, ctx))
    if not expected:
        return Finding(True, 0, "The chart shows actuals only.", "none")
    flagged = {s.name for s in all_series(plan) if s.estimate}
    unmarked = [n for n in expected if n not in flagged]
    listed = note_for(expected) in plan.notes
    shown = f"{len(expected)} estimate series"
    if not unmarked and listed:
        return Finding(
            True,
            len(expected),
            f"Drawn dashed, labelled and listed: "
            f"{', '.join(expected)}; never joined to the actuals.",
            shown,
        )
    what = f"not drawn as estimates: {', '.join(unmarked)}" if unmarked else "not listed"
    return Finding(False, len(expected), f"Estimates {what}.", shown)


def _correct(plan: ChartPlan, ctx: Context) -> ChartPlan:
    expected = _expected(plan, ctx)

    def marked(series: Series) -> Series:
        return series.model_copy(update={"estimate": series.estimate or series.name in expected})

    panels = [p.model_copy(update={"series": [marked(s) for s in p.series]}) for p in plan.panels]
    note = note_for(sorted(expected))
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
