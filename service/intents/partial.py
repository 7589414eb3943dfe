"""A period still running at ``as_of``, on a scale the complete periods decided.

The complete periods decide a chart's value axis (``scales.fit_periods``); a value of the partial
period that lies outside it is not allowed to stretch it. Such a value is drawn as an off-scale mark
at the edge of the plot, and the plan says what that mark reads: the values and how much of the
period had run. Nothing here draws.
"""

from __future__ import annotations

from collections.abc import Sequence

from service import formatting, wording
from service.intents import scales
from service.intents.plan import ChartPlan, PartialMark, Scale, Series


def axes_of(plan: ChartPlan) -> list[tuple[Scale, list[Series]]]:
    """Each value axis of the plan with the series drawn on it; panels that share one scale (so
    their heights compare) are one axis holding all their series."""
    if not plan.panels:
        return [(plan.value_axis, plan.series)]
    shared: dict[Scale, list[Series]] = {}
    for panel in plan.panels:
        shared.setdefault(panel.value_axis, []).extend(panel.series)
    return list(shared.items())


def outside(plan: ChartPlan) -> list[tuple[Series, float, Scale]]:
    """The partial period's values that lie outside their value axis, with the series and axis."""
    partial = plan.partial
    if partial is None:
        return []
    found = []
    for axis, series_list in axes_of(plan):
        for series in series_list:
            value = series.at(partial.index)
            if value is not None and not axis.lo <= value <= axis.hi:
                found.append((series, value, axis))
    return found


def complete_values(plan: ChartPlan) -> list[tuple[Scale, list[float]]]:
    """Each value axis with the values of the complete periods drawn on it (estimates of a
    complete period count; nothing of the partial period does)."""
    skip = plan.partial.index if plan.partial is not None else None
    out = []
    for axis, series_list in axes_of(plan):
        values = [
            v
            for s in series_list
            for x, v in zip(s.positions(), s.values, strict=True)
            if v is not None and x != skip
        ]
        out.append((axis, values))
    return out


def complete_share(plan: ChartPlan, *, zero: bool = False) -> float:
    """The least share of a plot's height the complete periods use, with the references the scale
    must also show (``scales.complete_share``), over every value axis of the plan; ``zero``: the
    chart asked for a zero-based scale, so the zero line counts as shown."""
    shown = [r.value for r in plan.references]
    return min(
        (
            scales.complete_share(axis.lo, axis.hi, values, shown, log=axis.log, zero=zero)
            for axis, values in complete_values(plan)
        ),
        default=1.0,
    )


def mark_off_scale(plan: ChartPlan) -> ChartPlan:
    """The plan with its partial period's off-scale mark written (or cleared when all fit)."""
    partial = plan.partial
    if partial is None:
        return plan
    found = outside(plan)
    text = None
    if found:
        values = ", ".join(_value(s, v, axis, plan.locale) for s, v, axis in found)
        below = all(v < axis.lo for _, v, axis in found)
        text = wording.say(
            "scale.off_scale_below" if below else "scale.off_scale_above",
            plan.locale,
            period=plan.periods[partial.index] if partial.index < len(plan.periods) else "",
            completeness=partial.text,
            values=values,
        )
    if text == partial.off_scale:
        return plan
    return plan.model_copy(update={"partial": partial.model_copy(update={"off_scale": text})})


def split(
    partial: PartialMark | None, *columns: Sequence[float | None]
) -> tuple[list[float], list[float]]:
    """The present values of the complete periods, and those of the partial period, of one or more
    columns of values on the period axis."""
    skip = partial.index if partial is not None else -1
    done = [v for values in columns for i, v in enumerate(values) if v is not None and i != skip]
    running = [
        v for values in columns if 0 <= skip < len(values) and (v := values[skip]) is not None
    ]
    return done, running


def _value(series: Series, value: float, axis: Scale, locale: str) -> str:
    """ "operated 1,601 journeys"; "5,254 passengers" where the unit already names the measure."""
    unit = series.unit or axis.unit
    shown = formatting.with_unit(value, unit, locale)
    return (
        shown if series.name.strip().lower() == unit.strip().lower() else f"{series.name} {shown}"
    )
