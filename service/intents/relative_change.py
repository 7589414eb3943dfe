"""``relative_change``: two or more measures over time, usually in different units.

Plumbline never draws two y-axes. Measures in different units are compared either

- **indexed** (form ``index`` → plan form ``lines``): each measure divided by its value in a base
  period, as an index (base = 100) or as a percent change since the base (base = 0), on one axis with
  a reference line at the base; or
- in **aligned panels** (form ``panels`` → plan form ``panels``): one panel per measure, each with its
  own value axis fitted to that measure, all sharing the time axis.

The time axis, gaps and partial mark are built as for ``trend``: every period from the first to the
last row, missing values left as gaps (never filled), a running last period marked partial.
"""

from __future__ import annotations

from collections.abc import Iterable
from typing import Any

import pandas as pd

from service import formatting, wording
from service.config import Limits
from service.data import periods
from service.data.frames import Table
from service.definition.model import RelativeChangeChart
from service.errors import Problem
from service.intents import partial as off_scale
from service.intents import scales, timeseries
from service.intents.compare import scale_note
from service.intents.plan import (
    ChartPlan,
    Gap,
    Panel,
    PartialMark,
    Reference,
    Scale,
    Series,
    heading,
)
from service.intents.registry import Encoder, Env, register
from service.intents.trend import estimates_note, runs


def _full_frame(table: Table) -> tuple[pd.PeriodIndex, pd.DataFrame]:
    """Every expected period, and the data reindexed onto them (missing periods as NaN rows)."""
    assert table.periods is not None
    full = periods.expected(table.periods.min(), table.periods.max())
    return full, table.frame.set_index(table.periods).reindex(full)


def _usable(value: float) -> bool:
    """A value a measure can be indexed to: present and not zero."""
    return not pd.isna(value) and value != 0.0


def base_index(chart: RelativeChangeChart, table: Table) -> int | None:
    """Where the base period is on the full period axis: the chart's ``base_period`` (``None`` if
    it has no row), else the first period where every measure has a non-zero value."""
    if table.periods is None or len(table.periods) == 0 or table.frequency is None:
        return None
    full, frame = _full_frame(table)
    if chart.base_period is not None:
        wanted = pd.Period(chart.base_period, freq=periods.pandas_freq(table.frequency))
        if wanted not in table.periods:
            return None
        return int(full.get_indexer(pd.PeriodIndex([wanted]))[0])
    for i in range(len(full)):
        if all(_usable(frame[m].iloc[i]) for m in chart.measures):
            return i
    return None


def base_label(chart: RelativeChangeChart, table: Table, locale: str) -> str | None:
    """How the base period is named on the chart, e.g. 'Jan 2026'."""
    index = base_index(chart, table)
    if index is None or table.frequency is None:
        return None
    full, _ = _full_frame(table)
    return periods.label(full[index], table.frequency, locale)


def units_text(chart: RelativeChangeChart, table: Table, locale: str = "en-GB") -> str | None:
    """'cost in GBP, cases in cases' when the measures' units differ, else ``None``."""
    units = [table.units.get(m, "") for m in chart.measures]
    if len(set(units)) <= 1:
        return None
    return ", ".join(
        wording.say(
            "text.measure_in_unit",
            locale,
            name=formatting.in_sentence(table.label(m), locale),
            unit=u,
        )
        for m, u in zip(chart.measures, units, strict=True)
    )


def problems(
    chart: RelativeChangeChart, table: Table, path: str, limits: Limits
) -> Iterable[Problem]:
    found = timeseries.problems(list(chart.measures), table, path, limits, noun="measures")
    yield from found
    if not timeseries.drawable(found):
        return
    empty = {m for m in chart.measures if table.frame[m].isna().all()}
    for i, measure in enumerate(chart.measures):
        if measure in empty:
            yield Problem(
                "no_values",
                f"{path}.measures[{i}]",
                f"'{measure}' has no values at all in dataset '{table.name}'",
                "give it values, or drop it from the chart",
                measure,
            )
    if chart.form == "index":
        yield from _index_problems(chart, table, path, empty)


def _index_problems(
    chart: RelativeChangeChart, table: Table, path: str, empty: set[str]
) -> Iterable[Problem]:
    assert table.periods is not None and table.frequency is not None
    for i, measure in enumerate(chart.measures):
        if (table.frame[measure] < 0).any():
            yield Problem(
                "negative_values",
                f"{path}.measures[{i}]",
                f"'{measure}' has negative values, and a ratio to a base period cannot be read "
                "across a change of sign",
                "use form 'panels'",
                measure,
            )
    full, frame = _full_frame(table)
    first, last = (periods.label(p, table.frequency, "en-GB") for p in (full[0], full[-1]))
    index = base_index(chart, table)
    if chart.base_period is not None and index is None:
        yield Problem(
            "base_period_not_in_data",
            f"{path}.base_period",
            f"the base period {chart.base_period.isoformat()} has no row in dataset '{table.name}'",
            f"choose a period with data, from {first} to {last}",
            chart.base_period.isoformat(),
        )
        return
    if index is None:
        if not empty:
            yield Problem(
                "no_common_base",
                f"{path}.base_period",
                "no period has a non-zero value for every measure, so there is nothing to index to",
                "use form 'panels'",
                None,
            )
        return
    name = periods.label(full[index], table.frequency, "en-GB")
    for i, measure in enumerate(chart.measures):
        value = frame[measure].iloc[index]
        if measure not in empty and not _usable(value):
            what = "no value" if pd.isna(value) else "a value of zero"
            yield Problem(
                "cannot_index",
                f"{path}.measures[{i}]",
                f"'{measure}' has {what} in the base period {name}, so it cannot be indexed",
                "choose another base_period, or use form 'panels'",
                measure,
            )


