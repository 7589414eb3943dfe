"""Labels are readable: no overlapping tick labels, no text cut off at the chart's edge, no text
drawn over a data mark (a line, marker, bar, interval or reference line).

Text extents exist only after layout, so this check is measured when the chart is drawn: the
renderer measures and hands back a plain report (``render.measured.LayoutReport``), and the
pipeline gives it to :func:`service.checks.engine.finish`, which looks up the waiver and calls
:func:`result`. ``plumbline check``, which draws nothing, does not list it.
"""

from __future__ import annotations

from collections.abc import Sequence
from datetime import date
from typing import Protocol

from service.checks.registry import CheckSpec, Context, Finding, register
from service.checks.results import CheckResult, Status, WaiverRecord
from service.definition.model import INTENTS, Waiver
from service.intents.forms import LENGTH_FORMS, POSITION_FORMS
from service.intents.plan import ChartPlan


class DrawnLabels(Protocol):
    """What this check reads of the renderer's measurement, declared here so that the checks
    never import the stage that draws (the renderer's ``LayoutReport`` satisfies it)."""

    @property
    def overlaps_before(self) -> int: ...
    @property
    def clipped_before(self) -> int: ...
    @property
    def overlaps(self) -> int: ...
    @property
    def clipped(self) -> int: ...
    @property
    def collisions_before(self) -> int: ...
    @property
    def collisions(self) -> int: ...
    @property
    def over_data(self) -> Sequence[str]: ...
    @property
    def actions(self) -> Sequence[str]: ...
    @property
    def clean(self) -> bool: ...


def _at_render(plan: ChartPlan, ctx: Context) -> Finding:
    return Finding(True, None, "Measured when the chart is drawn.")


SPEC = register(
    CheckSpec(
        id="label-layout",
        title="Labels do not overlap, get cut off or cover the data",
        intents=frozenset(INTENTS),
        forms=LENGTH_FORMS | POSITION_FORMS,
        measures="pairs of overlapping tick labels, text cut off at the chart's edge, and texts "
        "drawn over a data mark (line paths segment by segment, markers, bars, intervals, "
        "reference lines), measured on the drawn chart after layout",
        threshold="0 overlaps, 0 cut off, 0 texts over data",
        source="common practice (no source)",
        waivable=True,
        correction=None,
        measure=_at_render,
        phase="drawn",
    )
)


def result(
    plan: ChartPlan, report: DrawnLabels, waiver: Waiver | None, expired: date | None
) -> CheckResult:
    """The ``label-layout`` result, given the engine's waiver lookup for this chart: the current
    waiver, or None and the date an expired one ran out."""
    before = (
        f"{report.overlaps_before} overlaps, {report.clipped_before} cut off, "
        f"{report.collisions} texts over data"
    )
    after = (
        f"{report.overlaps} overlaps, {report.clipped} cut off, {report.collisions} texts over data"
    )
    base = {
        "check": SPEC.id,
        "chart": plan.chart_id,
        "measured": report.overlaps_before + report.clipped_before + report.collisions,
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
    if report.over_data:
        text += " Over the data: " + ", ".join(f"'{t}'" for t in report.over_data) + "."
    if expired is not None:
        text += f" A waiver expired on {expired.isoformat()} and no longer applies."
    if waiver is not None:
        record = WaiverRecord(reason=waiver.reason, by=waiver.by, expires=waiver.expires)
        return CheckResult(**base, status=Status.waived, explanation=text, waiver=record)
    return CheckResult(**base, status=Status.failed, explanation=text)
