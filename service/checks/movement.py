"""The latest change of a movement chart carries a verdict: a signal, or routine variation.

A change between two periods means little on its own: the check recomputes, from the data alone, the
natural process limits of the history (XmR chart, complete periods only) and the Western Electric
rules, and verifies that the plan states that reading of the latest complete period's change with its
limits, or says plainly that the history is too short for a verdict. A missing or wrong verdict is
recomputed and attached.
"""

from __future__ import annotations

from service import wording
from service.checks.registry import CheckSpec, Context, Finding, register
from service.definition.model import MovementChart
from service.intents import movement
from service.intents.compare import scale_note
from service.intents.plan import ChartPlan
from service.intents.registry import Env

_LINES = frozenset({"centre", "limit"})


def _reading(ctx: Context) -> movement.Reading:
    assert isinstance(ctx.chart, MovementChart)
    return movement.assess(ctx.chart, ctx.table, Env(locale=ctx.locale, as_of=ctx.as_of))


def _kind(reading: movement.Reading) -> str:
    if reading.limits is None:
        return "too little history"
    return "signal" if reading.verdicts[0].signal else "routine variation"


def _measure(plan: ChartPlan, ctx: Context) -> Finding:
    reading = _reading(ctx)
    expected = reading.verdicts[0]
    kind = _kind(reading)
    where = reading.labels[expected.index]
    drawn = [r for r in plan.references if r.kind in _LINES]
    locale = ctx.locale
    if not plan.verdicts:
        detail = wording.say("finding.no_verdict", locale, period=where)
        return Finding(False, "none", detail, "no verdict")
    if plan.verdicts[0] != expected:
        detail = wording.say(
            "finding.wrong_verdict", locale, shown=plan.verdicts[0].text, expected=expected.text
        )
        return Finding(False, "wrong", detail, "wrong verdict")
    if drawn != reading.references:
        return Finding(False, kind, wording.say("finding.wrong_limits", locale), "wrong limits")
    return Finding(True, kind, wording.sentence(expected.text), kind)


def _correct(plan: ChartPlan, ctx: Context) -> ChartPlan:
    reading = _reading(ctx)
    kept = [r for r in plan.references if r.kind not in _LINES]
    update: dict[str, object] = {
        "verdicts": reading.verdicts,
        "references": [*kept, *reading.references],
    }
    axis = plan.value_axis
    lines = [r.value for r in reading.references]
    if lines and (min(lines) < axis.lo or max(lines) > axis.hi):
        wider = movement.fitted_axis(reading, axis.unit, axis.label, axis.style)
        notes = [n for n in plan.notes if n != scale_note(axis, plan.locale)]
        if not wider.includes_zero:
            notes.append(scale_note(wider, plan.locale))
        update |= {"value_axis": wider, "notes": notes}
    return plan.model_copy(update=update)


SPEC = register(
    CheckSpec(
        id="delta-verdict",
        title="The latest change is judged against its history",
        intents=frozenset({"movement"}),
        forms=frozenset({"control"}),
        measures="whether the latest complete period's change carries the verdict its history "
        "gives (natural process limits x̄ ± 2.66·MR̄, moving-range limit 3.268·MR̄, Western "
        "Electric rules), with its limits drawn, or says the history is too short",
        threshold="a verdict (signal or routine variation) with its limits, or an explicit "
        "'too little history' statement",
        source="NIST/SEMATECH e-Handbook of Statistical Methods, §6.3.2.2 (individuals control "
        "charts); Western Electric, Statistical Quality Control Handbook (1956)",
        waivable=False,
        correction="The verdict on the latest change, with its limits, was recomputed from the "
        "data and attached.",
        measure=_measure,
        correct=_correct,
    )
)
