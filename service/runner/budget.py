"""One job under a time and memory budget, as the service runs its jobs: what a render worker
loads before its memory limit applies, the check of a definition as a worker runs it, and
``run_alone`` for the command line (a worker process of its own, or none when unbounded).

Light to import: the pipeline and the drawing stack load in the worker, when the job runs.
"""

from __future__ import annotations

import os
from collections.abc import Callable
from typing import TYPE_CHECKING, Any, TypeVar

from service import logs
from service.runner.pool import Pool, Progress

if TYPE_CHECKING:
    from service.config import Limits

T = TypeVar("T")

WORKER_NICENESS = 5
"""Render workers run at a lower CPU priority than the process answering requests, so accepting
a job or answering a status query stays quick while every core is drawing."""


def start_worker() -> None:
    """A render worker's start, before its memory limit applies."""
    from service.render import style

    os.nice(WORKER_NICENESS)
    logs.route_warnings()
    style.install()
    # Loaded here, before the worker's memory limit applies: scipy's OpenBLAS reserves its
    # buffers as it loads and, refused, retries in a loop or exits instead of raising; native
    # extensions (pandas, pydantic-core) refused memory while loading may abort or hang.
    from scipy import special  # noqa: F401

    from service import pipeline  # noqa: F401


def check_definition(raw: bytes, limits: Limits) -> dict[str, Any]:
    """``pipeline.check`` in a worker, answered as plain data: the report's id, whether it is
    blocked, the summary, every check's result, the waivers that were not needed, and the
    summary as the command line prints it (``line``)."""
    from service import pipeline
    from service.checks.results import summary, summary_line

    checked = pipeline.check(pipeline.intake(raw, limits))
    return {
        "report": checked.definition.report.id,
        "blocked": checked.blocked,
        "summary": summary(checked.results),
        "checks": [r.model_dump(mode="json") for r in checked.results],
        "unused_waivers": checked.unused_waivers,
        "line": summary_line(checked.results),
    }


def run_alone(
    job: Callable[..., T],
    *args: Any,
    timeout: float,
    memory_mb: int,
    progress: Progress | None = None,
    **kwargs: Any,
) -> T:
    """Run one job in a worker process of its own under a time budget (0: none) and a memory
    limit in MiB (0: none), as the service runs its jobs; without either, in this process."""
    if not timeout and not memory_mb:
        if progress is not None:
            kwargs["progress"] = progress
        return job(*args, **kwargs)
    pool = Pool(1, initializer=start_worker, timeout=timeout or float("inf"), memory_mb=memory_mb)
    try:
        result: T = pool.run(job, *args, progress=progress, **kwargs)
    finally:
        pool.close()
    return result


__all__ = ["WORKER_NICENESS", "check_definition", "run_alone", "start_worker"]
