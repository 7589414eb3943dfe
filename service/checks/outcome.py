"""The outcome of guarding a whole report: every chart's final plan and check results."""

from __future__ import annotations

from dataclasses import dataclass, field

from service.checks.results import CheckResult, Status
from service.data.frames import Table
from service.definition.model import ReportDefinition
from service.intents.plan import ChartPlan
from service.intents.table import TablePlan


@dataclass(frozen=True)
class CheckedChart:
    path: str
    plan: ChartPlan
    results: list[CheckResult]


@dataclass(frozen=True)
class CheckedTable:
    path: str
    plan: TablePlan
    results: list[CheckResult]


@dataclass(frozen=True)
class Checked:
    definition: ReportDefinition
    tables: dict[str, Table]
    fingerprint: str
    charts: list[CheckedChart]
    shown_tables: list[CheckedTable] = field(default_factory=list)
    """Each table of the report as it will be shown, with its checks (in reading order)."""

    @property
    def results(self) -> list[CheckResult]:
        """Every chart's results, then every table's."""
        found = [r for chart in self.charts for r in chart.results]
        return found + [r for table in self.shown_tables for r in table.results]

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
