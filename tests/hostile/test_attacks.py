"""The outside attacker's round, re-run by ``attacks.py`` against a real ``plumbline serve``: no
answer is 5xx and no connection is reset (the round once found 29 inputs that answered 500)."""

from __future__ import annotations

import os
import sys
from collections.abc import Iterator
from pathlib import Path

import attacks
import harness
import pytest

from service.archive.db import connect, engine_of
from service.workflow.keys import Role, create


@pytest.fixture(scope="module")
def service(tmp_path_factory: pytest.TempPathFactory) -> Iterator[tuple[str, str]]:
    data_dir = tmp_path_factory.mktemp("attacked")
    sessions = connect(f"sqlite:///{data_dir / 'plumbline.db'}")
    _, secret = create(
        sessions, name="Ann Author", roles={Role.author}, families={"*"}, expires=None
    )
    engine_of(sessions).dispose()
    port = harness.free_port()
    env = {
        **os.environ,
        "PLUMBLINE_DATA_DIR": str(data_dir),
        "PLUMBLINE_WORKERS": "2",
        "PLUMBLINE_RENDER_TIMEOUT_S": "30",  # six centuries of days are stopped, not waited for
    }
    process = harness.serve(port, log=Path(data_dir) / "server.log", env=env, timeout=90)
    yield f"http://{harness.LOOPBACK}:{port}", secret
    harness.stop(process, timeout=30)


def test_the_attacks_get_no_5xx_and_no_reset(service: tuple[str, str]) -> None:
    base, secret = service
    outcomes = attacks.run(base, secret)
    report = attacks.summary(outcomes)
    sys.stdout.write(f"{report}\n")  # the counts, for the record (pytest -s)
    assert len(outcomes) > 400
    assert [o for o in outcomes if o.failed] == [], report
    refused = {o.attack.name: o.status for o in outcomes}
    oversized = ["a 200 kB Authorization header", "a 2 MB Authorization header"]
    oversized += ["200 headers of 1 kB", "a 100 kB path", "a 100 kB query"]
    assert {name: refused[name] for name in oversized} == dict.fromkeys(oversized, 431)
    assert refused["ten thousand years of days (772 bytes) → check"] == 422
    assert refused["lone surrogate in chart title → reports"] == 422
