"""Worker processes for rendering: matplotlib is not thread-safe and rendering is CPU-bound, so a
pack is built in a separate process (``service.runner.pool``) and the event loop only awaits it. Every
job has the configured time budget; past it the worker is killed and the job fails with that reason.

A request that waits for its answer (a build with ``wait=true``, a check) is parsed and validated
before it waits for a worker, so a malformed one is answered at once; and at most ``max_waiting``
such requests wait while every worker is busy: past that a new one is refused with
:class:`~service.errors.TooBusy` (429 with Retry-After), like the background queue.
"""

from __future__ import annotations

import asyncio
from collections.abc import Callable
from functools import partial
from typing import Any, TypeVar

from starlette.concurrency import run_in_threadpool

from service import pipeline
from service.config import Limits, Settings
from service.definition import validate
from service.errors import TooBusy
from service.render.options import RenderOptions
from service.runner.budget import check_definition, start_worker
from service.runner.pool import Pool, Progress
from service.seal.verify import VerifyReport
from service.workflow import sealing

T = TypeVar("T")


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
        max_waiting: int | None = None,
    ) -> None:
        self.size = size
        self.max_waiting = max_waiting
        """Requests waiting for their answer that may wait while every worker is busy (None:
        any; 0: none)."""
        self._waiting = 0
        self.render = render or RenderOptions()
        """How each worker draws a pack's charts (its own helper processes, the chart cache)."""
        self._pool = Pool(size, initializer=start_worker, timeout=timeout, memory_mb=memory_mb)
        self._slots: asyncio.Semaphore | None = None

    async def _run(self, job: Callable[..., T], *args: Any, **kwargs: Any) -> T:
        """Wait for a free worker on the event loop, not in a thread: jobs queued behind busy
        workers must not take the threads that answer every other request."""
        if self._slots is None:
            self._slots = asyncio.Semaphore(self.size)
        async with self._slots:
            result: T = await run_in_threadpool(partial(self._pool.run, job, *args, **kwargs))
        return result

    async def _answer(
        self, raw: bytes, limits: Limits, job: Callable[..., T], *args: Any, task: str
    ) -> T:
        """Run ``job(raw, *args)`` for a request that waits for its answer: the definition is
        parsed and validated first (its shape problems are answered without a worker), then the
        request waits for a worker unless ``max_waiting`` requests already do."""
        await run_in_threadpool(validate.parse, raw, limits)
        return await self._waited(job, raw, *args, task=task)

    async def _waited(self, job: Callable[..., T], *args: Any, task: str) -> T:
        """Run ``job(*args)`` for a request that waits for its answer, under the pool's time and
        memory budget (``task`` names it in their messages): it waits for a worker unless
        ``max_waiting`` requests already do (:class:`TooBusy`)."""
        if self._slots is None:
            self._slots = asyncio.Semaphore(self.size)
        full = self.max_waiting is not None and self._waiting >= self.max_waiting
        if full and self._slots.locked():
            raise TooBusy(
                f"{self._waiting} requests are waiting for a worker, the most this service "
                "lets wait (PLUMBLINE_MAX_WAITING_REQUESTS); retry after the time given",
                retry_after=max(1, self._waiting // max(1, self.size)),
            )
        self._waiting += 1  # counted before the first await, so concurrent requests see it
        try:
            await self._slots.acquire()
        finally:
            self._waiting -= 1
        try:
            return await run_in_threadpool(partial(self._pool.run, job, *args, task=task))
        finally:
            self._slots.release()

    async def build_now(self, raw: bytes, limits: Limits) -> pipeline.Built:
        """Build a definition for a request that waits for the draft (see :meth:`_answer`)."""
        build = partial(build_pack, options=self.render)
        return await self._answer(raw, limits, build, limits, task="render")

    async def check(self, raw: bytes, limits: Limits) -> dict[str, Any]:
        """Check a definition in a worker, under the render budget (see :meth:`_answer`)."""
        return await self._answer(raw, limits, check_definition, limits, task="check")

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
        """Verify a sealed pack (its re-render draws every chart) in a worker, under the render
        budget, waiting for a worker like a check (see :meth:`_waited`)."""
        return await self._waited(verify_pack, pdf, roots, limits, task="verification")

    def missing(self) -> int:
        """How many render workers are dead and not replaced yet (0 when the pool is full)."""
        return self._pool.missing()

    def close(self) -> None:
        self._pool.close()
