"""Worker processes for rendering: matplotlib is not thread-safe and rendering is CPU-bound, so a
pack is built in a separate process and the event loop only awaits it."""

from __future__ import annotations

import asyncio
import multiprocessing
from concurrent.futures import ProcessPoolExecutor
from concurrent.futures.process import BrokenProcessPool

from service import pipeline
from service.config import Limits
from service.errors import RenderFailed
from service.render import style


def _start_worker() -> None:
    style.install()


class Workers:
    def __init__(self, size: int) -> None:
        self.size = size
        self._pool = self._new()

    def _new(self) -> ProcessPoolExecutor:
        return ProcessPoolExecutor(
            max_workers=self.size,
            mp_context=multiprocessing.get_context("spawn"),  # no fork of a threaded server
            initializer=_start_worker,
        )

    async def build(self, raw: bytes, limits: Limits) -> pipeline.Built:
        loop = asyncio.get_running_loop()
        try:
            return await loop.run_in_executor(self._pool, pipeline.build, raw, limits)
        except BrokenProcessPool:
            self._pool.shutdown(wait=False, cancel_futures=True)
            self._pool = self._new()
            raise RenderFailed("the render worker stopped unexpectedly; try again") from None

    def close(self) -> None:
        self._pool.shutdown(wait=True, cancel_futures=True)
