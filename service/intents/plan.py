"""The chart plan: a plain, serialisable description of what a chart will draw.

Encoders turn an intent plus data into a plan; checks measure the plan (and may correct it); the
renderer draws the plan and nothing else. Nothing here knows about matplotlib.

One plan type serves every form; each form uses the fields it needs and leaves the rest empty:

| form | fields |
|---|---|
| bars, dots | categories (value, optional interval lo/hi, target, percent), baseline |
| deviation | categories (value = actual − target), baseline 0, references |
| pie | categories (value, percent) |
| lines | periods, series, gaps, partial, references |
| control | lines fields, plus references (centre line, limits) and verdicts |
| panels | periods, panels (each with its own value axis and series), gaps, partial |
| histogram | bins, value_axis (counts), x_axis (measure) |
| box | boxes, value_axis |
| scatter | points, x_axis, value_axis (y), fit |
"""

from __future__ import annotations

from collections.abc import Sequence
from typing import Any, Literal

import numpy as np
from pydantic import BaseModel, ConfigDict

from service import formatting
from service.definition.model import ChartBase

Form = Literal[
    "bars", "dots", "deviation", "pie", "lines", "control", "panels", "histogram", "box", "scatter"
]
"""Every form a plan can take; ``forms.FORMS`` says what each encodes, its size and key figures."""


class Frozen(BaseModel):
    model_config = ConfigDict(extra="forbid", frozen=True)


class Scale(Frozen):
    """A value axis: its drawn range and unit."""

    lo: float
    hi: float
    unit: str
    label: str
    log: bool = False
    style: formatting.Style | None = None
    """How values on this axis are written (else as the unit implies)."""

    @property
    def includes_zero(self) -> bool:
        return self.lo <= 0.0 <= self.hi

    @property
    def writes(self) -> formatting.Style:
        """The style of the axis's values."""
        return self.style or formatting.style_for(self.unit)

    def shown(
        self, value: float | None, locale: str, *, short: bool = False, digits: int | None = None
    ) -> str:
        """A value on this axis as the pack writes it (``digits``: decimals, unless the axis's
        own format fixes them)."""
        style = self.writes
        if digits is not None and style.decimals is None:
            style = style.model_copy(update={"decimals": digits})
        return formatting.show(value, style, locale, short=short)


class Category(Frozen):
    label: str
    value: float | None
    lo: float | None = None
    """Lower bound of the value's interval (uncertainty), when the data has one."""
    hi: float | None = None
    target: float | None = None
    percent: int | None = None
    """The displayed share in whole percent (largest remainder: they sum to 100)."""
    expected_missing: bool = False
    """An expected part the data lacks: shown as missing, never dropped."""


class Series(Frozen):
    """One measure over time; ``values`` aligns with ``ChartPlan.periods`` (None: no data)."""

    name: str
    """The column drawn (an identifier: checks match it against the definition)."""
    unit: str
    values: list[float | None]
    segments: list[tuple[int, int]]
    """Runs of periods joined by a line, as (first, last) indexes, inclusive."""
    xs: list[int] | None = None
    """Period indexes of ``values`` when the series was reduced for drawing (else 0..n-1)."""
    estimate: bool = False
    """Estimates or forecasts: drawn dashed and labelled, never joined to actuals."""
    muted: bool = False
    """Drawn in grey, behind the focus series."""
    slot: int | None = None
    """The palette colour of this series' measure, the same on every chart of the pack
    (``intents.colours``); None: by position."""
    label: str | None = None
    """What readers see for the series (the column's label); else its name in words."""

    @property
    def title(self) -> str:
        """The series as readers see it."""
        return self.label or formatting.humanise(self.name)

    def positions(self) -> list[int]:
        """The period index of each value."""
        return self.xs if self.xs is not None else list(range(len(self.values)))

    def at(self, period: int) -> float | None:
        """The value drawn at period index ``period`` (None: nothing drawn there)."""
        if self.xs is None:  # value i is at period i: no list of a million positions to search
            return self.values[period] if 0 <= period < len(self.values) else None
        xs = self.xs
        return self.values[xs.index(period)] if period in xs else None

    def spans(self, period: int) -> bool:
        """Whether a drawn line segment reaches or crosses period index ``period``."""
        if self.xs is None:
            return any(a <= period <= b for a, b in self.segments)
        xs = self.xs
        return any(xs[a] <= period <= xs[b] for a, b in self.segments)

    def drawn_at(self, periods: Sequence[int]) -> list[bool]:
        """For each period index, whether a value is drawn there (as :meth:`at`, all at once)."""
        if self.xs is None:
            n = len(self.values)
            return [0 <= p < n and self.values[p] is not None for p in periods]
        first: dict[int, float | None] = {}
        for x, v in zip(self.xs, self.values, strict=False):
            first.setdefault(x, v)
        return [first.get(p) is not None for p in periods]

    def spanned(self, periods: Sequence[int]) -> list[bool]:
        """For each period index, whether a segment reaches or crosses it (as :meth:`spans`).

        A segment covers p when its start is at or before p and its end at or after it: so p is
        covered when the furthest end among the segments starting at or before p reaches p."""
        if not self.segments or not periods:
            return [False] * len(periods)
        ends = np.asarray(self.segments, dtype=np.int64).reshape(-1, 2)
        if self.xs is not None:
            ends = np.asarray(self.xs, dtype=np.int64)[ends]
        order = np.argsort(ends[:, 0], kind="stable")
        starts, reach = ends[order, 0], np.maximum.accumulate(ends[order, 1])
        wanted = np.asarray(periods, dtype=np.int64)
        k = np.searchsorted(starts, wanted, side="right") - 1
        covered = (k >= 0) & (reach[np.maximum(k, 0)] >= wanted)
        return [bool(c) for c in covered]


