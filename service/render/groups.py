"""Draw a pack's charts in fixed groups, in parallel processes and through the chart cache.

Each group of consecutive charts is one multi-page PDF with its own font subsets. Where a group
ends depends only on how many charts the pack has, never on the worker count or the cache, and
serial drawing draws the same groups, so the bytes are the same however they were made.
"""

from __future__ import annotations

import threading
from collections.abc import Callable
from concurrent.futures.process import BrokenProcessPool
from dataclasses import dataclass

from service.errors import RenderFailed
from service.intents.plan import ChartPlan
from service.render import cache, pool
from service.render.measured import LayoutReport
from service.render.options import RenderOptions

#: Every PDF file repeats the font subsets, which costs time (fontTools subsets each file) and
#: bytes. Measured on the demo's 10 charts drawn serially (chart files / pack):
#: 1 file 54 / 145 KiB; 2 files 79 / 167 KiB; 4 files 120 / 203 KiB; 10 files 216 / 286 KiB, and
#: 10 files took 74 % more drawing time than 1; writing one file's fonts took 0.49 s, more than
#: one chart.
#: Charts take about the same time each (235–372 ms on the demo, whatever their form), so groups
#: are cut by count: at least ``MIN_GROUP`` charts (a 10-chart pack is two files, one per core on
#: two cores), and never more than ``MAX_GROUPS`` files (the font cost of a 200-chart pack stays
#: bounded, and up to eight processes can share it).
MIN_GROUP = 5
MAX_GROUPS = 8


@dataclass(frozen=True)
class Drawn:
    """The pack's drawn charts: one PDF per group, and per chart its file and page."""

    files: list[bytes]
    pages: list[tuple[int, int]]
    reports: list[LayoutReport]
    cached: int
    """How many groups came from the cache (the rest were drawn)."""


def group_size(count: int) -> int:
    """Charts per group for a pack of ``count`` charts: it depends on nothing else."""
    return max(MIN_GROUP, -(-count // MAX_GROUPS))


def groups(count: int) -> list[range]:
    """Chart indexes of each group, for a pack of ``count`` charts."""
    size = group_size(count)
    return [range(i, min(i + size, count)) for i in range(0, count, size)]


Counter = Callable[[int, int], None]
"""Told (charts done, charts in the pack) each time a group is ready."""


def draw_all(
    plans: list[ChartPlan], options: RenderOptions | None = None, progress: Counter | None = None
) -> Drawn:
    """Every chart of a pack, in order: from the cache where it holds them, else drawn."""
    options = options or RenderOptions()
    parts = [[plans[i] for i in group] for group in groups(len(plans))]
    tally = _Tally(len(plans), progress)
    store = cache.ChartCache.of(options)
    keys = [cache.key(part) for part in parts] if store is not None else []
    found: list[tuple[bytes, list[LayoutReport]] | None] = (
        [store.get(k) for k in keys] if store is not None else [None] * len(parts)
    )
    missing = [i for i, hit in enumerate(found) if hit is None]
    tally.add(sum(len(parts[i]) for i, hit in enumerate(found) if hit is not None))
    if options.share is not None and missing:
        keys = keys or [cache.key(part) for part in parts]
        drawn = options.share.draw(
            [parts[i] for i in missing], [keys[i] for i in missing], pool.draw_group, tally.add
        )
    else:
        drawn = _draw([parts[i] for i in missing], options.workers, tally)
    for i, group in zip(missing, drawn, strict=True):
        found[i] = group
        if store is not None:
            store.put(keys[i], *group)
    files: list[bytes] = []
    pages: list[tuple[int, int]] = []
    reports: list[LayoutReport] = []
    for number, entry in enumerate(found):
        assert entry is not None  # every miss was drawn above
        files.append(entry[0])
        reports.extend(entry[1])
        pages.extend((number, page) for page in range(len(parts[number])))
    return Drawn(files, pages, reports, cached=len(parts) - len(missing))


class _Tally:
    """Charts ready so far, counted from any thread, told to ``progress`` one count at a time."""

    def __init__(self, total: int, progress: Counter | None) -> None:
        self.total, self.done, self.progress = total, 0, progress
        self._lock = threading.Lock()

    def add(self, charts: int) -> None:
        with self._lock:
            self.done += charts
            if self.progress is not None:
                self.progress(self.done, self.total)


def _draw(
    jobs: list[list[ChartPlan]], workers: int, tally: _Tally
) -> list[tuple[bytes, list[LayoutReport]]]:
    """Draw each job; with ``workers`` > 1, this process and ``workers`` − 1 helpers share them.

    The helpers take jobs from the front, this process from the back, each the next one as soon
    as it is free. A helper is fed by a thread of this process that only submits a job and waits
    for its bytes (it draws nothing: matplotlib stays on this process's main thread). Results go
    back in job order, so who drew what changes nothing.
    """
    if workers <= 1 or len(jobs) <= 1:
        serial = []
        for job in jobs:
            serial.append(pool.draw_group(job))
            tally.add(len(job))
        return serial
    executor = pool.executor(workers - 1)
    out: list[tuple[bytes, list[LayoutReport]] | None] = [None] * len(jobs)
    lock = threading.Lock()
    ends = [0, len(jobs)]  # the next job from the front, and one past the next from the back
    errors: list[BaseException] = []

    def take(front: bool) -> int | None:
        with lock:
            if errors or ends[0] >= ends[1]:
                return None
            if front:
                ends[0] += 1
                return ends[0] - 1
            ends[1] -= 1
            return ends[1]

    def feed() -> None:
        while (i := take(front=True)) is not None:
            try:
                out[i] = executor.submit(pool.draw_group, jobs[i]).result()
                tally.add(len(jobs[i]))
            except Exception as exc:  # noqa: BLE001 - handed to the main thread, which raises it
                with lock:
                    errors.append(exc)

    feeders = [
        threading.Thread(target=feed, daemon=True) for _ in range(min(workers, len(jobs)) - 1)
    ]
    for feeder in feeders:
        feeder.start()
    try:
        while (i := take(front=False)) is not None:
            out[i] = pool.draw_group(jobs[i])
            tally.add(len(jobs[i]))
    finally:
        with lock:
            ends[0] = ends[1]  # if this process failed, the helpers take nothing more
        for feeder in feeders:
            feeder.join()
    if errors:
        first = errors[0]
        if isinstance(first, BrokenProcessPool):
            pool.discard()
            raise RenderFailed("a chart drawing process stopped unexpectedly; try again")
        raise first
    return [group for group in out if group is not None]


__all__ = ["MAX_GROUPS", "MIN_GROUP", "Counter", "Drawn", "draw_all", "group_size", "groups"]
