"""API keys against a real SQLite file: stored only as salted scrypt hashes, refused when unknown,
revoked or expired, and limited to their report families."""

from __future__ import annotations

import hashlib
import sqlite3
from datetime import UTC, datetime, timedelta, timezone
from pathlib import Path
from typing import Any

import pytest
from sqlalchemy.orm import sessionmaker

from service.archive import audit
from service.archive.db import KeyRow, connect
from service.errors import NotFound, PlumblineError
from service.workflow import keys
from service.workflow.keys import (
    Forbidden,
    InvalidRequest,
    Principal,
    Role,
    Unauthorized,
    authenticate,
    can_see,
    create,
    revoke,
)
from service.workflow.lifecycle import Conflict


@pytest.fixture
def db(tmp_path: Path) -> Path:
    return tmp_path / "a.db"


@pytest.fixture
def sessions(db: Path) -> sessionmaker[Any]:
    return connect(f"sqlite:///{db}")


def _key(sessions: sessionmaker[Any], **kw: Any) -> tuple[str, str]:
    args: dict[str, Any] = {
        "name": "Ann Author",
        "roles": {Role.author},
        "families": {"hollin-vale"},
        "expires": None,
    }
    return create(sessions, **(args | kw))


def test_create_returns_the_secret_once_and_authenticates(sessions: sessionmaker[Any]) -> None:
    key_id, secret = _key(sessions, roles={Role.author, Role.reviewer})
    assert secret.startswith(f"{key_id}.")
    assert len(secret.partition(".")[2]) == 43  # 32 random bytes, URL-safe base64
    assert authenticate(sessions, secret) == Principal(
        key_id=key_id,
        name="Ann Author",
        roles=frozenset({Role.author, Role.reviewer}),
        families=frozenset({"hollin-vale"}),
    )


def test_create_prints_nothing(
    sessions: sessionmaker[Any], capsys: pytest.CaptureFixture[str]
) -> None:
    _key(sessions)
    assert capsys.readouterr() == ("", "")


def test_only_a_salted_scrypt_hash_is_stored(sessions: sessionmaker[Any], db: Path) -> None:
    first_id, first = _key(sessions)
    _, second = _key(sessions, name="Rui Reviewer")
    with sqlite3.connect(db) as raw:
        rows = raw.execute("SELECT * FROM keys").fetchall()
        trail = raw.execute("SELECT * FROM audit").fetchall()
    text = repr(rows) + repr(trail)
    for secret in (first, second):
        assert secret not in text
        assert secret.partition(".")[2] not in text
    files = [p for p in db.parent.iterdir() if p.name.startswith("a.db")]  # a.db, -wal, -shm
    for path in files:
        blob = path.read_bytes()
        assert first.encode() not in blob
        assert second.encode() not in blob
    with sessions() as session:
        row = session.get(KeyRow, first_id)
        other = next(r for r in session.query(KeyRow) if r.id != first_id)
    assert row is not None
    assert row.kdf == "scrypt-n16384-r8-p1"
    expected = hashlib.scrypt(
        first.encode(), salt=bytes.fromhex(row.salt), n=2**14, r=8, p=1, dklen=32
    )
    assert row.secret_hash == expected.hex()
    assert row.salt != other.salt  # a salt per key


@pytest.mark.parametrize("tamper", ["wrong", "unknown", "empty", "no-dot"])
def test_an_unknown_or_wrong_secret_is_refused(sessions: sessionmaker[Any], tamper: str) -> None:
    key_id, secret = _key(sessions)
    given = {
        "wrong": secret[:-2] + ("AA" if not secret.endswith("AA") else "BB"),
        "unknown": "key_0000000000000000." + secret.partition(".")[2],
        "empty": "",
        "no-dot": key_id,
    }[tamper]
    with pytest.raises(Unauthorized, match="not valid") as caught:
        authenticate(sessions, given)
    assert caught.value.status == 401


def test_a_revoked_key_is_refused(sessions: sessionmaker[Any]) -> None:
    key_id, secret = _key(sessions)
    assert revoke(sessions, key_id=key_id) is True
    with pytest.raises(Unauthorized, match="revoked"):
        authenticate(sessions, secret)
    assert revoke(sessions, key_id=key_id) is False  # already revoked: nothing changes
    with pytest.raises(NotFound):
        revoke(sessions, key_id="key_missing")


