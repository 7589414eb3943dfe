"""Advice on a line chart's aspect ratio: Cleveland's banking to 45° (median absolute slope).

With dx_i = Δx_i / range(x) and dy_i = Δy_i / range(y) over consecutive present points of each drawn
segment, m = median |dy_i / dx_i|; the aspect ratio (height / width) that banks the median slope to
45° is 1 / m (Cleveland, McGill & McGill, JASA 1988; Cleveland, Visualizing Data, 1993).

The check compares that with the drawn aspect: the figure's height / width (``charts.size_in``),
taken as the plot area's ratio (each of n stacked panels gets 1/n of the height). So that the two
compare like for like, range(y) here is the *drawn* value-axis range (the plan's ``value_axis``, or
each panel's), not Cleveland's data range: a padded axis flattens the drawn line by the same factor.
A log axis banks log10 of the values. ``banking_ratio`` takes either range.

Talbot, Gerth & Hanrahan ("Arc Length-Based Aspect Ratio Selection", InfoVis 2012) found 45° is not
always best, so this is advice, never a rule: it never blocks a chart.
"""

from __future__ import annotations

import math
from collections.abc import Sequence

import numpy as np

from service import formatting, wording
from service.checks.registry import CheckSpec, Context, Finding, register
from service.definition.model import OVER_TIME
from service.intents.plan import ChartPlan, Scale, Series

#: The drawn aspect may be this factor above or below the suggestion before advice is given.
FACTOR = 2.0


def slopes(
    series: Sequence[Series], x_range: float, y_range: float, *, log: bool = False
) -> list[float]:
    """|dy_i / dx_i| between consecutive present points of every drawn segment, normalised."""
    found: list[float] = []
    for s in series:
        xs = np.asarray(s.positions(), dtype=float)
        for first, last in s.segments:
            ys = np.asarray([float(v or 0.0) for v in s.values[first : last + 1]])
            if log:
                ys = np.log10(ys)
            dx = np.diff(xs[first : last + 1]) / x_range
            dy = np.diff(ys) / y_range
            found.extend(float(v) for v in np.abs(dy / dx))
    return found


def banking_ratio(
    series: Sequence[Series], x_range: float, y_range: float, *, log: bool = False
) -> tuple[float, float] | None:
    """(m, height/width = 1/m), or None when there is no slope or every slope is flat."""
    if x_range <= 0 or y_range <= 0:
        return None
    found = slopes(series, x_range, y_range, log=log)
    if not found:
        return None
    m = float(np.median(found))
    return (m, 1.0 / m) if m > 0 else None


def _axis_range(axis: Scale) -> float:
    if axis.log:
        return math.log10(axis.hi) - math.log10(axis.lo) if axis.lo > 0 < axis.hi else 0.0
    return axis.hi - axis.lo


def _median_slope(plan: ChartPlan) -> float | None:
    """Pooled median |slope| over the chart's lines, each normalised by its own drawn axis."""
    x_range = float(len(plan.periods) - 1)
    groups = [(p.series, p.value_axis) for p in plan.panels] or [(plan.series, plan.value_axis)]
    found: list[float] = []
    for series, axis in groups:
        y_range = _axis_range(axis)
        if x_range > 0 and y_range > 0:
            found.extend(slopes(series, x_range, y_range, log=axis.log))
    if not found:
        return None
    m = float(np.median(found))
    return m if m > 0 else None


def data_share(plan: ChartPlan) -> float:
    """The smallest share of a value axis that the drawn values span (1: the data fills it)."""
    groups = [(p.series, p.value_axis) for p in plan.panels] or [(plan.series, plan.value_axis)]
    shares = []
    for series, axis in groups:
        present = [v for s in series for v in s.values if v is not None]
        span = _axis_range(axis)
        if len(present) > 1 and span > 0:
            lo, hi = min(present), max(present)
            if axis.log:
                lo, hi = (math.log10(lo), math.log10(hi)) if lo > 0 else (0.0, 0.0)
            shares.append((hi - lo) / span)
    return min(shares, default=1.0)


def drawn_ratio(plan: ChartPlan) -> float:
    """Height / width of one plot area, taken from the figure size (stacked panels share it)."""
    # late import: the house sizes live with the drawing stack, kept out of the check-only path
    from service.intents.geometry import size_in

    width, height = size_in(plan)
    return height / max(len(plan.panels), 1) / width


def _measure(plan: ChartPlan, ctx: Context) -> Finding:
    drawn = drawn_ratio(plan)
    locale = ctx.locale
    shown_drawn = formatting.number(drawn, locale, digits=2)
    m = _median_slope(plan)
    drawn_text = wording.say("finding.drawn_ratio", locale, drawn=shown_drawn)
    if m is None:
        return Finding(True, None, wording.say("finding.no_slope", locale), drawn_text)
    suggested = 1.0 / m
    shown_suggested = formatting.number(suggested, locale, digits=2 if suggested >= 0.1 else 3)
    ratios = {"suggested": shown_suggested, "drawn": shown_drawn}
    shown = wording.say("finding.suggests", locale, **ratios)
    if suggested / FACTOR <= drawn <= suggested * FACTOR:
        detail = wording.say("finding.banking_ok", locale, **ratios)
        return Finding(True, round(suggested, 4), detail, shown)
    key = "finding.banking_steep" if drawn > suggested else "finding.banking_flat"
    detail = wording.say(key, locale, **ratios)
    share = data_share(plan)
    if drawn < suggested and share < 0.5:
        zero = plan.value_axis.lo == 0 and not plan.panels
        span = formatting.percent(round(share * 100), locale)
        why = wording.say("finding.span_zero" if zero else "finding.span", locale, share=span)
        detail = wording.sentence(detail, why)
    return Finding(False, round(suggested, 4), detail, shown)


SPEC = register(
    CheckSpec(
        id="aspect-banking",
        title="The aspect ratio banks the lines near 45°",
        intents=OVER_TIME,
        forms=frozenset({"lines", "panels", "control"}),
        measures="the aspect ratio (height/width) that banks the median absolute slope to 45° "
        "(range(y): the drawn value axis), against the drawn figure's",
        threshold="drawn height/width within a factor of 2 of the suggestion (advice)",
        source="Cleveland, McGill & McGill, 'The Shape Parameter of a Two-Variable Graph', JASA "
        "83(402), 1988; Cleveland, Visualizing Data, 1993; Talbot, Gerth & Hanrahan, InfoVis 2012 "
        "(45° not always optimal)",
        waivable=False,
        correction=None,
        measure=_measure,
        level="advice",
    )
)
