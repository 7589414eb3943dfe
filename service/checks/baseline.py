"""Bars start at zero: a bar's length is its value, so a truncated axis exaggerates differences."""

from __future__ import annotations

from service import wording
from service.checks.registry import CheckSpec, Context, Finding, register
from service.intents import intents_drawing, scales
from service.intents.compare import truncation_note
from service.intents.plan import ChartPlan


def _measure(plan: ChartPlan, ctx: Context) -> Finding:
    base = plan.baseline or 0.0
    if base == 0.0:
        return Finding(True, 0.0, wording.say("finding.bars_from_zero", ctx.locale), "0")
    shown = plan.value_axis.shown(base, ctx.locale)
    return Finding(
        False,
        base,
        wording.say("finding.bars_asked_from", ctx.locale, start=shown),
        wording.say("finding.starts_at", ctx.locale, start=shown),
    )


def _correct(plan: ChartPlan, ctx: Context) -> ChartPlan:
    values = [c.value for c in plan.categories if c.value is not None]
    values += [float(b.count) for b in plan.bins]
    values += [c.target for c in plan.categories if c.target is not None]
    lo, hi = scales.fit(values, include_zero=True, unit=plan.value_axis.unit)
    axis = plan.value_axis.model_copy(update={"lo": lo, "hi": hi})
    note = truncation_note(plan.baseline or 0.0, axis.unit, plan.locale)
    notes = [n for n in plan.notes if n != note]
    return plan.model_copy(update={"baseline": 0.0, "value_axis": axis, "notes": notes})


#: The forms drawn with bars from a zero line.
_BARS = frozenset({"bars", "deviation", "histogram"})


SPEC = register(
    CheckSpec(
        id="bar-zero-baseline",
        title="Bars start at zero",
        intents=intents_drawing(_BARS),
        forms=_BARS,
        measures="where the bars start on the value axis",
        threshold="0",
        source="Tufte (1983), p. 57; Correll, Bertini & Franconeri, 'Truncating the Y-Axis: Threat or "
        "Menace?', CHI 2020",
        waivable=True,
        never_waivable_for=frozenset({"share"}),
        correction="Bars were drawn from zero instead.",
        measure=_measure,
        correct=_correct,
    )
)
