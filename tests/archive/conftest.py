"""The archive tests run on both backends: a new SQLite file, or a new database on a throwaway
PostgreSQL server (``tests/postgres.py``; ``PLUMBLINE_REQUIRE_POSTGRES=1`` makes a missing one a
failure)."""

from __future__ import annotations

from collections.abc import Iterator
from pathlib import Path

import pytest
from postgres import Server, fresh_database, postgres_server

BACKENDS = ["sqlite", pytest.param("postgresql", marks=pytest.mark.slow)]
"""The PostgreSQL cases are ``slow``: they need the throwaway server."""

__all__ = ["BACKENDS", "Server", "postgres_server"]


@pytest.fixture(params=BACKENDS)
def database_url(request: pytest.FixtureRequest, tmp_path: Path) -> Iterator[str]:
    """The URL of an empty database: a new SQLite file, or a new database on the test server."""
    if request.param == "sqlite":
        yield f"sqlite:///{tmp_path / 'archive.db'}"
        return
    server: Server = request.getfixturevalue("postgres_server")
    with fresh_database(server) as url:
        yield url
