"""The build a worker runs for one job id: idempotent, because the broker delivers at least once.

1. A job that ended (*done* or *failed*) is left as it is: this is a redelivery of finished work.
2. Otherwise the definition is read from the store by its SHA-256, the author rebuilt from the
   job's key (revoked or expired since: the job fails), and the pack built in a render process
   with the render budget (``service.runner.pool``), progress written to the job row.
3. The draft and the job's *done* (with the draft's id) are committed in one transaction, and the
   job's update is conditional on it being unfinished and without a draft: of two deliveries that
   both built (a redelivery while the first was still finishing), one commits and the other's
   draft is rolled back, so the archive holds one pack per job. Files written before the rows
   are content-addressed: the loser leaves at most bytes that the winner's row also names.
4. A failure is written only onto an unfinished job, so it never overwrites a *done*.
"""

from __future__ import annotations

import logging
import threading
import time
from dataclasses import dataclass, replace
from typing import Any, cast

from sqlalchemy import event, update
from sqlalchemy.orm import Session, sessionmaker

from service.archive import db
from service.archive.db import JobRow, PackRow, now
from service.archive.files import Store
from service.archive.objects import BlobStore, open_store
from service.config import Limits, Settings
from service.distributed.fanout import SharedGroups, draw_offered
from service.distributed.render import warm
from service.pipeline import Built
from service.render.options import RenderOptions, from_settings
from service.runner.jobs import UNFINISHED, JobState, failure
from service.runner.pool import Pool
from service.runner.workers import build_pack
from service.workflow import drafts
from service.workflow.keys import Principal, principal_for

log = logging.getLogger("plumbline.worker")

_THROTTLE_S = 0.5


@dataclass
class Context:
    """What one worker process holds between builds."""

    sessions: sessionmaker[Any]
    store: BlobStore
    pool: Pool
    limits: Limits
    render: RenderOptions
    queue_url: str

    def close(self) -> None:
        self.pool.close()
        db.engine_of(self.sessions).dispose()


_context: Context | None = None
_lock = threading.Lock()


def context(settings: Settings) -> Context:
    """This process's context, made on first use: the archive (migrated), the store, and one
    render process with the render budget."""
    global _context  # noqa: PLW0603 - one per worker process, closed at its shutdown
    with _lock:
        if _context is None:
            settings.data_dir.mkdir(parents=True, exist_ok=True)  # a SQLite file, local files
            _context = Context(
                sessions=db.connect(settings.database_url),
                store=open_store(settings),
                pool=Pool(1, initializer=warm, timeout=settings.render_timeout_s),
                limits=settings.limits,
                render=replace(
                    from_settings(settings, service=True),
                    share=SharedGroups(settings.queue_url) if settings.fan_out_charts else None,
                ),
                queue_url=settings.queue_url,
            )
        return _context


def close() -> None:
    global _context  # noqa: PLW0603
    with _lock:
        if _context is not None:
            _context.close()
            _context = None


def build(ctx: Context, job_id: str) -> str:
    """Build the job's draft; returns what happened: done, failed, finished-already, missing."""
    with ctx.sessions() as session:
        row: JobRow | None = session.get(JobRow, job_id)
    if row is None:
        log.warning("job %s is not in the archive; nothing to build", job_id)
        return "missing"
    if row.status not in UNFINISHED:
        log.info("job %s is %s already; this delivery does nothing", job_id, row.status)
        return "finished-already"
    log.info("job %s: building (it was %s)", job_id, row.status)
    try:
        _set(ctx, job_id, status=JobState.RUNNING, stage="started")
        author = principal_for(ctx.sessions, row.key_id)
        raw = ctx.store.get(row.definition_sha256)
        built: Built = ctx.pool.run(
            build_pack, raw, ctx.limits, options=ctx.render, progress=_progress(ctx, job_id)
        )
        if not store_draft(ctx, job_id=job_id, built=built, definition=raw, author=author):
            log.info("job %s was finished by another delivery; this draft is dropped", job_id)
            return "finished-already"
        log.info("job %s: done", job_id)
    except Exception as exc:  # noqa: BLE001 - a job must end, and say how (failure logs it)
        _set(ctx, job_id, status=JobState.FAILED, stage="failed", error=failure(exc))
        return "failed"
    return "done"


class _FinishedElsewhere(Exception):
    """Raised inside the draft's transaction when the job is no longer unfinished: rolls it back."""


def store_draft(
    ctx: Context, *, job_id: str, built: Built, definition: bytes, author: Principal
) -> bool:
    """Create the draft and mark the job done with it in one transaction; ``False`` (and nothing
    committed) if the job had already ended."""
    sessions = sessionmaker(db.engine_of(ctx.sessions), expire_on_commit=False)

    def claim(session: Session) -> None:
        session.flush()
        packs = [o for o in session.identity_map.values() if isinstance(o, PackRow)]
        assert len(packs) == 1, "a draft's transaction holds exactly one pack"
        result = session.execute(
            update(JobRow)
            .where(
                JobRow.id == job_id,
                JobRow.status.in_(UNFINISHED),
                JobRow.pack_id.is_(None),
            )
            .values(status=JobState.DONE, stage="done", pack_id=packs[0].id, updated_at=now())
        )
        if int(getattr(result, "rowcount", 0) or 0) != 1:
            raise _FinishedElsewhere(job_id)

    event.listen(sessions, "before_commit", claim)
    try:
        drafts.create(
            sessions=sessions,
            store=cast(Store, ctx.store),  # drafts.create needs only put
            built=built,
            definition=definition,
            author=author,
        )
    except _FinishedElsewhere:
        return False
    return True


def _set(ctx: Context, job_id: str, **values: Any) -> None:
    """Update an unfinished job (a finished one is never changed again)."""
    with ctx.sessions.begin() as session:
        session.execute(
            update(JobRow)
            .where(JobRow.id == job_id, JobRow.status.in_(UNFINISHED))
            .values(updated_at=now(), **values)
        )


def draw(ctx: Context, key: str, plans: list[dict[str, Any]]) -> str:
    """Draw one offered group of another build's charts in this worker's render process."""
    from service.render import pool  # the job's function; the drawing happens in the process

    def run(group: list[Any]) -> Any:
        return ctx.pool.run(pool.draw_group, group)

    return draw_offered(ctx.queue_url, key, plans, run)


def _progress(ctx: Context, job_id: str) -> Any:
    """Progress written to the job's row: each new stage, then at most every ``_THROTTLE_S``."""
    last: list[Any] = [0.0, ""]

    def progress(stage: str, done: int, total: int) -> None:
        moment = time.monotonic()
        if stage != last[1] or moment - last[0] >= _THROTTLE_S or done == total:
            last[0], last[1] = moment, stage
            _set(ctx, job_id, status=JobState.RUNNING, stage=stage, done=done, total=total)

    return progress


__all__ = ["Context", "build", "close", "context", "draw", "store_draft"]
