"""``distribution``: how the values of one measure are spread (a histogram, or box plots).

Each row is one observation. Missing values are counted and said on the chart, never read as zero.

- **histogram**: equal-width bins at round edges (a 1–2–2.5–5 step, ``formatting.nice_edges``), about
  as many as asked or as numpy's ``"auto"`` rule gives (should ``"auto"`` ask for more than
  ``MAX_AUTO_BINS`` bins, as a long tail can make it, Sturges' rule is used instead). Bars count
  observations from zero.
- **box**: one box per group (or one for all). Quartiles use numpy's default *linear* method (which
  equals Python's ``statistics.quantiles(method="inclusive")``). Whiskers follow Tukey's rule: they
  reach the most extreme values within 1.5 × IQR of the box; values beyond are drawn as dots.
"""

from __future__ import annotations

import math
from collections.abc import Iterable

import numpy as np
import pandas as pd

from service import formatting, wording
from service.config import Limits
from service.data.frames import Table
from service.definition.model import DistributionChart
from service.errors import Problem
from service.intents import scales
from service.intents.compare import scale_note
from service.intents.plan import Bin, Box, ChartPlan, Scale, heading
from service.intents.registry import Encoder, Env, register

#: Fewer observations than this (in all, or in one group) make a spread that says little.
MIN_OBSERVATIONS = 5
#: More bins than this from numpy's "auto" rule: Sturges' rule is used instead.
MAX_AUTO_BINS = 100
#: Tukey's rule: whiskers reach the furthest values within this many box-lengths (IQRs) of the box.
WHISKER_IQR = 1.5


def problems(
    chart: DistributionChart, table: Table, path: str, limits: Limits
) -> Iterable[Problem]:
    values = table.frame[chart.measure]
    present = int(values.notna().sum())
    if len(values) == 0:
        yield Problem(
            "empty_dataset",
            f"{path}.dataset",
            f"dataset '{table.name}' has no rows",
            "add rows",
            table.name,
        )
        return
    if present == 0:
        yield Problem(
            "no_values",
            f"{path}.measure",
            f"'{chart.measure}' has no values at all in dataset '{table.name}'",
            "give it values, or drop the chart",
            chart.measure,
        )
        return
    if present < MIN_OBSERVATIONS:
        yield Problem(
            "too_few_observations",
            f"{path}.measure",
            f"only {present} values of '{chart.measure}': a spread of fewer than "
            f"{MIN_OBSERVATIONS} observations says little",
            "list the values in a table instead, or gather more observations",
            present,
        )
    if chart.group is None:
        return
    if chart.form == "histogram":
        yield Problem(
            "group_needs_box",
            f"{path}.group",
            "a histogram draws one measure for all rows; 'group' makes one box per group",
            "use form 'box', or leave out 'group'",
            chart.group,
        )
        return
    yield from _group_problems(chart, table, path, limits)


def _group_problems(
    chart: DistributionChart, table: Table, path: str, limits: Limits
) -> Iterable[Problem]:
    assert chart.group is not None
    labels = table.frame[chart.group]
    if labels.isna().any():
        yield Problem(
            "group_missing",
            f"{path}.group",
            f"{int(labels.isna().sum())} rows of dataset '{table.name}' have no '{chart.group}'",
            "give every row a group",
            None,
        )
    counts = table.frame[chart.measure].notna().groupby(labels, sort=False).sum()
    if len(counts) > limits.max_categories:
        yield Problem.over_limit(
            f"{path}.group",
            "groups",
            len(counts),
            setting="max_categories",
            limit=limits.max_categories,
            advice="merge small groups in the data",
        )
        return
    small = [f"{g} ({int(n)})" for g, n in counts.items() if n < MIN_OBSERVATIONS]
    if small:
        yield Problem(
            "too_few_observations",
            f"{path}.group",
            f"groups with fewer than {MIN_OBSERVATIONS} values of '{chart.measure}': "
            + ", ".join(small[:5])
            + (f" and {len(small) - 5} more" if len(small) > 5 else ""),
            "merge small groups in the data, or list their values in a table",
            small[0],
        )


def bin_edges(values: np.ndarray, bins: int | None) -> np.ndarray:
    """Equal-width bin edges at round numbers: about ``bins`` of them, else as many as numpy's
    "auto" rule asks (capped), moved to a 1–2–2.5–5 step so no edge reads 8.22."""
    if bins is None:
        auto = _auto_count(values)
        rule = "sturges" if auto > MAX_AUTO_BINS else "auto"
        bins = max(1, len(np.histogram_bin_edges(values, bins=rule)) - 1)
    lo, hi = float(values.min()), float(values.max())
    return np.asarray(formatting.nice_edges(lo, hi, bins), dtype=float)


