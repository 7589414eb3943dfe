"""Worker processes that draw chart groups, kept for the life of this process.

matplotlib is not thread-safe and drawing is CPU-bound, so charts are drawn in processes, never
threads. The pool is made on first use with the spawn start method (no fork of a threaded server),
each worker installs the house style once (``_start``), and it is shut down when this process
exits. It also works inside the API's own worker processes: ``ProcessPoolExecutor`` starts its
workers non-daemonic (Python ≥ 3.9), so they may start processes of their own. A multiprocessing
child joins its non-daemonic children *before* running ``atexit``, so the shutdown is registered
with ``multiprocessing.util.Finalize`` too, which runs first, and at a priority above the queues'
own finalizers (10): once those have closed the pool's call queue, the stop signal never reaches
the workers and the exit waits for them for ever (measured: the nested case hung).

This module imports no matplotlib: a worker loads the drawing stack in ``_start``.
"""

from __future__ import annotations

import atexit
import multiprocessing
import threading
from concurrent.futures import Future, ProcessPoolExecutor
from multiprocessing import util
from typing import TYPE_CHECKING

from service import logs

if TYPE_CHECKING:
    from service.intents.plan import ChartPlan
    from service.render.measured import LayoutReport

_lock = threading.Lock()
_pool: ProcessPoolExecutor | None = None
_size = 0
_hooked = False


def _start() -> None:
    """Each worker: the house style and every drawer, loaded once before the first job."""
    from service.render import charts, style  # the drawing stack, in the worker only

    logs.route_warnings()
    style.install()
    del charts


def _ready() -> None:
    """A job that does nothing: submitting it starts a worker ahead of the first real job."""


def draw_group(plans: list[ChartPlan]) -> tuple[bytes, list[LayoutReport]]:
    """One group's charts as one multi-page PDF (the job a worker runs)."""
    from service.render import charts  # loaded by ``_start`` in a worker; here on first use

    return charts.draw_pages(plans)


def executor(size: int) -> ProcessPoolExecutor:
    """The shared pool of ``size`` workers; made (or remade at a new size) on first use."""
    global _pool, _size, _hooked  # noqa: PLW0603 - one pool per process, by design
    with _lock:
        if _pool is not None and _size == size:
            return _pool
        old, _pool, _size = _pool, None, 0
        if old is not None:
            old.shutdown(wait=True, cancel_futures=True)
        _pool = ProcessPoolExecutor(
            max_workers=size, mp_context=multiprocessing.get_context("spawn"), initializer=_start
        )
        _size = size
        if not _hooked:
            atexit.register(shutdown)
            util.Finalize(None, shutdown, exitpriority=100)
            _hooked = True
        return _pool


def warm(size: int) -> list[Future[None]]:
    """Start the pool's workers now (they import while the caller reads and checks the pack)."""
    pool = executor(size)
    return [pool.submit(_ready) for _ in range(size)]


def _drop(*, wait: bool) -> None:
    global _pool, _size
    with _lock:
        old, _pool, _size = _pool, None, 0
    if old is not None:
        old.shutdown(wait=wait, cancel_futures=True)


def discard() -> None:
    """Drop a broken pool without waiting for it; the next use makes a new one."""
    _drop(wait=False)


def shutdown() -> None:
    """Stop the workers and wait for them (idempotent; runs at exit)."""
    _drop(wait=True)


def size() -> int:
    """How many workers the live pool has (0: none), for tests and measurement."""
    return _size


__all__ = ["discard", "draw_group", "executor", "shutdown", "size", "warm"]
