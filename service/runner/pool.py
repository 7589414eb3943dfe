"""Worker processes that can be stopped one by one: each job gets a deadline, and a job past it is
stopped by killing its process (matplotlib cannot be interrupted from outside), which is replaced.

Why not ``ProcessPoolExecutor``: it cannot cancel a running task or kill one worker, and a killed
worker breaks the whole pool (every job in flight fails). Here each worker is a spawned process (no
fork of a threaded server) serving one job at a time over its own pipe; a job sends progress
messages while it runs. A worker that dies or overruns fails only its own job. A worker that dies
while idle is noticed at once by a watcher thread waiting on every worker's sentinel, and replaced;
until then ``missing`` says the pool is short (``GET /v1/ready`` reports it).

Jobs are plain picklable callables; a job that wants to report progress takes a ``progress``
keyword argument, a callable ``(stage, done, total)``.

Each worker may be given a memory limit (``RLIMIT_AS`` on its whole address space, set once its
initializer has run, and inherited by any process it starts). A job that reaches it fails with
:class:`RenderMemory` and its worker is replaced (its heap may be left fragmented or half-built):
when Python raises ``MemoryError`` (or a library that could not be loaded for want of memory),
when the worker dies as native code does when refused memory (exit 1, SIGABRT, SIGSEGV, SIGBUS),
or dies or stalls with its peak address space near the limit (native code may abort, or retry
a failed allocation in a loop, instead of raising). A stall is judged at the job's deadline; a job
with no deadline (``plumbline render --time-limit 0``) is judged stalled once it has said nothing
for ``stall_s`` seconds with its peak near the limit, so it cannot wait for ever.
"""

from __future__ import annotations

import contextlib
import errno
import logging
import math
import multiprocessing
import multiprocessing.connection
import queue
import resource
import signal
import threading
import time
import traceback
from collections.abc import Callable
from dataclasses import dataclass
from multiprocessing.connection import Connection
from typing import Any

from service import logs
from service.errors import PlumblineError, RenderFailed, RenderTimeout

log = logging.getLogger("plumbline.runner")

Progress = Callable[[str, int, int], None]

_CONTEXT = multiprocessing.get_context("spawn")

MEMORY_SETTING = "PLUMBLINE_WORKER_MEMORY_MB"

_OUT_OF_MEMORY_EXITS = frozenset({1, -signal.SIGABRT, -signal.SIGSEGV, -signal.SIGBUS})
"""How native code refused memory under ``RLIMIT_AS`` ends a worker, as seen: OpenBLAS exits 1,
Rust code aborts, unchecked C allocations fault. Under a memory limit, a worker that dies so in a
job ran out of memory (a worker never exits by itself while it has a job)."""


class RenderMemory(PlumblineError):
    """A render that needed more memory than a worker may use; its worker was replaced."""

    code = "render_memory"
    status = 422


def memory_problem(memory_mb: int, task: str = "render") -> RenderMemory:
    return RenderMemory(
        f"the {task} needed more memory than the {memory_mb} MB a render worker may use, and "
        f"was stopped; make the pack smaller (fewer rows or charts), or raise {MEMORY_SETTING}"
    )


def foreign_failure(detail: str) -> RenderFailed:
    """A job that failed with a foreign exception: logged (with ``detail``, its traceback) under
    an incident id, which is all the caller is told."""
    incident = logs.incident(log, "the render worker failed", detail=detail)
    return RenderFailed(f"the render worker failed (incident {incident})", incident=incident)


def _limit_memory(memory_mb: int | None) -> None:
    """Cap this process's address space; never above a hard limit set from outside."""
    if not memory_mb:
        return
    wanted = memory_mb * 1024 * 1024
    _, hard = resource.getrlimit(resource.RLIMIT_AS)
    if hard != resource.RLIM_INFINITY:
        wanted = min(wanted, hard)
    resource.setrlimit(resource.RLIMIT_AS, (wanted, hard))


