"""``GET /v1/ready``: whether the service can do its work (database, store, and build queue)."""

from __future__ import annotations

import asyncio
from collections.abc import Callable
from pathlib import Path

from fastapi import APIRouter
from fastapi.responses import JSONResponse
from sqlalchemy import text
from starlette.concurrency import run_in_threadpool

from service.api import errors
from service.api.deps import ServicesDep
from service.archive import db
from service.runner.services import Services

PROBE = b"plumbline readiness probe\n"
"""Written to and read back from the store by ``GET /v1/ready`` (content-addressed: one file)."""

PROBE_TIMEOUT_S = 5.0

router = APIRouter(prefix="/v1", tags=["service"])


class _NotReady(Exception):
    pass


@router.get(
    "/ready",
    responses={
        503: {
            "description": "A part the service needs cannot be reached; `checks` says which.",
            "content": {"application/problem+json": {}},
        }
    },
)
async def ready(services: ServicesDep) -> JSONResponse:
    """Whether the service can do its work: the database answers ``SELECT 1``, the store takes a
    write and gives it back, and the build queue (if ``PLUMBLINE_QUEUE_URL`` is set) answers.
    ``/v1/health`` only says the process is alive."""
    probes: dict[str, Callable[[], None]] = {
        "database": lambda: _database(services),
        "store": lambda: _store(services),
    }
    if services.settings.queue_url:
        probes["queue"] = lambda: _queue(services)
    checks: dict[str, str] = {}
    for name, probe in probes.items():
        try:
            await asyncio.wait_for(run_in_threadpool(probe), timeout=PROBE_TIMEOUT_S)
            checks[name] = "ok"
        except TimeoutError:
            checks[name] = f"no answer within {PROBE_TIMEOUT_S:g} s"
        except Exception as exc:  # noqa: BLE001 - a probe's every failure is the answer
            checks[name] = _reason(exc)
    failed = {name: why for name, why in checks.items() if why != "ok"}
    if not failed:
        return JSONResponse({"status": "ready", "checks": checks})
    detail = "; ".join(f"{name}: {why}" for name, why in failed.items())
    return errors.problem(
        503,
        "not_ready",
        f"the service cannot do its work now ({detail}); it answers 200 here again once "
        "that is back",
        checks=checks,
    )


def _reason(exc: BaseException) -> str:
    if isinstance(exc, _NotReady):
        return str(exc)
    first = (str(exc).strip().splitlines() or [""])[0][:200]
    return f"{type(exc).__name__}: {first}" if first else type(exc).__name__


def _database(services: Services) -> None:
    engine = db.engine_of(services.sessions)
    where = engine.url.database
    # an open connection keeps a removed SQLite file usable; a new one would not find it
    sqlite_file = engine.dialect.name == "sqlite" and where not in (None, "", ":memory:")
    if sqlite_file and not Path(str(where)).is_file():
        raise _NotReady(f"the SQLite file {where} is not there (PLUMBLINE_DATABASE_URL)")
    with engine.connect() as connection:
        connection.execute(text("SELECT 1"))


def _store(services: Services) -> None:
    digest = services.store.put(PROBE)
    if services.store.get(digest) != PROBE:
        raise _NotReady("the store gave back different bytes than were written")


def _queue(services: Services) -> None:
    services.jobs.ping(PROBE_TIMEOUT_S)
