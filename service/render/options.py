"""How a pack's charts are drawn: in how many processes, and whether drawn charts are cached.

Plain values, passed explicitly from the caller's settings (``pipeline.render``/``build`` take
them); the defaults keep drawing serial, in this process, with no cache.
"""

from __future__ import annotations

import os
from collections.abc import Callable
from dataclasses import dataclass
from pathlib import Path
from typing import TYPE_CHECKING, Protocol

from service.errors import InvalidRequest

if TYPE_CHECKING:
    from service.config import Settings
    from service.intents.plan import ChartPlan
    from service.render.measured import LayoutReport

Group = tuple[bytes, "list[LayoutReport]"]
"""A drawn group of charts: its PDF, and per chart the label-layout report measured drawing it."""


class Sharer(Protocol):
    """Draws a pack's groups together with other processes (e.g. other machines' workers).

    ``draw`` gets the groups still to draw, their cache keys, ``local``, which draws one group
    here, and ``ready``, to be told the chart count of each group as it arrives (drawn here or
    elsewhere); it returns every group, in order. How the others are reached is the sharer's business:
    the render stage names no queue or broker (``service.distributed.fanout`` is one)."""

    def draw(
        self,
        jobs: list[list[ChartPlan]],
        keys: list[str],
        local: Callable[[list[ChartPlan]], Group],
        ready: Callable[[int], None],
    ) -> list[Group]: ...


#: Default bound on the chart cache folder: a demo-sized pack's charts take about 60 KB.
DEFAULT_CACHE_MAX_BYTES = 256 * 1024 * 1024


@dataclass(frozen=True)
class RenderOptions:
    workers: int = 1
    """Processes that draw charts, this one included: 1 draws serially here; N adds N − 1 worker
    processes (spawned once, kept for the life of this process). Output bytes never depend on it."""
    cache_dir: Path | None = None
    """Folder of drawn chart groups named by the SHA-256 of what they draw; None: no cache."""
    cache_max_bytes: int = DEFAULT_CACHE_MAX_BYTES
    """The cache folder is pruned, least recently used first, to stay under this many bytes."""
    share: Sharer | None = None
    """Draw groups together with other workers (picklable; None: only processes of this one)."""

    def __post_init__(self) -> None:
        if not 1 <= self.workers <= 64:
            raise InvalidRequest(
                f"render_workers is {self.workers}: set PLUMBLINE_RENDER_WORKERS to a whole number "
                "from 1 (draw in this process) to 64"
            )
        if self.cache_max_bytes < 1:
            raise InvalidRequest(
                f"chart_cache_max_bytes is {self.cache_max_bytes}: set "
                "PLUMBLINE_CHART_CACHE_MAX_BYTES to a positive number of bytes"
            )


def from_settings(
    settings: Settings, *, service: bool = False, cache: bool = True
) -> RenderOptions:
    """How to draw charts, from the settings: ``service`` for inside the service's workers,
    ``cache`` off to draw everything afresh (as verification must)."""
    workers = settings.render_workers or (1 if service else max(1, os.cpu_count() or 1))
    folder = settings.chart_cache_dir or settings.data_dir / "chart-cache"
    return RenderOptions(
        workers=workers,
        cache_dir=folder if cache and settings.chart_cache else None,
        cache_max_bytes=settings.chart_cache_max_bytes,
    )