def _auto_count(values: np.ndarray) -> int:
    """How many bins numpy's "auto" rule asks for (checked first: a tiny width asks for millions)."""
    span = float(np.ptp(values))
    if values.size < 2 or span == 0.0:
        return 1
    sturges = span / (math.log2(values.size) + 1.0)
    q1, q3 = np.percentile(values, [25, 75])
    fd = 2.0 * float(q3 - q1) * values.size ** (-1.0 / 3.0)
    width = min(fd, sturges) if fd > 0 else sturges
    return math.ceil(span / width)


def histogram_guide(name: str, total: int, locale: str) -> str:
    """The reading guide of a histogram of the measure called ``name`` (its display name)."""
    count = formatting.number(total, locale)
    text = wording.say("text.histogram_guide", locale, name=formatting.in_sentence(name, locale))
    return wording.sentence(text, wording.say("text.values_in_all", locale, count=count))


def box_guide(name: str, locale: str) -> str:
    """The reading guide of box plots of the measure called ``name`` (its display name)."""
    return wording.say("text.box_guide", locale, name=formatting.in_sentence(name, locale))


def missing_note(missing: int, name: str, locale: str) -> str:
    named = formatting.in_sentence(name, locale)
    if missing == 1:
        return wording.say("text.missing_value_one", locale, name=named)
    count = formatting.number(missing, locale)
    return wording.say("text.missing_values", locale, count=count, name=named)


def box_of(label: str, values: np.ndarray) -> Box:
    """Quartiles (numpy linear), Tukey whiskers and the outliers beyond them."""
    q1, median, q3 = (float(q) for q in np.percentile(values, [25, 50, 75]))
    reach = WHISKER_IQR * (q3 - q1)
    inside = values[(values >= q1 - reach) & (values <= q3 + reach)]
    outside = values[(values < q1 - reach) | (values > q3 + reach)]
    return Box(
        label=label,
        n=int(values.size),
        low=float(inside.min()),
        q1=q1,
        median=median,
        q3=q3,
        high=float(inside.max()),
        outliers=sorted(float(v) for v in outside),
    )


def encode(chart: DistributionChart, table: Table, env: Env) -> ChartPlan:
    column = table.frame[chart.measure]
    missing = int(column.isna().sum())
    name = table.label(chart.measure)
    notes = [missing_note(missing, name, env.locale)] if missing else []
    unit = table.units.get(chart.measure, "")
    label = formatting.titled(name, unit)
    if chart.form == "box":
        return _box_plan(chart, table, env, label, notes)
    values = column.dropna().to_numpy(dtype=float)
    edges = bin_edges(values, chart.bins)
    counts, _ = np.histogram(values, bins=edges)
    bins = [
        Bin(lo=float(lo), hi=float(hi), count=int(n))
        for lo, hi, n in zip(edges[:-1], edges[1:], counts, strict=True)
    ]
    _, top = scales.fit([float(c) for c in counts], include_zero=True)
    return ChartPlan(
        **heading(chart, env.locale, table.source),
        form="histogram",
        value_axis=Scale(
            lo=0.0,
            hi=top,
            unit=wording.say("text.observations", env.locale),
            label=wording.say("text.count_axis", env.locale),
            style=formatting.style_for("", integer=True),
        ),
        x_axis=Scale(
            lo=float(edges[0]),
            hi=float(edges[-1]),
            unit=unit,
            label=label,
            style=table.style(chart.measure),
        ),
        baseline=0.0,
        bins=bins,
        guide=histogram_guide(name, int(values.size), env.locale),
        notes=notes,
    )


def _box_plan(
    chart: DistributionChart, table: Table, env: Env, label: str, notes: list[str]
) -> ChartPlan:
    frame = table.frame.dropna(subset=[chart.measure])
    if chart.group is None:
        groups = [(wording.say("text.all", env.locale), frame[chart.measure])]
    else:
        grouped = frame.groupby(chart.group, sort=False)[chart.measure]
        groups = [(str(name), values) for name, values in grouped]
    boxes = [box_of(name, _floats(values)) for name, values in groups if len(values)]
    present = [float(v) for v in frame[chart.measure]]
    unit = table.units.get(chart.measure, "")
    lo, hi = scales.fit(present, include_zero=False, unit=unit, pad=scales.EDGE_ROOM)
    if present and min(present) >= 0.0:
        lo = max(lo, 0.0)  # padding never pushes a measure that cannot be negative below zero
    scale = Scale(lo=lo, hi=hi, unit=unit, label=label, style=table.style(chart.measure))
    if not scale.includes_zero:
        notes = [*notes, scale_note(scale, env.locale)]
    return ChartPlan(
        **heading(chart, env.locale, table.source),
        form="box",
        value_axis=scale,
        boxes=boxes,
        guide=box_guide(table.label(chart.measure), env.locale),
        notes=notes,
    )


def _floats(values: pd.Series) -> np.ndarray:
    return values.to_numpy(dtype=float)


ENCODER = register(Encoder("distribution", problems, encode, frozenset({"histogram", "box"})))
