"""The audit trail against a real SQLite file: one record per action in the action's transaction,
a sequence without gaps, and a database that refuses to rewrite or remove a record."""

from __future__ import annotations

import sqlite3
from datetime import UTC
from pathlib import Path

import pytest
from sqlalchemy import delete, text, update
from sqlalchemy.exc import IntegrityError
from test_lifecycle import REASON, World

from service.archive import audit
from service.archive.db import AuditRow, connect
from service.workflow import lifecycle
from service.workflow.lifecycle import Conflict


@pytest.fixture
def w(tmp_path: Path) -> World:
    return World(tmp_path)


def test_append_and_trail(tmp_path: Path) -> None:
    sessions = connect(f"sqlite:///{tmp_path / 'a.db'}")
    with sessions.begin() as session:
        first = audit.append(
            session,
            key_id="key_1",
            name="Ann",
            action="pack.submitted",
            pack_id="pk_1",
            content_hash="ab" * 32,
            detail={"from": "draft", "to": "in_review"},
        )
        second = audit.append(session, key_id="key_2", name="Rui", action="x", pack_id="pk_2")
    assert (first, second) == (1, 2)
    (entry,) = audit.trail(sessions, "pk_1")
    assert (entry.seq, entry.key_id, entry.name, entry.action) == (
        1,
        "key_1",
        "Ann",
        "pack.submitted",
    )
    assert (entry.pack_id, entry.content_hash) == ("pk_1", "ab" * 32)
    assert entry.detail == {"from": "draft", "to": "in_review"}
    assert entry.at.tzinfo is UTC
    assert audit.trail(sessions, "pk_none") == []
    assert audit.gaps(sessions) == []


def test_every_lifecycle_action_writes_one_record(w: World) -> None:
    earlier = w.pack()
    w.submit(earlier)
    w.sign(earlier)
    pack = w.pack(failed=[("precision", "riders")])
    lifecycle.record_author(sessions=w.sessions, principal=w.ann, pack_id=pack.id)
    w.submit(pack)
    w.send_back(pack)
    w.submit(pack)
    w.waive(pack, "precision", "riders")
    w.sign(pack, w.quinn)
    trail = audit.trail(w.sessions, pack.id)
    assert [(e.action, e.name) for e in trail] == [
        ("pack.author_recorded", "Ann Author"),
        ("pack.submitted", "Ann Author"),
        ("pack.changes_requested", "Rui Reviewer"),
        ("pack.submitted", "Ann Author"),
        ("check.waived", "Rui Reviewer"),
        ("pack.signed_off", "Quinn Approver"),
    ]
    assert {e.content_hash for e in trail} == {pack.pdf_sha256}
    assert trail[2].detail == {"from": "in_review", "to": "draft", "reason": "Label the axis."}
    assert trail[4].detail == {"check": "precision", "chart": "riders", "reason": REASON}
    assert trail[5].key_id == w.quinn.key_id
    assert [e.action for e in audit.trail(w.sessions, earlier.id)] == [
        "pack.submitted",
        "pack.signed_off",
        "pack.superseded",
    ]
    seqs = [e.seq for e in audit.everything(w.sessions)]
    assert seqs == list(range(1, len(seqs) + 1))
    assert audit.gaps(w.sessions) == []


def test_a_refused_action_writes_no_record_and_leaves_no_gap(w: World) -> None:
    pack = w.pack(failed=[("precision", "riders")])
    w.submit(pack)
    with pytest.raises(Conflict):
        w.sign(pack)  # the move happened, then the unwaived check refused it: all rolled back
    w.waive(pack, "precision", "riders")
    assert [e.action for e in audit.trail(w.sessions, pack.id)] == [
        "pack.submitted",
        "check.waived",
    ]
    assert [e.seq for e in audit.everything(w.sessions)] == [1, 2]
    assert audit.gaps(w.sessions) == []


def test_the_database_refuses_to_update_or_delete_a_record(w: World) -> None:
    pack = w.pack()
    w.submit(pack)
    with pytest.raises(IntegrityError, match="append-only"), w.sessions.begin() as session:
        session.execute(update(AuditRow).values(name="Someone else"))
    with pytest.raises(IntegrityError, match="append-only"), w.sessions.begin() as session:
        session.execute(delete(AuditRow))
    with pytest.raises(IntegrityError, match="append-only"), w.sessions.begin() as session:
        session.execute(text("UPDATE audit SET detail = '{}' WHERE seq = 1"))
    (entry,) = audit.trail(w.sessions, pack.id)
    assert entry.name == "Ann Author"


def test_the_triggers_hold_for_any_client_of_the_file(tmp_path: Path) -> None:
    connect(f"sqlite:///{tmp_path / 'a.db'}")
    with sqlite3.connect(tmp_path / "a.db") as raw:
        raw.execute(
            "INSERT INTO audit (seq, at, name, action, detail) VALUES (1, '2026-01-01', 'x', 'y', '{}')"
        )
        with pytest.raises(sqlite3.IntegrityError, match="append-only"):
            raw.execute("UPDATE audit SET action = 'z'")
        with pytest.raises(sqlite3.IntegrityError, match="append-only"):
            raw.execute("DELETE FROM audit")


def test_gaps_finds_a_removed_record(w: World, tmp_path: Path) -> None:
    pack = w.pack()
    w.submit(pack)
    w.send_back(pack)
    w.submit(pack)
    with sqlite3.connect(tmp_path / "a.db") as raw:  # someone with the file drops the trigger
        raw.execute("DROP TRIGGER audit_no_delete")
        raw.execute("DELETE FROM audit WHERE seq = 2")
    assert audit.gaps(w.sessions) == [2]
