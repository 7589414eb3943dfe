"""Background builds: ``POST /v1/reports?wait=false`` answers 202 with a job at once; the job builds
the draft in a worker process and ends *done* (with the draft's id) or *failed* (with the problem).

:class:`Jobs` is what the routes need of a runner; :class:`LocalJobs` (the service's own worker
processes) and ``service.distributed.jobs.CeleryJobs`` (workers behind a queue) both satisfy it.

The job's state lives in the ``jobs`` table, so any process of the service can answer
``GET /v1/jobs/{id}``; progress of a running job is kept in the memory of the process that runs it.
A job left *queued* or *running* by a process that stopped is marked failed when the service
starts again, saying so: nothing claims to be running that is not.

Shutdown (SIGTERM): new jobs are refused (429 with Retry-After), jobs still waiting for a worker
are failed at once, and running ones get ``PLUMBLINE_SHUTDOWN_GRACE_S`` to finish; the ones still
running then are failed with ``shutdown`` ("the service stopped; post again"). They are failed,
not handed back as queued, because the job holds the definition's bytes only in memory; an author
who posts again with the same ``Idempotency-Key`` gets the failed job, so a new key is needed.
Every end of a job is one conditional UPDATE (only from queued or running), so a job that finished
as the grace ran out stays done.
"""

from __future__ import annotations

import asyncio
import hashlib
import logging
import uuid
from enum import StrEnum
from typing import Any, Protocol

from sqlalchemy import update
from sqlalchemy.orm import sessionmaker
from starlette.concurrency import run_in_threadpool

from service import logs
from service.archive.db import JobRow, now
from service.archive.files import BlobStore
from service.config import Settings
from service.errors import InvalidDefinition, NotFound, PlumblineError, TooBusy, listing
from service.runner.workers import Workers
from service.workflow import drafts
from service.workflow.keys import Principal, Role

log = logging.getLogger("plumbline.jobs")


class JobState(StrEnum):
    """A job's state; the values are what the ``jobs`` table and the API hold."""

    QUEUED = "queued"
    RUNNING = "running"
    DONE = "done"
    FAILED = "failed"


UNFINISHED = (JobState.QUEUED, JobState.RUNNING)

STOPPED = {
    "code": "shutdown",
    "detail": "the service stopped before the job finished; post the definition again",
}


class Jobs(Protocol):
    """Background builds, as the routes use them (a local runner or a queue-backed one)."""

    def recover(self) -> int:
        """Deal with jobs a stopped process left unfinished; returns how many."""
        ...

    async def start(self, principal: Principal, raw: bytes) -> JobRow:
        """Record a queued job and start it; answers before any work is done."""
        ...

    def get(self, principal: Principal, job_id: str) -> JobRow:
        """The job, if it is this key's (else :class:`NotFound`)."""
        ...

    def ping(self, timeout: float) -> None:
        """Raise if the runner cannot take jobs now (readiness)."""
        ...

    async def close(self) -> None:
        """Stop taking jobs and release what the runner holds."""
        ...


def queued(principal: Principal, definition_sha256: str) -> JobRow:
    """A new job of ``principal``'s, queued, for the definition with this SHA-256."""
    moment = now()
    return JobRow(
        id=f"jb_{uuid.uuid4().hex}",
        key_id=principal.key_id,
        status=JobState.QUEUED,
        stage="queued",
        done=0,
        total=0,
        definition_sha256=definition_sha256,
        pack_id=None,
        error=None,
        created_at=moment,
        updated_at=moment,
    )


def failure(exc: Exception) -> dict[str, Any]:
    """What a failed job stores as its ``error``, which its author reads: a product error's code,
    status and detail (and a definition's problems); a server-side failure also its incident id,
    under which it is logged. A foreign exception is an internal error whose text and stack go
    to the log only."""
    if not isinstance(exc, PlumblineError):
        incident = logs.incident(log, "a job failed inside Plumbline", exc=exc)
        return {
            "code": "internal_error",
            "detail": f"something went wrong on our side (incident {incident})",
            "incident": incident,
        }
    error: dict[str, Any] = {"code": exc.code, "status": exc.status, "detail": exc.message}
    if isinstance(exc, InvalidDefinition):
        error.update(listing(exc.problems))
    if exc.status >= 500:
        error["incident"] = logs.incident(
            log, "a job failed", detail=exc.message, found=exc.incident
        )
    return error


def load(sessions: sessionmaker[Any], principal: Principal, job_id: str) -> JobRow:
    """The job, if it is ``principal``'s."""
    with sessions() as session:
        row: JobRow | None = session.get(JobRow, job_id)
    if row is None or row.key_id != principal.key_id:
        raise NotFound(f"there is no job '{job_id}'")
    return row


