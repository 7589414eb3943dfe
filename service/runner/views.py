"""A background build as its author sees it (``GET /v1/jobs/{id}``, and the 202 of
``POST /v1/reports?wait=false``): a pydantic model, so the OpenAPI document describes it."""

from __future__ import annotations

from typing import Any

from pydantic import Field

from service.archive.db import JobRow
from service.runner.jobs import JobState
from service.workflow.views import View


class JobProgress(View):
    stage: str
    done: int
    total: int


class JobLinks(View):
    self_: str = Field(alias="self")
    pack: str | None = None
    """Once the job is done: the draft's address."""


class JobView(View):
    """A background build as its author sees it; ``pack`` once done, ``error`` once failed."""

    id: str
    status: JobState
    progress: JobProgress
    created_at: str
    updated_at: str
    links: JobLinks
    pack: str | None = None
    error: dict[str, Any] | None = None


def view(row: JobRow) -> JobView:
    """The job's answer; fields that do not apply are left unset (and out of the JSON)."""
    links = JobLinks(self_=f"/v1/jobs/{row.id}")
    out = JobView(
        id=row.id,
        status=JobState(row.status),
        progress=JobProgress(stage=row.stage, done=row.done, total=row.total),
        created_at=row.created_at.isoformat(),
        updated_at=row.updated_at.isoformat(),
        links=links,
    )
    if row.pack_id is not None:
        out.pack = row.pack_id
        links.pack = f"/v1/reports/{row.pack_id}"
    if row.error is not None:
        out.error = row.error
    return out


__all__ = ["JobLinks", "JobProgress", "JobView", "view"]
