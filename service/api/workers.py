"""Worker processes for rendering: matplotlib is not thread-safe and rendering is CPU-bound, so a
pack is built in a separate process and the event loop only awaits it."""

from __future__ import annotations

import asyncio
import multiprocessing
from collections.abc import Callable
from concurrent.futures import ProcessPoolExecutor
from concurrent.futures.process import BrokenProcessPool
from typing import Any, TypeVar

from service import pipeline
from service.config import Limits
from service.errors import RenderFailed
from service.render import style

T = TypeVar("T")


def _start_worker() -> None:
    style.install()


def verify_pack(pdf: bytes, roots: list[bytes], limits: Limits) -> dict[str, Any]:
    """Verify a sealed pack in a worker: the re-render draws, so it must not run on the loop."""
    from service import seal
    from service.seal import verify

    rerender = seal.rerender_with(lambda raw: pipeline.build(raw, limits).pdf)
    return verify.verify(pdf, trust_roots=roots, rerender=rerender).as_dict()


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
        return await self._run(pipeline.build, raw, limits)

    async def verify(self, pdf: bytes, roots: list[bytes], limits: Limits) -> dict[str, Any]:
        return await self._run(verify_pack, pdf, roots, limits)

    async def _run(self, job: Callable[..., T], *args: Any) -> T:
        loop = asyncio.get_running_loop()
        try:
            return await loop.run_in_executor(self._pool, job, *args)
        except BrokenProcessPool:
            self._pool.shutdown(wait=False, cancel_futures=True)
            self._pool = self._new()
            raise RenderFailed("the render worker stopped unexpectedly; try again") from None

    def close(self) -> None:
        self._pool.shutdown(wait=True, cancel_futures=True)
