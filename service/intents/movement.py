"""``movement``: a KPI's latest change judged against its own history (XmR chart).

The statistics at the top are pure: an individuals and moving-range (XmR) chart with natural process
limits x̄ ± 3·MR̄/d2 (d2 = 1.128 for moving ranges of two, so 3/d2 = 2.66), the moving-range limit
D4·MR̄ (D4 = 3.268), and the Western Electric run rules, each side of the centre line separately. The
encoder draws the whole history on the full period axis (gaps and a partial last period as ``trend``
does), computes the limits from the complete periods only, and states a verdict on the latest complete
period's change. ``plan.verdicts[0]`` is that verdict; any further verdicts mark points where a rule
fires. The check ``delta-verdict`` recomputes the same reading with :func:`assess`.
"""

from __future__ import annotations

import math
from collections.abc import Iterable, Sequence
from dataclasses import dataclass
from itertools import pairwise

import pandas as pd

from service import formatting
from service.config import Limits
from service.data import periods
from service.data.frames import Table
from service.definition.model import MovementChart
from service.errors import Problem
from service.intents import partial as off_scale
from service.intents import scales
from service.intents.compare import scale_note
from service.intents.plan import (
    ChartPlan,
    Gap,
    PartialMark,
    Reference,
    Scale,
    Series,
    Verdict,
    heading,
)
from service.intents.registry import Encoder, Env, register
from service.intents.trend import runs

D2 = 1.128  # expected range of two normal values, in standard deviations
E2 = 3 / D2  # 2.66: natural process limits are x̄ ± E2·MR̄ (3 sigma)
D4 = 3.268  # upper range limit factor for moving ranges of two


@dataclass(frozen=True)
class ProcessLimits:
    centre: float
    mr_bar: float

    @property
    def sigma(self) -> float:
        return self.mr_bar / D2

    @property
    def lower(self) -> float:
        return self.centre - E2 * self.mr_bar

    @property
    def upper(self) -> float:
        return self.centre + E2 * self.mr_bar

    @property
    def range_limit(self) -> float:
        return D4 * self.mr_bar


def moving_ranges(values: Sequence[float | None]) -> list[float]:
    """|x_i − x_(i−1)| for each pair of adjacent values both present (never across a gap)."""
    return [abs(b - a) for a, b in pairwise(values) if a is not None and b is not None]


def xmr(values: Sequence[float | None]) -> ProcessLimits:
    """Centre line (mean) and average moving range of the present values."""
    present = [v for v in values if v is not None]
    ranges = moving_ranges(values)
    assert present and ranges, "an XmR chart needs two adjacent values"
    return ProcessLimits(centre=sum(present) / len(present), mr_bar=sum(ranges) / len(ranges))


def run_rules(
    values: Sequence[float | None], limits: ProcessLimits, run_length: int = 8
) -> dict[int, list[int]]:
    """Western Electric rules: rule number → indexes of the points that complete its pattern.

    Over the present points in order, each side separately, with z = (x − centre) / sigma: 1, one
    point beyond 3; 2, two of three in a row beyond 2; 3, four of five beyond 1; 4, ``run_length`` in a
    row on one side. A point is marked only when it is itself one of the points of the pattern."""
    at = [i for i, v in enumerate(values) if v is not None]
    z = [_z(values[i] or 0.0, limits) for i in at]
    fired: dict[int, set[int]] = {1: set(), 2: set(), 3: set(), 4: set()}
    for side in (1.0, -1.0):
        s = [side * v for v in z]
        for k in range(len(s)):
            if s[k] > 3:
                fired[1].add(at[k])
            if s[k] > 2 and sum(v > 2 for v in s[max(0, k - 2) : k + 1]) >= 2:
                fired[2].add(at[k])
            if s[k] > 1 and sum(v > 1 for v in s[max(0, k - 4) : k + 1]) >= 4:
                fired[3].add(at[k])
            if k + 1 >= run_length and all(v > 0 for v in s[k + 1 - run_length : k + 1]):
                fired[4].add(at[k])
    return {rule: sorted(found) for rule, found in fired.items()}


def _z(value: float, limits: ProcessLimits) -> float:
    """Distance from the centre line in sigmas (a history without variation: 0 on it, else ±inf)."""
    if limits.sigma > 0:
        return (value - limits.centre) / limits.sigma
    return 0.0 if value == limits.centre else math.copysign(math.inf, value - limits.centre)


def reasons(
    value: float, limits: ProcessLimits, rules: Iterable[int], run_length: int
) -> list[str]:
    """Plain words for the rules that fire at one point."""
    above = value > limits.centre
    side = "above" if above else "below"
    words = {
        1: f"rule 1: beyond the {'upper' if above else 'lower'} limit",
        2: f"rule 2: 2 of 3 beyond 2 sigma {side}",
        3: f"rule 3: 4 of 5 beyond 1 sigma {side}",
        4: f"rule 4: {run_length} in a row {side} the centre line",
    }
    return [words[r] for r in sorted(rules)]


@dataclass(frozen=True)
class Reading:
    """Everything the chart says about the history: what the encoder draws and the check verifies."""

    labels: list[str]
    values: list[float | None]
    partial: PartialMark | None
    limits: ProcessLimits | None
    references: list[Reference]
    verdicts: list[Verdict]


