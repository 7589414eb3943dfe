"""While slow renders hold every worker, a malformed definition is answered 422 at once, and a
synchronous request past ``PLUMBLINE_MAX_WAITING_REQUESTS`` is refused 429 with Retry-After.

Once, with two slow renders holding both workers, thirty posts of ``{`` each waited over a minute.
The slow renders here are six centuries of days (let through by a raised ``max_periods``; ten
thousand years are now refused as out of range at once), each stopped at the render budget.
"""

from __future__ import annotations

import concurrent.futures
import os
import time
from collections.abc import Iterator
from pathlib import Path

import harness
import httpx
import pytest
from factories import encode, make_daily, make_definition

from service.archive.db import connect, engine_of
from service.workflow.keys import Role, create

BUDGET_S = 15


@pytest.fixture(scope="module")
def busy_server(tmp_path_factory: pytest.TempPathFactory) -> Iterator[tuple[str, str]]:
    data_dir = tmp_path_factory.mktemp("waiting-server")
    sessions = connect(f"sqlite:///{data_dir / 'plumbline.db'}")
    secret = create(sessions, name="Ann Author", roles={Role.author}, families={"*"}, expires=None)
    engine_of(sessions).dispose()
    port = harness.free_port()
    env = {
        **os.environ,
        "PLUMBLINE_DATA_DIR": str(data_dir),
        "PLUMBLINE_WORKERS": "2",
        "PLUMBLINE_MAX_WAITING_REQUESTS": "1",
        "PLUMBLINE_RENDER_TIMEOUT_S": str(BUDGET_S),
        "PLUMBLINE_WORKER_MEMORY_MB": "0",
        "PLUMBLINE_LIMITS__MAX_PERIODS": "10000000",
    }
    process = harness.serve(port, log=Path(data_dir) / "server.log", env=env, timeout=60)
    yield f"http://127.0.0.1:{port}", secret[1]
    harness.stop(process, timeout=30)


def test_malformed_bodies_are_answered_at_once_and_excess_requests_refused(
    busy_server: tuple[str, str],
) -> None:
    base, secret = busy_server
    headers = {"Authorization": f"Bearer {secret}", "content-type": "application/json"}
    slow = encode(make_daily("1678-01-01", "2261-12-30"))  # earlier dates are refused at once
    quick = encode(make_definition())

    def post(body: bytes, route: str = "/v1/reports") -> httpx.Response:
        with httpx.Client(base_url=base, timeout=120, headers=headers) as http:
            return http.post(route, content=body)

    with concurrent.futures.ThreadPoolExecutor(4) as pool:
        # two renders: a check of six centuries of days may end before the requests below
        held = [pool.submit(post, slow), pool.submit(post, slow)]
        time.sleep(3)  # both workers are now busy with them

        started = time.monotonic()
        malformed = post(b"{")
        assert time.monotonic() - started < 3
        assert malformed.status_code == 422
        assert malformed.json()["errors"][0]["code"] == "invalid_json"

        waiting = pool.submit(post, quick)  # the one request that may wait
        time.sleep(1)
        refused = post(quick, "/v1/check")
        assert refused.status_code == 429
        assert int(refused.headers["Retry-After"]) >= 1
        assert "PLUMBLINE_MAX_WAITING_REQUESTS" in refused.json()["detail"]

        for future in held:
            stopped = future.result()
            assert stopped.status_code == 422
            assert stopped.json()["code"] in ("render_timeout", "render_memory")
        assert waiting.result().status_code == 201
