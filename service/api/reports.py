"""The /v1/reports routes: build drafts, search the archive, read a pack, and move it through review.

Every route needs an API key (``Authorization: Bearer <key>``). A pack of a report family the key
is not granted answers 404, exactly like a pack that does not exist. Refused actions answer with
the reason: 401 (no or bad key), 403 (the key lacks the role, or is the pack's author), 404, 409 (an
illegal transition, a changed draft, an open failed check), 422 (a malformed request).
POSTs accept an ``Idempotency-Key``.
"""

from __future__ import annotations

from typing import Annotated, Any

from fastapi import APIRouter, Depends, Path, Query, Request, Response
from pydantic import BaseModel, ConfigDict, Field
from starlette.concurrency import run_in_threadpool

from service.api import deps, docs, idempotency
from service.api.deps import PackDep, PackId, PrincipalDep, ServicesDep
from service.errors import NotFound
from service.runner import views as job_views
from service.runner.services import Services
from service.workflow import drafts, lifecycle, month_over_month, views
from service.workflow.keys import Principal

router = APIRouter(
    prefix="/v1/reports", tags=["reports"], dependencies=[Depends(deps.single_query_values)]
)

_READ = docs.refusals(401, 404, 422)
"""A read of one pack or job: no key, not found (or not visible to the key), a malformed id."""
_ACT = docs.refusals(400, 401, 403, 404, 409, 422)
"""A lifecycle action: also the key's role, an illegal move, an unreadable body."""
_CREATED: dict[int | str, dict[str, Any]] = {
    201: {
        "description": "The draft pack, stored (its address is in Location).",
        "headers": {"Location": {"schema": {"type": "string"}}},
    },
    202: {
        "description": "With wait=false: the job that builds the draft (GET its Location).",
        "content": {"application/json": {"schema": {"$ref": "#/components/schemas/JobView"}}},
        "headers": {"Location": {"schema": {"type": "string"}}},
    },
    **docs.refusals(401, 403, 409, 413, 415, 422, 429, 500),
}


class _Body(BaseModel):
    model_config = ConfigDict(extra="forbid")


class ChangesRequest(_Body):
    reason: str = Field(min_length=1, max_length=2000, description="Which changes are needed.")


class WaiverRequest(_Body):
    check: str = Field(description="The check's id, e.g. bar-zero-baseline.")
    chart: str = Field(description="The chart's id in the definition.")
    reason: str = Field(
        description=f"Why the exception is acceptable ({lifecycle.MIN_REASON} to 2000 characters)."
    )


class SignOffRequest(_Body):
    content_sha256: str = Field(
        pattern=r"^[0-9a-f]{64}$",
        description="The SHA-256 of the draft PDF the approver reviewed (the pack's pdf.sha256).",
    )


async def _view(services: Services, principal: Principal, pack_id: str) -> dict[str, Any]:
    def load() -> dict[str, Any]:
        row = drafts.visible(sessions=services.sessions, principal=principal, pack_id=pack_id)
        return views.pack_detail(services.sessions, row).json_body()

    return await run_in_threadpool(load)


@router.post(
    "",
    status_code=201,
    openapi_extra=docs.merged(docs.DEFINITION_BODY, docs.IDEMPOTENCY_KEY),
    responses=_CREATED,
    dependencies=[deps.JsonBody],
    response_model=views.PackDetail,
)
async def create_report(
    request: Request,
    services: ServicesDep,
    principal: PrincipalDep,
    wait: Annotated[
        bool, Query(description="false: answer 202 with a job at once and build in the background")
    ] = True,
) -> Response:
    """Validate a definition, run every check, render the draft pack and store it, with the key
    that sent it as its author (the key needs the author role and the report's family).

    A failed check that is not waived does not stop the draft: it is stored with ``blocked: true``
    and each failure is marked on its chart and in the appendix, so a reviewer can see it.
    With ``wait=false`` the answer is ``202`` with a job (``GET /v1/jobs/{id}``) that ends *done*
    with the draft or *failed* with the problem.
    """
    raw = await request.body()
    if not wait:

        async def queue() -> idempotency.Answer:
            job = await services.jobs.start(principal, raw)
            return 202, job_views.view(job).json_body(), f"/v1/jobs/{job.id}"

        return await idempotency.once(request, services, principal, raw, queue)

    async def run() -> idempotency.Answer:
        row = await services.build_draft(principal, raw)
        view = await run_in_threadpool(views.pack_detail, services.sessions, row)
        return 201, view.json_body(), f"/v1/reports/{row.id}"

    return await idempotency.once(request, services, principal, raw, run)


