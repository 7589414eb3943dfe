"""The one table of chart forms: what each form's marks encode, its height, and its key figures.

Every form a plan can take (``plan.Form``) has one row in :data:`FORMS`. Checks read what a form
encodes (length forms must start at zero; position forms may not, if the chart says so), the chart's
size is read from the row's height, and month over month reads the figures a reader takes from a
chart through the row's key figures. The drawer of each form is registered in ``render.registry``
(render imports intents, never the reverse); a meta-test holds the two tables to the same forms.
Nothing here draws.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass
from typing import Any, Literal, TypeGuard

import numpy as np

from service.intents.plan import ChartPlan, Form, Series

LINE_HEIGHT_IN = 2.9
BAR_ROW_IN = 0.27

#: Height of one of several aligned panels.
PANEL_HEIGHT_IN = 1.6

Measure = np.ndarray[Any, Any] | None
"""The chart's measure column as numbers, for figures the plan does not keep (a median)."""


@dataclass(frozen=True)
class KeyFigure:
    """One figure a reader takes from a chart: a bar's value, a line's latest point, a count."""

    label: str
    """The category, the series, or what a summary figure is (``n``, ``median``)."""
    value: float
    unit: str
    period: str | None = None
    """The period label of a series' value (``Oct 2026``); ``None`` for other figures."""
    estimate: bool = False
    """The value of an estimate or projection series, not a measured one."""
    partial: bool = False
    """The value of a period only partly elapsed at ``as_of`` (only when no complete one exists)."""
    name: str | None = None
    """The column a series' figure belongs to, so a definition may name it by its identifier as
    well as by its label."""


@dataclass(frozen=True)
class FormSpec:
    encodes: Literal["length", "position"]
    """What the marks encode a value by: ``length`` (or area) must start at zero."""
    height: Callable[[ChartPlan, float], float]
    """The chart's height in inches, given the height its notes and flags take."""
    key_figures: Callable[[ChartPlan, Measure], list[KeyFigure]]
    """The figures a reader takes from the chart as the checks left it."""


def _rows(plan: ChartPlan, extra: float) -> float:
    rows = max(len(plan.categories), 2)
    return min(8.5, 0.75 + BAR_ROW_IN * rows + extra)


def _boxes(plan: ChartPlan, extra: float) -> float:
    rows = max(len(plan.boxes), 2)
    return min(8.5, 1.0 + 2 * BAR_ROW_IN * rows + extra)


def _panels(plan: ChartPlan, extra: float) -> float:
    return min(9.0, 0.6 + PANEL_HEIGHT_IN * len(plan.panels) + extra)


def _pie(plan: ChartPlan, extra: float) -> float:
    return 3.4 + extra


def _line(plan: ChartPlan, extra: float) -> float:
    return LINE_HEIGHT_IN + extra


def _number(value: float | None) -> TypeGuard[float]:
    return value is not None and math.isfinite(value)


def _categories(plan: ChartPlan, measure: Measure) -> list[KeyFigure]:
    """Each category's value (a deviation chart: actual minus target, as drawn)."""
    unit = plan.value_axis.unit
    return [KeyFigure(c.label, float(c.value), unit) for c in plan.categories if _number(c.value)]


def _latest(series: Series, plan: ChartPlan) -> tuple[int, float] | None:
    """The period index and value of the series' latest drawn value (see :func:`_series`)."""
    points = [
        (x, float(v)) for x, v in zip(series.positions(), series.values, strict=True) if _number(v)
    ]
    if not points:
        return None
    partial = None if plan.partial is None or series.estimate else plan.partial.index
    complete = [p for p in points if p[0] != partial]
    return max(complete or points)


def _series(plan: ChartPlan, measure: Measure) -> list[KeyFigure]:
    """Each series' latest value and its period, skipping a partly elapsed last period when the
    series has a complete one (a part-month against a whole month would show a fall that did not
    happen)."""
    drawn = [(s, plan.value_axis.unit, s.title) for s in plan.series]
    drawn += [
        (s, panel.value_axis.unit, f"{panel.title}: {s.title}")
        for panel in plan.panels
        for s in panel.series
    ]
    found = []
    for series, axis_unit, label in drawn:
        latest = _latest(series, plan)
        if latest is None:
            continue
        index, value = latest
        partial = plan.partial is not None and index == plan.partial.index
        found.append(
            KeyFigure(
                label,
                value,
                series.unit or axis_unit,
                period=plan.periods[index],
                estimate=series.estimate,
                partial=partial and not series.estimate,
                name=series.name,
            )
        )
    return found


def _histogram(plan: ChartPlan, measure: Measure) -> list[KeyFigure]:
    """n and the median of the measure."""
    assert plan.x_axis is not None
    found = [KeyFigure("n", float(sum(b.count for b in plan.bins)), "observations")]
    if measure is not None and measure.size:
        median = float(np.percentile(measure, 50))
        found.append(KeyFigure("median", median, plan.x_axis.unit))
    return found


def _box(plan: ChartPlan, measure: Measure) -> list[KeyFigure]:
    """n and the median of each box."""
    found = []
    for box in plan.boxes:
        found.append(KeyFigure(f"{box.label}: n", float(box.n), "observations"))
        found.append(KeyFigure(f"{box.label}: median", float(box.median), plan.value_axis.unit))
    return found


def _scatter(plan: ChartPlan, measure: Measure) -> list[KeyFigure]:
    """n and the fitted line's slope."""
    found = [KeyFigure("n", float(len(plan.points)), "points")]
    if plan.fit is not None and plan.x_axis is not None:
        unit = f"{plan.value_axis.unit} per {plan.x_axis.unit}"
        found.append(KeyFigure("slope of the fitted line", float(plan.fit.slope), unit))
    return found


FORMS: dict[Form, FormSpec] = {
    "bars": FormSpec("length", _rows, _categories),
    "dots": FormSpec("position", _rows, _categories),
    "deviation": FormSpec("length", _rows, _categories),
    "pie": FormSpec("length", _pie, _categories),
    "lines": FormSpec("position", _line, _series),
    "control": FormSpec("position", _line, _series),
    "panels": FormSpec("position", _panels, _series),
    "histogram": FormSpec("length", _line, _histogram),
    "box": FormSpec("position", _boxes, _box),
    "scatter": FormSpec("position", _line, _scatter),
}

#: Forms whose marks encode value by length or area: they must start at zero.
LENGTH_FORMS = frozenset(form for form, spec in FORMS.items() if spec.encodes == "length")
#: Forms whose marks encode value by position: a non-zero scale is allowed if the chart says so.
POSITION_FORMS = frozenset(form for form, spec in FORMS.items() if spec.encodes == "position")