class Gap(Frozen):
    """A period drawn as 'no data'."""

    index: int
    series: list[str]
    """Which series have no value there (all of them when the period has no row at all)."""


class PartialMark(Frozen):
    """The last period, only partly elapsed at ``as_of``: drawn hollow and labelled."""

    index: int
    text: str
    fraction: float
    off_scale: str | None = None
    """What the off-scale mark says when a value of this period lies outside its value axis (the
    complete periods decide the scale): the values and the completeness. None: every value fits."""


class Reference(Frozen):
    """A horizontal reference: a target, a centre line, a natural process limit."""

    value: float
    label: str
    kind: Literal["target", "centre", "limit"]


class Verdict(Frozen):
    """The reading of a change, printed beside it: a signal, or routine variation."""

    index: int
    text: str
    signal: bool


class Panel(Frozen):
    """One of several aligned panels sharing the time axis, each with its own scale."""

    title: str
    value_axis: Scale
    series: list[Series]
    notes: list[str] = []


class Bin(Frozen):
    lo: float
    hi: float
    count: int


class Box(Frozen):
    label: str
    n: int
    low: float
    q1: float
    median: float
    q3: float
    high: float
    outliers: list[float] = []


class Point(Frozen):
    x: float
    y: float
    label: str | None = None


class Fit(Frozen):
    slope: float
    intercept: float
    r2: float


class Reduction(Frozen):
    """Points removed before drawing because the output could not show them (M4)."""

    before: int
    after: int
    width_px: int


def heading(chart: ChartBase, locale: str, source: str | None = None) -> dict[str, Any]:
    """The fields every plan copies from its chart definition (``source``: the dataset's)."""
    return {
        "chart_id": chart.id,
        "intent": chart.intent,
        "title": chart.title,
        "subtitle": chart.subtitle,
        "note": chart.note,
        "locale": locale,
        "source": chart.source or source,
        "description": chart.description,
    }


def all_series(plan: ChartPlan) -> list[Series]:
    """Every series of a plan, whether drawn on one axes or in panels."""
    return [*plan.series, *(s for panel in plan.panels for s in panel.series)]


class ChartPlan(Frozen):
    chart_id: str
    intent: str
    form: Form
    title: str
    subtitle: str | None = None
    note: str | None = None
    locale: str = "en-GB"
    value_axis: Scale
    x_axis: Scale | None = None
    baseline: float | None = None
    """Where bars start on the value axis (bars only)."""
    categories: list[Category] = []
    periods: list[str] = []
    series: list[Series] = []
    panels: list[Panel] = []
    gaps: list[Gap] = []
    partial: PartialMark | None = None
    references: list[Reference] = []
    verdicts: list[Verdict] = []
    bins: list[Bin] = []
    boxes: list[Box] = []
    points: list[Point] = []
    fit: Fit | None = None
    reduction: Reduction | None = None
    value_labels: bool = False
    """Print each value beside its mark (e.g. when the chart alone cannot give the precision)."""
    palette: list[str] = []
    """The colours the marks use, in order; empty means the house palette."""
    slots: list[int] = []
    """Palette indexes of the colour-coded marks of forms not drawn as series (the measure's own
    colour first), so a measure keeps one colour across the pack; empty: by position."""
    guide: str | None = None
    """A one-line reading guide shown beside the chart (box plots, scatter plots)."""
    source: str | None = None
    """The source line printed under the chart."""
    description: str | None = None
    """The text alternative: what the chart shows, in plain words."""
    notes: list[str] = []
    """Sentences the chart itself must show (e.g. that its scale does not start at zero)."""
    flags: list[str] = []
    """Failed checks, printed on the chart so a reviewer cannot miss them."""