def test_only_an_admin_revokes_or_creates(sessions: sessionmaker[Any]) -> None:
    _, admin_secret = _key(sessions, name="Ada Admin", roles={Role.admin}, families={"*"})
    _, author_secret = _key(sessions)
    admin = authenticate(sessions, admin_secret)
    author = authenticate(sessions, author_secret)
    with pytest.raises(Forbidden, match="admin") as caught:
        _key(sessions, by=author)
    assert caught.value.status == 403
    key_id, secret = _key(sessions, name="Rui Reviewer", by=admin)
    with pytest.raises(Forbidden):
        revoke(sessions, key_id=key_id, by=author)
    assert revoke(sessions, key_id=key_id, by=admin)
    with pytest.raises(Unauthorized):
        authenticate(sessions, secret)
    actions = [(e.action, e.key_id) for e in audit.everything(sessions)]
    assert ("key.created", admin.key_id) in actions
    assert ("key.revoked", admin.key_id) in actions
    assert ("key.created", None) in actions  # from the command line


def test_an_expired_key_is_refused(sessions: sessionmaker[Any]) -> None:
    issued = datetime.now(UTC)
    plus_two = timezone(timedelta(hours=2))
    expires = (issued + timedelta(hours=1)).astimezone(plus_two)  # any zone: stored as UTC
    key_id, secret = _key(sessions, expires=expires)
    assert authenticate(sessions, secret, at=issued).key_id == key_id
    assert authenticate(sessions, secret, at=expires - timedelta(seconds=1)).key_id == key_id
    with pytest.raises(Unauthorized, match="expired"):
        authenticate(sessions, secret, at=expires)
    with pytest.raises(Unauthorized, match="expired"):
        authenticate(sessions, secret, at=issued + timedelta(days=1))


def test_a_key_cannot_be_made_already_expired_unless_allowed(sessions: sessionmaker[Any]) -> None:
    with pytest.raises(InvalidRequest, match="has passed"):
        _key(sessions, expires=datetime.now(UTC) - timedelta(seconds=1))


def test_an_already_expired_key_is_refused_on_the_real_clock(sessions: sessionmaker[Any]) -> None:
    past = datetime.now(UTC) - timedelta(seconds=1)
    _, secret = _key(sessions, expires=past, allow_expired=True)
    with pytest.raises(Unauthorized, match="expired"):
        authenticate(sessions, secret)


@pytest.mark.parametrize(
    ("change", "message"),
    [
        ({"name": "  "}, "name"),
        ({"roles": set()}, "roles"),
        ({"roles": {"author"}}, "roles"),
        ({"families": set()}, "families"),
        ({"families": {"Hollin Vale"}}, "families"),
        ({"expires": datetime(2030, 1, 1)}, "time zone"),  # naive: the case under test
    ],
)
def test_create_refuses_bad_input(
    sessions: sessionmaker[Any], change: dict[str, Any], message: str
) -> None:
    with pytest.raises(InvalidRequest, match=message) as caught:
        _key(sessions, **change)
    assert caught.value.status == 422


def _principal(*families: str) -> Principal:
    return Principal("key_x", "X", frozenset({Role.reviewer}), frozenset(families))


@pytest.mark.parametrize(
    ("families", "report_id", "visible"),
    [
        (("hollin-vale",), "hollin-vale", True),
        (("hollin-vale",), "hollin-vale-ops-monthly", True),
        (("hollin-vale",), "hollin-vale_board", True),
        (("hollin-vale",), "hollin-valley-ops", False),  # a prefix only on a word boundary
        (("hollin-vale",), "hollin", False),
        (("hollin-vale",), "marsh-end-ops-monthly", False),  # another family's report
        (("marsh-end", "hollin-vale"), "marsh-end-ops", True),
        (("*",), "anything-at-all", True),
        ((), "hollin-vale", False),
    ],
)
def test_can_see_only_granted_families(
    families: tuple[str, ...], report_id: str, visible: bool
) -> None:
    assert can_see(_principal(*families), report_id) is visible


def test_error_classes_are_product_errors() -> None:
    for error, status, code in [
        (keys.Unauthorized, 401, "unauthorized"),
        (keys.Forbidden, 403, "forbidden"),
        (Conflict, 409, "conflict"),
        (keys.InvalidRequest, 422, "invalid_request"),
    ]:
        assert issubclass(error, PlumblineError)
        assert (error.status, error.code) == (status, code)
