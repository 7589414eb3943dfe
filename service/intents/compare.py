"""``compare``: one measure across categories.

Totals are drawn as zero-based bars (length encodes value). A requested non-zero baseline is carried
into the plan as asked; the check ``bar-zero-baseline`` corrects it unless waived. When the definition
asks to focus on small differences, the encoder draws dots on a fitted scale (position, not length) and
the chart says that its scale does not start at zero.
"""

from __future__ import annotations

import math
from collections.abc import Iterable

import pandas as pd

from service import formatting, wording
from service.config import Limits
from service.data.frames import Table
from service.definition.model import CompareChart
from service.errors import Problem
from service.intents import categories, scales
from service.intents.plan import Category, ChartPlan, Scale, heading
from service.intents.registry import Encoder, Env, register


def problems(chart: CompareChart, table: Table, path: str, limits: Limits) -> Iterable[Problem]:
    labels = table.frame[chart.category]
    yield from categories.problems(table, chart.category, path, limits)
    yield from _interval_problems(chart, table, path)
    if len(labels) == 0:
        yield Problem(
            "empty_dataset",
            f"{path}.dataset",
            f"dataset '{table.name}' has no rows to compare",
            "add rows",
            table.name,
        )


def _interval_problems(chart: CompareChart, table: Table, path: str) -> Iterable[Problem]:
    """Intervals that cannot be: bounds the wrong way round, a value outside its bounds, a
    negative spread, a sample smaller than one."""
    spec = chart.interval
    if spec is None:
        return
    frame = table.frame
    checks: list[tuple[str, pd.Series, str, str]] = []
    if spec.lower is not None and spec.upper is not None:
        lo, hi, value = frame[spec.lower], frame[spec.upper], frame[chart.measure]
        checks.append(("lower", lo > hi, "its lower bound is above its upper bound", "swap them"))
        checks.append(
            (
                "lower",
                (value < lo) | (value > hi),
                "its value lies outside its interval",
                "check the bounds belong to this measure",
            )
        )
    if spec.sd is not None and spec.n is not None:
        checks.append(
            (
                "sd",
                frame[spec.sd] < 0,
                "its standard deviation is negative",
                "a spread cannot be below zero",
            )
        )
        checks.append(
            (
                "n",
                frame[spec.n] < 1,
                "its sample size is below one",
                "give each category's number of observations",
            )
        )
    for field, bad, what, hint in checks:
        for row in list(bad.fillna(False).to_numpy().nonzero()[0])[:5]:
            label = frame[chart.category].iloc[row]
            yield Problem(
                "impossible_interval",
                f"{path}.interval.{field}",
                f"'{label}': {what}",
                hint,
                str(label),
            )


def intervals(
    chart: CompareChart, frame: pd.DataFrame, values: list[float | None]
) -> list[tuple[float | None, float | None]]:
    """Each value's interval: the given bounds, or mean ± t·sd/√n at the stated level."""
    spec = chart.interval
    if spec is None:
        return [(None, None)] * len(values)
    if spec.lower is not None and spec.upper is not None:
        return [
            (None if pd.isna(lo) else float(lo), None if pd.isna(hi) else float(hi))
            for lo, hi in zip(frame[spec.lower], frame[spec.upper], strict=True)
        ]
    assert spec.sd is not None and spec.n is not None
    from scipy import special  # Student's t quantile; scipy.stats costs a second to import

    out: list[tuple[float | None, float | None]] = []
    for value, sd, n in zip(values, frame[spec.sd], frame[spec.n], strict=True):
        if value is None or pd.isna(sd) or pd.isna(n) or n < 2:
            out.append((None, None))
            continue
        t = float(special.stdtrit(int(n) - 1, (1 + spec.level) / 2))
        half = t * float(sd) / math.sqrt(n)
        out.append((value - half, value + half))
    return out


def encode(chart: CompareChart, table: Table, env: Env) -> ChartPlan:
    locale = env.locale
    frame = table.frame
    if chart.sort != "as_given":
        frame = frame.sort_values(
            chart.measure, ascending=chart.sort == "ascending", kind="stable", na_position="last"
        )
    values = [None if pd.isna(v) else float(v) for v in frame[chart.measure]]
    bounds = intervals(chart, frame, values)
    categories = [
        Category(label=str(c), value=v, lo=lo, hi=hi)
        for c, v, (lo, hi) in zip(frame[chart.category], values, bounds, strict=True)
    ]
    present = [v for v in values if v is not None]
    present += [b for pair in bounds for b in pair if b is not None]
    unit = table.units.get(chart.measure, "")
    label = formatting.titled(table.label(chart.measure), unit)
    style = table.style(chart.measure)
    notes: list[str] = []
    if chart.focus == "differences":
        lo, hi = scales.fit(present, include_zero=False, unit=unit, pad=scales.EDGE_ROOM)
        scale = Scale(lo=lo, hi=hi, unit=unit, label=label, style=style)
        if not scale.includes_zero:
            notes.append(scale_note(scale, locale))
        return ChartPlan(
            **heading(chart, locale, table.source),
            form="dots",
            value_axis=scale,
            categories=categories,
            notes=notes,
        )
    base = chart.baseline if chart.baseline is not None else 0.0
    lo, hi = scales.fit([*present, base], include_zero=base == 0.0, unit=unit)
    if base != 0.0:
        lo = base if base > 0 else min(lo, base)
    return ChartPlan(
        **heading(chart, locale, table.source),
        form="bars",
        value_axis=Scale(lo=lo, hi=max(hi, lo + 1e-9), unit=unit, label=label, style=style),
        baseline=base,
        categories=categories,
        notes=[] if base == 0.0 else [truncation_note(base, unit, locale)],
    )


def truncation_note(base: float, unit: str, locale: str) -> str:
    start = formatting.with_unit(base, unit, locale)
    return wording.say("text.truncation_note", locale, start=start)


def scale_note(scale: Scale, locale: str) -> str:
    return wording.say("text.scale_note", locale, start=scale.shown(scale.lo, locale))


ENCODER = register(Encoder("compare", problems, encode, frozenset({"bars", "dots"})))
