"""Worker processes for rendering: matplotlib is not thread-safe and rendering is CPU-bound, so a
pack is built in a separate process (``service.runner.pool``) and the event loop only awaits it. Every
job has the configured time budget; past it the worker is killed and the job fails with that reason.
"""

from __future__ import annotations

import asyncio
import os
from collections.abc import Callable
from functools import partial
from typing import Any, TypeVar

from starlette.concurrency import run_in_threadpool

from service import pipeline
from service.config import Limits, Settings
from service.render import style
from service.render.options import RenderOptions
from service.runner.pool import Pool, Progress
from service.seal.verify import VerifyReport
from service.workflow import sealing

T = TypeVar("T")


WORKER_NICENESS = 5
"""Render workers run at a lower CPU priority than the process answering requests, so accepting
a job or answering a status query stays quick while every core is drawing."""


def _start_worker() -> None:
    os.nice(WORKER_NICENESS)
    style.install()
    # Loaded here, before the worker's memory limit applies: scipy's OpenBLAS reserves its
    # buffers as it loads and, refused, retries in a loop or exits instead of raising.
    from scipy import special  # noqa: F401


def build_pack(
    raw: bytes,
    limits: Limits,
    *,
    options: RenderOptions | None = None,
    progress: Progress | None = None,
) -> pipeline.Built:
    """``pipeline.build`` in a worker, saying how many charts are drawn as it goes."""
    return pipeline.build(raw, limits, options=options, progress=progress)


def verify_pack(pdf: bytes, roots: list[bytes], limits: Limits) -> VerifyReport:
    """Verify a sealed pack in a worker: the re-render draws, so it must not run on the loop."""
    from service.seal import verify

    return verify.verify(pdf, trust_roots=roots, rerender=sealing.rerender(limits))


class Workers:
    def __init__(
        self,
        size: int,
        *,
        timeout: float = 300.0,
        render: RenderOptions | None = None,
        memory_mb: int | None = None,
    ) -> None:
        self.size = size
        self.render = render or RenderOptions()
        """How each worker draws a pack's charts (its own helper processes, the chart cache)."""
        self._pool = Pool(size, initializer=_start_worker, timeout=timeout, memory_mb=memory_mb)
        self._slots: asyncio.Semaphore | None = None

    async def _run(self, job: Callable[..., T], *args: Any, **kwargs: Any) -> T:
        """Wait for a free worker on the event loop, not in a thread: jobs queued behind busy
        workers must not take the threads that answer every other request."""
        if self._slots is None:
            self._slots = asyncio.Semaphore(self.size)
        async with self._slots:
            result: T = await run_in_threadpool(partial(self._pool.run, job, *args, **kwargs))
        return result

    async def build(
        self, raw: bytes, limits: Limits, progress: Progress | None = None
    ) -> pipeline.Built:
        return await self._run(build_pack, raw, limits, options=self.render, progress=progress)

    def sealer(self, settings: Settings) -> sealing.Sealer:
        """Render, seal and sign a signed-off pack in a worker, with the configured (or
        development) key; the returned function blocks, so call it off the event loop."""
        job = partial(
            sealing.seal_pack,
            key_path=settings.seal_key,
            cert_path=settings.seal_cert,
            development_dir=settings.data_dir / "keys",
            limits=settings.limits,
            options=self.render,
        )

        def seal(definition: bytes, record: dict[str, Any]) -> sealing.SealedPack:
            sealed: sealing.SealedPack = self._pool.run(job, definition, record)
            return sealed

        return seal

    async def verify(self, pdf: bytes, roots: list[bytes], limits: Limits) -> VerifyReport:
        return await self._run(verify_pack, pdf, roots, limits)

    def missing(self) -> int:
        """How many render workers are dead and not replaced yet (0 when the pool is full)."""
        return self._pool.missing()

    def close(self) -> None:
        self._pool.close()
