"""A real Plumbline server on a loopback port, with its own SQLite file and file store."""

from __future__ import annotations

import os
from collections.abc import Iterator
from pathlib import Path

import harness
import httpx
import pytest
from factories import Clients

from service.archive.db import connect, engine_of
from service.workflow.keys import Role, create

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
    port = harness.free_port()
    env = {
        **os.environ,
        "PLUMBLINE_DATA_DIR": str(data_dir),
        "PLUMBLINE_WORKERS": "2",
        "PLUMBLINE_LIMITS__MAX_PAYLOAD_BYTES": "2000000",
    }
    process = harness.serve(port, log=data_dir / "server.log", env=env, timeout=30)
    yield {"base": f"http://127.0.0.1:{port}", "data_dir": Path(data_dir), "keys": secrets}
    harness.stop(process, timeout=20)


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
