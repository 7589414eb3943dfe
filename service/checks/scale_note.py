"""Position encodings (dots, lines) may use a scale that does not start at zero, if the chart says so."""

from __future__ import annotations

from service import wording
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
        start = axis.shown(axis.lo, ctx.locale)
        starts.append(start)
        if scale_note(axis, plan.locale) not in notes:
            unmarked.append(start)
    lo = plan.panels[0].value_axis.lo if plan.panels else plan.value_axis.lo
    locale = ctx.locale
    if not starts:
        included = wording.say("finding.includes_zero", locale)
        return Finding(True, lo, wording.say("finding.axis_includes_zero", locale), included)
    shown = wording.say("finding.starts_at", locale, start=", ".join(starts))
    key = "finding.scale_noted" if not unmarked else "finding.scale_not_noted"
    return Finding(not unmarked, lo, wording.say(key, locale, shown=shown), shown)


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
