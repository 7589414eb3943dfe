"""The chart plan: a plain, serialisable description of what a chart will draw.

Encoders turn an intent plus data into a plan; checks measure the plan (and may correct it); the
renderer draws the plan and nothing else. Nothing here knows about matplotlib.
"""

from __future__ import annotations

from typing import Any, Literal

from pydantic import BaseModel, ConfigDict

from service.definition.model import ChartBase

Form = Literal["bars", "dots", "lines"]


class Frozen(BaseModel):
    model_config = ConfigDict(extra="forbid", frozen=True)


class Scale(Frozen):
    """The value axis: its drawn range and unit."""

    lo: float
    hi: float
    unit: str
    label: str

    @property
    def includes_zero(self) -> bool:
        return self.lo <= 0.0 <= self.hi


class Category(Frozen):
    label: str
    value: float | None


class Series(Frozen):
    """One measure over time; ``values`` aligns with ``ChartPlan.periods`` (None: no data)."""

    name: str
    unit: str
    values: list[float | None]
    segments: list[tuple[int, int]]
    """Runs of periods joined by a line, as (first, last) indexes, inclusive."""


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


def heading(chart: ChartBase, locale: str) -> dict[str, Any]:
    """The fields every plan copies from its chart definition."""
    return {
        "chart_id": chart.id,
        "intent": chart.intent,
        "title": chart.title,
        "subtitle": chart.subtitle,
        "note": chart.note,
        "locale": locale,
    }


class ChartPlan(Frozen):
    chart_id: str
    intent: str
    form: Form
    title: str
    subtitle: str | None = None
    note: str | None = None
    locale: str = "en-GB"
    value_axis: Scale
    bar_base: float | None = None
    """Where bars start on the value axis (bars only)."""
    categories: list[Category] = []
    periods: list[str] = []
    series: list[Series] = []
    gaps: list[Gap] = []
    partial: PartialMark | None = None
    notes: list[str] = []
    """Sentences the chart itself must show (e.g. that its scale does not start at zero)."""
    flags: list[str] = []
    """Failed checks, printed on the chart so a reviewer cannot miss them."""
