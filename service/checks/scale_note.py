"""Position encodings (dots, lines) may use a scale that does not start at zero, if the chart says so."""

from __future__ import annotations

from service import formatting
from service.checks.registry import CheckSpec, Context, Finding, register
from service.intents import intents_drawing
from service.intents.compare import scale_note
from service.intents.forms import POSITION_FORMS
from service.intents.plan import ChartPlan, Scale


def _axes(plan: ChartPlan) -> list[tuple[Scale, list[str]]]:
    """Each value axis with the notes shown beside it (a panel's own, else the chart's)."""
    if plan.panels:
        return [(p.value_axis, p.notes) for p in plan.panels]
    return [(plan.value_axis, plan.notes)]


def _measure(plan: ChartPlan, ctx: Context) -> Finding:
    unmarked, starts = [], []
    for axis, notes in _axes(plan):
        if axis.includes_zero or axis.log:  # a log scale has a note of its own
            continue
        start = formatting.with_unit(axis.lo, axis.unit, ctx.locale)
        starts.append(start)
        if scale_note(axis, plan.locale) not in notes:
            unmarked.append(start)
    lo = plan.panels[0].value_axis.lo if plan.panels else plan.value_axis.lo
    if not starts:
        return Finding(True, lo, "The value axis includes zero.", "includes 0")
    shown = "starts at " + ", ".join(starts)
    if not unmarked:
        return Finding(True, lo, f"The scale {shown}, and the chart says so.", shown)
    return Finding(False, lo, f"The scale {shown}, but the chart does not say so.", shown)


def _correct(plan: ChartPlan, ctx: Context) -> ChartPlan:
    def noted(axis: Scale, notes: list[str]) -> list[str]:
        note = scale_note(axis, plan.locale)
        needed = not (axis.includes_zero or axis.log) and note not in notes
        return [*notes, note] if needed else notes

    if plan.panels:
        panels = [p.model_copy(update={"notes": noted(p.value_axis, p.notes)}) for p in plan.panels]
        return plan.model_copy(update={"panels": panels})
    return plan.model_copy(update={"notes": noted(plan.value_axis, plan.notes)})


SPEC = register(
    CheckSpec(
        id="nonzero-scale-noted",
        title="A scale that does not start at zero is marked",
        intents=intents_drawing(POSITION_FORMS),
        forms=POSITION_FORMS,
        measures="where the value axis starts, and whether the chart states it",
        threshold="axis includes 0, or a note on the chart",
        source="common practice (no source)",
        waivable=False,
        correction="A note saying where the scale starts was added to the chart.",
        measure=_measure,
        correct=_correct,
    )
)
