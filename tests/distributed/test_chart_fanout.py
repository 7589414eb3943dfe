"""A pack's chart groups fan out across Celery workers and are assembled once.

Two real workers, a real redis-server: one builds the pack and offers its groups on the draw
queue, the other draws some of them; the archived PDF is byte for byte the one a serial render in
this process makes. A group is drawn once (claimed in Redis) and published under its content
address, so a second build of the same charts draws nothing.
"""

from __future__ import annotations

import json
import time
from typing import Any

from factories import make_definition, make_trend_chart
from test_celery_builds import _store, packs_of, start, wait_until_ended

from service import pipeline
from service.config import Limits
from service.distributed import fanout
from service.distributed.jobs import CeleryJobs
from service.render import cache, groups

DREW = "for another worker's pack"


def fifteen_charts(tag: str) -> bytes:
    charts = [
        make_trend_chart(id=f"{tag}-{i}", title=f"Boardings {tag}, view {i}") for i in range(15)
    ]
    return json.dumps(make_definition(charts=charts)).encode()


def test_a_packs_groups_are_drawn_on_two_workers_and_the_pack_is_the_serial_one(
    stack: Any,
) -> None:
    import redis

    stack.start_worker("w1")
    stack.start_worker("w2")
    author = stack.author()
    store = _store(stack)
    jobs = CeleryJobs(sessions=stack.sessions, store=store, settings=stack.settings)
    raw = fifteen_charts("fan")
    assert len(groups.groups(15)) == 3  # the builder offers two and draws one

    job = start(jobs, author, raw)
    ended = wait_until_ended(stack, job.id)
    assert ended.status == "done", ended.error
    logs = stack.log_of("w1") + stack.log_of("w2")
    assert DREW in logs, "no group was drawn by the worker that was not building"
    [pack] = packs_of(stack)
    serial = pipeline.build(raw, Limits())  # this process, serial, no cache, no queue
    assert store.get(pack.pdf_sha256) == serial.pdf

    # every group is published under its content address, and no claim is left behind
    checked = pipeline.check(pipeline.intake(raw, Limits()))
    plans = [c.plan for c in checked.charts]
    keys = [cache.key([plans[i] for i in part]) for part in groups.groups(len(plans))]
    client = redis.Redis.from_url(stack.env["PLUMBLINE_QUEUE_URL"])
    try:
        assert all(fanout.fetch(client, key) is not None for key in keys)
        assert not client.keys(f"{fanout.PREFIX}*:claim")
    finally:
        client.close()

    # the same charts again: taken from what was published, nothing drawn
    drawn_before = logs.count(DREW)
    again = start(jobs, author, raw)
    ended = wait_until_ended(stack, again.id)
    assert ended.status == "done", ended.error
    time.sleep(1.0)  # leftover draw tasks, if any, would log by now
    logs = stack.log_of("w1") + stack.log_of("w2")
    assert logs.count(DREW) == drawn_before
    assert {p.pdf_sha256 for p in packs_of(stack)} == {pack.pdf_sha256}
