"""Every chart says where its data comes from, and has a text alternative."""

from __future__ import annotations

from service import formatting, wording
from service.checks.registry import CheckSpec, Context, Finding, register
from service.definition.model import INTENTS
from service.intents.forms import LENGTH_FORMS, POSITION_FORMS
from service.intents.plan import ChartPlan

_ALL_INTENTS = frozenset(INTENTS)
_ALL_FORMS = LENGTH_FORMS | POSITION_FORMS


def _source(plan: ChartPlan, ctx: Context) -> Finding:
    if plan.source:
        detail = wording.say("finding.source", plan.locale, source=plan.source)
        return Finding(True, plan.source, detail, "given")
    return Finding(False, None, wording.say("finding.no_source", plan.locale), "none")


def _fill_source(plan: ChartPlan, ctx: Context) -> ChartPlan:
    dataset = formatting.humanise(ctx.table.name)
    source = wording.say("text.source_unstated", ctx.locale, dataset=dataset, owner=ctx.owner)
    return plan.model_copy(update={"source": source})


register(
    CheckSpec(
        id="source-line",
        title="A source line under every chart",
        intents=_ALL_INTENTS,
        forms=_ALL_FORMS,
        measures="whether the chart or its dataset names where the data comes from",
        threshold="a source is named",
        source="common practice (no source)",
        waivable=False,
        correction="The source line names the dataset and the report's owner instead.",
        measure=_source,
        correct=_fill_source,
    )
)


def _alternative(plan: ChartPlan, ctx: Context) -> Finding:
    words = len((plan.description or "").split())
    count = wording.say("finding.words", plan.locale, count=words)
    if words >= 5:
        return Finding(True, words, wording.say("finding.alternative", plan.locale), count)
    return Finding(False, words, wording.say("finding.no_alternative", plan.locale), count)


register(
    CheckSpec(
        id="text-alternative",
        title="Every chart has a text alternative",
        intents=_ALL_INTENTS,
        forms=_ALL_FORMS,
        measures="the words of the chart's description (written by the author, else generated)",
        threshold="at least 5 words",
        source="W3C WCAG 2.2, success criterion 1.1.1 Non-text Content",
        waivable=False,
        correction=None,
        measure=_alternative,
        phase="final",
    )
)
