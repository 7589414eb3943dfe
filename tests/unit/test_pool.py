"""The render worker pool: a job past its time budget is stopped by killing its worker, which is
replaced; a worker that dies fails only its own job; progress reaches the caller; errors travel."""

from __future__ import annotations

import os
import resource
import threading
import time
from collections.abc import Callable, Iterator
from typing import Any

import pytest

from service.errors import InvalidRequest, RenderFailed, RenderTimeout
from service.runner.pool import Pool, RenderMemory


def counts_to(n: int, *, progress: Callable[[str, int, int], None]) -> int:
    for i in range(1, n + 1):
        progress("counting", i, n)
    return n


def pid() -> int:
    return os.getpid()


def dies() -> None:
    os._exit(7)


def address_space_limit() -> int:
    return resource.getrlimit(resource.RLIMIT_AS)[0]


def allocates(mb: int) -> int:
    block = bytearray(mb * 1024 * 1024)  # zero-filled: every page is really taken
    return len(block)


def stalls_at_the_limit() -> None:
    """Take memory until refused, then wait for ever: as native code that retries a refused
    allocation in a loop (OpenBLAS) behaves under the limit, neither failing nor finishing."""
    held = []
    try:
        while True:
            held.append(bytearray(16 * 1024 * 1024))
    except MemoryError:
        held.pop()
    time.sleep(3600)


def aborts() -> None:
    os.abort()  # as Rust code does when an allocation is refused


def refuses() -> None:
    raise InvalidRequest("this job refuses on purpose")


def breaks() -> None:
    raise ZeroDivisionError("a fault inside the job")


@pytest.fixture
def pool() -> Iterator[Pool]:
    workers = Pool(1, timeout=30)
    yield workers
    workers.close()


def test_a_job_past_its_budget_is_stopped_and_its_worker_replaced(pool: Pool) -> None:
    before = pool.run(pid)
    started = time.monotonic()
    with pytest.raises(RenderTimeout, match=r"time budget of 0\.5 s"):
        pool.run(time.sleep, 30, timeout=0.5)
    assert time.monotonic() - started < 10  # stopped, not waited for
    after = pool.run(pid)
    assert after != before  # a new process took the killed one's place
    assert pool.run(counts_to, 2, progress=lambda *_: None) == 2


def test_a_worker_that_dies_fails_only_its_own_job(pool: Pool) -> None:
    with pytest.raises(RenderFailed, match="stopped unexpectedly"):
        pool.run(dies)
    assert pool.run(pid) > 0


def test_progress_reaches_the_caller_in_order(pool: Pool) -> None:
    seen: list[tuple[Any, ...]] = []
    assert pool.run(counts_to, 3, progress=lambda *args: seen.append(args)) == 3
    assert seen == [("counting", 1, 3), ("counting", 2, 3), ("counting", 3, 3)]


def test_product_errors_travel_and_foreign_ones_become_render_failures(
    pool: Pool, caplog: pytest.LogCaptureFixture
) -> None:
    with pytest.raises(InvalidRequest, match="refuses on purpose"):
        pool.run(refuses)
    with pytest.raises(
        RenderFailed, match=r"render worker failed \(incident [0-9a-f]{12}\)"
    ) as got:
        pool.run(breaks)
    # the caller learns the incident id only; the log holds the foreign text under that id
    assert "ZeroDivision" not in got.value.message
    assert "a fault inside the job" not in got.value.message
    logged = [r for r in caplog.records if getattr(r, "incident", None) == got.value.incident]
    assert logged, "no log line with the incident id"
    assert "ZeroDivisionError: a fault inside the job" in logged[0].getMessage()
    first = pool.run(pid)
    assert pool.run(pid) == first  # an error is not a crash: the worker is kept


def test_jobs_beyond_the_pool_size_wait_for_a_free_worker() -> None:
    workers = Pool(2, timeout=30)
    try:
        results: list[int] = []
        threads = [
            threading.Thread(target=lambda: results.append(workers.run(pid))) for _ in range(6)
        ]
        for thread in threads:
            thread.start()
        for thread in threads:
            thread.join(timeout=60)
        assert len(results) == 6
        assert len(set(results)) <= 2  # never more processes than the pool's size
    finally:
        workers.close()


