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

from service import formatting, wording
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
    value: float,
    limits: ProcessLimits,
    rules: Iterable[int],
    run_length: int,
    locale: str = "en-GB",
) -> list[str]:
    """Plain words for the rules that fire at one point."""
    side = "above" if value > limits.centre else "below"
    return [wording.say(f"text.rule{r}_{side}", locale, run=run_length) for r in sorted(rules)]


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
        partial = PartialMark(
            index=len(full) - 1, text=done.text(env.locale), fraction=done.fraction
        )
    judged = values[:-1] if partial is not None else values  # a partial period is never judged
    complete = [i for i, v in enumerate(judged) if v is not None]
    last = complete[-1] if complete else 0
    locale = env.locale
    if len(complete) < chart.min_history or not moving_ranges(judged):
        text = wording.say(
            "text.too_little_history", locale, count=len(complete), needed=chart.min_history
        )
        verdict = Verdict(index=last, text=text, signal=False)
        return Reading(labels, values, partial, None, [], [verdict])
    limits = xmr(judged)
    style = table.style(chart.measure)
    if style.decimals is None:
        digits = formatting.decimals_for([v for v in judged if v is not None])
        style = style.model_copy(update={"decimals": digits})
    bare = formatting.style_for("", decimals=style.decimals, grouping=style.grouping)

    def shown(value: float, with_unit: bool = True) -> str:
        return formatting.show(value, style if with_unit else bare, locale)

    fired: dict[int, list[int]] = {}
    for rule, indexes in run_rules(judged, limits, chart.run_length).items():
        for i in indexes:
            fired.setdefault(i, []).append(rule)
    references = [
        Reference(
            value=limits.centre,
            label=wording.say("text.centre_line", locale, value=shown(limits.centre)),
            kind="centre",
        ),
        Reference(
            value=limits.upper,
            label=wording.say("text.upper_limit", locale, value=shown(limits.upper)),
            kind="limit",
        ),
        Reference(
            value=limits.lower,
            label=wording.say("text.lower_limit", locale, value=shown(limits.lower)),
            kind="limit",
        ),
    ]
    value = judged[last] or 0.0
    why = reasons(value, limits, fired.get(last, []), chart.run_length, locale)
    band = wording.say(
        "text.limits_band",
        locale,
        lo=shown(limits.lower, False),
        hi=shown(limits.upper, False),
        range=formatting.show(limits.range_limit, bare, locale),
    )
    previous = judged[last - 1] if last > 0 else None
    if previous is None:
        opening = wording.say("text.no_change_to_judge", locale, period=labels[last])
    else:
        change = value - previous
        opening = wording.say(
            "text.latest_change",
            locale,
            change=formatting.change(change, style, locale),
            before=labels[last - 1],
            after=labels[last],
        )
        if abs(change) > limits.range_limit:
            why.append(wording.say("text.range_beyond", locale))
    if why:
        text = wording.say(
            "text.signal_verdict", locale, opening=opening, why="; ".join(why), band=band
        )
    else:
        text = wording.say("text.routine_verdict", locale, opening=opening, band=band)
    verdicts = [Verdict(index=last, text=text, signal=bool(why))]
    for i, rules in sorted(fired.items()):
        if i == last:
            continue  # the verdict on the latest change already names its rules
        key = "text.signal_rule" if len(rules) == 1 else "text.signal_rules"
        named = ", ".join(map(str, rules))
        verdicts.append(
            Verdict(
                index=i, text=wording.say(key, locale, period=labels[i], rules=named), signal=True
            )
        )
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


def fitted_axis(
    reading: Reading, unit: str, label: str, style: formatting.Style | None = None
) -> Scale:
    """A value axis that holds every drawn value and every reference line."""
    done, running = off_scale.split(reading.partial, reading.values)
    references = [r.value for r in reading.references]
    lo, hi = scales.fit_periods([*done, *references], running, include_zero=False, unit=unit)
    return Scale(lo=lo, hi=hi, unit=unit, label=label, style=style)


def encode(chart: MovementChart, table: Table, env: Env) -> ChartPlan:
    reading = assess(chart, table, env)
    unit = table.units.get(chart.measure, "")
    values = reading.values
    name = table.label(chart.measure)
    series = Series(name=chart.measure, label=name, unit=unit, values=values, segments=runs(values))
    gaps = [Gap(index=i, series=[chart.measure]) for i, v in enumerate(values) if v is None]
    label = formatting.titled(name, unit)
    scale = fitted_axis(reading, unit, label, table.style(chart.measure))
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
