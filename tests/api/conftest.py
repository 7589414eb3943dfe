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
from factories import Clients

from service.archive.db import connect, engine_of
from service.workflow.keys import Role, create


def _free_port() -> int:
    with socket.socket() as sock:
        sock.bind(("127.0.0.1", 0))
        return int(sock.getsockname()[1])


PEOPLE: dict[str, tuple[str, set[Role], set[str]]] = {
    "author": ("Ann Author", {Role.author}, {"*"}),
    "author2": ("Aiden Author", {Role.author}, {"hollin-vale"}),
    "reviewer": ("Rui Reviewer", {Role.reviewer}, {"hollin-vale", "test"}),
    "approver": ("Pat Approver", {Role.approver}, {"hollin-vale", "test"}),
    "approver2": ("Quinn Approver", {Role.approver}, {"hollin-vale", "test"}),
    "auditor": ("Ada Auditor", {Role.auditor}, {"*"}),
    "stranger": ("Mo Elsewhere", {Role.author, Role.reviewer, Role.approver}, {"marsh-end"}),
    "everything": ("Sam Both", {Role.author, Role.reviewer, Role.approver}, {"*"}),
}
"""One key per person, made in the server's own archive before it starts (invented people)."""


@pytest.fixture(scope="session")
def server(tmp_path_factory: pytest.TempPathFactory) -> Iterator[dict[str, object]]:
    data_dir = tmp_path_factory.mktemp("server-data")
    sessions = connect(f"sqlite:///{data_dir / 'plumbline.db'}")
    secrets = {
        who: create(sessions, name=name, roles=roles, families=families, expires=None)[1]
        for who, (name, roles, families) in PEOPLE.items()
    }
    engine_of(sessions).dispose()
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
    yield {"base": base, "data_dir": Path(data_dir), "keys": secrets}
    process.terminate()
    process.wait(timeout=20)
    log.close()


@pytest.fixture
def people(server: dict[str, object]) -> Iterator[Clients]:
    """``people("reviewer")``: a client sending that person's key (closed after the test)."""
    opened: list[httpx.Client] = []
    secrets = server["keys"]
    assert isinstance(secrets, dict)

    def open_(who: str) -> httpx.Client:
        http = httpx.Client(
            base_url=str(server["base"]),
            timeout=120,
            headers={"Authorization": f"Bearer {secrets[who]}"},
        )
        opened.append(http)
        return http

    yield open_
    for http in opened:
        http.close()


@pytest.fixture
def client(people: Clients) -> httpx.Client:
    """A client with the author's key (every report family)."""
    return people("author")


@pytest.fixture
def anonymous(server: dict[str, object]) -> Iterator[httpx.Client]:
    with httpx.Client(base_url=str(server["base"]), timeout=60) as http:
        yield http
