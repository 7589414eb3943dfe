"""The check registry: one table of every integrity check, its rule, source and powers.

A check is registered with :func:`register`. The catalogue (``plumbline checks``, ``GET /v1/checks``)
and the appendix read their wording from here, so there is one source of truth.
"""

from __future__ import annotations

import difflib
from collections.abc import Callable, Iterable, Mapping
from dataclasses import dataclass, field
from datetime import datetime
from typing import Any, Literal

from service.data.frames import Table
from service.definition.model import AnyChart, Dataset, ReportDefinition
from service.definition.model import Table as TableSpec
from service.errors import Problem
from service.intents.plan import ChartPlan
from service.intents.table import TablePlan


@dataclass(frozen=True)
class Context:
    """What a check may consult besides the plan: the chart's definition, its data, the clock."""

    chart: AnyChart
    table: Table
    as_of: datetime
    locale: str
    owner: str = ""
    """The report's owner, accountable for data whose source is not stated."""
    tables: Mapping[str, Table] = field(default_factory=dict)
    """Every dataset of the pack by name, for checks that compare one dataset with another."""


@dataclass(frozen=True)
class Finding:
    ok: bool
    measured: float | int | str | None
    detail: str
    shown: str | None = None
    """The measured value as a reader should see it ("8 of 30 days", "85%"); else ``measured``."""
    applicable: bool = True
    """False when the chart's form cannot break the rule at all (the result is *not applicable*,
    not a pass)."""


Measure = Callable[[ChartPlan, Context], Finding]
Correct = Callable[[ChartPlan, Context], ChartPlan]


@dataclass(frozen=True)
class CheckSpec:
    id: str
    title: str
    intents: frozenset[str]
    forms: frozenset[str]
    measures: str
    threshold: str
    source: str
    waivable: bool
    correction: str | None
    measure: Measure
    correct: Correct | None = None
    phase: Literal["plan", "final", "drawn"] = "plan"
    """``final`` checks run after the plan is finished (its text alternative written)."""
    level: Literal["rule", "advice"] = "rule"
    """An ``advice`` check never fails or blocks: a breach is reported with status ``advice``."""
    never_waivable_for: frozenset[str] = frozenset()
    """Intents for which this otherwise waivable check protects data integrity."""

    @property
    def correctable(self) -> bool:
        return self.correct is not None

    def applies(self, plan: ChartPlan) -> bool:
        return plan.intent in self.intents and plan.form in self.forms

    def waivable_for(self, intent: str) -> bool:
        return self.waivable and intent not in self.never_waivable_for

    def describe(self) -> dict[str, Any]:
        return {
            "id": self.id,
            "title": self.title,
            "intents": sorted(self.intents),
            "forms": sorted(self.forms),
            "measures": self.measures,
            "threshold": self.threshold,
            "source": self.source,
            "correctable": self.correctable,
            "correction": self.correction,
            "waivable": self.waivable,
            "never_waivable_for": sorted(self.never_waivable_for),
            "level": self.level,
        }


@dataclass(frozen=True)
class TableContext:
    """What a table check may consult besides the table's plan."""

    spec: TableSpec
    dataset: Dataset
    table: Table
    as_of: datetime
    locale: str


@dataclass(frozen=True)
class TableCheckSpec:
    """A check of a table (rather than a chart): measured on the table's plan, corrected where it
    can be, never waived (what a table lists is the data itself)."""

    id: str
    title: str
    measures: str
    threshold: str
    source: str
    correction: str
    applies: Callable[[TablePlan, TableContext], bool]
    measure: Callable[[TablePlan, TableContext], Finding]
    correct: Callable[[TablePlan, TableContext], TablePlan]

    def describe(self) -> dict[str, Any]:
        return {
            "id": self.id,
            "title": self.title,
            "intents": [],
            "forms": ["table"],
            "measures": self.measures,
            "threshold": self.threshold,
            "source": self.source,
            "correctable": True,
            "correction": self.correction,
            "waivable": False,
            "never_waivable_for": [],
            "level": "rule",
        }


CHECKS: dict[str, CheckSpec] = {}
TABLE_CHECKS: dict[str, TableCheckSpec] = {}
_ORDER: list[str] = []


def set_order(modules: list[str]) -> None:
    """The order the engine runs checks in, by the module that defines them."""
    _ORDER[:] = modules


def _rank(spec: CheckSpec) -> int:
    module = spec.measure.__module__
    return _ORDER.index(module) if module in _ORDER else len(_ORDER)


def register(spec: CheckSpec) -> CheckSpec:
    if spec.id in CHECKS:
        raise ValueError(f"check id {spec.id!r} is registered twice")
    if spec.correct is None and spec.correction is not None:
        raise ValueError(f"check {spec.id!r} describes a correction it cannot make")
    CHECKS[spec.id] = spec
    ordered = sorted(CHECKS.values(), key=_rank)  # stable: registration order within a module
    CHECKS.clear()
    CHECKS.update((s.id, s) for s in ordered)
    return spec


def register_table(spec: TableCheckSpec) -> TableCheckSpec:
    if spec.id in CHECKS or spec.id in TABLE_CHECKS:
        raise ValueError(f"check id {spec.id!r} is registered twice")
    TABLE_CHECKS[spec.id] = spec
    return spec


