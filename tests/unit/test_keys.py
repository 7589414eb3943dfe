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
        person_id=keys.person_of(sessions, key_id),
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


# --- persons: separation of duties compares people, and names that read alike are refused ---------


def test_each_key_belongs_to_a_new_person_unless_made_for_one(sessions: sessionmaker[Any]) -> None:
    ann_key, ann_secret = _key(sessions)
    rui_key, _ = _key(sessions, name="Rui Reviewer")
    ann = keys.person_of(sessions, ann_key)
    assert ann.startswith("person_")
    assert ann != keys.person_of(sessions, rui_key)
    second, second_secret = _key(sessions, roles={Role.approver}, person=ann)
    assert keys.person_of(sessions, second) == ann
    assert authenticate(sessions, second_secret).person == authenticate(sessions, ann_secret).person
    with pytest.raises(NotFound, match="no person 'person_nobody'"):
        _key(sessions, name="Ann's laptop", person="person_nobody")


@pytest.mark.parametrize(
    ("name", "why"),
    [
        ("\u0410lice Author", "mixes scripts (Cyrillic, Latin)"),  # Cyrillic capital A
        ("Alice\u200b Author", "U+200B ZERO WIDTH SPACE"),
        ("Alice Author\u2066", "U+2066 LEFT-TO-RIGHT ISOLATE"),
        ("Alice\ufe0f Author", "U+FE0F VARIATION SELECTOR-16"),
        ("alice author", "reads like 'Alice Author'"),
        ("A\u200clice Author", "U+200C ZERO WIDTH NON-JOINER"),
        ("\u0391lice Author", "mixes scripts (Greek, Latin)"),
    ],
)
def test_a_name_that_reads_like_another_persons_is_refused(
    sessions: sessionmaker[Any], name: str, why: str
) -> None:
    """The issue's approver keys "Аlice Author" and "Alice\\u200b Author" are never made."""
    _key(sessions, name="Alice Author")
    with pytest.raises(InvalidRequest) as refused:
        _key(sessions, name=name, roles={Role.approver})
    assert why in refused.value.message


def test_a_confusable_name_in_one_script_is_refused_by_its_skeleton(
    sessions: sessionmaker[Any],
) -> None:
    alice, _ = _key(sessions, name="Asa Coe")
    person = keys.person_of(sessions, alice)
    look_alike = "\u0410\u0455\u0430 \u0421\u043e\u0435"  # every letter Cyrillic: "Аѕа Сое"
    with pytest.raises(InvalidRequest) as refused:
        _key(sessions, name=look_alike, roles={Role.approver})
    assert refused.value.message == (
        f"the name '{look_alike}' reads like 'Asa Coe', the name of person '{person}', who holds "
        "a key already: a different person needs a name that cannot be taken for theirs; to give "
        f"that person another key, make it for them (--person {person})"
    )
    with pytest.raises(InvalidRequest, match="reads like 'Asa Coe'"):
        _key(sessions, name="Asa  Coe")  # the same name, spaced
    with pytest.raises(InvalidRequest, match="reads like 'Asa Coe'"):
        _key(sessions, name="\uff21\uff53\uff41 Coe")  # full-width letters: NFKC makes them plain
    _key(sessions, name="Asa Coe (laptop)", person=person)
    with pytest.raises(InvalidRequest, match=r"reads like 'Asa Coe \(laptop\)'"):
        _key(sessions, name="Asa Coe (1aptop)")  # a key's own name counts too


def test_names_are_stored_in_nfkc_with_single_spaces(sessions: sessionmaker[Any]) -> None:
    _, secret = _key(sessions, name="  \uff22\uff4f  Builder\u00a0Jr. ")
    assert authenticate(sessions, secret).name == "Bo Builder Jr."
    _, secret = _key(sessions, name="\u5c71\u7530 \u3072\u308d\u3057")  # Han with Hiragana
    assert authenticate(sessions, secret).name == "\u5c71\u7530 \u3072\u308d\u3057"


def test_a_second_walkthrough_in_one_archive_gives_the_same_invented_person_a_new_key(
    sessions: sessionmaker[Any],
) -> None:
    """``plumbline walkthrough`` (``make demo``) makes its keys in the configured archive on every
    run; a second "Demo Author" would be refused as another person of the same name."""
    from service.workflow import walkthrough

    first = walkthrough._key(sessions, "Demo Author", Role.author, "test-pack")
    second = walkthrough._key(sessions, "Demo Author", Role.author, "test-pack")
    assert first.key_id != second.key_id
    assert first.person == second.person == keys.person_named(sessions, "Demo  Author")
    assert keys.person_named(sessions, "Demo Reviewer") is None
