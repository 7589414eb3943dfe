"""A real Plumbline server on a loopback port, with its own SQLite file and file store."""

from __future__ import annotations

import os
import socket
import subprocess
import sys
import time
from collections.abc import Iterator
from pathlib import Path

import httpx
import pytest


def _free_port() -> int:
    with socket.socket() as sock:
        sock.bind(("127.0.0.1", 0))
        return int(sock.getsockname()[1])


@pytest.fixture(scope="session")
def server(tmp_path_factory: pytest.TempPathFactory) -> Iterator[dict[str, object]]:
    data_dir = tmp_path_factory.mktemp("server-data")
    port = _free_port()
    env = {
        **os.environ,
        "PLUMBLINE_DATA_DIR": str(data_dir),
        "PLUMBLINE_WORKERS": "2",
        "PLUMBLINE_LIMITS__MAX_PAYLOAD_BYTES": "2000000",
    }
    log = (data_dir / "server.log").open("wb")
    process = subprocess.Popen(
        [sys.executable, "-m", "service.cli", "serve", "--port", str(port)],
        env=env,
        stdout=log,
        stderr=subprocess.STDOUT,
    )
    base = f"http://127.0.0.1:{port}"
    deadline = time.monotonic() + 30
    while True:
        try:
            if httpx.get(f"{base}/v1/health", timeout=1).status_code == 200:
                break
        except httpx.TransportError:
            pass
        if process.poll() is not None or time.monotonic() > deadline:
            process.kill()
            raise RuntimeError((data_dir / "server.log").read_text())
        time.sleep(0.2)
    yield {"base": base, "data_dir": Path(data_dir)}
    process.terminate()
    process.wait(timeout=20)
    log.close()


@pytest.fixture
def client(server: dict[str, object]) -> Iterator[httpx.Client]:
    with httpx.Client(base_url=str(server["base"]), timeout=60) as http:
        yield http
