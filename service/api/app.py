"""The FastAPI application factory, the request-id and access-log middleware, readiness, and
``serve`` (the HTTP service with JSON logs and a graceful stop on SIGTERM)."""

from __future__ import annotations

import asyncio
import json
import logging
import signal
import time
from collections.abc import AsyncIterator, Callable, Mapping
from contextlib import asynccontextmanager
from pathlib import Path
from typing import TYPE_CHECKING, Any

from fastapi import APIRouter, FastAPI, Request
from fastapi.openapi.utils import get_openapi
from fastapi.responses import JSONResponse
from sqlalchemy import text
from starlette.concurrency import run_in_threadpool
from starlette.datastructures import MutableHeaders
from starlette.types import ASGIApp, Message, Receive, Scope, Send

from service import __version__, logs, web
from service.api import errors, reports
from service.api.deps import Services, ServicesDep
from service.api.jobs import Jobs
from service.api.limits import BodyLimit
from service.api.routes import router
from service.api.workers import Workers
from service.archive import db
from service.archive.objects import open_store
from service.config import Settings, get_settings
from service.definition.model import ReportDefinition

if TYPE_CHECKING:
    from service.distributed.jobs import CeleryJobs

access_log = logging.getLogger(logs.ACCESS)

PROBE = b"plumbline readiness probe\n"
"""Written to and read back from the store by ``GET /v1/ready`` (content-addressed: one file)."""

PROBE_TIMEOUT_S = 5.0


def create_app(settings: Settings | None = None) -> FastAPI:
    settings = settings or get_settings()

    @asynccontextmanager
    async def lifespan(app: FastAPI) -> AsyncIterator[None]:
        settings.data_dir.mkdir(parents=True, exist_ok=True)
        workers = Workers(
            settings.workers,
            timeout=settings.render_timeout_s,
            render=settings.render_options(service=True),
            memory_mb=settings.worker_memory_mb,
        )
        sessions = db.connect(settings.database_url)
        store = open_store(settings)
        jobs: Jobs | CeleryJobs
        if settings.queue_url:
            from service.distributed.jobs import CeleryJobs  # Celery loads only when configured

            jobs = CeleryJobs(sessions=sessions, store=store, settings=settings)
        else:
            jobs = Jobs(sessions=sessions, store=store, workers=workers, settings=settings)
        jobs.recover()
        app.state.services = Services(
            settings=settings, sessions=sessions, store=store, workers=workers, jobs=jobs
        )
        try:
            yield
        finally:
            await jobs.close()  # within PLUMBLINE_SHUTDOWN_GRACE_S; the rest are failed
            workers.close()

    app = FastAPI(
        title="Plumbline",
        version=__version__,
        lifespan=lifespan,
        description="Report packs whose charts do not mislead. The checks support, but do not "
        "replace, the owner's judgement, the applicable reporting standards and professional "
        "review.",
    )
    app.include_router(router)
    app.include_router(ready_router)
    app.include_router(reports.router)
    app.include_router(reports.jobs_router)
    errors.install(app)
    web.install(app)
    app.add_middleware(BodyLimit, limit=settings.limits.max_payload_bytes)
    app.add_middleware(RequestIds, handlers=app.exception_handlers)  # outermost: sees the 413s

    def openapi() -> dict[str, Any]:
        if app.openapi_schema:
            return app.openapi_schema
        spec = get_openapi(
            title=app.title, version=app.version, description=app.description, routes=app.routes
        )
        definition = ReportDefinition.model_json_schema(ref_template="#/components/schemas/{model}")
        components = spec.setdefault("components", {}).setdefault("schemas", {})
        components.update(definition.pop("$defs", {}))
        components["ReportDefinition"] = definition
        app.openapi_schema = spec
        return spec

    app.openapi = openapi  # type: ignore[method-assign]
    return app


# --- request ids and the access log -------------------------------------------------------------


