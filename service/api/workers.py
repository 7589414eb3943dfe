"""Worker processes for rendering: matplotlib is not thread-safe and rendering is CPU-bound, so a
pack is built in a separate process and the event loop only awaits it."""

from __future__ import annotations

import asyncio
import multiprocessing
from collections.abc import Callable
from concurrent.futures import ProcessPoolExecutor
from concurrent.futures.process import BrokenProcessPool
from functools import partial
from typing import Any, TypeVar

from service import pipeline
from service.config import Limits, Settings
from service.errors import RenderFailed
from service.render import style
from service.seal.verify import VerifyReport
from service.workflow import sealing

T = TypeVar("T")


def _start_worker() -> None:
    style.install()


def verify_pack(pdf: bytes, roots: list[bytes], limits: Limits) -> VerifyReport:
    """Verify a sealed pack in a worker: the re-render draws, so it must not run on the loop."""
    from service.seal import verify

    return verify.verify(pdf, trust_roots=roots, rerender=sealing.rerender(limits))


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

    def sealer(self, settings: Settings) -> sealing.Sealer:
        """Render, seal and sign a signed-off pack in a worker, with the configured (or
        development) key; the returned function blocks, so call it off the event loop."""
        job = partial(
            sealing.seal_pack,
            key_path=settings.seal_key,
            cert_path=settings.seal_cert,
            development_dir=settings.data_dir / "keys",
            limits=settings.limits,
        )

        def seal(definition: bytes, record: dict[str, Any]) -> sealing.SealedPack:
            try:
                return self._pool.submit(job, definition, record).result()
            except BrokenProcessPool:
                self._restart()
                raise RenderFailed("the render worker stopped unexpectedly; try again") from None

        return seal

    async def verify(self, pdf: bytes, roots: list[bytes], limits: Limits) -> VerifyReport:
        return await self._run(verify_pack, pdf, roots, limits)

    async def _run(self, job: Callable[..., T], *args: Any) -> T:
        loop = asyncio.get_running_loop()
        try:
            return await loop.run_in_executor(self._pool, job, *args)
        except BrokenProcessPool:
            self._restart()
            raise RenderFailed("the render worker stopped unexpectedly; try again") from None

    def _restart(self) -> None:
        self._pool.shutdown(wait=False, cancel_futures=True)
        self._pool = self._new()

    def close(self) -> None:
        self._pool.shutdown(wait=True, cancel_futures=True)