def encode(chart: RelativeChangeChart, table: Table, env: Env) -> ChartPlan:
    assert table.periods is not None and table.frequency is not None
    full, frame = _full_frame(table)
    raw = {m: [None if pd.isna(v) else float(v) for v in frame[m]] for m in chart.measures}
    gaps = [
        Gap(index=i, series=[m for m in chart.measures if raw[m][i] is None])
        for i in range(len(full))
        if any(raw[m][i] is None for m in chart.measures)
    ]
    done = periods.completeness(full[-1], env.as_of)
    fields: dict[str, Any] = {
        **heading(chart, env.locale, table.source),
        "periods": [periods.label(p, table.frequency, env.locale) for p in full],
        "gaps": gaps,
        "partial": None
        if done is None
        else PartialMark(index=len(full) - 1, text=done.text(env.locale), fraction=done.fraction),
    }
    if chart.form == "panels":
        return _panels(chart, table, raw, fields)
    return _indexed(chart, table, raw, fields)


Raw = dict[str, list[float | None]]
"""Each measure's values on the full period axis (``None``: no data)."""


def _series(name: str, unit: str, values: list[float | None], table: Table) -> Series:
    estimate = name in table.estimates
    return Series(
        name=name,
        label=table.label(name),
        unit=unit,
        values=values,
        segments=runs(values),
        estimate=estimate,
    )


def _indexed(
    chart: RelativeChangeChart, table: Table, raw: Raw, fields: dict[str, Any]
) -> ChartPlan:
    index, locale = base_index(chart, table), fields["locale"]
    base = base_label(chart, table, locale)
    assert index is not None and base is not None, "problems() reports a chart with no base"
    percent = chart.index_as == "percent_change"
    series: list[Series] = []
    for measure, values in raw.items():
        at_base = values[index]
        assert at_base is not None and at_base != 0.0
        shown = [None if v is None else _indexed_value(v, at_base, percent=percent) for v in values]
        # Series.unit is how one value is written: an index has none, a change is in %.
        series.append(_series(measure, "%" if percent else "", shown, table))
    unit = wording.say("text.change_since" if percent else "text.index_unit", locale, base=base)
    done, running = off_scale.split(fields["partial"], *(s.values for s in series))
    lo, hi = scales.fit_periods(done, running, include_zero=False)  # a change is not a share
    style = formatting.style_for("%") if percent else formatting.style_for("")
    scale = Scale(lo=lo, hi=hi, unit=unit, label=unit, style=style)
    level = 0.0 if percent else 100.0
    level_text = formatting.percent(0, locale) if percent else formatting.number(100, locale)
    label = wording.say("text.base_line", locale, base=base, value=level_text)
    differ = units_text(chart, table, locale)
    opening = wording.say(
        "text.change_opening" if percent else "text.index_opening", locale, base=base
    )
    why = wording.say(
        "text.units_differ_only" if differ else "text.only_change", locale, differ=differ
    )
    notes = [wording.sentence(opening, why)]
    if not scale.includes_zero:
        notes.append(scale_note(scale, locale))
    return off_scale.mark_off_scale(
        ChartPlan(
            **fields,
            form="lines",
            value_axis=scale,
            series=series,
            references=[Reference(value=level, label=label, kind="centre")],
            notes=notes + _estimates(chart, table, locale),
        )
    )


def _indexed_value(value: float, base: float, *, percent: bool) -> float:
    # Multiplied before dividing, so whole ratios stay exact (44 × 100 / 40 = 110, not 110.00…01).
    return (value - base) * 100.0 / base if percent else value * 100.0 / base


def _panels(
    chart: RelativeChangeChart, table: Table, raw: Raw, fields: dict[str, Any]
) -> ChartPlan:
    panels: list[Panel] = []
    for measure, values in raw.items():
        unit = table.units.get(measure, "")
        done, running = off_scale.split(fields["partial"], values)
        lo, hi = scales.fit_periods(done, running, include_zero=False, unit=unit)
        name = table.label(measure)
        axis = Scale(lo=lo, hi=hi, unit=unit, label=unit or name, style=table.style(measure))
        notes = [] if axis.includes_zero else [scale_note(axis, fields["locale"])]
        title = formatting.titled(name, unit)
        series = [_series(measure, unit, values, table)]
        panels.append(Panel(title=title, value_axis=axis, series=series, notes=notes))
    locale = fields["locale"]
    differ = units_text(chart, table, locale)
    key = "text.panels_units_differ" if differ else "text.panels_note"
    note = wording.say(key, locale, differ=differ)
    return off_scale.mark_off_scale(
        ChartPlan(
            **fields,
            form="panels",
            value_axis=panels[0].value_axis,  # required by the plan; each panel is drawn on its own
            panels=panels,
            notes=[note, *_estimates(chart, table, locale)],
        )
    )


def _estimates(chart: RelativeChangeChart, table: Table, locale: str) -> list[str]:
    """The note naming measures declared as estimates (drawn dashed), if there are any."""
    estimated = [table.label(m) for m in chart.measures if m in table.estimates]
    return [estimates_note(estimated, locale)] if estimated else []


ENCODER = register(Encoder("relative_change", problems, encode, frozenset({"lines", "panels"})))
