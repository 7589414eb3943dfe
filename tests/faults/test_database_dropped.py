"""The archive database's connection dropped in the middle of a transaction (PostgreSQL: the
backend terminated with ``pg_terminate_backend``): the request is answered 503 with a problem that
says so, not a 500; nothing of the transaction is left; the same request sent again succeeds.

A real ``plumbline serve`` on a throwaway PostgreSQL server (``tests/archive/conftest.py``). To
catch the service's transaction while it is open, after it has written, the test holds the audit
trail's advisory lock (``service.archive.audit.LOCK_KEY``) on its own connection: the service's
transaction inserts or updates its rows, then waits for that lock to append its audit record, and
its backend is terminated there."""

from __future__ import annotations

import threading
from collections.abc import Iterator
from pathlib import Path
from typing import Any

import consistency
import httpx
import pytest
import serving
from postgres import fresh_database
from sqlalchemy import Connection, create_engine, text

from service.archive import audit

DEMO = serving.ROOT / "sample_requests" / "bus-cooperative-monthly.json"


@pytest.fixture
def database(postgres_server: Any) -> Iterator[str]:
    with fresh_database(postgres_server, prefix="f") as url:
        yield url


@pytest.fixture
def server(database: str, tmp_path: Path) -> Iterator[tuple[serving.Server, dict[str, str]]]:
    secrets = serving.keys(database)
    env = {"PLUMBLINE_DATABASE_URL": database, "PLUMBLINE_WORKERS": "1"}
    running = serving.Server(tmp_path, env).start()
    yield running, secrets
    running.stop()


def _waiting_backend(watch: Connection, database: str) -> int | None:
    """The backend of ``database`` waiting for a lock (the service's, held up by ours)."""
    row = watch.execute(
        text(
            "SELECT pid, query FROM pg_stat_activity WHERE datname = :db AND "
            "wait_event_type = 'Lock' AND pid <> pg_backend_pid()"
        ),
        {"db": database.rsplit("/", 1)[1]},
    ).first()
    if row is None:
        return None
    assert "pg_advisory_xact_lock" in row.query, row.query  # held up at the audit append
    return int(row.pid)


def _dropped_mid_transaction(database: str, send: Any, *, timeout: float = 180) -> httpx.Response:
    """Send a request while holding the audit lock; terminate the service's backend once it
    waits for the lock; return the answer."""
    engine = create_engine(database, isolation_level="AUTOCOMMIT")
    answers: list[httpx.Response] = []
    try:
        with engine.connect() as hold, engine.connect() as watch:
            hold.execute(text("BEGIN"))
            hold.execute(text("SELECT pg_advisory_xact_lock(:k)"), {"k": audit.LOCK_KEY})
            thread = threading.Thread(target=lambda: answers.append(send()))
            thread.start()
            found: list[int] = []

            def waiting() -> bool:
                pid = _waiting_backend(watch, database)
                if pid is not None:
                    found.append(pid)
                return pid is not None

            serving.wait_for(waiting, timeout, "the service's transaction to wait for the lock")
            terminated = watch.execute(text("SELECT pg_terminate_backend(:p)"), {"p": found[0]})
            assert terminated.scalar() is True
            thread.join(timeout=60)
            hold.execute(text("ROLLBACK"))
    finally:
        engine.dispose()
    assert answers, "the request did not come back"
    return answers[0]


def _is_database_problem(response: httpx.Response) -> None:
    assert response.status_code == 503, response.text
    assert response.headers["content-type"].startswith("application/problem+json")
    problem = response.json()
    assert problem["code"] == "database_unavailable"
    assert "connection to the archive database was lost" in problem["detail"]
    assert "send the request again" in problem["detail"]
    assert "Traceback" not in response.text


def test_a_draft_whose_connection_drops_mid_transaction_is_not_half_written(
    server: tuple[serving.Server, dict[str, str]], database: str
) -> None:
    running, secrets = server
    raw = DEMO.read_bytes()
    with running.client(secrets["author"]) as http:
        answer = _dropped_mid_transaction(database, lambda: http.post("/v1/reports", content=raw))
        _is_database_problem(answer)
        found = consistency.check(database, running.data_dir / "files")
        assert found.packs == {}  # the pack and review rows it had inserted were rolled back
        assert found.unclaimed  # its files were written first and no row claims them

        again = http.post("/v1/reports", content=raw)
        assert again.status_code == 201, again.text
        assert http.get(f"/v1/reports/{again.json()['id']}/audit").json()["entries"][0][
            "action"
        ] == ("pack.created")
    found = consistency.check(database, running.data_dir / "files")
    assert set(found.packs) == {again.json()["id"]}


def test_a_sign_off_whose_connection_drops_mid_transaction_can_be_sent_again(
    server: tuple[serving.Server, dict[str, str]], database: str
) -> None:
    running, secrets = server
    with (
        running.client(secrets["author"]) as author,
        running.client(secrets["approver"]) as approver,
    ):
        created = author.post("/v1/reports", content=DEMO.read_bytes())
        assert created.status_code == 201, created.text
        pack = created.json()
        assert pack["failed"] == [], "the demo must need no waiver for this test"
        assert author.post(f"/v1/reports/{pack['id']}/submit").status_code == 200
        body = {"content_sha256": pack["pdf"]["sha256"]}

        answer = _dropped_mid_transaction(
            database, lambda: approver.post(f"/v1/reports/{pack['id']}/sign-off", json=body)
        )
        _is_database_problem(answer)
        found = consistency.check(database, running.data_dir / "files", approver="Pat Approver")
        assert found.packs[pack["id"]].status == "in_review"  # the move was rolled back
        assert found.signed == set()
        # the sealed file, stored first, is removed again when its sign-off is not recorded
        assert found.unclaimed == set()

        again = approver.post(f"/v1/reports/{pack['id']}/sign-off", json=body)
        assert again.status_code == 200, again.text
        assert again.json()["status"] == "signed_off"
        assert approver.get(f"/v1/reports/{pack['id']}/sealed").status_code == 200
    found = consistency.check(database, running.data_dir / "files", approver="Pat Approver")
    assert found.signed == {pack["id"]}


def test_connections_dropped_while_idle_are_replaced_without_an_error(
    server: tuple[serving.Server, dict[str, str]], database: str
) -> None:
    """A database restart drops every pooled connection: the next requests still succeed."""
    running, secrets = server
    with running.client(secrets["author"]) as http:
        assert http.get("/v1/reports").status_code == 200  # the pool holds a connection now
        engine = create_engine(database, isolation_level="AUTOCOMMIT")
        try:
            with engine.connect() as admin:
                dropped = admin.execute(
                    text(
                        "SELECT count(pg_terminate_backend(pid)) FROM pg_stat_activity "
                        "WHERE datname = :db AND pid <> pg_backend_pid()"
                    ),
                    {"db": database.rsplit("/", 1)[1]},
                ).scalar()
        finally:
            engine.dispose()
        assert (dropped or 0) >= 1
        for _ in range(3):
            listed = http.get("/v1/reports")
            assert listed.status_code == 200, listed.text
        created = http.post("/v1/reports", content=DEMO.read_bytes())
        assert created.status_code == 201, created.text
    consistency.check(database, running.data_dir / "files")
