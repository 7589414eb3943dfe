"""A real, throwaway PostgreSQL server for the tests, and one fresh database per test.

The server is started once per test session (per folder whose conftest takes the fixture) from the
binaries of Debian's ``postgresql`` package (``/usr/lib/postgresql/<version>/bin``), in a temporary
folder, listening on a free loopback port and on a unix socket in that folder, and is stopped at
the end. initdb refuses to run as root, so as root the folder belongs to the ``postgres`` user and
the server runs as that user.

Without the binaries the PostgreSQL cases are skipped with a loud reason, unless
``PLUMBLINE_REQUIRE_POSTGRES=1`` (CI sets it), which turns that into a failure.
"""

from __future__ import annotations

import contextlib
import glob
import os
import pwd
import shutil
import subprocess
import tempfile
import uuid
from collections.abc import Iterator
from dataclasses import dataclass
from pathlib import Path
from typing import NoReturn

import harness
import pytest
from sqlalchemy import create_engine, text

SERVER_USER = "postgres"
SUPERUSER = "plumbline"


@dataclass(frozen=True)
class Server:
    port: int
    socket_dir: Path

    def url(self, database: str = "postgres") -> str:
        return f"postgresql+psycopg://{SUPERUSER}@127.0.0.1:{self.port}/{database}"


def _binaries() -> Path | None:
    found = sorted(
        glob.glob("/usr/lib/postgresql/*/bin/initdb"),
        key=lambda p: int(Path(p).parts[-3]) if Path(p).parts[-3].isdigit() else 0,
    )
    return Path(found[-1]).parent if found else None


def _unavailable(reason: str) -> NoReturn:
    harness.missing(
        "PLUMBLINE_REQUIRE_POSTGRES",
        "PostgreSQL archive tests",
        reason,
        "install Debian's postgresql package (apt-get install postgresql) to run them",
    )


@pytest.fixture(scope="session")
def postgres_server() -> Iterator[Server]:
    bin_dir = _binaries()
    if bin_dir is None:
        _unavailable("no initdb under /usr/lib/postgresql/*/bin")
    assert bin_dir is not None
    as_root = os.geteuid() == 0
    prefix: list[str] = []
    if as_root:
        try:
            owner = pwd.getpwnam(SERVER_USER)
        except KeyError:
            _unavailable(f"running as root and there is no '{SERVER_USER}' user to run the server")
        prefix = ["runuser", "-u", SERVER_USER, "--"]
    # Not pytest's tmp_path: its parent folder is private to the user running the tests.
    root = Path(tempfile.mkdtemp(prefix="plumbline-pg-"))
    data, sockets, log = root / "data", root / "sockets", root / "server.log"
    sockets.mkdir()
    if as_root:
        for path in (root, sockets):
            os.chown(path, owner.pw_uid, owner.pw_gid)

    def run(*args: str) -> None:
        done = subprocess.run([*prefix, *args], capture_output=True, text=True, check=False)
        if done.returncode != 0:
            logged = log.read_text() if log.exists() else ""
            pytest.fail(f"{' '.join(args)} failed:\n{done.stdout}{done.stderr}{logged}")

    run(
        str(bin_dir / "initdb"),
        f"--pgdata={data}",
        f"--username={SUPERUSER}",
        "--auth=trust",
        "--encoding=UTF8",
        "--no-locale",
        "--no-sync",
    )
    port = harness.free_port()
    options = " ".join(
        [
            "-c listen_addresses=127.0.0.1",
            f"-c port={port}",
            f"-c unix_socket_directories={sockets}",
            "-c fsync=off",  # a throwaway server: durability is not under test
            "-c max_connections=100",
        ]
    )
    run(str(bin_dir / "pg_ctl"), f"--pgdata={data}", f"--log={log}", "-o", options, "-w", "start")
    try:
        yield Server(port=port, socket_dir=sockets)
    finally:
        run(str(bin_dir / "pg_ctl"), f"--pgdata={data}", "-m", "fast", "-w", "stop")
        shutil.rmtree(root, ignore_errors=True)


@contextlib.contextmanager
def fresh_database(server: Server, prefix: str = "t") -> Iterator[str]:
    """The URL of a new, empty database on ``server``, dropped afterwards."""
    name = f"{prefix}_{uuid.uuid4().hex[:16]}"
    admin = create_engine(server.url(), isolation_level="AUTOCOMMIT")
    try:
        with admin.connect() as connection:
            connection.execute(text(f'CREATE DATABASE "{name}"'))
        yield server.url(name)
        with admin.connect() as connection:
            connection.execute(text(f'DROP DATABASE "{name}" WITH (FORCE)'))
    finally:
        admin.dispose()