class LocalJobs:
    """Background builds in this service's own worker processes."""

    def __init__(
        self,
        *,
        sessions: sessionmaker[Any],
        store: BlobStore,
        workers: Workers,
        settings: Settings,
    ) -> None:
        self.sessions, self.store, self.workers, self.settings = sessions, store, workers, settings
        self._tasks: dict[str, asyncio.Task[None]] = {}
        self._waiting: set[str] = set()
        """Jobs of this process not yet given a worker."""
        self._gate: asyncio.Semaphore | None = None
        self._stopping = False
        self._starting = 0
        self._live: dict[str, tuple[str, int, int]] = {}
        """Progress of this process's running jobs, kept in memory: one database write per job
        start and end, not per progress message, keeps the archive's write lock free for others."""

    def recover(self) -> int:
        """Fail the jobs a stopped process left unfinished; returns how many."""
        with self.sessions.begin() as session:
            result = session.execute(
                update(JobRow)
                .where(JobRow.status.in_(UNFINISHED))
                .values(
                    status=JobState.FAILED,
                    updated_at=now(),
                    error={
                        "code": "interrupted",
                        "detail": "the service stopped while the job ran; post the definition again",
                    },
                )
            )
        return int(getattr(result, "rowcount", 0) or 0)

    def ping(self, timeout: float) -> None:
        """Local workers need no queue: always ready."""

    async def start(self, principal: Principal, raw: bytes) -> JobRow:
        """Record a queued job and start it; answers before any work is done."""
        principal.require(Role.author)
        if self._stopping:
            raise TooBusy(
                "the service is stopping and takes no new builds; post again in a moment "
                "(to the service once it is back)",
                retry_after=max(1, round(self.settings.shutdown_grace_s)),
            )
        active = len(self._tasks) + self._starting
        if active >= self.settings.max_queued_jobs:
            raise TooBusy(
                f"{active} background builds are waiting or running, the most this service "
                "takes (PLUMBLINE_MAX_QUEUED_JOBS); retry after the time given",
                retry_after=max(1, active // max(1, self.workers.size)),
            )
        self._starting += 1  # counted before the first await, so concurrent starts see it
        try:
            return await self._queue(principal, raw)
        finally:
            self._starting -= 1

    async def _queue(self, principal: Principal, raw: bytes) -> JobRow:
        digest = hashlib.sha256(raw).hexdigest()  # stored with the draft; the job holds the bytes
        row = queued(principal, digest)
        await run_in_threadpool(self._add, row)
        self._waiting.add(row.id)
        task = asyncio.create_task(self._run(row.id, principal, raw))
        self._tasks[row.id] = task
        task.add_done_callback(lambda _: self._tasks.pop(row.id, None))
        return row

    def _add(self, row: JobRow) -> None:
        with self.sessions.begin() as session:
            session.add(row)

    def get(self, principal: Principal, job_id: str) -> JobRow:
        row = load(self.sessions, principal, job_id)
        live = self._live.get(job_id)
        if live is not None and row.status == JobState.RUNNING:
            row.stage, row.done, row.total = live
        return row

    def _set(self, job_id: str, **values: Any) -> None:
        """Move an unfinished job on; a job already done or failed is left as it is."""
        with self.sessions.begin() as session:
            session.execute(
                update(JobRow)
                .where(JobRow.id == job_id, JobRow.status.in_(UNFINISHED))
                .values(updated_at=now(), **values)
            )

    async def _run(self, job_id: str, principal: Principal, raw: bytes) -> None:
        def progress(stage: str, done: int, total: int) -> None:  # called in a worker thread
            if job_id not in self._live:  # the one write: the job has a worker now
                self._set(job_id, status=JobState.RUNNING, stage=stage, done=done, total=total)
            self._live[job_id] = (stage, done, total)

        if self._gate is None:
            self._gate = asyncio.Semaphore(self.workers.size)
        try:
            async with self._gate:  # wait here, where shutdown can fail a job not yet started
                self._waiting.discard(job_id)
                built = await self.workers.build(raw, self.settings.limits, progress=progress)
            row = await run_in_threadpool(
                lambda: drafts.create(
                    sessions=self.sessions,
                    store=self.store,
                    built=built,
                    definition=raw,
                    author=principal,
                )
            )
            await run_in_threadpool(
                self._set, job_id, status=JobState.DONE, stage="done", pack_id=row.id
            )
        except Exception as exc:  # noqa: BLE001 - a job must end, and say how
            await run_in_threadpool(
                self._set, job_id, status=JobState.FAILED, stage="failed", error=failure(exc)
            )
        finally:
            self._waiting.discard(job_id)
            self._live.pop(job_id, None)

    async def close(self) -> None:
        """Stop taking jobs, fail the ones not yet started, give running ones the grace period,
        then fail what is left (nothing half-done is left claimed). Call before the workers
        are closed."""
        self._stopping = True
        waiting = [self._tasks[i] for i in self._waiting if i in self._tasks]
        await self._stop(waiting)
        running = list(self._tasks.values())
        if running:
            await asyncio.wait(running, timeout=self.settings.shutdown_grace_s)
        await self._stop([task for task in running if not task.done()])

    async def _stop(self, tasks: list[asyncio.Task[None]]) -> None:
        ids = [job_id for job_id, task in list(self._tasks.items()) if task in tasks]
        for task in tasks:
            task.cancel()
        if tasks:
            await asyncio.gather(*tasks, return_exceptions=True)
        for job_id in ids:
            await run_in_threadpool(
                self._set, job_id, status=JobState.FAILED, stage="failed", error=STOPPED
            )


__all__ = [
    "STOPPED",
    "UNFINISHED",
    "JobState",
    "Jobs",
    "LocalJobs",
    "failure",
    "load",
    "queued",
]
