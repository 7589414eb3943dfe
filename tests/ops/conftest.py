"""One real ``plumbline serve`` per test that asks (``start_server``), stopped after it."""

from __future__ import annotations

import os
from collections.abc import Iterator
from pathlib import Path

import harness
import pytest
from ops_server import Server, Start

from service.archive.db import connect, engine_of
from service.workflow.keys import Role, create


@pytest.fixture
def start_server(tmp_path: Path) -> Iterator[Start]:
    """``start_server(PLUMBLINE_X="…")``: a running server with those settings."""
    started: list[Server] = []

    def start(database_url: str | None = None, **env: str) -> Server:
        data_dir = tmp_path / f"server-{len(started)}"
        data_dir.mkdir()
        url = database_url or f"sqlite:///{data_dir / 'plumbline.db'}"
        sessions = connect(url)
        _, secret = create(
            sessions, name="Ann Author", roles={Role.author}, families={"*"}, expires=None
        )
        engine_of(sessions).dispose()
        port = harness.free_port()
        log = data_dir / "server.log"
        environment = {
            **os.environ,
            "PLUMBLINE_DATA_DIR": str(data_dir),
            "PLUMBLINE_DATABASE_URL": url,
            "PLUMBLINE_WORKERS": "1",
            **env,
        }
        process = harness.serve(port, log=log, env=environment)
        server = Server(process, f"http://127.0.0.1:{port}", port, data_dir, log, secret)
        started.append(server)
        return server

    yield start
    for server in started:
        if server.process.poll() is None:
            server.process.kill()
            server.process.wait(timeout=30)
