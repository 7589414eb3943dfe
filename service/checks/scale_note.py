"""Position encodings (dots, lines) may use a scale that does not start at zero, if the chart says so."""

from __future__ import annotations

from service import formatting
from service.checks.registry import CheckSpec, Context, Finding, register
from service.intents.compare import scale_note
from service.intents.plan import ChartPlan


def _measure(plan: ChartPlan, ctx: Context) -> Finding:
    axis = plan.value_axis
    start = formatting.with_unit(axis.lo, axis.unit, ctx.locale)
    shown = f"starts at {start}"
    if axis.includes_zero:
        return Finding(True, axis.lo, "The value axis includes zero.", "includes 0")
    if scale_note(axis, plan.locale) in plan.notes:
        return Finding(True, axis.lo, f"The scale starts at {start}, and the chart says so.", shown)
    return Finding(
        False, axis.lo, f"The scale starts at {start}, but the chart does not say so.", shown
    )


def _correct(plan: ChartPlan, ctx: Context) -> ChartPlan:
    return plan.model_copy(
        update={"notes": [*plan.notes, scale_note(plan.value_axis, plan.locale)]}
    )


SPEC = register(
    CheckSpec(
        id="nonzero-scale-noted",
        title="A scale that does not start at zero is marked",
        intents=frozenset({"compare", "trend"}),
        forms=frozenset({"dots", "lines"}),
        measures="where the value axis starts, and whether the chart states it",
        threshold="axis includes 0, or a note on the chart",
        source="common practice (no source)",
        waivable=False,
        correction="A note saying where the scale starts was added to the chart.",
        measure=_measure,
        correct=_correct,
    )
)
