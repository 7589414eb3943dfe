"""A pack's chart groups drawn by several Celery workers, and assembled once by the one building it.

The worker that builds a pack (``plumbline.build``) reads and checks it, cuts its charts into the
render stage's fixed groups (``render.groups``) and, for each group not yet drawn, sends a
``plumbline.draw`` task to the draw queue. Idle workers take those; the builder meanwhile draws
groups itself, from the last one back. Redis, the broker, is the meeting point:

- a group is **claimed** before it is drawn (``SET NX`` with an expiry), so each is drawn once; a
  claim whose drawer died expires after ``claim_s`` and the group is drawn by whoever claims next;
- a drawn group is **published** under its content address (the chart cache key: the SHA-256 of
  every plan in it, the style and the library versions) for ``keep_s``, so a second pack with the
  same charts, or a redelivered build, takes it instead of drawing it again.

The builder never waits on a group nobody holds: what no other worker claimed it draws itself,
so a pack finishes even when every worker is busy building (then nothing is gained, and nothing
is lost but a few queued draw tasks that find their group drawn). The bytes are those of a serial
render: the same groups, each drawn whole by one process (tested).

Draw tasks carry the final chart plans as JSON, never pickles; published groups are the PDF bytes
and the layout reports as JSON.
"""

from __future__ import annotations

import json
import logging
import time
from collections.abc import Callable
from dataclasses import asdict, dataclass
from typing import Any

from service.errors import RenderFailed
from service.intents.plan import ChartPlan
from service.render.measured import LayoutReport
from service.render.options import Group

log = logging.getLogger("plumbline.worker")

DRAW_TASK = "plumbline.draw"
DRAW_QUEUE = "plumbline.draws"
PREFIX = "plumbline:group:"
POLL_S = 0.05


def _pdf_key(key: str) -> str:
    return f"{PREFIX}{key}:pdf"


def _layout_key(key: str) -> str:
    return f"{PREFIX}{key}:layout"


def _claim_key(key: str) -> str:
    return f"{PREFIX}{key}:claim"


def _client(url: str) -> Any:
    import redis  # the broker's client library, installed with celery[redis]

    return redis.Redis.from_url(url, socket_timeout=10, socket_connect_timeout=5)


def fetch(client: Any, key: str) -> Group | None:
    """The published group under ``key``, or None."""
    pdf, layout = client.mget([_pdf_key(key), _layout_key(key)])
    if pdf is None or layout is None:
        return None
    return pdf, [LayoutReport(**report) for report in json.loads(layout)]


def publish(client: Any, key: str, group: Group, keep_s: float) -> None:
    pdf, reports = group
    layout = json.dumps([asdict(report) for report in reports])
    with client.pipeline() as batch:  # MULTI/EXEC: both halves appear together
        batch.set(_pdf_key(key), pdf, px=int(keep_s * 1000))
        batch.set(_layout_key(key), layout, px=int(keep_s * 1000))
        batch.delete(_claim_key(key))
        batch.execute()


def claim(client: Any, key: str, who: str, claim_s: float) -> bool:
    return bool(client.set(_claim_key(key), who, nx=True, px=int(claim_s * 1000)))


@dataclass(frozen=True)
class SharedGroups:
    """The render stage's ``Sharer`` for a queued deployment (picklable: plain settings only)."""

    url: str
    """The Redis broker's URL (``PLUMBLINE_QUEUE_URL``)."""
    claim_s: float = 60.0
    """A claimed group not published by then is drawn by whoever claims it next. A group is at
    most 25 charts (200 ÷ 8) at about 0.4 s each, so 60 s leaves six times the time needed."""
    keep_s: float = 3600.0
    """How long a drawn group stays published for other packs and redeliveries."""
    wait_s: float = 600.0
    """The longest a build waits for its groups in all (the render budget stops it sooner)."""

    def draw(
        self,
        jobs: list[list[ChartPlan]],
        keys: list[str],
        local: Callable[[list[ChartPlan]], Group],
        ready: Callable[[int], None],
    ) -> list[Group]:
        client = _client(self.url)
        try:
            return self._draw(client, jobs, keys, local, ready)
        finally:
            client.close()

    def _draw(
        self,
        client: Any,
        jobs: list[list[ChartPlan]],
        keys: list[str],
        local: Callable[[list[ChartPlan]], Group],
        ready: Callable[[int], None],
    ) -> list[Group]:
        out: list[Group | None] = [fetch(client, key) for key in keys]
        for i, group in enumerate(out):
            if group is not None:
                ready(len(jobs[i]))
        offered = [i for i, group in enumerate(out) if group is None]
        if len(offered) > 1:  # one group alone is drawn here at once
            send(self.url, [(keys[i], jobs[i]) for i in offered[:-1]])
        me = f"builder-{time.monotonic_ns()}"
        deadline = time.monotonic() + self.wait_s
        while pending := [i for i, group in enumerate(out) if group is None]:
            moved = False
            for i in reversed(pending):  # others take the queue's front; this builder the back
                group = fetch(client, keys[i])
                if group is None and claim(client, keys[i], me, self.claim_s):
                    group = local(jobs[i])
                    publish(client, keys[i], group, self.keep_s)
                if group is not None:
                    out[i] = group
                    ready(len(jobs[i]))
                    moved = True
                    break  # look again from the back: others may have finished meanwhile
            if not moved:
                if time.monotonic() > deadline:
                    raise RenderFailed(
                        f"{len(pending)} chart group(s) were not drawn within {self.wait_s:g} s"
                    )
                time.sleep(POLL_S)
        return [group for group in out if group is not None]


def send(url: str, jobs: list[tuple[str, list[ChartPlan]]]) -> None:
    """Offer each group to the draw queue: (cache key, the group's final plans as JSON)."""
    from celery import Celery  # type: ignore[import-untyped]

    app = Celery("plumbline-fanout", broker=url, set_as_current=False)
    app.conf.update(task_serializer="json", accept_content=["json"], task_ignore_result=True)
    with app.producer_or_acquire() as producer:
        for key, plans in jobs:
            app.send_task(
                DRAW_TASK,
                args=[key, [plan.model_dump(mode="json") for plan in plans]],
                queue=DRAW_QUEUE,
                producer=producer,
            )


def draw_offered(
    url: str,
    key: str,
    plans: list[dict[str, Any]],
    run: Callable[[list[ChartPlan]], Group],
    *,
    claim_s: float = SharedGroups.claim_s,
    keep_s: float = SharedGroups.keep_s,
) -> str:
    """A worker's ``plumbline.draw``: draw the offered group unless it is drawn or claimed."""
    client = _client(url)
    try:
        if client.exists(_pdf_key(key)):
            return "drawn-already"
        if not claim(client, key, f"worker-{time.monotonic_ns()}", claim_s):
            return "claimed-elsewhere"
        try:
            group = run([ChartPlan.model_validate(plan) for plan in plans])
        except BaseException:
            client.delete(_claim_key(key))  # the builder draws it now, not after the claim ends
            raise
        publish(client, key, group, keep_s)
        log.info("drew chart group %s (%d charts) for another worker's pack", key[:12], len(plans))
        return "drawn"
    finally:
        client.close()


__all__ = [
    "DRAW_QUEUE",
    "DRAW_TASK",
    "SharedGroups",
    "claim",
    "draw_offered",
    "fetch",
    "publish",
    "send",
]
