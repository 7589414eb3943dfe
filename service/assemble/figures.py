"""The cover's headline figures: the one key figure each chart may mark, as a reader needs it.

A chart marks its figure with ``key_figure`` in the definition: a series or measure as the chart
names it, a category's label, or a summary (``median``, ``n``). The figure is read from the plan as
the checks left it, through the chart form's key figures (``intents.forms.FORMS``, the same figures
month over month compares), so the cover never shows a value the chart does not. A series' figure
gets its change from the series' previous drawn value, in percentage points for a percentage; every
figure carries the check status of its chart. Nothing here draws.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from service import formatting
from service.assemble.appendix import counted, counts_text
from service.checks.outcome import Checked, CheckedChart
from service.checks.results import Status
from service.definition.model import DistributionChart
from service.intents.forms import FORMS, KeyFigure
from service.intents.plan import ChartPlan, Series
from service.wording import say

#: The worst status of a chart's checks decides the colour of its figure's check status.
_WORST = (Status.failed, Status.waived, Status.corrected, Status.advice)


@dataclass(frozen=True)
class Headline:
    chart_id: str
    chart: str
    figure: str
    value: str
    change: str
    checks: str
    status: str
    """The worst status among the chart's checks (``passed`` when all passed)."""


def headline(checked: Checked, locale: str) -> list[Headline]:
    models = dict(checked.definition.charts())
    found: list[Headline] = []
    for item in checked.charts:
        model = models[item.path]
        if model.key_figure is None:
            continue
        measure = None
        if isinstance(model, DistributionChart):
            column = checked.tables[model.dataset].frame[model.measure].dropna()
            measure = column.to_numpy(dtype=float)
        offered = FORMS[item.plan.form].key_figures(item.plan, measure)
        found.append(_headline(item, model.key_figure, offered, locale))
    return found


def _headline(item: CheckedChart, name: str, offered: list[KeyFigure], locale: str) -> Headline:
    plan = item.plan
    status, checks = _checks(item, locale)
    wanted = name.strip().casefold()
    figure = next(
        (f for f in offered if wanted in (f.label.casefold(), (f.name or "").casefold())), None
    )
    if figure is None:
        figure = next((f for f in offered if f.label.casefold().endswith(f": {wanted}")), None)
    if figure is None:
        names = ", ".join(f.label for f in offered) or "—"
        missing = say("cover.figure_missing", locale, name=name, names=names)
        return Headline(plan.chart_id, plan.title, name, "—", missing, checks, status)
    label = figure.label
    marks = [say("cover.estimate", locale)] if figure.estimate else []
    if figure.partial:
        marks.append(say("cover.partial", locale))
    if figure.period:
        label += f" · {figure.period}"
    if marks:
        label += f" ({', '.join(marks)})"
    value = formatting.with_unit(figure.value, figure.unit, locale, digits=_digits(figure.value))
    return Headline(
        chart_id=plan.chart_id,
        chart=plan.title,
        figure=label,
        value=value,
        change=_change(plan, figure, locale),
        checks=checks,
        status=status,
    )


def _digits(value: float) -> int:
    return formatting.decimals_for([value]) if abs(value) < 1000 else 0


def _checks(item: CheckedChart, locale: str) -> tuple[str, str]:
    counts = {s: sum(r.status is s for r in item.results) for s in Status}
    for status in _WORST:
        if counts[status]:
            shown = [counted(counts[s], s, locale) for s in _WORST if counts[s]]
            return status.value, ", ".join(shown)
    if counts[Status.passed]:
        return Status.passed.value, say("cover.all_passed", locale, count=counts[Status.passed])
    return Status.passed.value, counts_text(item.results, locale)


def _series(plan: ChartPlan, label: str) -> Series | None:
    """The series a key figure was taken from, by the label ``forms`` gave it."""
    for series in plan.series:
        if series.title == label:
            return series
    for panel in plan.panels:
        for series in panel.series:
            if f"{panel.title}: {series.title}" == label:
                return series
    return None


def _change(plan: ChartPlan, figure: KeyFigure, locale: str) -> str:
    """The change from the series' previous drawn value to the figure, with that value's period;
    in percentage points when the unit is a percentage. Empty for a figure that is not a series'."""
    if figure.period is None:
        return ""
    series = _series(plan, figure.label)
    if series is None:
        return ""
    at = plan.periods.index(figure.period)
    earlier = [
        (x, float(v))
        for x, v in zip(series.positions(), series.values, strict=True)
        if x < at and v is not None and math.isfinite(v)
    ]
    if not earlier:
        return say("cover.no_earlier", locale)
    x, before = earlier[-1]
    difference = figure.value - before
    percent = figure.unit.strip() == "%"
    unit = "pp" if percent else figure.unit
    digits = max(_digits(figure.value), _digits(before))
    text = _signed(difference, unit, locale, digits)
    if not percent and before != 0:
        relative = float(np.round(100 * difference / abs(before), 1))
        text += f" ({_signed(relative, '%', locale, 1)})"
    return say("cover.change_since", locale, change=text, period=plan.periods[x])


def _signed(value: float, unit: str, locale: str, digits: int) -> str:
    text = formatting.with_unit(abs(value), unit, locale, digits=digits)
    if round(value, digits) == 0:
        return text
    return ("+" if value > 0 else "\u2212") + text
