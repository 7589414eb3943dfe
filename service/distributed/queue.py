"""The Celery application: the broker, delivery rules, and the tasks (``plumbline.build``, and
``plumbline.draw``, a group of another build's charts: ``fanout``).

Delivery rules, each for a reason (ENGINEERING.md, "Web service limits"): a build is acknowledged
only after it ran (``task_acks_late``), and given back when its worker process is lost
(``task_reject_on_worker_lost``); a worker takes one build at a time
(``worker_prefetch_multiplier=1``), so a long build does not hold others back; the broker's
visibility timeout is longer than the render budget, so a build still running is never given to a
second worker, while one whose worker vanished is given again after it. Results live in the
archive's ``jobs`` table, so Celery keeps none.
"""

from __future__ import annotations

from collections.abc import Sequence
from typing import Any

from service.config import Settings
from service.distributed import fanout
from service.distributed.options import QueueOptions

TASK = "plumbline.build"
QUEUE = "plumbline.builds"


def make_app(settings: Settings) -> Any:
    """A configured Celery application with the build task registered."""
    from celery import Celery  # type: ignore[import-untyped]  # only a queued deployment needs it
    from kombu import Queue  # type: ignore[attr-defined]

    from service.distributed import tasks

    options = QueueOptions.of(settings)
    app = Celery("plumbline", broker=options.url, set_as_current=False)
    app.conf.update(
        task_acks_late=True,
        task_reject_on_worker_lost=True,
        worker_prefetch_multiplier=1,
        broker_transport_options={
            "visibility_timeout": options.visibility_timeout_s,
            # look for builds of lost workers this often, scanning every time
            "unacked_restore_interval": options.restore_interval_s,
            "unacked_restore_throttle": 1,
        },
        broker_connection_retry_on_startup=True,
        worker_cancel_long_running_tasks_on_connection_loss=True,
        task_default_queue=QUEUE,
        # every worker takes both: draws first, they are what a running build waits for
        task_queues=[Queue(fanout.DRAW_QUEUE), Queue(QUEUE)],  # type: ignore[no-untyped-call]
        task_serializer="json",
        accept_content=["json"],
        task_ignore_result=True,
        worker_send_task_events=False,
    )

    def build(job_id: str) -> str:
        return tasks.build(tasks.context(settings), job_id)

    def draw(key: str, plans: list[dict[str, Any]]) -> str:
        return tasks.draw(tasks.context(settings), key, plans)

    app.task(name=TASK, acks_late=True, reject_on_worker_lost=True)(build)
    # A lost draw is not given back: its claim expires and the builder draws the group itself.
    app.task(name=fanout.DRAW_TASK, acks_late=False)(draw)
    _connect_signals(settings)
    return app


def _connect_signals(settings: Settings) -> None:
    """Open the worker's archive, store and render process when it is ready (the first build is
    then not slower than the next), and close them when it stops."""
    from celery.signals import worker_ready, worker_shutdown  # type: ignore[import-untyped]

    from service.distributed import tasks

    def ready(**_: Any) -> None:
        tasks.context(settings)

    def shutdown(**_: Any) -> None:
        tasks.close()

    worker_ready.connect(ready, weak=False, dispatch_uid="plumbline.ready")
    worker_shutdown.connect(shutdown, weak=False, dispatch_uid="plumbline.shutdown")


def run_worker(settings: Settings, argv: Sequence[str] = ()) -> None:
    """Run a worker in this process until it is stopped: one build at a time (the render itself
    runs in a child process with its deadline, ``service.runner.pool``)."""
    app = make_app(settings)
    app.worker_main(
        [
            "worker",
            "--pool=solo",
            "--loglevel=INFO",
            "--without-gossip",
            "--without-mingle",
            "--without-heartbeat",
            *argv,
        ]
    )


__all__ = ["QUEUE", "TASK", "make_app", "run_worker"]
