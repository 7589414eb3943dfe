"""An in-process Plumbline app for the fuzz tests: its own data folder, SQLite file and keys.

The app is the real one (``create_app``) with its real render workers; requests reach it over
ASGI, so no port is needed. Keys are made in its archive before it starts, as an operator would
with ``plumbline keys create``.
"""

from __future__ import annotations

from collections.abc import Iterator
from pathlib import Path

import httpx
import pytest
from anyio.from_thread import start_blocking_portal
from fastapi import FastAPI
from fuzz_kit import REQUEST_TIMEOUT_S, Api

from service.app import create_app
from service.archive.db import connect, engine_of
from service.config import Settings
from service.workflow.keys import Role, create


@pytest.fixture(scope="session")
def app_settings(tmp_path_factory: pytest.TempPathFactory) -> Settings:
    data_dir = Path(tmp_path_factory.mktemp("fuzz-data"))
    return Settings(
        data_dir=data_dir,
        workers=2,
        chart_cache=False,
        render_timeout_s=REQUEST_TIMEOUT_S - 15,
    )


@pytest.fixture(scope="session")
def fuzz_keys(app_settings: Settings) -> dict[str, str]:
    """Secrets of a key with every role, and of an approver who is no author (invented people)."""
    app_settings.data_dir.mkdir(parents=True, exist_ok=True)
    sessions = connect(app_settings.database_url)
    made = {
        "everything": create(
            sessions,
            name="Ola Everything",
            roles={Role.author, Role.reviewer, Role.approver, Role.auditor},
            families={"*"},
            expires=None,
        )[1],
        "approver": create(
            sessions, name="Pim Approver", roles={Role.approver}, families={"*"}, expires=None
        )[1],
    }
    engine_of(sessions).dispose()
    return made


@pytest.fixture(scope="session")
def fuzz_app(app_settings: Settings, fuzz_keys: dict[str, str]) -> FastAPI:
    """The app, not started: each test module runs its lifespan (workers, archive) itself."""
    return create_app(app_settings)


@pytest.fixture(scope="module")
def api(fuzz_app: FastAPI, fuzz_keys: dict[str, str]) -> Iterator[Api]:
    """The app with its lifespan running (workers started), for this module's tests."""
    with start_blocking_portal() as portal:
        lifespan = fuzz_app.router.lifespan_context(fuzz_app)
        portal.call(lifespan.__aenter__)
        client = httpx.AsyncClient(
            transport=httpx.ASGITransport(app=fuzz_app), base_url="http://plumbline.test"
        )
        try:
            yield Api(portal, client, fuzz_keys["everything"])
        finally:
            portal.call(client.aclose)
            portal.call(lifespan.__aexit__, None, None, None)
