"""Checks on series and value axes: never two y-axes, and no more colour-coded series than a reader
can tell apart.

``series-count`` runs first, because its correction may change the form (lines → panels);
``no-dual-axis`` then measures the final form.
"""

from __future__ import annotations

from service import wording
from service.checks.registry import CheckSpec, Context, Finding, register
from service.definition.model import INTENTS, RelativeChangeChart, TrendChart
from service.intents import relative_change
from service.intents.compare import scale_note
from service.intents.plan import ChartPlan, Panel, Series

#: At most this many series may be told apart by colour alone on one axes.
MAX_COLOURED = 4


def shared_note(locale: str) -> str:
    """The note of panels split from one chart: they share its scale."""
    return wording.say("text.shared_scale", locale)


SHARED_NOTE = shared_note("en-GB")


def _coloured(series: list[Series]) -> list[Series]:
    return [s for s in series if not s.muted]


def _count(plan: ChartPlan, ctx: Context) -> Finding:
    locale = ctx.locale
    if plan.form == "panels":
        most = max((len(_coloured(p.series)) for p in plan.panels), default=0)
        shared = len({p.value_axis for p in plan.panels}) <= 1
        panels = {"panels": len(plan.panels), "most": most}
        shown = wording.say(
            "finding.split_shared" if shared else "finding.split_own", locale, **panels
        )
        if shared and most <= MAX_COLOURED:
            return Finding(True, most, wording.say("finding.panels_ok", locale, **panels), shown)
        key = "finding.panels_differ" if not shared else "finding.panels_crowded"
        return Finding(False, most, wording.say(key, locale, **panels), shown)
    coloured = _coloured(plan.series)
    muted = len(plan.series) - len(coloured)
    count = len(coloured)
    names = ", ".join(s.title for s in coloured)
    grey = wording.say(
        "finding.other_grey" if muted == 1 else "finding.others_grey", locale, count=muted
    )
    words = {"names": names, "others": grey, "count": count, "most": MAX_COLOURED}
    if muted:
        shown = wording.say("finding.highlighted", locale, **words)
    else:
        shown = wording.say("finding.count_series", locale, **words)
    if count <= MAX_COLOURED:
        key = "finding.highlighted_ok" if muted else "finding.series_ok"
        return Finding(True, count, wording.say(key, locale, **words), shown)
    return Finding(False, count, wording.say("finding.series_too_many", locale, **words), shown)


def _split(plan: ChartPlan) -> ChartPlan:
    """One panel per series, every panel on the chart's own value axis (shared, so comparable)."""
    axis = plan.value_axis
    note = scale_note(axis, plan.locale)
    needs_note = not (axis.includes_zero or axis.log)
    panels = [
        Panel(
            title=series.title,
            value_axis=axis,
            series=[series.model_copy(update={"muted": False})],
            notes=[note] if needs_note else [],
        )
        for series in plan.series
    ]
    notes = [n for n in plan.notes if n != note] + [shared_note(plan.locale)]
    return plan.model_copy(
        update={"form": "panels", "series": [], "panels": panels, "notes": notes}
    )


def _correct(plan: ChartPlan, ctx: Context) -> ChartPlan:
    chart = ctx.chart
    focus = chart.focus if isinstance(chart, TrendChart) else None
    if focus is not None and any(s.name == focus for s in plan.series):
        series = [s.model_copy(update={"muted": s.name != focus}) for s in plan.series]
        return plan.model_copy(update={"series": series})
    return _split(plan)


SERIES_COUNT = register(
    CheckSpec(
        id="series-count",
        title="No more than four colour-coded series",
        intents=frozenset({"trend"}),
        forms=frozenset({"lines"}),
        measures="the series on one axes told apart by colour alone (muted grey series not counted)",
        threshold=f"at most {MAX_COLOURED}",
        source="UK Government Analysis Function, 'Data visualisation: charts' guidance (at most "
        "four colours or categories; from memory); Paul Tol, 'Colour schemes' (colour-blind-safe "
        "qualitative schemes stop at 7 to 9 colours; from memory)",
        waivable=True,
        correction="The focus series was highlighted and the others drawn in grey; without a "
        "focus, the series were split into panels on one shared scale.",
        measure=_count,
        correct=_correct,
    )
)


def _chosen(plan: ChartPlan, ctx: Context) -> tuple[str, str]:
    """What a relative_change chart draws instead of two y-axes, and why."""
    chart = ctx.chart
    assert isinstance(chart, RelativeChangeChart)
    locale = ctx.locale
    differ = relative_change.units_text(chart, ctx.table, locale)
    if differ:
        why = wording.say("finding.units_differ", locale, differ=differ)
    else:
        why = wording.say("finding.only_change", locale)
    if plan.form == "panels":
        return wording.say("finding.aligned_panels", locale), why
    base = relative_change.base_label(chart, ctx.table, locale)
    if chart.index_as == "percent_change":
        return wording.say("finding.indexed_change", locale, base=base), why
    return wording.say("finding.indexed_100", locale, base=base), why


def _axes(plan: ChartPlan, ctx: Context) -> Finding:
    # A Panel has one value_axis and a plan without panels has one: a second y-axis cannot be
    # written down, so the count is one by construction; what is recorded is the form.
    locale = ctx.locale
    if isinstance(ctx.chart, RelativeChangeChart):
        chosen, why = _chosen(plan, ctx)
        detail = wording.say("finding.drawn_instead", locale, chosen=chosen, why=why)
        return Finding(True, 1, detail, chosen)
    count = len(plan.panels)
    if count:
        shown = wording.say("finding.axis_per_panel", locale, count=count)
    else:
        shown = wording.say("finding.one_axis", locale)
    detail = wording.say("finding.no_second_axis", locale, shown=shown[:1].upper() + shown[1:])
    return Finding(True, 1, detail, shown, applicable=False)


NO_DUAL_AXIS = register(
    CheckSpec(
        id="no-dual-axis",
        title="Never two value axes on one chart",
        intents=frozenset(INTENTS),
        forms=frozenset(
            {
                "lines",
                "panels",
                "control",
                "bars",
                "dots",
                "deviation",
                "histogram",
                "box",
                "scatter",
            }
        ),
        measures="the value axes of each panel (a plan has exactly one per panel); for measures "
        "in different units, the form drawn instead",
        threshold="1 value axis per panel",
        source="Schwabish, 'Avoiding the Dual Axis Chart', PolicyViz newsletter (September 2022); "
        "Cairo, How Charts Lie (2019), quoting Gary Smith, Standard Deviations (2015) (from "
        "memory)",
        waivable=False,
        correction=None,
        measure=_axes,
    )
)
