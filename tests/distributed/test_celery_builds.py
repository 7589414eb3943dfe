"""Builds on Celery workers (real processes) through a real redis-server, with the archive on a
real PostgreSQL server and files in moto's S3 server: a job ends done with its PDF in the object
store; a worker killed mid-build hands the job to another, and the archive holds one pack for it;
an invalid definition ends failed with every problem; a lost job is sent again."""

from __future__ import annotations

import asyncio
import hashlib
import json
import time
from datetime import timedelta
from pathlib import Path
from typing import Any

from factories import make_definition, make_trend_chart
from sqlalchemy import func, select

from service import pipeline
from service.archive.db import AuditRow, JobRow, PackRow, ReviewRow, now
from service.distributed import tasks
from service.distributed.jobs import CeleryJobs
from service.render.options import RenderOptions
from service.runner.jobs import JobState
from service.workflow.keys import Principal

DEMO = Path(__file__).parents[2] / "sample_requests" / "bus-cooperative-monthly.json"
VISIBILITY_BOUND = 90.0
"""How long a redelivered job may take in all: the visibility timeout, a restore sweep, a worker
start and a build, with room for a loaded machine."""


def job_of(stack: Any, job_id: str) -> JobRow:
    with stack.sessions() as session:
        row: JobRow | None = session.get(JobRow, job_id)
    assert row is not None
    return row


def wait_until_ended(stack: Any, job_id: str, timeout: float = 90) -> JobRow:
    deadline = time.monotonic() + timeout
    while time.monotonic() < deadline:
        row = job_of(stack, job_id)
        if row.status in ("done", "failed"):
            return row
        time.sleep(0.05)
    logs = "\n".join(log.read_text(errors="replace") for log in sorted(stack.logs.iterdir()))
    raise AssertionError(f"job {job_id} did not end in {timeout} s: {row.status}\n{logs}")


def packs_of(stack: Any) -> list[PackRow]:
    with stack.sessions() as session:
        return list(session.scalars(select(PackRow)).all())


def start(jobs: CeleryJobs, author: Principal, raw: bytes) -> JobRow:
    return asyncio.run(jobs.start(author, raw))


def twelve_charts() -> bytes:
    """A definition that takes a couple of seconds to build: time to kill its worker mid-way."""
    charts = [
        make_trend_chart(id=f"boardings-{i}", title=f"Boardings, view {i}") for i in range(12)
    ]
    return json.dumps(make_definition(charts=charts)).encode()


def test_a_job_posted_to_the_queue_ends_done_with_its_pdf_in_the_object_store(
    stack: Any, s3: Any, bucket: str
) -> None:
    stack.start_worker("w1")
    author = stack.author()
    jobs = CeleryJobs(sessions=stack.sessions, store=_store(stack), settings=stack.settings)
    raw = DEMO.read_bytes()
    began = time.monotonic()
    job = start(jobs, author, raw)
    assert job.status == JobState.QUEUED
    ended = wait_until_ended(stack, job.id)
    took = time.monotonic() - began
    assert ended.status == "done", ended.error
    charts = sum(len(s.get("charts", [])) for s in json.loads(raw)["sections"])
    assert (ended.stage, ended.done, ended.total) == ("done", charts, charts)
    assert jobs.get(author, job.id).pack_id == ended.pack_id
    [pack] = packs_of(stack)
    assert pack.id == ended.pack_id
    prefix = stack.env["PLUMBLINE_STORE_URL"].split("/", 3)[3]
    # the PDF and the definition, read from the bucket directly, hash to the names the row holds
    pdf = s3.get_object(Bucket=bucket, Key=f"{prefix}/{pack.pdf_sha256}")["Body"].read()
    assert hashlib.sha256(pdf).hexdigest() == pack.pdf_sha256
    assert pdf.startswith(b"%PDF-")
    assert len(pdf) == pack.pdf_bytes
    source = s3.get_object(Bucket=bucket, Key=f"{prefix}/{pack.definition_sha256}")["Body"]
    assert source.read() == raw
    with stack.sessions() as session:
        review = session.get(ReviewRow, pack.id)
    assert review is not None
    assert review.authors == [
        {"key_id": author.key_id, "name": "Ann Author", "person_id": author.person}
    ]
    print(f"\njob end to end (demo pack, warm worker): {took:.2f} s")  # noqa: T201 - with -s

    # a second delivery of the finished job (as after a redelivery) does nothing
    jobs.app.send_task("plumbline.build", args=[job.id])
    deadline = time.monotonic() + 30
    while "this delivery does nothing" not in stack.log_of("w1"):
        assert time.monotonic() < deadline, stack.log_of("w1")
        time.sleep(0.1)
    assert [p.id for p in packs_of(stack)] == [pack.id]
    asyncio.run(jobs.close())


