"""Background builds through the broker: the runner's ``Jobs`` interface (``service.runner.jobs``)
for a service whose builds run on Celery workers (``PLUMBLINE_QUEUE_URL`` set).

``start`` stores the definition, records the job *queued* and sends its id; a worker does the
rest (``service.distributed.tasks``). Unlike the embedded pool, a job outlives the service that
took it: a restart fails nothing. ``recover`` sends again the jobs that look lost (unfinished and
untouched for longer than the broker's visibility timeout: a message lost with the broker, or a
service stopped between recording the job and sending it); the build is idempotent, so a second
message for a job that is still on its way costs only a look at its row.
"""

from __future__ import annotations

import logging
from datetime import timedelta
from typing import Any

from sqlalchemy import select, update
from sqlalchemy.orm import sessionmaker
from starlette.concurrency import run_in_threadpool

from service import logs
from service.archive.db import JobRow, now, utc
from service.archive.objects import BlobStore
from service.config import Settings
from service.distributed.options import QueueOptions
from service.distributed.queue import TASK, make_app
from service.errors import PlumblineError
from service.runner.jobs import UNFINISHED, JobState, load, queued
from service.workflow.keys import Principal, Role

log = logging.getLogger("plumbline.jobs")


class QueueUnavailable(PlumblineError):
    code = "queue_unavailable"
    status = 503


class CeleryJobs:
    def __init__(
        self,
        *,
        sessions: sessionmaker[Any],
        store: BlobStore,
        settings: Settings,
        app: Any = None,
    ) -> None:
        self.sessions, self.store, self.settings = sessions, store, settings
        self.options = QueueOptions.of(settings)
        self.app = app if app is not None else make_app(settings)

    def recover(self) -> int:
        """Send again every job that looks lost; returns how many."""
        stale = now() - timedelta(seconds=self.options.visibility_timeout_s)
        with self.sessions() as session:
            rows = session.execute(
                select(JobRow.id, JobRow.updated_at).where(JobRow.status.in_(UNFINISHED))
            ).all()
        lost = [job_id for job_id, updated in rows if utc(updated) < stale]
        for job_id in lost:
            self._send(job_id)
        return len(lost)

    async def start(self, principal: Principal, raw: bytes) -> JobRow:
        """Record a queued job and send it to the workers; answers before any work is done."""
        principal.require(Role.author)
        digest = await run_in_threadpool(self.store.put, raw)
        row = queued(principal, digest)
        await run_in_threadpool(self._add_and_send, row)
        return row

    def _add_and_send(self, row: JobRow) -> None:
        with self.sessions.begin() as session:
            session.add(row)
        try:
            self._send(row.id)
        except QueueUnavailable as exc:
            error = {"code": exc.code, "status": exc.status, "detail": exc.message}
            with self.sessions.begin() as session:
                session.execute(
                    update(JobRow)
                    .where(JobRow.id == row.id, JobRow.status == JobState.QUEUED)
                    .values(status=JobState.FAILED, stage="failed", error=error, updated_at=now())
                )
            raise

    def _send(self, job_id: str) -> None:
        try:
            self.app.send_task(TASK, args=[job_id], retry=True)
        except Exception as exc:  # kombu's connection errors are translated here
            incident = logs.incident(log, "the build queue did not take a job", exc=exc)
            raise QueueUnavailable(
                f"the build queue at {_safe(self.options.url)} did not take the job "
                f"(incident {incident}); check that Redis is running and "
                "PLUMBLINE_QUEUE_URL, then post the definition again",
                incident=incident,
            ) from exc

    def get(self, principal: Principal, job_id: str) -> JobRow:
        return load(self.sessions, principal, job_id)

    def ping(self, timeout: float) -> None:
        """Reach the broker (Redis: PING); raises if it does not answer."""
        with self.app.connection_for_write() as connection:
            connection.ensure_connection(max_retries=1, interval_start=0, timeout=timeout)
            client = getattr(connection.default_channel, "client", None)
            if client is not None:
                client.ping()  # redis: PING

    async def close(self) -> None:
        """Release the broker connections; queued jobs stay with the broker."""
        await run_in_threadpool(self.app.close)


def _safe(url: str) -> str:
    """The broker URL without a password, for messages."""
    if "@" not in url:
        return url
    scheme, _, rest = url.partition("://")
    return f"{scheme}://…@{rest.rpartition('@')[2]}"


__all__ = ["CeleryJobs", "QueueUnavailable"]
