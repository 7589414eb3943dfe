"""``target``: actual against plan or target, per category.

Two forms. ``bars`` draws the actuals as zero-based bars with a short target mark on each bar (a single
``target_value`` is also carried as one target reference). ``deviation`` draws the variance, actual
minus target, as bars from a zero line labelled "on target", on a value axis scaled to the variances
(it always holds zero, but is not made symmetric: room for a side with no bars says nothing).

Categories keep the order of the data in both forms (the data's order is usually the organisation's
own: regions, teams, budget lines); they are not sorted by variance. A missing actual or target gives
no variance: the category is shown "no data", never as zero.
"""

from __future__ import annotations

from collections.abc import Iterable
from typing import Any

import pandas as pd

from service import formatting, wording
from service.config import Limits
from service.data.frames import Table
from service.definition.model import TargetChart
from service.errors import Problem
from service.intents import categories, scales
from service.intents.plan import Category, ChartPlan, Reference, Scale, heading
from service.intents.registry import Encoder, Env, register


def deviation_note(locale: str) -> str:
    """The note of a deviation chart: what its bars are."""
    return wording.say("text.deviation_note", locale)


DEVIATION_NOTE = deviation_note("en-GB")


def problems(chart: TargetChart, table: Table, path: str, limits: Limits) -> Iterable[Problem]:
    labels = table.frame[chart.category]
    if len(labels) == 0:
        yield Problem(
            "empty_dataset",
            f"{path}.dataset",
            f"dataset '{table.name}' has no rows to set against a target",
            "add rows",
            table.name,
        )
        return
    yield from categories.problems(
        table,
        chart.category,
        path,
        limits,
        advice="show the categories furthest from target and group the rest in the data",
    )
    if chart.target is not None:
        actual_unit = table.units.get(chart.actual, "")
        target_unit = table.units.get(chart.target, "")
        if actual_unit != target_unit:
            yield Problem(
                "mixed_units",
                f"{path}.target",
                f"the target '{chart.target}' is in '{target_unit}' but the actual "
                f"'{chart.actual}' is in '{actual_unit}': actual minus target would mean nothing",
                f"give the target in '{actual_unit}', the actual's unit, in the data",
                [actual_unit, target_unit],
            )


def _present(value: Any) -> float | None:
    return None if pd.isna(value) else float(value)


def targets_of(chart: TargetChart, frame: pd.DataFrame) -> list[float | None]:
    """Each row's target: its own (target column), or the one target value."""
    if chart.target is not None:
        return [_present(v) for v in frame[chart.target]]
    return [chart.target_value] * len(frame)


def variance(actual: float | None, target: float | None) -> float | None:
    """Actual minus target; ``None`` when either is missing (never zero)."""
    if actual is None or target is None:
        return None
    return actual - target


Row = tuple[str, float | None, float | None]
"""One category: its label, actual and target (``None``: missing)."""


def encode(chart: TargetChart, table: Table, env: Env) -> ChartPlan:
    frame = table.frame
    rows: list[Row] = list(
        zip(
            [str(c) for c in frame[chart.category]],
            [_present(v) for v in frame[chart.actual]],
            targets_of(chart, frame),
            strict=True,
        )
    )
    if chart.form == "deviation":
        return _deviation(chart, table, env, rows)
    return _bars(chart, table, env, rows)


def _bars(chart: TargetChart, table: Table, env: Env, rows: list[Row]) -> ChartPlan:
    unit = table.units.get(chart.actual, "")
    style = table.style(chart.actual)
    categories = [Category(label=label, value=a, target=t) for label, a, t in rows]
    present = [v for _, a, t in rows for v in (a, t) if v is not None]
    lo, hi = scales.fit(present, include_zero=True, unit=unit)
    references: list[Reference] = []
    if chart.target_value is not None:
        shown = formatting.show(chart.target_value, style, env.locale)
        label = wording.say("text.target_line", env.locale, value=shown)
        references.append(Reference(value=chart.target_value, label=label, kind="target"))
    without = [label for label, _, t in rows if t is None]
    notes = []
    if without:
        names = ", ".join(without)
        notes.append(wording.sentence(wording.say("text.no_target", env.locale, names=names)))
    return ChartPlan(
        **heading(chart, env.locale, table.source),
        form="bars",
        value_axis=Scale(
            lo=lo,
            hi=max(hi, lo + 1e-9),
            unit=unit,
            label=formatting.titled(table.label(chart.actual), unit),
            style=style,
        ),
        baseline=0.0,
        categories=categories,
        references=references,
        notes=notes,
    )


def _deviation(chart: TargetChart, table: Table, env: Env, rows: list[Row]) -> ChartPlan:
    style = table.style(chart.actual)
    if style.kind == "percent":  # a difference of two percentages is in percentage points
        style = formatting.style_for("pp", decimals=style.decimals)
    unit = style.unit
    categories = [Category(label=label, value=variance(a, t)) for label, a, t in rows]
    variances = [c.value for c in categories if c.value is not None]
    lo, hi = scales.fit(variances, include_zero=True, unit=unit)  # to the data, not symmetric
    note = deviation_note(env.locale)
    if chart.target_value is not None:
        shown = table.style(chart.actual)
        value = formatting.show(chart.target_value, shown, env.locale)
        note = wording.sentence(note, wording.say("text.one_target", env.locale, value=value))
    return ChartPlan(
        **heading(chart, env.locale, table.source),
        form="deviation",
        value_axis=Scale(
            lo=lo,
            hi=hi,
            unit=unit,
            label=formatting.titled(
                wording.say("text.minus_target", env.locale, name=table.label(chart.actual)),
                wording.say("text.pp_unit", env.locale) if style.points else unit,
            ),
            style=style,
        ),
        baseline=0.0,
        categories=categories,
        references=[
            Reference(value=0.0, label=wording.say("text.on_target", env.locale), kind="target")
        ],
        notes=[note],
    )


ENCODER = register(Encoder("target", problems, encode, frozenset({"bars", "deviation"})))