def test_a_worker_killed_mid_build_hands_the_job_to_another_and_one_pack_is_made(
    stack: Any,
) -> None:
    first = stack.start_worker("w1")
    author = stack.author()
    jobs = CeleryJobs(sessions=stack.sessions, store=_store(stack), settings=stack.settings)
    job = start(jobs, author, twelve_charts())
    deadline = time.monotonic() + 60
    while job_of(stack, job.id).stage != "drawing":
        assert time.monotonic() < deadline, stack.log_of("w1")
        time.sleep(0.02)
    stack.kill(first)
    killed = time.monotonic()
    at_kill = job_of(stack, job.id)
    assert (at_kill.status, at_kill.pack_id) == ("running", None), "killed too late to test"
    stack.start_worker("w2")
    ended = wait_until_ended(stack, job.id, timeout=VISIBILITY_BOUND)
    redelivered = time.monotonic() - killed
    assert ended.status == "done", ended.error
    assert f"job {job.id}: building (it was running)" in stack.log_of("w2")
    assert f"job {job.id}: done" in stack.log_of("w2")
    packs = packs_of(stack)
    assert [p.id for p in packs] == [ended.pack_id]
    with stack.sessions() as session:
        created = session.scalar(
            select(func.count()).select_from(AuditRow).where(AuditRow.action == "pack.created")
        )
    assert created == 1
    print(f"\njob done {redelivered:.2f} s after its worker was killed")  # noqa: T201 - with -s
    asyncio.run(jobs.close())


def test_an_invalid_definition_ends_failed_with_every_problem(stack: Any) -> None:
    stack.start_worker("w1")
    author = stack.author()
    jobs = CeleryJobs(sessions=stack.sessions, store=_store(stack), settings=stack.settings)
    definition = json.loads(DEMO.read_text())
    definition["sections"][0]["charts"][0]["dataset"] = "no-such-dataset"
    ended = wait_until_ended(stack, start(jobs, author, json.dumps(definition).encode()).id)
    assert ended.status == JobState.FAILED
    assert ended.pack_id is None
    assert ended.error is not None
    assert ended.error["code"] == "invalid_definition"
    paths = [p["path"] for p in ended.error["errors"]]
    assert "sections[0].charts[0].dataset" in paths, ended.error
    assert packs_of(stack) == []
    asyncio.run(jobs.close())


def test_recover_sends_a_lost_job_again(stack: Any) -> None:
    """A job recorded but never sent (the service stopped in between) is found and built."""
    author = stack.author()
    jobs = CeleryJobs(sessions=stack.sessions, store=_store(stack), settings=stack.settings)
    raw = json.dumps(make_definition()).encode()
    digest = _store(stack).put(raw)
    long_ago = now() - timedelta(seconds=VISIBILITY_BOUND)
    with stack.sessions.begin() as session:
        for job_id, moment in (("jb_lost", long_ago), ("jb_recent", now())):
            session.add(
                JobRow(
                    id=job_id,
                    key_id=author.key_id,
                    status=JobState.QUEUED,
                    stage="queued",
                    done=0,
                    total=0,
                    definition_sha256=digest,
                    pack_id=None,
                    error=None,
                    created_at=moment,
                    updated_at=moment,
                )
            )
    assert jobs.recover() == 1  # the recent one may still be on its way: left alone
    stack.start_worker("w1")
    assert wait_until_ended(stack, "jb_lost").status == "done"
    assert job_of(stack, "jb_recent").status == JobState.QUEUED
    asyncio.run(jobs.close())


def test_of_two_deliveries_that_both_built_only_one_stores_a_pack(stack: Any) -> None:
    """A redelivery while the first delivery was still finishing: both built; the second's draft
    is rolled back in the transaction that would have marked the job done."""
    author = stack.author()
    raw = json.dumps(make_definition()).encode()
    store = _store(stack)
    digest = store.put(raw)
    with stack.sessions.begin() as session:
        session.add(
            JobRow(
                id="jb_twice",
                key_id=author.key_id,
                status="running",
                stage="building",
                done=0,
                total=1,
                definition_sha256=digest,
                pack_id=None,
                error=None,
                created_at=now(),
                updated_at=now(),
            )
        )
    built_limits = stack.settings.limits
    built = pipeline.build(raw, built_limits)
    # store_draft needs the archive and the store only: no render process is started
    ctx = tasks.Context(
        sessions=stack.sessions,
        store=store,
        pool=None,
        limits=built_limits,
        render=RenderOptions(),
        queue_url=stack.env["PLUMBLINE_QUEUE_URL"],
    )
    assert tasks.store_draft(ctx, job_id="jb_twice", built=built, definition=raw, author=author)
    assert not tasks.store_draft(ctx, job_id="jb_twice", built=built, definition=raw, author=author)
    [pack] = packs_of(stack)
    assert job_of(stack, "jb_twice").pack_id == pack.id
    with stack.sessions() as session:
        assert session.scalar(select(func.count()).select_from(ReviewRow)) == 1
        assert (
            session.scalar(
                select(func.count()).select_from(AuditRow).where(AuditRow.action == "pack.created")
            )
            == 1
        )
    # and a failure reported late never overwrites the done
    tasks._set(ctx, "jb_twice", status=JobState.FAILED, stage="failed", error={"code": "late"})
    assert job_of(stack, "jb_twice").status == "done"


def _store(stack: Any) -> Any:
    from service.archive.objects import open_store

    return open_store(stack.settings)