def assess(chart: MovementChart, table: Table, env: Env) -> Reading:
    assert table.periods is not None and table.frequency is not None
    full = periods.expected(table.periods.min(), table.periods.max())
    frame = table.frame.set_index(table.periods).reindex(full)
    values = [None if pd.isna(v) else float(v) for v in frame[chart.measure]]
    labels = [periods.label(p, table.frequency, env.locale) for p in full]
    done = periods.completeness(full[-1], env.as_of)
    partial = None
    if done is not None:
        partial = PartialMark(index=len(full) - 1, text=done.text(), fraction=done.fraction)
    judged = values[:-1] if partial is not None else values  # a partial period is never judged
    complete = [i for i, v in enumerate(judged) if v is not None]
    last = complete[-1] if complete else 0
    if len(complete) < chart.min_history or not moving_ranges(judged):
        text = f"Too little history for a verdict ({len(complete)} of {chart.min_history} points)"
        verdict = Verdict(index=last, text=text, signal=False)
        return Reading(labels, values, partial, None, [], [verdict])
    limits = xmr(judged)
    unit = table.units.get(chart.measure, "")
    digits = formatting.decimals_for([v for v in judged if v is not None])

    def shown(value: float, with_unit: bool = True) -> str:
        return formatting.with_unit(value, unit if with_unit else "", env.locale, digits=digits)

    fired: dict[int, list[int]] = {}
    for rule, indexes in run_rules(judged, limits, chart.run_length).items():
        for i in indexes:
            fired.setdefault(i, []).append(rule)
    references = [
        Reference(value=limits.centre, label=f"centre line {shown(limits.centre)}", kind="centre"),
        Reference(
            value=limits.upper,
            label=f"upper natural process limit {shown(limits.upper)}",
            kind="limit",
        ),
        Reference(
            value=limits.lower,
            label=f"lower natural process limit {shown(limits.lower)}",
            kind="limit",
        ),
    ]
    value = judged[last] or 0.0
    why = reasons(value, limits, fired.get(last, []), chart.run_length)
    band = (
        f"limits {shown(limits.lower, False)} to {shown(limits.upper, False)}; "
        f"moving-range limit {shown(limits.range_limit, False)}"
    )
    previous = judged[last - 1] if last > 0 else None
    if previous is None:
        opening = f"No change to judge for {labels[last]} (no value the period before)"
    else:
        change = value - previous
        sign = "+" if change > 0 else ""
        opening = f"Latest change {sign}{shown(change)} ({labels[last - 1]} to {labels[last]})"
        if abs(change) > limits.range_limit:
            why.append("moving range beyond its limit")
    if why:
        text = f"{opening}: signal ({'; '.join(why)}; {band})"
    else:
        text = f"{opening}: within routine variation ({band})"
    verdicts = [Verdict(index=last, text=text, signal=bool(why))]
    for i, rules in sorted(fired.items()):
        if i == last:
            continue  # the verdict on the latest change already names its rules
        named = f"rule {rules[0]}" if len(rules) == 1 else f"rules {', '.join(map(str, rules))}"
        verdicts.append(Verdict(index=i, text=f"{labels[i]}: signal ({named})", signal=True))
    return Reading(labels, values, partial, limits, references, verdicts)


def problems(chart: MovementChart, table: Table, path: str, limits: Limits) -> Iterable[Problem]:
    if table.periods is None or len(table.periods) == 0:
        yield Problem(
            "empty_dataset",
            f"{path}.dataset",
            f"dataset '{table.name}' has no rows to draw",
            "add rows",
            table.name,
        )
        return
    if table.frame[chart.measure].isna().all():
        yield Problem(
            "no_values",
            f"{path}.measure",
            f"'{chart.measure}' has no values at all in dataset '{table.name}'",
            "give it values, or chart another measure",
            chart.measure,
        )


def fitted_axis(reading: Reading, unit: str, label: str) -> Scale:
    """A value axis that holds every drawn value and every reference line."""
    done, running = off_scale.split(reading.partial, reading.values)
    references = [r.value for r in reading.references]
    lo, hi = scales.fit_periods([*done, *references], running, include_zero=False, unit=unit)
    return Scale(lo=lo, hi=hi, unit=unit, label=label)


def encode(chart: MovementChart, table: Table, env: Env) -> ChartPlan:
    reading = assess(chart, table, env)
    unit = table.units.get(chart.measure, "")
    values = reading.values
    series = Series(name=chart.measure, unit=unit, values=values, segments=runs(values))
    gaps = [Gap(index=i, series=[chart.measure]) for i, v in enumerate(values) if v is None]
    scale = fitted_axis(reading, unit, formatting.titled(chart.measure, unit))
    plan = ChartPlan(
        **heading(chart, env.locale, table.source),
        form="control",
        value_axis=scale,
        periods=reading.labels,
        series=[series],
        gaps=gaps,
        partial=reading.partial,
        references=reading.references,
        verdicts=reading.verdicts,
        notes=[] if scale.includes_zero else [scale_note(scale, env.locale)],
    )
    return off_scale.mark_off_scale(plan)


ENCODER = register(Encoder("movement", problems, encode, frozenset({"control"})))
