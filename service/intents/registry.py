"""The one table of intents. Each intent module registers its :class:`Encoder` on import."""

from __future__ import annotations

from collections.abc import Callable, Iterable
from dataclasses import dataclass
from datetime import datetime
from typing import Any

from service.config import Limits
from service.data.frames import Table
from service.definition.model import OVER_TIME
from service.errors import Problem
from service.intents.plan import ChartPlan


@dataclass(frozen=True)
class Env:
    """What an encoder may know besides its chart and data."""

    locale: str
    as_of: datetime
    """``as_of`` on the sender's clock, zone dropped (see ``definition.model.local_wall_time``)."""
    palette: tuple[str, ...] | None = None
    """The report's custom palette, if it has one."""


@dataclass(frozen=True)
class Encoder:
    intent: str
    problems: Callable[[Any, Table, str, Limits], Iterable[Problem]]
    """Data-dependent validation: (chart, table, path of the chart, limits) → problems."""
    encode: Callable[[Any, Table, Env], ChartPlan]
    forms: frozenset[str]
    """Every form the encoder can produce (each needs a drawer in ``render``)."""

    @property
    def over_time(self) -> bool:
        """The intent draws values over time (``definition.model.ChartBase.over_time``)."""
        return self.intent in OVER_TIME


ENCODERS: dict[str, Encoder] = {}


def register(encoder: Encoder) -> Encoder:
    if encoder.intent in ENCODERS:
        raise ValueError(f"intent {encoder.intent!r} is registered twice")
    ENCODERS[encoder.intent] = encoder
    return encoder
