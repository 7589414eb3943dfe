"""The FastAPI application factory."""

from __future__ import annotations

from collections.abc import AsyncIterator
from contextlib import asynccontextmanager
from typing import TYPE_CHECKING, Any

from fastapi import FastAPI
from fastapi.openapi.utils import get_openapi

from service import __version__, web
from service.api import errors, reports
from service.api.deps import Services
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


def create_app(settings: Settings | None = None) -> FastAPI:
    settings = settings or get_settings()

    @asynccontextmanager
    async def lifespan(app: FastAPI) -> AsyncIterator[None]:
        settings.data_dir.mkdir(parents=True, exist_ok=True)
        workers = Workers(
            settings.workers,
            timeout=settings.render_timeout_s,
            render=settings.render_options(service=True),
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
            await jobs.close()
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
    app.include_router(reports.router)
    app.include_router(reports.jobs_router)
    errors.install(app)
    web.install(app)
    app.add_middleware(BodyLimit, limit=settings.limits.max_payload_bytes)

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
