"""Checks on series and value axes: never two y-axes, and no more colour-coded series than a reader
can tell apart.

``series-count`` runs first, because its correction may change the form (lines → panels);
``no-dual-axis`` then measures the final form.
"""

from __future__ import annotations

from service.checks.registry import CheckSpec, Context, Finding, register
from service.definition.model import INTENTS, RelativeChangeChart, TrendChart
from service.intents import relative_change
from service.intents.compare import scale_note
from service.intents.plan import ChartPlan, Panel, Series

#: At most this many series may be told apart by colour alone on one axes.
MAX_COLOURED = 4

SHARED_NOTE = "The panels share one scale, so their heights can be compared."


def _others(count: int) -> str:
    return f"{count} other{'' if count == 1 else 's'} in grey"


def _coloured(series: list[Series]) -> list[Series]:
    return [s for s in series if not s.muted]


def _count(plan: ChartPlan, ctx: Context) -> Finding:
    if plan.form == "panels":
        most = max((len(_coloured(p.series)) for p in plan.panels), default=0)
        shared = len({p.value_axis for p in plan.panels}) <= 1
        shown = f"split into {len(plan.panels)} panels on " + (
            "one shared scale" if shared else "different scales"
        )
        if shared and most <= MAX_COLOURED:
            return Finding(
                True,
                most,
                f"The series are drawn in {len(plan.panels)} panels on one shared scale, "
                f"at most {most} colour-coded in each.",
                shown,
            )
        return Finding(
            False,
            most,
            f"The series are split into {len(plan.panels)} panels, but "
            + ("their scales differ." if not shared else f"one has {most} colour-coded series."),
            shown,
        )
    coloured = _coloured(plan.series)
    muted = len(plan.series) - len(coloured)
    count = len(coloured)
    names = ", ".join(s.name for s in coloured)
    shown = f"highlighted {names}, {_others(muted)}" if muted else f"{count} series"
    if count <= MAX_COLOURED:
        detail = (
            f"Highlighted {names}; the {_others(muted)} are context, not to be told apart."
            if muted
            else f"{count} colour-coded series (at most {MAX_COLOURED}): each can be told apart."
        )
        return Finding(True, count, detail, shown)
    return Finding(
        False,
        count,
        f"{count} series are told apart by colour alone, more than the {MAX_COLOURED} a reader "
        "can match to their labels reliably.",
        shown,
    )


def _split(plan: ChartPlan) -> ChartPlan:
    """One panel per series, every panel on the chart's own value axis (shared, so comparable)."""
    axis = plan.value_axis
    note = scale_note(axis, plan.locale)
    needs_note = not (axis.includes_zero or axis.log)
    panels = [
        Panel(
            title=series.name,
            value_axis=axis,
            series=[series.model_copy(update={"muted": False})],
            notes=[note] if needs_note else [],
        )
        for series in plan.series
    ]
    notes = [n for n in plan.notes if n != note] + [SHARED_NOTE]
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
    differ = relative_change.units_text(chart, ctx.table)
    why = f"units differ ({differ})" if differ else "only the change is compared"
    if plan.form == "panels":
        return "aligned panels, each with its own scale", why
    base = relative_change.base_label(chart, ctx.table, ctx.locale)
    if chart.index_as == "percent_change":
        return f"indexed as % change since {base}", why
    return f"indexed to {base} = 100", why


def _axes(plan: ChartPlan, ctx: Context) -> Finding:
    # A Panel has one value_axis and a plan without panels has one: a second y-axis cannot be
    # written down, so the count is one by construction; what is recorded is the form.
    if isinstance(ctx.chart, RelativeChangeChart):
        chosen, why = _chosen(plan, ctx)
        return Finding(
            True,
            1,
            f"Drawn as {chosen} because {why}: never two y-axes, which would let the "
            "choice of two scales make any two lines appear to cross or move together.",
            chosen,
        )
    count = len(plan.panels)
    shown = f"1 value axis in each of {count} panels" if count else "1 value axis"
    return Finding(
        True,
        1,
        f"{shown.capitalize()}: this form cannot draw a second y-axis, so two y-axes are "
        "impossible.",
        shown,
        applicable=False,
    )


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
