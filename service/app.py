"""The composition root: the one place that builds the service from its settings.

``create_app`` builds the FastAPI application — the API's routers, the review pages, the error
handlers and middleware — and, when it starts, the job runner: the archive, the store, the render
workers with the settings' render options, and the background jobs (the service's own workers, or
Celery workers when ``PLUMBLINE_QUEUE_URL`` is set). ``serve`` runs it (JSON logs, a graceful stop
on SIGTERM); ``worker`` runs a queue worker. The edges it wires (``api``, ``web``,
``distributed``) never import one another, nor this module.
"""

from __future__ import annotations

import signal
from collections.abc import AsyncIterator, Sequence
from contextlib import asynccontextmanager
from typing import Any

from fastapi import FastAPI
from fastapi.openapi.utils import get_openapi

from service import __version__, logs, web
from service.api import errors, ready, reports, routes
from service.api.limits import BodyLimit, HeaderLimitH11
from service.api.middleware import RequestIds
from service.archive import db
from service.archive.objects import open_store
from service.config import Settings, get_settings
from service.definition.model import ReportDefinition
from service.render.options import from_settings
from service.runner.jobs import Jobs, LocalJobs
from service.runner.services import Services
from service.runner.workers import Workers


def create_app(settings: Settings | None = None) -> FastAPI:
    settings = settings or get_settings()

    @asynccontextmanager
    async def lifespan(app: FastAPI) -> AsyncIterator[None]:
        settings.data_dir.mkdir(parents=True, exist_ok=True)
        workers = Workers(
            settings.workers,
            timeout=settings.render_timeout_s,
            render=from_settings(settings, service=True),
            memory_mb=settings.worker_memory_mb,
            max_waiting=settings.max_waiting_requests,
        )
        sessions = db.connect(settings.database_url)
        store = open_store(settings)
        jobs: Jobs
        if settings.queue_url:
            from service.distributed.jobs import CeleryJobs  # Celery loads only when configured

            jobs = CeleryJobs(sessions=sessions, store=store, settings=settings)
        else:
            jobs = LocalJobs(sessions=sessions, store=store, workers=workers, settings=settings)
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
    app.include_router(routes.router)
    app.include_router(ready.router)
    app.include_router(reports.router)
    app.include_router(reports.jobs_router)
    errors.install(app)
    web.install(app)
    app.add_middleware(
        BodyLimit, limit=settings.limits.max_payload_bytes, header_limit=settings.max_header_bytes
    )
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
            http=HeaderLimitH11,
            h11_max_incomplete_event_size=settings.max_header_bytes,
        )
    finally:
        signal.signal(signal.SIGTERM, previous)
    return 0


def worker(settings: Settings, argv: Sequence[str] = ()) -> int:
    """Run a queue worker in this process until it is stopped (``plumbline worker``)."""
    from service.distributed.queue import run_worker  # Celery loads only for a worker

    run_worker(settings, argv)
    return 0


__all__ = ["create_app", "serve", "worker"]
