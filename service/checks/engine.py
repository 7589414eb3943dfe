"""Run every applicable check over a chart plan: pass, correct, honour a waiver, or fail.

For each check in registry order: measure the plan. A breach is *waived* when the definition carries a
current waiver for that check and chart (the plan is left as requested); otherwise *corrected* when the
check can correct it (the corrected plan is measured again and must pass); otherwise *failed*. Failed
checks are written onto the plan's ``flags`` so the chart itself shows them.

:func:`finish` adds the checks that need the drawn chart (``label-layout``) once the renderer has
measured it. Both phases find a chart's waiver through :func:`waiver_for`, the one waiver lookup.
"""

from __future__ import annotations

import re
from collections.abc import Sequence
from dataclasses import dataclass, replace
from datetime import date

from service import formatting, wording
from service.checks import describe, layout, registry
from service.checks.layout import DrawnLabels
from service.checks.outcome import Checked
from service.checks.registry import CheckSpec, Context, Finding
from service.checks.results import CheckResult, Status, WaiverRecord
from service.definition.model import Waiver, local_wall_time
from service.intents.plan import ChartPlan


@dataclass(frozen=True)
class Guarded:
    plan: ChartPlan
    results: list[CheckResult]


def guard(plan: ChartPlan, ctx: Context, waivers: list[Waiver]) -> Guarded:
    results: list[CheckResult] = []
    specs = list(registry.CHECKS.values())  # applicability is judged on the plan as it stands
    plan = _run([s for s in specs if s.phase == "plan"], plan, ctx, waivers, results)
    if not plan.description:
        plan = plan.model_copy(update={"description": describe.describe(plan, results)})
    plan = _run([s for s in specs if s.phase == "final"], plan, ctx, waivers, results)
    flags = [f"{r.check}: {r.explanation}" for r in results if r.status is Status.failed]
    if flags:
        plan = plan.model_copy(update={"flags": flags})
    return Guarded(plan=plan, results=results)


def _run(
    specs: list[CheckSpec],
    plan: ChartPlan,
    ctx: Context,
    waivers: list[Waiver],
    results: list[CheckResult],
) -> ChartPlan:
    for spec in specs:
        if not spec.applies(plan):
            continue  # e.g. a pie corrected to bars is then measured as bars
        finding = spec.measure(plan, ctx)
        if finding.ok and not finding.applicable:
            results.append(_result(spec, plan, Status.not_applicable, finding, finding.detail))
            continue
        if finding.ok:
            results.append(_result(spec, plan, Status.passed, finding, finding.detail))
            continue
        if spec.level == "advice":
            results.append(_result(spec, plan, Status.advice, finding, finding.detail))
            continue
        waiver, expired = waiver_for(spec, plan, waivers, ctx.as_of.date())
        if waiver is not None:
            record = WaiverRecord(reason=waiver.reason, by=waiver.by, expires=waiver.expires)
            results.append(
                _result(
                    spec,
                    plan,
                    Status.waived,
                    finding,
                    wording.sentence(
                        finding.detail, wording.say("finding.waived_by", ctx.locale, by=waiver.by)
                    ),
                    waiver=record,
                )
            )
            continue
        note = ""
        if expired:
            note = wording.say("finding.waiver_expired", ctx.locale, date=expired.isoformat())
        if spec.correct is not None:
            corrected = spec.correct(plan, ctx)
            after = spec.measure(corrected, ctx)
            if after.ok:
                text = wording.sentence(finding.detail, correction(spec, ctx.locale), note)
                results.append(_result(spec, plan, Status.corrected, finding, text, after=after))
                plan = corrected
                continue
        text = wording.sentence(finding.detail, note) if note else finding.detail
        results.append(_result(spec, plan, Status.failed, finding, text))
    return plan


def correction(spec: CheckSpec | registry.TableCheckSpec, locale: str) -> str:
    """What a check's correction did, in the report's language (the registry holds the English)."""
    key = f"finding.correction.{spec.id}"
    return wording.say(key, locale) if key in wording.CATALOGUES["en"] else spec.correction or ""


def waiver_for(
    spec: CheckSpec, plan: ChartPlan, waivers: list[Waiver], today: date
) -> tuple[Waiver | None, date | None]:
    """The waiver that applies to ``spec`` on this chart, or None and the date the first one for
    it expired (``today`` is the report's as_of date)."""
    for waiver in waivers:
        if (
            waiver.check == spec.id
            and waiver.chart == plan.chart_id
            and spec.waivable_for(plan.intent)
        ):
            if waiver.expires is not None and waiver.expires < today:
                return None, waiver.expires
            return waiver, None
    return None, None


def finish(checked: Checked, reports: Sequence[DrawnLabels]) -> Checked:
    """The report with each chart's checks measured on its drawing (one report per chart, in
    order) added after its other results."""
    waivers = checked.definition.waivers
    today = local_wall_time(checked.definition.report.as_of).date()
    charts = [
        replace(chart, results=[*chart.results, finish_chart(chart.plan, report, waivers, today)])
        for chart, report in zip(checked.charts, reports, strict=True)
    ]
    return replace(checked, charts=charts)


def finish_chart(
    plan: ChartPlan, report: DrawnLabels, waivers: list[Waiver], today: date
) -> CheckResult:
    """The ``label-layout`` result of one drawn chart."""
    return layout.result(plan, report, *waiver_for(layout.SPEC, plan, waivers, today))


def _result(
    spec: CheckSpec,
    plan: ChartPlan,
    status: Status,
    finding: Finding,
    explanation: str,
    *,
    waiver: WaiverRecord | None = None,
    after: Finding | None = None,
) -> CheckResult:
    return CheckResult(
        check=spec.id,
        chart=plan.chart_id,
        status=status,
        measured=finding.measured,
        measured_text=_shown(finding, plan.locale),
        corrected_to=None if after is None else _shown(after, plan.locale),
        threshold=spec.threshold,
        explanation=explanation,
        source=spec.source,
        waiver=waiver,
    )


def _shown(finding: Finding, locale: str) -> str:
    """The measured value as the appendix prints it; a fixed word ("none", "signal") in the
    report's language."""
    text = finding.shown if finding.shown is not None else _plain(finding.measured, locale)
    key = "finding.measured." + re.sub(r"\W+", "_", text).strip("_")
    return wording.say(key, locale) if key in wording.CATALOGUES["en"] else text


def _plain(value: float | int | str | None, locale: str) -> str:
    """A measured value without words of its own: four significant digits, in the locale."""
    if value is None:
        return "—"
    if isinstance(value, float):
        rounded = float(f"{value:.4g}")
        digits = next((d for d in range(7) if round(rounded, d) == rounded), 6)
        return formatting.number(rounded, locale, digits=digits)
    if isinstance(value, int) and not isinstance(value, bool):
        return formatting.number(value, locale)
    return str(value)
