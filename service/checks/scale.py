"""Scales a designer would choose: a value axis ends at the next nice number beyond the data (a
percentage at 100 unless a value passes it), and a period still running never decides the scale of
the complete ones.

Both are measured on the plan, whose value axes the drawers draw exactly (ticks at the plan's nice
steps, ``render.common.value_ticks``). The colour of each measure across the pack is decided once,
in ``intents.colours``; the colour checks measure it.
"""

from __future__ import annotations

import math

from service import formatting, wording
from service.checks.registry import CheckSpec, Context, Finding, register
from service.definition.model import INTENTS, OVER_TIME
from service.intents import partial as off_scale
from service.intents import scales
from service.intents.compare import scale_note
from service.intents.forms import LENGTH_FORMS, POSITION_FORMS
from service.intents.plan import ChartPlan, Scale

_VALUE_AXIS_FORMS = (LENGTH_FORMS | POSITION_FORMS) - {"pie"}
_OVER_TIME_FORMS = frozenset({"lines", "control", "panels"})


def _shown(plan: ChartPlan) -> list[tuple[Scale, list[float]]]:
    """Each value axis with every value it must show: marks, intervals, targets, references, a bar
    baseline; of a chart over time, the complete periods only (the partial one never decides)."""
    if plan.form in _OVER_TIME_FORMS:
        refs = [r.value for r in plan.references]
        return [(axis, [*values, *refs]) for axis, values in off_scale.complete_values(plan)]
    values: list[float | None] = [plan.baseline]
    for c in plan.categories:
        values += [c.value, c.lo, c.hi, c.target]
    values += [r.value for r in plan.references]
    values += [float(b.count) for b in plan.bins]
    values += [v for b in plan.boxes for v in (b.low, b.high, *b.outliers)]
    values += [p.y for p in plan.points]
    return [(plan.value_axis, [v for v in values if v is not None and math.isfinite(v)])]


def _far_end(axis: Scale, values: list[float]) -> str | None:
    """Why an axis does not end at the next nice number beyond its values (None: it does)."""
    if axis.log or not values:
        return None
    ticks = scales.ticks(axis.lo, axis.hi)
    step = ticks[1] - ticks[0] if len(ticks) > 1 else axis.hi - axis.lo
    top, bottom = max(values), min(values)
    if axis.unit == scales.PERCENT and top <= 100.0 < axis.hi:
        return "percent"
    room = scales.EDGE_ROOM * (top - bottom) + 1e-9 * step  # a line or dot kept off the frame
    if axis.hi - max(top, 0.0 if axis.lo == 0.0 else top) >= step + room:
        return "high"
    floor = 0.0 if axis.lo == 0.0 and bottom >= 0.0 else bottom
    if floor - axis.lo >= step + room:
        return "low"
    return None


def _end_measure(plan: ChartPlan, ctx: Context) -> Finding:
    ends = []
    for axis, values in _shown(plan):
        shown = formatting.with_unit(axis.hi, axis.unit, ctx.locale)
        ends.append(shown)
        why = _far_end(axis, values)
        if why is not None:
            top = formatting.with_unit(max(values), axis.unit, ctx.locale)
            bottom = formatting.with_unit(min(values), axis.unit, ctx.locale)
            detail = wording.say(
                f"scale.end_{why}",
                ctx.locale,
                lo=formatting.with_unit(axis.lo, axis.unit, ctx.locale),
                hi=shown,
                top=top,
                bottom=bottom,
            )
            return Finding(False, axis.hi, detail, shown)
    hi = plan.panels[0].value_axis.hi if plan.panels else plan.value_axis.hi
    return Finding(True, hi, wording.say("scale.end_ok", ctx.locale), ", ".join(ends))


def _partial_measure(plan: ChartPlan, ctx: Context) -> Finding:
    share = off_scale.complete_share(plan, zero=_zero_based(ctx))
    percent = formatting.percent(round(share * 100), ctx.locale)
    shown = percent
    if share < scales.MIN_COMPLETE_SHARE:
        detail = wording.say("scale.partial_squeezed", ctx.locale, share=percent)
        return Finding(False, round(share, 4), detail, shown)
    unmarked = off_scale.outside(plan) and (plan.partial is None or not plan.partial.off_scale)
    if unmarked:
        detail = wording.say("scale.partial_unmarked", ctx.locale, share=percent)
        return Finding(False, round(share, 4), detail, shown)
    return Finding(
        True, round(share, 4), wording.say("scale.partial_ok", ctx.locale, share=percent), shown
    )


