"""The v1 routes that are not about one stored pack: health, schema, the check catalogue, a dry-run
check of a definition, and verification of a sealed pack file. /v1/reports is in ``reports``."""

from __future__ import annotations

from typing import Any

from fastapi import APIRouter, Depends, Request
from pydantic import BaseModel

from service import __version__
from service.api import deps, docs
from service.api.deps import PrincipalDep, ServicesDep
from service.checks import registry
from service.definition.schema import definition_schema

router = APIRouter(prefix="/v1", dependencies=[Depends(deps.single_query_values)])


class Health(BaseModel):
    status: str
    version: str


class CheckAnswer(BaseModel):
    """A definition's checks, run without rendering or storing anything."""

    report: str
    blocked: bool
    summary: dict[str, int]
    checks: list[dict[str, Any]]
    unused_waivers: list[str]


@router.get("/health", tags=["service"], response_model=Health)
async def health() -> Health:
    """The service is alive."""
    return Health(status="ok", version=__version__)


@router.get("/schema", tags=["definitions"])
async def schema() -> dict[str, Any]:
    """The JSON Schema of report definitions (version 1)."""
    return definition_schema()


@router.get("/checks", tags=["checks"])
async def checks() -> list[dict[str, Any]]:
    """The catalogue of integrity checks: rule, threshold, source, and whether each can be
    corrected or waived."""
    return registry.catalogue()


@router.post(
    "/check",
    tags=["checks"],
    openapi_extra=docs.DEFINITION_BODY,
    responses=docs.refusals(401, 413, 415, 422, 429, 500),
    dependencies=[deps.JsonBody],
    response_model=CheckAnswer,
)
async def check_definition(
    request: Request, services: ServicesDep, principal: PrincipalDep
) -> CheckAnswer:
    """Validate a definition and run its checks without rendering or storing anything (in a
    worker process, under the same time and memory budget as a render)."""
    return CheckAnswer(**await services.check(await request.body()))


@router.post(
    "/verify",
    tags=["archive"],
    responses=docs.refusals(401, 413, 422, 500),
    openapi_extra=docs.PDF_BODY,
)
async def verify_pack(
    request: Request, services: ServicesDep, principal: PrincipalDep
) -> dict[str, Any]:
    """Verify a sealed pack step by step: signature intact, valid, trusted and by whom; nothing
    appended; the attachments' hashes; re-rendering the attached definition (and sign-off record)
    gives the same bytes; the file is the one this archive sealed.

    Trusted: the organisation's certificate when configured, else the development certificate."""
    report = await services.verify(await request.body(), principal)
    return report.as_dict()