def test_a_closed_pool_refuses_new_jobs_and_leaves_no_process() -> None:
    workers = Pool(1, timeout=30)
    worker_pid = workers.run(pid)
    workers.close()
    with pytest.raises(RenderFailed, match="shutting down"):
        workers.run(pid)
    with pytest.raises(ProcessLookupError):
        os.kill(worker_pid, 0)


def test_a_job_past_the_worker_memory_limit_fails_clearly_and_its_worker_is_replaced() -> None:
    workers = Pool(1, timeout=60, memory_mb=400)
    try:
        assert workers.run(address_space_limit) == 400 * 1024 * 1024  # RLIMIT_AS, in bytes
        before = workers.run(pid)
        assert workers.run(allocates, 50) == 50 * 1024 * 1024  # well under the limit: runs
        with pytest.raises(RenderMemory, match=r"400 MB.*PLUMBLINE_WORKER_MEMORY_MB") as caught:
            workers.run(allocates, 800)
        assert caught.value.code == "render_memory"
        assert caught.value.status == 422
        after = workers.run(pid)
        assert after != before  # a new process took the place of the one that ran out
        assert workers.run(allocates, 50) == 50 * 1024 * 1024  # and serves as before
    finally:
        workers.close()


def test_without_a_memory_limit_the_worker_keeps_the_inherited_one() -> None:
    workers = Pool(1, timeout=30, memory_mb=0)
    try:
        assert workers.run(address_space_limit) == resource.getrlimit(resource.RLIMIT_AS)[0]
    finally:
        workers.close()


def test_a_worker_that_aborts_under_a_memory_limit_is_reported_as_out_of_memory() -> None:
    workers = Pool(1, timeout=30, memory_mb=2048)
    try:
        with pytest.raises(RenderMemory, match="PLUMBLINE_WORKER_MEMORY_MB"):
            workers.run(aborts)
        assert workers.run(pid) > 0
    finally:
        workers.close()
    unlimited = Pool(1, timeout=30)
    try:
        with pytest.raises(RenderFailed, match="stopped unexpectedly; try again"):
            unlimited.run(aborts)  # without a limit, memory is not blamed
    finally:
        unlimited.close()


def test_an_idle_worker_killed_is_replaced_before_a_job_reaches_it() -> None:
    """A worker that dies while idle is noticed and replaced within seconds; the pool says it is
    short meanwhile, and the next job runs as usual (no failure, no memory hint)."""
    import signal

    workers = Pool(2, timeout=30)
    try:
        first = workers.run(pid)
        assert workers.missing() == 0
        os.kill(first, signal.SIGKILL)
        deadline = time.monotonic() + 10
        while time.monotonic() < deadline and workers.live_pids() & {first}:
            time.sleep(0.05)
        assert first not in workers.live_pids()
        while time.monotonic() < deadline and workers.missing():
            time.sleep(0.05)
        assert workers.missing() == 0
        assert len(workers.live_pids()) == 2
        for _ in range(3):
            assert workers.run(pid) != first
    finally:
        workers.close()


def test_a_short_pool_is_reported_and_makes_the_service_not_ready() -> None:
    from types import SimpleNamespace
    from typing import cast

    from service.runner.services import NotReady, Services

    workers = Pool(1, timeout=30)
    workers.close()
    assert workers.missing() == 1
    services = cast(
        Services, SimpleNamespace(workers=SimpleNamespace(size=1, missing=workers.missing))
    )
    with pytest.raises(NotReady, match="1 of 1 render workers stopped"):
        Services.probe_workers(services)


def test_with_no_time_budget_a_job_stalled_at_the_memory_limit_is_stopped() -> None:
    """``plumbline render --time-limit 0 --memory-limit MB`` once waited for ever on a job stalled
    at its memory limit: only the deadline, which it did not have, judged a stall."""
    workers = Pool(1, timeout=float("inf"), memory_mb=400, stall_s=2)
    try:
        started = time.monotonic()
        with pytest.raises(RenderMemory, match="400 MB"):
            workers.run(stalls_at_the_limit)
        assert time.monotonic() - started < 30
        assert workers.run(pid) != 0  # a fresh worker serves the next job
    finally:
        workers.close()


def test_the_stopped_job_is_named_in_the_message(pool: Pool) -> None:
    with pytest.raises(RenderTimeout, match=r"^the verification took longer than its time budget"):
        pool.run(time.sleep, 30, timeout=0.5, task="verification")
