"""Dependencies: the app's services, and loaders that answer 404 inside the dependency."""

from __future__ import annotations

from dataclasses import dataclass
from typing import Annotated, Any

from fastapi import Depends, Path, Request
from sqlalchemy.orm import sessionmaker

from service.api.workers import Workers
from service.archive.db import PackRow
from service.archive.files import Store
from service.config import Settings
from service.workflow import drafts


@dataclass
class Services:
    settings: Settings
    sessions: sessionmaker[Any]
    store: Store
    workers: Workers


def _services(request: Request) -> Services:
    services = request.app.state.services
    assert isinstance(services, Services)
    return services


ServicesDep = Annotated[Services, Depends(_services)]

PackId = Annotated[str, Path(pattern=r"^pk_[0-9a-f]{32}$", description="A pack id, e.g. pk_3f…")]


def _pack(pack_id: PackId, services: ServicesDep) -> PackRow:
    return drafts.get(sessions=services.sessions, pack_id=pack_id)


PackDep = Annotated[PackRow, Depends(_pack)]