def _serve(
    conn: Connection, initializer: Callable[[], None] | None, memory_mb: int | None = None
) -> None:
    """A worker's loop: run each job it is sent, answer ("ok", value), ("error", exc) for a
    product error, ("foreign", traceback text) for any other, or ("fatal", exc) for an error
    after which the worker must be replaced."""
    if initializer is not None:
        initializer()
    # after the initializer: native libraries it loads reserve memory as they start (OpenBLAS
    # retries a failed reservation in a loop instead of failing), which must not be cut short
    _limit_memory(memory_mb)

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
        except Exception as exc:  # noqa: BLE001 - every error is answered, none ends the loop
            if _out_of_memory(exc):
                # the job's frames, and what it allocated, are released by now
                with contextlib.suppress(Exception):
                    conn.send(("fatal", memory_problem(memory_mb or 0)))
                return
            if not isinstance(exc, PlumblineError):  # its text goes to the log, not the caller
                conn.send(("foreign", "".join(traceback.format_exception(exc)).strip()))
                continue
            conn.send(("error", exc))


def _peak_bytes(pid: int | None) -> int:
    """The largest address space process ``pid`` has had (Linux ``VmPeak``); 0 if unknown."""
    try:
        with open(f"/proc/{pid}/status", encoding="ascii") as status:
            for line in status:
                if line.startswith("VmPeak:"):
                    return int(line.split()[1]) * 1024
    except (OSError, ValueError, IndexError):
        pass
    return 0


def _out_of_memory(exc: BaseException) -> bool:
    """A ``MemoryError``, or an error a stage translated from one (``raise … from exc``)."""
    seen: set[int] = set()
    current: BaseException | None = exc
    while current is not None and id(current) not in seen:
        if isinstance(current, MemoryError):
            return True
        if isinstance(current, OSError) and current.errno == errno.ENOMEM:
            return True
        if isinstance(current, ImportError) and "failed to map segment" in str(current):
            return True  # the dynamic loader could not map a library: no address space left
        seen.add(id(current))
        current = current.__cause__ or current.__context__
    return False


@dataclass
class _Worker:
    process: Any
    conn: Connection


