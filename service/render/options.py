"""How a pack's charts are drawn: in how many processes, and whether drawn charts are cached.

Plain values, passed explicitly from the caller's settings (``pipeline.render``/``build`` take
them); the defaults keep drawing serial, in this process, with no cache.
"""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path

from service.errors import InvalidRequest

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
