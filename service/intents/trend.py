"""``trend``: one or more measures (sharing a unit) over time.

The time axis holds every period from the first to the last with data, at the declared frequency, so a
missing period has a place: lines are broken there and the period is marked "no data" (never joined
across, never filled with zero). The last period is judged against ``as_of``: if it was still running,
it is drawn hollow and labelled with its completeness.
"""

from __future__ import annotations

from collections.abc import Iterable

import numpy as np

from service import formatting
from service.config import Limits
from service.data import periods
from service.data.frames import Table
from service.definition.model import TrendChart
from service.errors import Problem
from service.intents import scales, timeseries
from service.intents.compare import scale_note
from service.intents.plan import ChartPlan, PartialMark, Scale, Series, heading
from service.intents.registry import Encoder, Env, register


def problems(chart: TrendChart, table: Table, path: str, limits: Limits) -> Iterable[Problem]:
    found = timeseries.problems(list(chart.measures), table, path, limits)
    yield from found
    if not timeseries.drawable(found):
        return
    for i, measure in enumerate(chart.measures):
        if chart.scale == "log" and (table.frame[measure] <= 0).any():
            yield Problem(
                "log_of_non_positive",
                f"{path}.measures[{i}]",
                f"'{measure}' has zero or negative values, which a logarithmic scale cannot show",
                "use scale 'linear'",
                measure,
            )
        if table.frame[measure].isna().all():
            yield Problem(
                "no_values",
                f"{path}.measures[{i}]",
                f"'{measure}' has no values at all in dataset '{table.name}'",
                "give it values, or drop it from the chart",
                measure,
            )


def estimates_note(names: list[str]) -> str:
    return "Estimates, not actuals (dashed, or a hollow diamond): " + ", ".join(names) + "."


def project(series: list[Series], partial: PartialMark, chart: TrendChart) -> list[Series]:
    """Run-rate estimates of the partial period: its value so far divided by the share elapsed.

    Each is a separate series (so it is never joined to the actuals), marked as an estimate."""
    out = []
    for s in series:
        value = s.values[partial.index]
        if value is None or partial.fraction <= 0 or s.estimate:
            continue
        values: list[float | None] = [None] * len(s.values)
        values[partial.index] = value / partial.fraction
        out.append(
            Series(
                name=f"{s.name} (estimate)",
                unit=s.unit,
                values=values,
                segments=[(partial.index, partial.index)],
                estimate=True,
            )
        )
    return out


LOG_NOTE = "Logarithmic scale: equal distances show equal ratios, not equal differences."


def runs(values: list[float | None]) -> list[tuple[int, int]]:
    """Maximal runs of consecutive present values, as (first, last) indexes."""
    return timeseries.runs_of(np.fromiter((v is not None for v in values), bool, len(values)))


def encode(chart: TrendChart, table: Table, env: Env) -> ChartPlan:
    locale, as_of = env.locale, env.as_of
    assert table.periods is not None and table.frequency is not None
    full = periods.expected(table.periods.min(), table.periods.max())
    frame = table.frame.set_index(table.periods).reindex(full)
    unit = next((table.units[m] for m in chart.measures if m in table.units), "")
    series: list[Series] = []
    drawn_at: list[timeseries.Mask] = []
    for measure in chart.measures:
        values, drawn = timeseries.on_axis(frame[measure])
        drawn_at.append(drawn)
        series.append(
            Series(
                name=measure,
                unit=unit,
                values=values,
                segments=timeseries.runs_of(drawn),
                estimate=measure in table.estimates,
            )
        )
    gaps = timeseries.gaps_of([s.name for s in series], drawn_at)
    partial = None
    done = periods.completeness(full[-1], as_of)
    if done is not None:
        partial = PartialMark(index=len(full) - 1, text=done.text(), fraction=done.fraction)
    notes: list[str] = []
    if chart.projection is not None and partial is not None:
        series.extend(project(series, partial, chart))
    elif chart.projection is not None:
        notes.append("No projection: the last period was complete at as_of.")
    estimated = sorted(s.name for s in series if s.estimate)
    if estimated:
        notes.append(estimates_note(estimated))
    log = chart.scale == "log"
    measured = [frame[m].to_numpy(dtype=float, na_value=np.nan) for m in chart.measures]
    if partial is not None:  # a projection has one value, at the partial period
        measured.append(
            np.asarray([s.values[partial.index] for s in series[len(measured) :]], dtype=float)
        )
    present = timeseries.extremes(np.concatenate(measured), positive=log)
    lo, hi = scales.fit_log(present) if log else scales.fit(present, include_zero=chart.from_zero)
    label = unit if len(chart.measures) > 1 else formatting.titled(chart.measures[0], unit)
    scale = Scale(lo=lo, hi=hi, unit=unit, label=label, log=log)
    if not (scale.includes_zero or log):
        notes.append(scale_note(scale, locale))
    if log:
        notes.append(LOG_NOTE)
    return ChartPlan(
        **heading(chart, locale, table.source),
        form="lines",
        value_axis=scale,
        periods=periods.labels(full, table.frequency, locale),
        series=series,
        gaps=gaps,
        partial=partial,
        notes=notes,
    )


ENCODER = register(Encoder("trend", problems, encode, frozenset({"lines", "panels"})))