class Pool:
    """``size`` worker processes; ``run`` blocks the calling thread until its job ends."""

    def __init__(
        self,
        size: int,
        *,
        initializer: Callable[[], None] | None = None,
        timeout: float = 300.0,
        memory_mb: int | None = None,
        stall_s: float = 60.0,
    ) -> None:
        self.size = size
        self.timeout = timeout
        self.stall_s = stall_s
        """With no deadline: how long a job near its memory limit may send nothing."""
        self.memory_mb = memory_mb or None
        """Each worker's address-space limit in MiB (None: no limit)."""
        self._initializer = initializer
        self._idle: queue.Queue[_Worker] = queue.Queue()
        self._all: list[_Worker] = []
        self._lock = threading.Lock()
        self._closed = False
        for _ in range(size):
            self._idle.put(self._start())
        self._wake_r, self._wake_w = _CONTEXT.Pipe(duplex=False)
        self._watcher = threading.Thread(
            target=self._watch, name="plumbline-pool-watcher", daemon=True
        )
        self._watcher.start()

    def _watch(self) -> None:
        """Replace idle workers that die (a busy one's death is its job's ``run`` to handle)."""
        while not self._closed:
            with self._lock:
                sentinels = {w.process.sentinel: w for w in self._all}
            ready = multiprocessing.connection.wait([*sentinels, self._wake_r], timeout=5)
            for sentinel in ready:
                worker = sentinels.get(sentinel)
                if worker is None or self._closed or not self._take_idle(worker):
                    continue
                log.warning(
                    "an idle render worker stopped (exit %s); replacing it", worker.process.exitcode
                )
                self._retire(worker)
                if not self._closed:
                    self._idle.put(self._start())
            if any(r is self._wake_r for r in ready):
                return

    def _take_idle(self, worker: _Worker) -> bool:
        """Take ``worker`` out of the idle queue; False if a job holds it."""
        with self._idle.mutex:
            try:
                self._idle.queue.remove(worker)
            except ValueError:
                return False
            return True

    def live_pids(self) -> set[int]:
        """The process ids of the workers alive now."""
        with self._lock:
            return {w.process.pid for w in self._all if w.process.is_alive()}

    def missing(self) -> int:
        """How many workers the pool is short of its size (dead and not replaced yet)."""
        return max(0, self.size - len(self.live_pids()))

    def _start(self) -> _Worker:
        ours, theirs = _CONTEXT.Pipe(duplex=True)
        process = _CONTEXT.Process(
            target=_serve,
            args=(theirs, self._initializer, self.memory_mb),
            daemon=False,
            name="plumbline-render",
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
        task: str = "render",
        **kwargs: Any,
    ) -> Any:
        """Run ``job(*args, **kwargs)`` in a worker; raise :class:`RenderTimeout` past the
        deadline (the worker is killed and replaced) and :class:`RenderFailed` if it dies.
        ``task`` names the job in those messages ("render", "check", "verification")."""
        if self._closed:
            raise RenderFailed("the service is shutting down; try again shortly")
        worker = self._idle.get()
        if not worker.process.is_alive():  # died idle a moment ago, before the watcher saw it
            self._retire(worker)
            worker = self._start()
        limit = self.timeout if timeout is None else timeout
        healthy = False
        try:
            worker.conn.send((job, args, kwargs, progress is not None))
            kind, value = self._answer(worker, time.monotonic() + limit, limit, progress, task)
            healthy = kind != "fatal"
            if kind == "fatal" and isinstance(value, RenderMemory):
                raise memory_problem(self.memory_mb or 0, task)
            if kind in ("error", "fatal"):
                raise value
            if kind == "foreign":
                raise foreign_failure(value)
            return value
        except (EOFError, OSError):
            raise self._died(worker, _peak_bytes(worker.process.pid), task) from None
        finally:
            if healthy and not self._closed:
                self._idle.put(worker)
            else:
                self._retire(worker)
                if not self._closed:
                    self._idle.put(self._start())

    def _died(self, worker: _Worker, peak: int, task: str) -> PlumblineError:
        worker.process.join(timeout=1)
        code = worker.process.exitcode
        if self._near_limit(peak) or (self.memory_mb and code in _OUT_OF_MEMORY_EXITS):
            return memory_problem(self.memory_mb or 0, task)
        if self.memory_mb:
            return RenderFailed(
                "the render worker stopped unexpectedly (it may have needed more than the "
                f"{self.memory_mb} MB a render worker may use, {MEMORY_SETTING}); try again"
            )
        return RenderFailed("the render worker stopped unexpectedly; try again")

    def _near_limit(self, peak: int) -> bool:
        """Whether a worker's peak address space came within reach of its limit (5 %, and at
        least 64 MiB: OpenBLAS reserves 32 MiB buffers): a job that dies or stalls there ran
        out of memory (native code may abort, or retry a failed allocation in a loop, instead
        of raising ``MemoryError``)."""
        if not self.memory_mb:
            return False
        limit = self.memory_mb * 1024 * 1024
        return peak >= limit - max(limit // 20, 64 * 1024 * 1024)

    def _answer(
        self, worker: _Worker, deadline: float, limit: float, progress: Progress | None, task: str
    ) -> tuple[str, Any]:
        """Wait for the job's answer, passing progress on; raise past the deadline, or (with no
        deadline) once the job has stalled near its memory limit."""
        peak = 0
        heard = time.monotonic()
        while True:
            left = deadline - time.monotonic()
            if left <= 0:
                if self._near_limit(max(peak, _peak_bytes(worker.process.pid))):
                    raise memory_problem(self.memory_mb or 0, task)
                raise RenderTimeout(
                    f"the {task} took longer than its time budget of {limit:g} s and was "
                    "stopped; make the pack smaller, or raise PLUMBLINE_RENDER_TIMEOUT_S"
                )
            if not worker.conn.poll(min(left, 0.25)):
                if not worker.process.is_alive():
                    raise self._died(worker, peak, task)
                if self.memory_mb:
                    peak = max(peak, _peak_bytes(worker.process.pid))
                    silent = time.monotonic() - heard
                    if math.isinf(deadline) and silent > self.stall_s and self._near_limit(peak):
                        raise memory_problem(self.memory_mb, task)
                continue
            heard = time.monotonic()
            kind, value = worker.conn.recv()
            if kind != "progress":
                return kind, value
            if progress is not None:
                progress(*value)

    def close(self) -> None:
        """Stop every worker: idle ones are asked to leave, busy ones are killed."""
        self._closed = True
        with contextlib.suppress(Exception):
            self._wake_w.send(None)
        if self._watcher is not threading.current_thread():
            self._watcher.join(timeout=30)  # it starts no worker once it has seen the wake-up
        with self._lock:
            workers = list(self._all)
        for worker in workers:
            with contextlib.suppress(Exception):
                worker.conn.send(None)
        for worker in workers:
            worker.process.join(timeout=5)
            self._retire(worker)


__all__ = ["MEMORY_SETTING", "Pool", "Progress", "RenderMemory"]
