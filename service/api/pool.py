"""Worker processes that can be stopped one by one: each job gets a deadline, and a job past it is
stopped by killing its process (matplotlib cannot be interrupted from outside), which is replaced.

Why not ``ProcessPoolExecutor``: it cannot cancel a running task or kill one worker, and a killed
worker breaks the whole pool (every job in flight fails). Here each worker is a spawned process (no
fork of a threaded server) serving one job at a time over its own pipe; a job sends progress
messages while it runs. A worker that dies or overruns fails only its own job.

Jobs are plain picklable callables; a job that wants to report progress takes a ``progress``
keyword argument, a callable ``(stage, done, total)``.
"""

from __future__ import annotations

import contextlib
import multiprocessing
import queue
import threading
import time
import traceback
from collections.abc import Callable
from dataclasses import dataclass
from multiprocessing.connection import Connection
from typing import Any

from service.errors import PlumblineError, RenderFailed, RenderTimeout

Progress = Callable[[str, int, int], None]

_CONTEXT = multiprocessing.get_context("spawn")


def _serve(conn: Connection, initializer: Callable[[], None] | None) -> None:
    """A worker's loop: run each job it is sent, answer ("ok", value) or ("error", exc)."""
    if initializer is not None:
        initializer()

    def progress(stage: str, done: int, total: int) -> None:
        conn.send(("progress", (stage, done, total)))

    while True:
        try:
            message = conn.recv()
        except (EOFError, OSError):
            return
        if message is None:
            return
        job, args, kwargs, wants_progress = message
        if wants_progress:
            kwargs = {**kwargs, "progress": progress}
        try:
            conn.send(("ok", job(*args, **kwargs)))
        except PlumblineError as exc:
            conn.send(("error", exc))
        except Exception as exc:  # noqa: BLE001 - reported to the caller as a render fault
            detail = "".join(traceback.format_exception_only(type(exc), exc)).strip()
            conn.send(("error", RenderFailed(f"the render worker failed: {detail}")))


@dataclass
class _Worker:
    process: Any
    conn: Connection


class Pool:
    """``size`` worker processes; ``run`` blocks the calling thread until its job ends."""

    def __init__(
        self, size: int, *, initializer: Callable[[], None] | None = None, timeout: float = 300.0
    ) -> None:
        self.size = size
        self.timeout = timeout
        self._initializer = initializer
        self._idle: queue.Queue[_Worker] = queue.Queue()
        self._all: list[_Worker] = []
        self._lock = threading.Lock()
        self._closed = False
        for _ in range(size):
            self._idle.put(self._start())

    def _start(self) -> _Worker:
        ours, theirs = _CONTEXT.Pipe(duplex=True)
        process = _CONTEXT.Process(
            target=_serve, args=(theirs, self._initializer), daemon=False, name="plumbline-render"
        )
        process.start()
        theirs.close()
        worker = _Worker(process, ours)
        with self._lock:
            self._all.append(worker)
        return worker

    def _retire(self, worker: _Worker) -> None:
        with contextlib.suppress(Exception):
            worker.process.kill()
        worker.process.join(timeout=10)
        worker.conn.close()
        with self._lock:
            if worker in self._all:
                self._all.remove(worker)

    def run(
        self,
        job: Callable[..., Any],
        *args: Any,
        timeout: float | None = None,
        progress: Progress | None = None,
        **kwargs: Any,
    ) -> Any:
        """Run ``job(*args, **kwargs)`` in a worker; raise :class:`RenderTimeout` past the
        deadline (the worker is killed and replaced) and :class:`RenderFailed` if it dies."""
        if self._closed:
            raise RenderFailed("the service is shutting down; try again shortly")
        worker = self._idle.get()
        limit = self.timeout if timeout is None else timeout
        healthy = False
        try:
            worker.conn.send((job, args, kwargs, progress is not None))
            kind, value = self._answer(worker, time.monotonic() + limit, limit, progress)
            healthy = True
            if kind == "error":
                raise value
            return value
        except (EOFError, OSError):
            raise RenderFailed("the render worker stopped unexpectedly; try again") from None
        finally:
            if healthy and not self._closed:
                self._idle.put(worker)
            else:
                self._retire(worker)
                if not self._closed:
                    self._idle.put(self._start())

    @staticmethod
    def _answer(
        worker: _Worker, deadline: float, limit: float, progress: Progress | None
    ) -> tuple[str, Any]:
        """Wait for the job's answer, passing progress on; raise past the deadline."""
        while True:
            left = deadline - time.monotonic()
            if left <= 0:
                raise RenderTimeout(
                    f"the render took longer than its time budget of {limit:g} s and was "
                    "stopped; make the pack smaller, or raise PLUMBLINE_RENDER_TIMEOUT_S"
                )
            if not worker.conn.poll(min(left, 0.25)):
                if not worker.process.is_alive():
                    raise RenderFailed("the render worker stopped unexpectedly; try again")
                continue
            kind, value = worker.conn.recv()
            if kind != "progress":
                return kind, value
            if progress is not None:
                progress(*value)

    def close(self) -> None:
        """Stop every worker: idle ones are asked to leave, busy ones are killed."""
        self._closed = True
        with self._lock:
            workers = list(self._all)
        for worker in workers:
            with contextlib.suppress(Exception):
                worker.conn.send(None)
        for worker in workers:
            worker.process.join(timeout=5)
            self._retire(worker)


__all__ = ["Pool", "Progress"]
