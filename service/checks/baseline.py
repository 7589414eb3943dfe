"""Bars start at zero: a bar's length is its value, so a truncated axis exaggerates differences."""

from __future__ import annotations

from service import formatting
from service.checks.registry import CheckSpec, Context, Finding, register
from service.intents import intents_drawing, scales
from service.intents.compare import truncation_note
from service.intents.plan import ChartPlan


def _measure(plan: ChartPlan, ctx: Context) -> Finding:
    base = plan.baseline or 0.0
    if base == 0.0:
        return Finding(True, 0.0, "Bars start at zero.", "0")
    shown = formatting.with_unit(base, plan.value_axis.unit, ctx.locale)
    return Finding(
        False,
        base,
        f"The definition asked for bars starting at {shown}, which would "
        "make their lengths exaggerate the differences.",
        f"starts at {shown}",
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