def _zero_based(ctx: Context) -> bool:
    """Whether the chart asked for a scale from zero (a zero the partial period pulled in does not
    count as shown)."""
    return bool(getattr(ctx.chart, "from_zero", False))


def _refit(
    plan: ChartPlan, axis: Scale, done: list[float], running: list[float], *, zero: bool
) -> Scale:
    refs = [r.value for r in plan.references]
    lo, hi = scales.fit_periods(
        [*done, *refs],
        running,
        include_zero=zero,
        unit=axis.unit,
        log=axis.log,
    )
    return axis.model_copy(update={"lo": lo, "hi": hi})


def _partial_correct(plan: ChartPlan, ctx: Context) -> ChartPlan:
    """Each value axis decided by its complete periods again, the partial values outside it marked
    off the scale, and the scale note moved to where the axis now starts."""

    def renoted(notes: list[str], old: Scale, new: Scale) -> list[str]:
        stale = scale_note(old, plan.locale)
        kept = [n for n in notes if n != stale]
        return kept if new.includes_zero or new.log else [*kept, scale_note(new, plan.locale)]

    index = plan.partial.index if plan.partial is not None else -1
    if plan.panels:
        refitted = {}
        for old, series in off_scale.axes_of(plan):  # panels sharing a scale keep sharing it
            done, running = off_scale.split(plan.partial, *(s.values for s in series))
            refitted[old] = _refit(plan, old, done, running, zero=_zero_based(ctx))
        panels = []
        for panel in plan.panels:
            axis = refitted[panel.value_axis]
            notes = renoted(panel.notes, panel.value_axis, axis)
            panels.append(panel.model_copy(update={"value_axis": axis, "notes": notes}))
        fixed = plan.model_copy(update={"panels": panels, "value_axis": panels[0].value_axis})
    else:
        values = [
            [v if x != index else None for x, v in zip(s.positions(), s.values, strict=True)]
            for s in plan.series
        ]
        running = [v for s in plan.series if (v := s.at(index)) is not None]
        done, _ = off_scale.split(None, *values)
        axis = _refit(plan, plan.value_axis, done, running, zero=_zero_based(ctx))
        notes = renoted(plan.notes, plan.value_axis, axis)
        fixed = plan.model_copy(update={"value_axis": axis, "notes": notes})
    return off_scale.mark_off_scale(fixed)


END = register(
    CheckSpec(
        id="scale-nice-end",
        title="The value axis ends at the next nice number beyond the data",
        intents=frozenset(INTENTS),
        forms=_VALUE_AXIS_FORMS,
        measures="how far the value axis runs past the greatest (and before the least) value it "
        "must show, in tick steps; for a percentage, whether it runs past 100",
        threshold="less than one tick step each side; a percentage with no value above 100 ends "
        "at 100 at most",
        source="Few, 'Show Me the Numbers' (2012), ch. 10 (scales that fit the data); common "
        "practice",
        waivable=True,
        correction=None,
        measure=_end_measure,
    )
)

PARTIAL = register(
    CheckSpec(
        id="partial-period-scale",
        title="A partial period does not decide the scale of the complete periods",
        intents=OVER_TIME,
        forms=_OVER_TIME_FORMS,
        measures="the share of the plot height the complete periods use (with the references "
        "and the zero line the scale must show), and whether a partial value outside the scale "
        "is marked off-scale with its value and completeness",
        threshold=f"at least {scales.MIN_COMPLETE_SHARE:.0%} of the height",
        source="Cleveland, 'The Elements of Graphing Data' (1994), p. 94 (fill the data region); "
        "common practice",
        waivable=False,
        correction="The scale was fitted to the complete periods; the partial period's values "
        "outside it are drawn as an off-scale mark with their values and completeness.",
        measure=_partial_measure,
        correct=_partial_correct,
    )
)
