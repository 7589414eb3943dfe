"""Requests that wait for their answer (a build with ``wait=true``, a check) while every worker is
busy: a malformed definition is answered at once, without a worker, and past
``max_waiting`` waiting requests a new one is refused with ``TooBusy`` (429 and Retry-After).

Once, while two slow renders held both workers, thirty posts of ``{`` each waited over a minute.
"""

from __future__ import annotations

import asyncio
import time
from collections.abc import Iterator

import pytest
from factories import encode, make_daily, make_definition

from service.config import Limits
from service.errors import InvalidDefinition, RenderTimeout, TooBusy
from service.runner.pool import RenderMemory
from service.runner.workers import Workers

HOLD_S = 6.0
"""How long the stand-in for a slow render holds a worker."""


@pytest.fixture(scope="module")
def workers() -> Iterator[Workers]:
    pool = Workers(2, timeout=60, max_waiting=1)
    yield pool
    pool.close()


def test_a_malformed_body_is_answered_at_once_and_excess_requests_are_refused(
    workers: Workers,
) -> None:
    async def scenario() -> None:
        slow = [asyncio.create_task(workers._run(time.sleep, HOLD_S)) for _ in range(2)]
        await asyncio.sleep(0.5)  # both workers are now held

        started = time.monotonic()
        with pytest.raises(InvalidDefinition) as caught:
            await workers.check(b"{", Limits())
        assert time.monotonic() - started < 2
        assert caught.value.problems[0].code == "invalid_json"
        with pytest.raises(InvalidDefinition):
            await workers.build_now(b"{", Limits())

        waiting = asyncio.create_task(workers.check(encode(make_definition()), Limits()))
        await asyncio.sleep(0.2)  # it waits for a worker now
        started = time.monotonic()
        with pytest.raises(TooBusy) as refused:
            await workers.build_now(encode(make_definition()), Limits())
        assert time.monotonic() - started < 2
        assert refused.value.status == 429
        assert refused.value.retry_after >= 1
        assert "PLUMBLINE_MAX_WAITING_REQUESTS" in refused.value.message

        answer = await waiting  # served once a worker is free
        assert answer["report"] == "test-pack"
        assert not answer["blocked"]
        await asyncio.gather(*slow)
        assert workers._waiting == 0

    asyncio.run(scenario())


def test_a_slow_check_is_stopped_at_the_time_budget_in_its_worker() -> None:
    """Ten thousand years of days, let through by a raised ``max_periods``, once took minutes and
    gigabytes inside the service's own process; in a worker it is stopped at the budget."""
    definition = make_daily("1700-01-01", "2250-12-30")  # dates before 1678 are refused now
    pool = Workers(1, timeout=30, memory_mb=2048, max_waiting=0)
    try:
        # with none allowed to wait, a request that finds a worker free is still served
        assert asyncio.run(pool.check(encode(make_definition()), Limits()))["report"] == "test-pack"
        pool._pool.timeout = 1  # six centuries of days take 2 to 20 s to check, by the load
        started = time.monotonic()
        with pytest.raises((RenderTimeout, RenderMemory)):
            asyncio.run(pool.check(encode(definition), Limits(max_periods=10_000_000)))
        assert time.monotonic() - started < 30
    finally:
        pool.close()


def test_a_check_past_its_time_budget_is_called_a_check() -> None:
    """The answer to a slow ``POST /v1/check`` said "the render took longer than its time budget"."""
    definition = make_daily("1700-01-01", "2250-12-30")  # six centuries of days
    pool = Workers(1, timeout=1, memory_mb=0, max_waiting=0)
    try:
        with pytest.raises(RenderTimeout) as stopped:
            asyncio.run(pool.check(encode(definition), Limits(max_periods=10_000_000)))
        assert stopped.value.message.startswith("the check took longer than its time budget of 1 s")
    finally:
        pool.close()


def test_a_verification_waits_for_a_worker_only_as_long_as_a_check_would() -> None:
    """``POST /v1/verify`` re-renders the pack in a worker under the render budget; while every
    worker is busy it no longer waits in an unbounded queue, but is refused like a check."""
    pool = Workers(1, timeout=60, memory_mb=0, max_waiting=0)

    async def scenario() -> None:
        held = asyncio.create_task(pool._run(time.sleep, 3))
        await asyncio.sleep(0.5)  # the only worker is held
        started = time.monotonic()
        with pytest.raises(TooBusy):
            await pool.verify(b"%PDF-1.7 not a sealed pack", [], Limits())
        assert time.monotonic() - started < 2
        await held
        report = await pool.verify(b"%PDF-1.7 not a sealed pack", [], Limits())
        assert not report.ok

    try:
        asyncio.run(scenario())
    finally:
        pool.close()
