"""Session cookies and CSRF tokens: signed, bound to one session, refused when altered or expired;
the secret made once per data folder, readable by the owner only, the same for racing processes."""

from __future__ import annotations

import json
import multiprocessing
import stat
from pathlib import Path

import pytest
from pydantic import SecretStr, ValidationError

from service.config import Settings
from service.web import session as cookies


def test_a_cookie_round_trips_and_any_change_is_refused() -> None:
    secret = b"s" * 32
    made = cookies.Session.signed_in(now=1_000)
    value = cookies.encode(made, secret)
    assert cookies.decode(value, secret, now=1_001) == made
    body, _, signature = value.partition(".")
    assert cookies.decode(value, b"t" * 32, now=1_001) is None  # another secret
    assert cookies.decode(f"{body}.{signature[:-2]}AA", secret, now=1_001) is None
    # A payload naming another key, signed with a guessed signature, is refused.
    forged = cookies._b64(json.dumps({"sid": made.sid, "key": "key_x", "exp": 9**9}).encode())
    assert cookies.decode(f"{forged}.{signature}", secret, now=1_001) is None
    assert cookies.decode("", secret) is None
    assert cookies.decode("x" * 2000, secret) is None


def test_a_cookie_expires() -> None:
    secret = b"s" * 32
    made = cookies.Session.signed_in(now=1_000)
    assert made.expires == 1_000 + cookies.SIGNED_IN_SECONDS
    value = cookies.encode(made, secret)
    assert cookies.decode(value, secret, now=made.expires - 1) == made
    assert cookies.decode(value, secret, now=made.expires) is None


def test_signing_in_issues_a_new_session_id() -> None:
    before = cookies.Session.anonymous()
    after = cookies.Session.signed_in()
    assert before.sid != after.sid
    assert before.digest != after.digest
    # the cookie names no key: who is signed in is the archive's record of the session
    assert set(json.loads(cookies._unb64(cookies.encode(after, b"s" * 32).split(".")[0]))) == {
        "sid",
        "exp",
    }


def test_the_csrf_token_is_bound_to_the_session() -> None:
    secret = b"s" * 32
    one, two = cookies.Session.anonymous(), cookies.Session.anonymous()
    token = cookies.csrf_token(one, secret)
    assert cookies.csrf_ok(one, secret, token)
    assert not cookies.csrf_ok(two, secret, token)
    assert not cookies.csrf_ok(one, b"t" * 32, token)
    assert not cookies.csrf_ok(one, secret, None)
    assert not cookies.csrf_ok(one, secret, "")


def test_the_secret_file_is_made_once_with_mode_0600(tmp_path: Path) -> None:
    settings = Settings(data_dir=tmp_path / "data")
    first = cookies.secret_of(settings)
    path = tmp_path / "data" / cookies.SECRET_FILE
    assert stat.S_IMODE(path.stat().st_mode) == 0o600
    assert len(first) == 32
    assert cookies.secret_of(settings) == first
    assert [p.name for p in path.parent.iterdir()] == [cookies.SECRET_FILE]  # no temporary left


def _race(
    folder: str, start: multiprocessing.synchronize.Event, out: multiprocessing.Queue
) -> None:  # type: ignore[type-arg]
    start.wait()
    out.put(cookies.secret_of(Settings(data_dir=Path(folder))).hex())


def test_processes_racing_to_make_the_secret_agree(tmp_path: Path) -> None:
    context = multiprocessing.get_context("spawn")
    start, out = context.Event(), context.Queue()
    workers = [context.Process(target=_race, args=(str(tmp_path), start, out)) for _ in range(4)]
    for worker in workers:
        worker.start()
    start.set()
    seen = {out.get(timeout=60) for _ in workers}
    for worker in workers:
        worker.join(timeout=60)
    assert len(seen) == 1
    assert seen == {(tmp_path / cookies.SECRET_FILE).read_text().strip()}


def test_a_configured_secret_is_used_and_a_short_one_refused(tmp_path: Path) -> None:
    given = "a-long-random-session-secret-of-40-chars!"
    settings = Settings(data_dir=tmp_path, session_secret=SecretStr(given))
    assert cookies.secret_of(settings) == given.encode()
    assert not (tmp_path / cookies.SECRET_FILE).exists()
    with pytest.raises(ValidationError, match="at least 32 characters"):
        Settings(data_dir=tmp_path, session_secret=SecretStr("short"))  # refused at start-up


def test_a_damaged_secret_file_is_reported(tmp_path: Path) -> None:
    (tmp_path / cookies.SECRET_FILE).write_text("not hex")
    with pytest.raises(cookies.SessionSecretProblem, match="64 hexadecimal"):
        cookies.secret_of(Settings(data_dir=tmp_path))