MAX_OFFSET = 1_000_000_000
"""Past any archive's size, and within the 64-bit integers SQLite and PostgreSQL take (an offset
beyond them was a 500)."""
_STATUS_PATTERN = f"^({'|'.join(drafts.STATUSES)})$"


@router.get("", responses=docs.refusals(401, 422), response_model=views.PackList)
def list_reports(
    *,
    services: ServicesDep,
    principal: PrincipalDep,
    report: Annotated[str | None, Query(description="A report id, exactly.")] = None,
    period: Annotated[str | None, Query(description="Part of the period's label.")] = None,
    status: Annotated[
        str | None,
        Query(description="One of: " + ", ".join(drafts.STATUSES), pattern=_STATUS_PATTERN),
    ] = None,
    signer: Annotated[str | None, Query(description="Part of the approver's name.")] = None,
    limit: Annotated[int, Query(ge=1, le=drafts.MAX_PAGE)] = 50,
    offset: Annotated[int, Query(ge=0, le=MAX_OFFSET)] = 0,
) -> views.PackList:
    """The packs this key may see, newest first, narrowed by report, period, status and signer."""
    query = drafts.Query(report, period, status, signer, limit, offset)
    return views.pack_list(services.sessions, principal, query)


@router.get("/{pack_id}", responses=_READ, response_model=views.PackSummary)
def get_report(pack: PackDep, services: ServicesDep) -> views.PackSummary:
    """A stored pack: its report, status, check summary, review, seal and links."""
    return views.pack_summary(services.sessions, pack)


@router.get("/{pack_id}/checks", responses=_READ, response_model=views.PackChecks)
def get_checks(pack: PackDep, services: ServicesDep) -> views.PackChecks:
    """Every check result of a stored pack, and the waivers given in review."""
    return views.pack_checks(services.sessions, pack)


@router.get("/{pack_id}/audit", responses=_READ, response_model=views.PackAudit)
def get_audit(pack: PackDep, services: ServicesDep) -> views.PackAudit:
    """The pack's audit trail: every action on it, who, when, and the content hash it concerned."""
    return views.pack_audit(services.sessions, pack)


@router.get("/{pack_id}/compare/{other_id}", responses=docs.refusals(401, 404, 409, 422))
def compare_packs(
    pack_id: PackId, other_id: PackId, services: ServicesDep, principal: PrincipalDep
) -> dict[str, Any]:
    """Month over month: two signed packs of one report — which checks changed outcome, which
    waivers are new or dropped, which key figures moved (the older pack is ``earlier``)."""
    return month_over_month.compare(
        sessions=services.sessions,
        store=services.store,
        principal=principal,
        pack_id=pack_id,
        other_id=other_id,
        limits=services.settings.limits,
    )


def _pdf(data: bytes, digest: str, filename: str) -> Response:
    return Response(
        data,
        media_type="application/pdf",
        headers={
            "ETag": f'"{digest}"',
            "Content-Disposition": f'attachment; filename="{filename}"',
        },
    )


@router.get("/{pack_id}/pdf", responses={**docs.PDF_ANSWER, **_READ}, response_class=Response)
def get_pdf(pack: PackDep, services: ServicesDep) -> Response:
    """The pack's draft PDF, exactly as stored (its SHA-256 is the ETag)."""
    data = services.store.get(pack.pdf_sha256)
    return _pdf(data, pack.pdf_sha256, f"{pack.report_id}-{pack.id}-draft.pdf")


@router.get("/{pack_id}/sealed", responses={**docs.PDF_ANSWER, **_READ}, response_class=Response)
def get_sealed(pack: PackDep, services: ServicesDep) -> Response:
    """The signed-off pack: PDF/A-3b with its sources attached, digitally signed."""
    sealed = drafts.seal_of(sessions=services.sessions, pack_id=pack.id)
    if sealed is None:
        raise NotFound(f"the pack '{pack.id}' has no sealed file: it is {pack.status}")
    data = services.store.get(sealed.sha256)
    return _pdf(data, sealed.sha256, f"{pack.report_id}-{pack.id}-sealed.pdf")