def rule(check: str) -> CheckSpec | TableCheckSpec:
    """The registered spec of a chart's or a table's check (id, title, threshold, source,
    correction)."""
    spec = CHECKS.get(check)
    return spec if spec is not None else TABLE_CHECKS[check]


def source(check: str) -> str:
    """Where the rule of a chart's or a table's check comes from."""
    return rule(check).source


def applicable(plan: ChartPlan) -> list[CheckSpec]:
    return [spec for spec in CHECKS.values() if spec.applies(plan)]


def catalogue() -> list[dict[str, Any]]:
    found = [spec.describe() for spec in CHECKS.values()]
    return found + [spec.describe() for spec in TABLE_CHECKS.values()]


def waiver_problems(definition: ReportDefinition) -> Iterable[Problem]:
    """Waivers must name a known, waivable check that applies to a chart of the report."""
    charts = {chart.id: chart for _, chart in definition.charts()}
    seen: set[tuple[str, str]] = set()
    for w, waiver in enumerate(definition.waivers):
        path = f"waivers[{w}]"
        spec = CHECKS.get(waiver.check)
        if spec is None:
            close = difflib.get_close_matches(waiver.check, list(CHECKS), n=1)
            yield Problem(
                "unknown_check",
                f"{path}.check",
                f"there is no check '{waiver.check}'",
                f"did you mean '{close[0]}'?" if close else "see `plumbline checks`",
                waiver.check,
            )
            continue
        chart = charts.get(waiver.chart)
        if not spec.waivable or (chart is not None and not spec.waivable_for(chart.intent)):
            yield Problem(
                "not_waivable",
                f"{path}.check",
                f"the check '{spec.id}' protects the integrity of the data and cannot be waived",
                "fix the data or the chart instead",
                waiver.check,
            )
        if chart is None:
            close = difflib.get_close_matches(waiver.chart, list(charts), n=1)
            yield Problem(
                "unknown_chart",
                f"{path}.chart",
                f"there is no chart '{waiver.chart}'",
                f"did you mean '{close[0]}'?" if close else "name a chart id of this report",
                waiver.chart,
            )
        elif chart.intent not in spec.intents:
            yield Problem(
                "check_not_applicable",
                f"{path}.check",
                f"the check '{spec.id}' does not apply to '{chart.id}' (intent '{chart.intent}')",
                f"it applies to intents: {', '.join(sorted(spec.intents))}",
                waiver.check,
            )
        key = (waiver.check, waiver.chart)
        if key in seen:
            yield Problem(
                "duplicate_waiver",
                path,
                f"'{waiver.check}' on '{waiver.chart}' is waived twice",
                "keep one waiver per check and chart",
                list(key),
            )
        seen.add(key)


def markdown() -> str:
    """The catalogue as a Markdown document (``docs/checks.md`` is generated from this)."""
    lines = [
        "# Integrity checks",
        "",
        "Generated from the check registry by `plumbline checks --markdown`; do not edit by hand.",
        "Every chart is measured by each check that applies to its intent and form. Statuses:",
        "`passed`; `corrected` (Plumbline changed the chart to meet the rule, recording before and",
        "after); `waived` (a breach accepted with a reason, by a named person); `failed` (blocks",
        "the pack); `advice` (worth a reader's attention, never blocks); `not_applicable` (the",
        "chart's form cannot break the rule, e.g. one value axis where no second can be drawn:",
        "recorded, never counted as a pass).",
        "",
        "| id | rule | applies to | measures | threshold | corrects | waivable | source |",
        "|---|---|---|---|---|---|---|---|",
    ]
    for spec in CHECKS.values():
        waivable = "no"
        if spec.waivable:
            waivable = "yes"
            if spec.never_waivable_for:
                waivable += f" (not for {', '.join(sorted(spec.never_waivable_for))})"
        if spec.level == "advice":
            waivable = "advice only"
        applies = ", ".join(sorted(spec.intents)) + " — " + ", ".join(sorted(spec.forms))
        cells = [
            f"`{spec.id}`",
            spec.title,
            applies,
            spec.measures,
            spec.threshold,
            "yes" if spec.correctable else "no",
            waivable,
            spec.source,
        ]
        lines.append("| " + " | ".join(c.replace("|", "\\|") for c in cells) + " |")
    lines += [
        "",
        "## Table checks",
        "",
        "Every table is measured by each check that applies to it (a table of a dataset with a",
        "time column, a table with estimates, totals or a limit). A table's checks are never waived:",
        "what it lists is the data itself. The appendix lists them under the table's id.",
        "",
        "| id | rule | measures | threshold | corrects | source |",
        "|---|---|---|---|---|---|",
    ]
    for table_spec in TABLE_CHECKS.values():
        cells = [
            f"`{table_spec.id}`",
            table_spec.title,
            table_spec.measures,
            table_spec.threshold,
            "yes",
            table_spec.source,
        ]
        lines.append("| " + " | ".join(c.replace("|", "\\|") for c in cells) + " |")
    return "\n".join(lines) + "\n"
