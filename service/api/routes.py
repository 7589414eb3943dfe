"""The v1 routes."""

from __future__ import annotations

from typing import Any

from fastapi import APIRouter, Request, Response
from starlette.concurrency import run_in_threadpool

from service import __version__, pipeline
from service.api.deps import PackDep, ServicesDep
from service.archive.db import PackRow
from service.checks import registry
from service.definition.schema import definition_schema
from service.workflow import drafts

router = APIRouter(prefix="/v1")

_PROBLEM: dict[str, Any] = {"content": {"application/problem+json": {}}}
_DEFINITION_BODY = {
    "requestBody": {
        "required": True,
        "content": {
            "application/json": {"schema": {"$ref": "#/components/schemas/ReportDefinition"}}
        },
    }
}


def _links(row: PackRow) -> dict[str, str]:
    base = f"/v1/reports/{row.id}"
    return {"self": base, "pdf": f"{base}/pdf", "checks": f"{base}/checks"}


def _pack_view(row: PackRow, *, with_results: bool) -> dict[str, Any]:
    view: dict[str, Any] = {
        "id": row.id,
        "report": {
            "id": row.report_id,
            "title": row.title,
            "period": row.period,
            "as_of": row.as_of,
        },
        "status": row.status,
        "blocked": row.blocked,
        "summary": row.summary,
        "failed": [f"{r['check']} on {r['chart']}" for r in row.results if r["status"] == "failed"],
        "unused_waivers": row.unused_waivers,
        "pdf": {"sha256": row.pdf_sha256, "bytes": row.pdf_bytes},
        "definition_sha256": row.definition_sha256,
        "created_at": row.created_at.isoformat(),
        "links": _links(row),
    }
    if with_results:
        view["checks"] = row.results
    return view


@router.get("/health", tags=["service"])
async def health() -> dict[str, str]:
    """The service is alive."""
    return {"status": "ok", "version": __version__}


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
    "/reports",
    status_code=201,
    tags=["reports"],
    openapi_extra=_DEFINITION_BODY,
    responses={413: _PROBLEM, 422: _PROBLEM},
)
async def create_report(
    request: Request, response: Response, services: ServicesDep
) -> dict[str, Any]:
    """Validate a definition, run every check, render the draft pack and store it.

    A failed check that is not waived does not stop the draft: it is stored with ``blocked: true``
    and each failure is marked on its chart and in the appendix, so a reviewer can see it.
    """
    raw = await request.body()
    built = await services.workers.build(raw, services.settings.limits)
    row = await run_in_threadpool(
        drafts.create,
        sessions=services.sessions,
        store=services.store,
        built=built,
        definition=raw,
    )
    response.headers["Location"] = f"/v1/reports/{row.id}"
    return _pack_view(row, with_results=True)


@router.post(
    "/check",
    tags=["checks"],
    openapi_extra=_DEFINITION_BODY,
    responses={413: _PROBLEM, 422: _PROBLEM},
)
async def check_definition(request: Request, services: ServicesDep) -> dict[str, Any]:
    """Validate a definition and run its checks without rendering or storing anything."""
    raw = await request.body()
    checked = await run_in_threadpool(
        lambda: pipeline.check(pipeline.intake(raw, services.settings.limits))
    )
    from service.checks.results import summary

    return {
        "report": checked.definition.report.id,
        "blocked": checked.blocked,
        "summary": summary(checked.results),
        "checks": [r.model_dump(mode="json") for r in checked.results],
        "unused_waivers": checked.unused_waivers,
    }


@router.post(
    "/verify",
    tags=["archive"],
    responses={413: _PROBLEM},
    openapi_extra={
        "requestBody": {
            "required": True,
            "content": {"application/pdf": {"schema": {"type": "string", "format": "binary"}}},
        }
    },
)
async def verify_pack(request: Request, services: ServicesDep) -> dict[str, Any]:
    """Verify a sealed pack step by step: signature intact, valid, trusted and by whom; nothing
    appended; the attachments' hashes; re-rendering the attached definition gives the same bytes.

    Trusted: the organisation's certificate when configured, else the development certificate."""
    from service.seal import keys

    pdf = await request.body()
    settings = services.settings
    roots: list[bytes] = []
    if settings.seal_cert is not None:
        roots.append(settings.seal_cert.read_bytes())
    development = keys.development_certificate(settings.data_dir / "keys")
    if development is not None:
        roots.append(development)
    return await services.workers.verify(pdf, roots, settings.limits)


@router.get("/reports/{pack_id}", tags=["reports"], responses={404: _PROBLEM})
def get_report(pack: PackDep) -> dict[str, Any]:
    """A stored pack: its report, status, check summary and links."""
    return _pack_view(pack, with_results=False)


@router.get("/reports/{pack_id}/checks", tags=["reports"], responses={404: _PROBLEM})
def get_checks(pack: PackDep) -> dict[str, Any]:
    """Every check result of a stored pack."""
    return {"id": pack.id, "blocked": pack.blocked, "summary": pack.summary, "checks": pack.results}


@router.get(
    "/reports/{pack_id}/pdf",
    tags=["reports"],
    responses={200: {"content": {"application/pdf": {}}}, 404: _PROBLEM},
    response_class=Response,
)
def get_pdf(pack: PackDep, services: ServicesDep) -> Response:
    """The pack's PDF, exactly as stored (its SHA-256 is the ETag)."""
    data = services.store.get(pack.pdf_sha256)
    return Response(
        data,
        media_type="application/pdf",
        headers={
            "ETag": f'"{pack.pdf_sha256}"',
            "Content-Disposition": f'inline; filename="{pack.report_id}-{pack.id}.pdf"',
        },
    )
