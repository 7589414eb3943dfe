"""The outcome of guarding a whole report: every chart's final plan and check results."""

from __future__ import annotations

from dataclasses import dataclass

from service.checks.results import CheckResult, Status
from service.data.frames import Table
from service.definition.model import ReportDefinition
from service.intents.plan import ChartPlan


@dataclass(frozen=True)
class CheckedChart:
    path: str
    plan: ChartPlan
    results: list[CheckResult]


@dataclass(frozen=True)
class Checked:
    definition: ReportDefinition
    tables: dict[str, Table]
    fingerprint: str
    charts: list[CheckedChart]

    @property
    def results(self) -> list[CheckResult]:
        return [r for chart in self.charts for r in chart.results]

    @property
    def blocked(self) -> bool:
        return any(r.status is Status.failed for r in self.results)

    @property
    def unused_waivers(self) -> list[str]:
        """The definition's waivers that waived no result, as "check on chart" (before drawing,
        a ``label-layout`` waiver is among them: that check is measured on the drawn chart)."""
        used = {(r.check, r.chart) for r in self.results if r.status is Status.waived}
        waivers = self.definition.waivers
        return [f"{w.check} on {w.chart}" for w in waivers if (w.check, w.chart) not in used]

    def failures(self) -> list[CheckResult]:
        return [r for r in self.results if r.status is Status.failed]
