"""The audit trail is append-only in the database itself, on a real SQLite file and a real
PostgreSQL server: UPDATE and DELETE (and on PostgreSQL, TRUNCATE) are refused for every client,
not only for Plumbline's own sessions."""

from __future__ import annotations

import sqlite3
from collections.abc import Iterator
from typing import Any

import psycopg
import pytest
from sqlalchemy import delete, make_url, text, update
from sqlalchemy.exc import IntegrityError
from sqlalchemy.orm import sessionmaker

from service.archive import audit
from service.archive.db import AuditRow, connect, engine_of


@pytest.fixture
def sessions(database_url: str) -> Iterator[sessionmaker[Any]]:
    made = connect(database_url)
    with made.begin() as session:
        audit.append(session, key_id="key_1", name="Ann Author", action="pack.submitted")
        audit.append(session, key_id="key_2", name="Rui Reviewer", action="check.waived")
    yield made
    engine_of(made).dispose()


def names(sessions: sessionmaker[Any]) -> list[str]:
    return [entry.name for entry in audit.everything(sessions)]


def test_update_and_delete_are_refused(sessions: sessionmaker[Any]) -> None:
    attempts = [
        update(AuditRow).values(name="Someone else"),
        update(AuditRow).where(AuditRow.seq == 2).values(action="check.confirmed"),
        delete(AuditRow),
        delete(AuditRow).where(AuditRow.seq == 2),
        text("UPDATE audit SET detail = '{}' WHERE seq = 1"),
    ]
    for statement in attempts:
        with pytest.raises(IntegrityError, match="append-only"), sessions.begin() as session:
            session.execute(statement)
    assert names(sessions) == ["Ann Author", "Rui Reviewer"]
    assert audit.gaps(sessions) == []


def test_appending_still_works_after_a_refusal(sessions: sessionmaker[Any]) -> None:
    with pytest.raises(IntegrityError), sessions.begin() as session:
        session.execute(delete(AuditRow))
    with sessions.begin() as session:
        seq = audit.append(session, key_id=None, name="command line", action="key.revoked")
    assert seq == 3
    assert names(sessions) == ["Ann Author", "Rui Reviewer", "command line"]


def test_any_client_of_the_database_is_refused(database_url: str, sessions: Any) -> None:
    """Not the ORM's doing: the database's own trigger refuses a plain driver connection."""
    url = make_url(database_url)
    if url.get_backend_name() == "sqlite":
        with sqlite3.connect(str(url.database)) as raw:
            for statement in ("UPDATE audit SET name = 'x'", "DELETE FROM audit"):
                with pytest.raises(sqlite3.IntegrityError, match="append-only"):
                    raw.execute(statement)
        return
    conninfo = url.set(drivername="postgresql").render_as_string(hide_password=False)
    with psycopg.connect(conninfo, autocommit=True) as raw:
        for verb, statement in [
            ("UPDATE", "UPDATE audit SET name = 'x'"),
            ("DELETE", "DELETE FROM audit WHERE seq = 1"),
            ("TRUNCATE", "TRUNCATE audit"),
            ("DELETE", "DELETE FROM audit WHERE false"),  # refused even when nothing matches
        ]:
            with pytest.raises(psycopg.errors.RestrictViolation) as caught:
                raw.execute(statement)
            assert str(caught.value).startswith(f"the audit trail is append-only: {verb}")
            assert caught.value.diag.message_hint == "correct a record by appending a new one"
    assert names(sessions) == ["Ann Author", "Rui Reviewer"]
