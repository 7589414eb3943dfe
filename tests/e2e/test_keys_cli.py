"""`plumbline keys create|revoke`: the secret is printed once and stored only as a hash."""

from __future__ import annotations

import os
import sqlite3
import subprocess
import sys
from pathlib import Path

ROOT = Path(__file__).parents[2]


def _cli(*args: str, data_dir: Path) -> subprocess.CompletedProcess[str]:
    env = {**os.environ, "PLUMBLINE_DATA_DIR": str(data_dir)}
    return subprocess.run(
        [sys.executable, "-m", "service.cli", *args],
        capture_output=True,
        text=True,
        check=False,
        cwd=ROOT,
        env=env,
        timeout=60,
    )


def test_create_prints_the_secret_once_and_stores_only_its_hash(tmp_path: Path) -> None:
    made = _cli(
        "keys",
        "create",
        "--name",
        "R. Reviewer",
        "--role",
        "reviewer",
        "--family",
        "hollin-vale",
        data_dir=tmp_path,
    )
    assert made.returncode == 0, made.stderr
    key_line, secret_line, person_line = made.stdout.splitlines()
    assert person_line.startswith("person person_")
    key_id = key_line.removeprefix("key ")
    secret = secret_line.rsplit(" ", 1)[-1]
    assert secret.startswith(key_id)
    database = (tmp_path / "plumbline.db").read_bytes()
    assert secret.split(".", 1)[1].encode() not in database  # only a hash is kept
    with sqlite3.connect(tmp_path / "plumbline.db") as db:
        assert db.execute("SELECT count(*) FROM keys").fetchone() == (1,)
    revoked = _cli("keys", "revoke", key_id, data_dir=tmp_path)
    assert revoked.stdout.strip() == f"revoked {key_id}"
    again = _cli("keys", "revoke", key_id, data_dir=tmp_path)
    assert "already revoked" in again.stdout


def test_an_unknown_role_or_a_zoneless_expiry_is_refused(tmp_path: Path) -> None:
    bad_role = _cli(
        "keys", "create", "--name", "X", "--role", "boss", "--family", "*", data_dir=tmp_path
    )
    assert bad_role.returncode == 2
    assert "invalid choice" in bad_role.stderr
    no_zone = _cli(
        "keys",
        "create",
        "--name",
        "X",
        "--role",
        "author",
        "--family",
        "*",
        "--expires",
        "2027-01-31T00:00:00",
        data_dir=tmp_path,
    )
    assert no_zone.returncode == 2
    assert "give a time zone" in no_zone.stderr


def test_a_name_that_reads_like_another_persons_is_refused_and_a_person_gets_a_second_key(
    tmp_path: Path,
) -> None:
    def create(name: str, *more: str) -> subprocess.CompletedProcess[str]:
        return _cli("keys", "create", "--name", name, "--family", "*", *more, data_dir=tmp_path)

    first = create("Alice Author", "--role", "author")
    assert first.returncode == 0, first.stderr
    person = first.stdout.splitlines()[2].split()[1]
    look_alike = create("\u0410\u0406\u0456\u0441\u0435 Author", "--role", "approver")
    assert look_alike.returncode == 2
    assert "mixes scripts (Cyrillic, Latin)" in look_alike.stderr
    hidden = create("Alice\u200b Author", "--role", "approver")
    assert hidden.returncode == 2
    assert "U+200B ZERO WIDTH SPACE" in hidden.stderr
    same = create("alice author", "--role", "approver")
    assert same.returncode == 2
    assert f"reads like 'Alice Author', the name of person '{person}'" in same.stderr
    assert f"--person {person}" in same.stderr
    second = create("Alice Author", "--role", "approver", "--person", person)
    assert second.returncode == 0, second.stderr
    assert second.stdout.splitlines()[2].split()[1] == person
    with sqlite3.connect(tmp_path / "plumbline.db") as db:
        assert db.execute("SELECT count(*) FROM persons").fetchone() == (1,)
