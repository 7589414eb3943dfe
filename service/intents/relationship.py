"""``relationship``: two measures against each other, as a scatter plot.

Both axes are position encodings fitted to the data; an axis that leaves out zero says so (the
vertical one with ``compare.scale_note``, which the check ``nonzero-scale-noted`` reads; the
horizontal one with the same sentence about the horizontal scale). Rows without both values are not
drawn, and the chart says how many. A least-squares line and its r² are drawn only when the
definition asks (``fit``); computed with numpy in closed form.
"""

from __future__ import annotations

from collections.abc import Iterable

import numpy as np
import pandas as pd

from service import formatting, wording
from service.config import Limits
from service.data.frames import Table
from service.definition.model import RelationshipChart
from service.errors import Problem
from service.intents import scales
from service.intents.compare import scale_note
from service.intents.plan import ChartPlan, Fit, Point, Scale, heading
from service.intents.registry import Encoder, Env, register

#: Fewer points than this do not show a relationship.
MIN_POINTS = 3
#: Points are named beside their dot only up to this many (more would bury the dots).
MAX_LABELLED = 15


def problems(
    chart: RelationshipChart, table: Table, path: str, limits: Limits
) -> Iterable[Problem]:
    frame = table.frame
    both = pairs(chart, table)
    if len(frame) == 0:
        yield Problem(
            "empty_dataset", f"{path}.dataset", f"dataset '{table.name}' has no rows", "add rows"
        )
        return
    if len(both) < MIN_POINTS:
        yield Problem(
            "too_few_points",
            f"{path}.y",
            f"only {len(both)} rows have both '{chart.x}' and '{chart.y}': a scatter plot needs "
            f"at least {MIN_POINTS}",
            "give more rows both values, or show the values in a table",
            len(both),
        )
        return
    if not chart.fit:
        return
    for axis, name in (("x", chart.x), ("y", chart.y)):
        if both[name].nunique() == 1:
            yield Problem(
                "no_variation",
                f"{path}.{axis}",
                f"every row has the same '{name}', so no least-squares line (or r²) can be fitted",
                "set 'fit' to false",
                float(both[name].iloc[0]),
            )


def pairs(chart: RelationshipChart, table: Table) -> pd.DataFrame:
    """The rows that have both an x and a y value (x and y may name the same column)."""
    frame = table.frame
    return frame[frame[chart.x].notna() & frame[chart.y].notna()]


def least_squares(xs: list[float], ys: list[float]) -> Fit | None:
    """The least-squares line y = intercept + slope·x and its r²; None if x or y never varies."""
    x = np.asarray(xs, dtype=float)
    y = np.asarray(ys, dtype=float)
    if x.size < 2:
        return None
    dx, dy = x - x.mean(), y - y.mean()
    sxx, syy, sxy = float(dx @ dx), float(dy @ dy), float(dx @ dy)
    if sxx == 0.0 or syy == 0.0:
        return None
    slope = sxy / sxx
    return Fit(
        slope=slope, intercept=float(y.mean()) - slope * float(x.mean()), r2=sxy**2 / (sxx * syy)
    )


def r2_text(fit: Fit, locale: str) -> str:
    return f"r² = {formatting.number(fit.r2, locale, digits=2)}"


def guide(chart: RelationshipChart, table: Table, fit: Fit | None, locale: str) -> str:
    """The reading guide: what a dot is, which way is more, and (with a line) what r² means."""

    def named(name: str) -> str:
        return formatting.in_sentence(table.label(name), locale)

    what = named(chart.label) if chart.label else wording.say("text.row", locale)
    text = wording.say("text.scatter_guide", locale, what=what, x=named(chart.x), y=named(chart.y))
    if fit is None:
        return wording.sentence(text)
    share = formatting.percent(round(fit.r2 * 100), locale)
    line = wording.say(
        "text.fit_guide", locale, r2=r2_text(fit, locale), share=share, y=named(chart.y)
    )
    return wording.sentence(text, line)


def dropped_note(dropped: int, locale: str) -> str:
    if dropped == 1:
        return wording.say("text.dropped_one", locale)
    return wording.say("text.dropped", locale, count=formatting.number(dropped, locale))


def horizontal_note(axis: Scale, locale: str) -> str:
    """``compare.scale_note`` for the horizontal axis."""
    return wording.say("text.horizontal_scale_note", locale, start=axis.shown(axis.lo, locale))


def fit_for(chart: RelationshipChart, table: Table) -> Fit | None:
    """The fit the chart asked for, recomputed from the data (None when not asked)."""
    if not chart.fit:
        return None
    both = pairs(chart, table)
    return least_squares(_floats(both[chart.x]), _floats(both[chart.y]))


def encode(chart: RelationshipChart, table: Table, env: Env) -> ChartPlan:
    frame = table.frame
    kept = pairs(chart, table)
    xs, ys = _floats(kept[chart.x]), _floats(kept[chart.y])
    named = chart.label is not None and len(kept) <= MAX_LABELLED
    labels = [
        None if not named or pd.isna(v) else str(v)
        for v in (kept[chart.label] if chart.label else [None] * len(kept))
    ]
    points = [Point(x=x, y=y, label=n) for x, y, n in zip(xs, ys, labels, strict=True)]
    x_axis = _scale(xs, chart.x, table)
    y_axis = _scale(ys, chart.y, table)
    notes: list[str] = []
    if not y_axis.includes_zero:
        notes.append(scale_note(y_axis, env.locale))
    if not x_axis.includes_zero:
        notes.append(horizontal_note(x_axis, env.locale))
    if len(frame) > len(kept):
        notes.append(dropped_note(len(frame) - len(kept), env.locale))
    fit = least_squares(xs, ys) if chart.fit else None
    return ChartPlan(
        **heading(chart, env.locale, table.source),
        form="scatter",
        value_axis=y_axis,
        x_axis=x_axis,
        points=points,
        fit=fit,
        guide=guide(chart, table, fit, env.locale),
        notes=notes,
    )


def _scale(values: list[float], name: str, table: Table) -> Scale:
    unit = table.units.get(name, "")
    lo, hi = scales.fit(values, include_zero=False, unit=unit, pad=scales.EDGE_ROOM)
    if values and min(values) >= 0.0:
        lo = max(lo, 0.0)  # padding never pushes a measure that cannot be negative below zero
    label = formatting.titled(table.label(name), unit)
    return Scale(lo=lo, hi=hi, unit=unit, label=label, style=table.style(name))


def _floats(values: pd.Series) -> list[float]:
    return [float(v) for v in values]


ENCODER = register(Encoder("relationship", problems, encode, frozenset({"scatter"})))
