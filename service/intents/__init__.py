"""Intents: what a chart must show, and the encoder that picks an honest form for it.

``ENCODERS`` is the one table of intents. Each entry names the definition model it accepts, a
``problems`` function for data-dependent validation, and an ``encode`` function that returns a
:class:`~service.intents.plan.ChartPlan`.
"""

from __future__ import annotations

from collections.abc import Callable, Iterable
from dataclasses import dataclass
from datetime import datetime
from typing import Any

from service.config import Limits
from service.data.frames import Table
from service.definition.model import CompareChart, TrendChart
from service.errors import Problem
from service.intents import compare, trend
from service.intents.plan import ChartPlan


@dataclass(frozen=True)
class Encoder:
    intent: str
    model: type[Any]
    problems: Callable[[Any, Table, str, Limits], Iterable[Problem]]
    encode: Callable[[Any, Table, str, datetime], ChartPlan]
    forms: frozenset[str]


def _compare(chart: CompareChart, table: Table, locale: str, as_of: datetime) -> ChartPlan:
    return compare.encode(chart, table, locale=locale)


def _trend(chart: TrendChart, table: Table, locale: str, as_of: datetime) -> ChartPlan:
    return trend.encode(chart, table, locale=locale, as_of=as_of)


ENCODERS: dict[str, Encoder] = {
    "compare": Encoder(
        "compare", CompareChart, compare.problems, _compare, frozenset({"bars", "dots"})
    ),
    "trend": Encoder("trend", TrendChart, trend.problems, _trend, frozenset({"lines"})),
}