class RequestIds:
    """Give every request an id (the client's ``X-Request-ID`` if sane, else a new one), answer
    it in the ``X-Request-ID`` header and as ``request_id`` in every problem body, and write one
    access line when the answer is sent.

    An exception no handler took is answered here with the app's last-resort handler (so that
    answer carries the id too) instead of by Starlette's outermost error middleware.
    """

    def __init__(self, app: ASGIApp, *, handlers: Mapping[Any, Callable[..., Any]]) -> None:
        self.app, self.handlers = app, handlers

    async def __call__(self, scope: Scope, receive: Receive, send: Send) -> None:
        if scope["type"] != "http":
            await self.app(scope, receive, send)
            return
        rid = logs.accept_request_id(dict(scope.get("headers") or []).get(b"x-request-id"))
        logs.request_id.set(rid)  # the request's own task: it ends with the request
        scope.setdefault("state", {})["request_id"] = rid
        began = time.perf_counter()
        status = 0
        held: Message | None = None
        body = b""

        async def answer(message: Message) -> None:
            nonlocal status, held, body
            if message["type"] == "http.response.start":
                status = int(message["status"])
                headers = MutableHeaders(scope=message)
                headers["X-Request-ID"] = rid
                if headers.get("content-type", "").startswith("application/problem+json"):
                    held = message  # sent with the body, once the id is in it
                    return
                await send(message)
            elif message["type"] == "http.response.body" and held is not None:
                body += message.get("body", b"")
                if message.get("more_body", False):
                    return
                body = _with_request_id(body, rid)
                MutableHeaders(scope=held)["content-length"] = str(len(body))
                start, held = held, None
                await send(start)
                await send({"type": "http.response.body", "body": body})
            else:
                await send(message)

        try:
            await self.app(scope, receive, answer)
        except Exception as exc:
            handler = self.handlers.get(Exception)
            if status or handler is None:
                raise
            response = await handler(Request(scope, receive), exc)
            await response(scope, receive, answer)
        finally:
            access_log.info(
                "%s %s %s",
                scope.get("method", ""),
                scope.get("path", ""),
                status,
                extra={
                    "method": scope.get("method", ""),
                    "path": scope.get("path", ""),
                    "status": status,
                    "duration_ms": round((time.perf_counter() - began) * 1000, 1),
                },
            )


def _with_request_id(body: bytes, rid: str) -> bytes:
    try:
        problem = json.loads(body)
    except ValueError:
        return body
    if not isinstance(problem, dict):
        return body
    problem.setdefault("request_id", rid)
    return json.dumps(problem, ensure_ascii=False, separators=(",", ":")).encode()


# --- readiness -----------------------------------------------------------------------------------

ready_router = APIRouter(prefix="/v1", tags=["service"])


class _NotReady(Exception):
    pass


@ready_router.get(
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
    app = getattr(services.jobs, "app", None)
    if app is None:
        raise _NotReady("the build queue is configured but not in use")
    with app.connection_for_write() as connection:
        connection.ensure_connection(max_retries=1, interval_start=0, timeout=PROBE_TIMEOUT_S)
        client = getattr(connection.default_channel, "client", None)
        if client is not None:
            client.ping()  # redis: PING


# --- serving -------------------------------------------------------------------------------------


def serve(settings: Settings, *, host: str | None = None, port: int | None = None) -> int:
    """Run the HTTP service until SIGTERM or SIGINT: open requests are answered (up to
    ``PLUMBLINE_SHUTDOWN_GRACE_S``), then background builds get the same grace (``Jobs.close``);
    the process then exits 0."""
    import uvicorn

    logs.setup(settings.log_format, settings.log_level)
    # uvicorn raises the signal again once it has stopped; a handler of ours makes that a
    # normal return (exit 0) instead of death by SIGTERM.
    previous = signal.signal(signal.SIGTERM, lambda *_: None)
    try:
        uvicorn.run(
            create_app(settings),
            host=host or settings.host,
            port=settings.port if port is None else port,
            log_config=None,
            log_level=settings.log_level.lower(),
            access_log=False,
            timeout_graceful_shutdown=max(1, round(settings.shutdown_grace_s)),
        )
    finally:
        signal.signal(signal.SIGTERM, previous)
    return 0