async def _act(
    request: Request,
    services: Services,
    principal: Principal,
    pack_id: str,
    action: Any,
) -> Response:
    """Run one lifecycle action once (per Idempotency-Key) and answer with the pack."""
    raw = await request.body()

    async def run() -> idempotency.Answer:
        await action()
        return 200, await _view(services, principal, pack_id), None

    return await idempotency.once(request, services, principal, raw, run)


@router.post(
    "/{pack_id}/submit",
    responses=docs.refusals(401, 403, 404, 409, 422),
    openapi_extra=docs.IDEMPOTENCY_KEY,
    response_model=views.PackDetail,
)
async def submit(
    pack_id: str, request: Request, services: ServicesDep, principal: PrincipalDep
) -> Response:
    """An author sends a draft for review."""

    async def action() -> None:
        await run_in_threadpool(
            lifecycle.submit, sessions=services.sessions, principal=principal, pack_id=pack_id
        )

    return await _act(request, services, principal, pack_id, action)


@router.post(
    "/{pack_id}/request-changes",
    responses={**_ACT, **docs.refusals(415)},
    openapi_extra=docs.IDEMPOTENCY_KEY,
    response_model=views.PackDetail,
    dependencies=[deps.JsonBody],
)
async def request_changes(
    pack_id: str,
    body: ChangesRequest,
    request: Request,
    services: ServicesDep,
    principal: PrincipalDep,
) -> Response:
    """A reviewer or approver sends a pack in review back to draft, saying why."""

    async def action() -> None:
        await run_in_threadpool(
            lifecycle.request_changes,
            sessions=services.sessions,
            principal=principal,
            pack_id=pack_id,
            reason=body.reason,
        )

    return await _act(request, services, principal, pack_id, action)


@router.post(
    "/{pack_id}/waivers",
    responses={**_ACT, **docs.refusals(415)},
    openapi_extra=docs.IDEMPOTENCY_KEY,
    response_model=views.PackDetail,
    dependencies=[deps.JsonBody],
)
async def waive(
    pack_id: str,
    body: WaiverRequest,
    request: Request,
    services: ServicesDep,
    principal: PrincipalDep,
) -> Response:
    """A reviewer who is not an author waives one failed, waivable check on one chart of the draft
    in review (or confirms a standing waiver that came with the definition)."""

    async def action() -> None:
        await run_in_threadpool(
            lifecycle.waive,
            sessions=services.sessions,
            store=services.store,
            principal=principal,
            pack_id=pack_id,
            check=body.check,
            chart=body.chart,
            reason=body.reason,
        )

    return await _act(request, services, principal, pack_id, action)


@router.post(
    "/{pack_id}/sign-off",
    responses={**_ACT, **docs.refusals(415, 500)},
    openapi_extra=docs.IDEMPOTENCY_KEY,
    response_model=views.PackDetail,
    dependencies=[deps.JsonBody],
)
async def sign_off(
    pack_id: str,
    body: SignOffRequest,
    request: Request,
    services: ServicesDep,
    principal: PrincipalDep,
) -> Response:
    """An approver who is not an author signs off the draft whose PDF SHA-256 they reviewed; the
    sealed pack (PDF/A-3b, definition, datasets and sign-off record attached, digitally signed) is
    archived in the same step."""

    async def action() -> None:
        await services.sign_off_and_seal(principal, pack_id, body.content_sha256)

    return await _act(request, services, principal, pack_id, action)


jobs_router = APIRouter(
    prefix="/v1/jobs", tags=["reports"], dependencies=[Depends(deps.single_query_values)]
)


@jobs_router.get(
    "/{job_id}",
    responses=_READ,
    response_model=job_views.JobView,
    response_model_exclude_unset=True,
)
def get_job(
    job_id: Annotated[str, Path(pattern=r"^jb_[0-9a-f]{32}$")],
    services: ServicesDep,
    principal: PrincipalDep,
) -> job_views.JobView:
    """A background build: queued, running (stage, charts done of total), done (with the draft's
    id) or failed (with the problem). Only the key that posted it sees it."""
    return job_views.view(services.jobs.get(principal, job_id))
