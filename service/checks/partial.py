"""A period still running at ``as_of`` is drawn distinctly, with its completeness, not as a collapse."""

from __future__ import annotations

from service import wording
from service.checks.registry import CheckSpec, Context, Finding, register
from service.data import periods
from service.definition.model import OVER_TIME
from service.intents import partial as off_scale
from service.intents.plan import ChartPlan, PartialMark


def _last(ctx: Context) -> tuple[str, periods.Completeness | None, int]:
    table = ctx.table
    assert table.periods is not None and table.frequency is not None
    last = table.periods.max()
    index = len(periods.expected(table.periods.min(), last)) - 1
    return (
        periods.label(last, table.frequency, ctx.locale),
        periods.completeness(last, ctx.as_of),
        index,
    )


def _measure(plan: ChartPlan, ctx: Context) -> Finding:
    label, done, index = _last(ctx)
    locale = ctx.locale
    if done is None:
        if plan.partial is None:
            return Finding(
                True, 1.0, wording.say("finding.last_complete", locale, period=label), "complete"
            )
        return Finding(
            False,
            1.0,
            wording.say("finding.complete_drawn_partial", locale, period=label),
            "complete",
        )
    fraction = round(done.fraction, 4)
    ran = done.text(locale)
    expected = PartialMark(index=index, text=ran, fraction=done.fraction)
    if plan.partial is not None and plan.partial.model_copy(update={"off_scale": None}) == expected:
        detail = wording.say("finding.partial_drawn", locale, period=label, done=ran)
        return Finding(True, fraction, detail, ran)
    detail = wording.say("finding.partial_not_drawn", locale, period=label, done=ran)
    return Finding(False, fraction, detail, ran)


def _correct(plan: ChartPlan, ctx: Context) -> ChartPlan:
    _, done, index = _last(ctx)
    mark = (
        None
        if done is None
        else PartialMark(index=index, text=done.text(ctx.locale), fraction=done.fraction)
    )
    return off_scale.mark_off_scale(plan.model_copy(update={"partial": mark}))


SPEC = register(
    CheckSpec(
        id="partial-period",
        title="A partial last period is marked",
        intents=OVER_TIME,
        forms=frozenset({"lines", "panels", "control"}),
        measures="the share of the last period elapsed at as_of (whole days)",
        threshold="a period under 100 % elapsed is drawn hollow and labelled",
        source="common practice (no source)",
        waivable=False,
        correction="The last period was drawn hollow and labelled with its completeness.",
        measure=_measure,
        correct=_correct,
    )
)
