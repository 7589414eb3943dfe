"""Shared settings of the fuzz tests: how many examples, how long a request may take.

Runs are bounded and repeatable: every fuzz test takes its settings from ``PROFILE``
(derandomised, no example database, no per-example deadline — a hang is caught by the
per-request timeout instead). ``PLUMBLINE_FUZZ_SCALE=10`` runs ten times the examples, and
``PLUMBLINE_FUZZ_RANDOM=1`` draws new ones on every run (for a longer hunt by hand).
"""

from __future__ import annotations

import os
import time
from concurrent.futures import TimeoutError as FutureTimeout
from typing import Any

import anyio
import httpx
import pytest
from anyio.from_thread import BlockingPortal
from hypothesis import HealthCheck, settings

SCALE = max(1, int(os.environ.get("PLUMBLINE_FUZZ_SCALE", "1")))

PROFILE = settings(
    deadline=None,
    database=None,
    derandomize=os.environ.get("PLUMBLINE_FUZZ_RANDOM") != "1",
    print_blob=True,
    suppress_health_check=[HealthCheck.too_slow, HealthCheck.data_too_large],
)

REQUEST_TIMEOUT_S = 60.0
"""No single request may take longer; a render that hangs fails the test instead of the run."""


def fuzz_settings(max_examples: int) -> settings:
    """The fuzz profile with ``max_examples`` (times ``PLUMBLINE_FUZZ_SCALE``)."""
    return settings(PROFILE, max_examples=max_examples * SCALE)


def report(config: pytest.Config, line: str) -> None:
    """Show a count of cases run in pytest's own output (also without ``-s``)."""
    reporter = config.pluginmanager.get_plugin("terminalreporter")
    capture = config.pluginmanager.get_plugin("capturemanager")
    if reporter is None or capture is None:
        return
    with capture.global_and_fixture_disabled():
        reporter.write_line(line)


class Api:
    """The app on an event loop of its own, reached over ASGI with httpx; every request is
    bounded by ``REQUEST_TIMEOUT_S``."""

    def __init__(self, portal: BlockingPortal, client: httpx.AsyncClient, key: str) -> None:
        self.portal, self.client = portal, client
        self.headers = {"Authorization": f"Bearer {key}"}

    def send(self, method: str, url: str, **kwargs: Any) -> httpx.Response:
        headers = {**self.headers, **kwargs.pop("headers", {})}

        async def bounded() -> httpx.Response:
            with anyio.fail_after(REQUEST_TIMEOUT_S):
                return await self.client.request(method, url, headers=headers, **kwargs)

        started = time.monotonic()
        future = self.portal.start_task_soon(bounded)
        try:
            response = future.result(timeout=REQUEST_TIMEOUT_S + 5)
        except (TimeoutError, FutureTimeout):
            pytest.fail(f"{method} {url} did not answer within {REQUEST_TIMEOUT_S:g} s")
        assert response.status_code < 500, (
            f"{method} {url} answered {response.status_code} after "
            f"{time.monotonic() - started:.1f} s: {response.text[:2000]}"
        )
        return response

    def post_json(self, url: str, body: bytes, **kwargs: Any) -> httpx.Response:
        headers = {"Content-Type": "application/json"}
        return self.send("POST", url, content=body, headers=headers, **kwargs)
