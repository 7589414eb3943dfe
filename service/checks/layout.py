"""Labels are readable: no overlapping tick labels, no text cut off at the chart's edge.

Text extents exist only after layout, so this check is measured when the chart is drawn:
:mod:`service.render.layout` measures and fills in a :class:`LayoutReport`. ``plumbline check``,
which draws nothing, does not list it.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from datetime import date

from service.checks.registry import CheckSpec, Context, Finding, register
from service.checks.results import CheckResult, Status, WaiverRecord
from service.definition.model import INTENTS, Waiver
from service.intents.forms import LENGTH_FORMS, POSITION_FORMS
from service.intents.plan import ChartPlan


@dataclass
class LayoutReport:
    overlaps_before: int = 0
    clipped_before: int = 0
    overlaps: int = 0
    clipped: int = 0
    actions: list[str] = field(default_factory=list)

    @property
    def clean(self) -> bool:
        return self.overlaps == 0 and self.clipped == 0


def _at_render(plan: ChartPlan, ctx: Context) -> Finding:
    return Finding(True, None, "Measured when the chart is drawn.")


SPEC = register(
    CheckSpec(
        id="label-layout",
        title="Labels do not overlap or get cut off",
        intents=frozenset(INTENTS),
        forms=LENGTH_FORMS | POSITION_FORMS,
        measures="pairs of overlapping tick labels and text cut off at the chart's edge, measured "
        "on the drawn chart after layout",
        threshold="0 overlaps, 0 cut off",
        source="common practice (no source)",
        waivable=True,
        correction=None,
        measure=_at_render,
        phase="drawn",
    )
)


def result(
    plan: ChartPlan, report: LayoutReport, waivers: list[Waiver], today: date
) -> CheckResult:
    """The ``label-layout`` result; ``today`` (the as_of date) decides whether a waiver expired."""
    before = f"{report.overlaps_before} overlaps, {report.clipped_before} cut off"
    after = f"{report.overlaps} overlaps, {report.clipped} cut off"
    base = {
        "check": SPEC.id,
        "chart": plan.chart_id,
        "measured": report.overlaps_before + report.clipped_before,
        "measured_text": before,
        "threshold": SPEC.threshold,
        "source": SPEC.source,
    }
    if report.clean and not report.actions:
        return CheckResult(**base, status=Status.passed, explanation="Every label has room.")
    if report.clean:
        done = "; ".join(dict.fromkeys(report.actions))
        return CheckResult(
            **base,
            status=Status.corrected,
            corrected_to=after,
            explanation=f"Labels collided ({before}); Plumbline {done}.",
        )
    text = f"After mending, labels still collide or are cut off ({after})."
    waiver = next((w for w in waivers if w.check == SPEC.id and w.chart == plan.chart_id), None)
    if waiver is not None and waiver.expires is not None and waiver.expires < today:
        text += f" A waiver expired on {waiver.expires.isoformat()} and no longer applies."
        waiver = None
    if waiver is not None:
        record = WaiverRecord(reason=waiver.reason, by=waiver.by, expires=waiver.expires)
        return CheckResult(**base, status=Status.waived, explanation=text, waiver=record)
    return CheckResult(**base, status=Status.failed, explanation=text)
