"""The review pages under ``/review``: sign in and out, the queue, a pack with its checks and the
review forms, downloads, and month over month.

Every action calls the workflow library, which applies every rule; a page only decides which forms
to offer. After a POST the browser is sent (303) to the pack page with a message; a refused action
shows the page again with the library's reason and its 4xx status. Another family's pack is "not
found", as in the JSON API.
"""

from __future__ import annotations

import logging
import re
from typing import Annotated, Any

from fastapi import APIRouter, Depends, Request
from starlette.concurrency import run_in_threadpool
from starlette.responses import Response

from service import logs
from service.errors import InvalidRequest, NotFound, PlumblineError, Unauthorized
from service.web.pages import FLASH, Stop, html, redirect
from service.web.visit import Visit, form, refuse, safe_next, signed_in, visit
from service.workflow import drafts, keys, lifecycle, review
from service.workflow.month_over_month import compare

log = logging.getLogger("plumbline.web")
router = APIRouter(prefix="/review", include_in_schema=False)
VisitDep = Annotated[Visit, Depends(visit)]
_PACK = re.compile(r"^pk_[0-9a-f]{32}$")
MAX_KEY_CHARS = 200
SIGN_IN_FAILED = (
    "That key was not accepted. Paste the whole key as it was given to you; if it still fails, "
    "ask for a new one."
)
"""The same words whatever the cause (unknown, wrong, revoked or expired key)."""


def _flash(done: str | None) -> str:
    return FLASH.get(done or "", "")


def _pack_id(current: Visit, pack_id: str) -> str:
    if not _PACK.match(pack_id):
        raise _not_found(current, pack_id)
    return pack_id


def _not_found(current: Visit, pack_id: str) -> Stop:
    shown = pack_id if len(pack_id) <= 80 else pack_id[:79] + "…"
    return refuse(
        current,
        404,
        "Pack not found",
        f"There is no pack '{shown}' that your key may see. Check the address, or open the "
        "queue to find the pack.",
    )


def _reason(exc: PlumblineError) -> str:
    if exc.status < 500:
        return exc.message
    incident = logs.incident(log, "review action failed", detail=exc.message, found=exc.incident)
    return exc.message if exc.incident else f"{exc.message} (incident {incident})"


# --- signing in and out --------------------------------------------------------------------------


@router.get("/sign-in")
async def sign_in_page(
    current: VisitDep, next: str | None = None, done: str | None = None, ended: str | None = None
) -> Response:
    notice = (
        "Your session ended: it was signed out or expired, or its key was revoked. Sign in again."
        if ended
        else ""
    )
    context = current.context(
        next=safe_next(next), flash=_flash(done), error="", notice=current.ended or notice
    )
    return current.finish(html("sign_in.html", context))


@router.post("/sign-in")
async def sign_in(request: Request, current: VisitDep) -> Response:
    fields = await form(request, current)
    secret = fields.get("key", "").strip()
    target = safe_next(fields.get("next"))
    address = request.client.host if request.client is not None else ""
    current.services.auth_failures.check(address)
    try:
        if not secret or len(secret) > MAX_KEY_CHARS:
            raise Unauthorized("no key")
        principal = await run_in_threadpool(keys.authenticate, current.services.sessions, secret)
    except Unauthorized as refused:
        current.services.auth_failures.failed(address, refused)
        context = current.context(next=target, flash="", error=SIGN_IN_FAILED, notice="")
        return current.finish(html("sign_in.html", context, status=401))
    await current.start(principal.key_id)
    return current.finish(redirect(f"{target}?done=signed_in"))


@router.post("/sign-out")
async def sign_out(request: Request, current: VisitDep) -> Response:
    await form(request, current)
    return await current.end(redirect("/review/sign-in?done=signed_out"))


# --- queue and pack ------------------------------------------------------------------------------


@router.get("")
async def queue(request: Request, current: VisitDep, done: str | None = None) -> Response:
    principal = signed_in(request, current)
    services = current.services
    lists = await run_in_threadpool(review.queue, sessions=services.sessions, principal=principal)
    return current.finish(html("queue.html", current.context(flash=_flash(done), **lists)))


async def _show_pack(
    current: Visit,
    pack_id: str,
    *,
    status: int = 200,
    flash: str = "",
    refused: str = "",
    entered: dict[str, str] | None = None,
) -> Response:
    principal = current.principal
    assert principal is not None
    services = current.services
    try:
        page = await run_in_threadpool(
            review.pack_page,
            sessions=services.sessions,
            store=services.store,
            principal=principal,
            pack_id=pack_id,
        )
    except NotFound:
        raise _not_found(current, pack_id) from None
    context = current.context(
        page=page, flash=flash, refused=refused, entered=entered or {}, moment=review.moment
    )
    return current.finish(html("pack.html", context, status=status))


@router.get("/packs/{pack_id}")
async def pack(
    request: Request, pack_id: str, current: VisitDep, done: str | None = None
) -> Response:
    signed_in(request, current)
    return await _show_pack(current, _pack_id(current, pack_id), flash=_flash(done))


async def _act(request: Request, current: Visit, pack_id: str, action: Any, done: Any) -> Response:
    """Check the visitor and the form, run the action; 303 to the pack, or the page with why."""
    pack_id = _pack_id(current, pack_id)
    if current.principal is None:
        raise Stop(current.finish(redirect(f"/review/sign-in?next=/review/packs/{pack_id}")))
    fields = await form(request, current)
    try:
        await action(current.principal, fields)
    except PlumblineError as exc:
        entered = {k: v for k, v in fields.items() if k != "csrf"}
        return await _show_pack(
            current, pack_id, status=exc.status, refused=_reason(exc), entered=entered
        )
    code = done(fields) if callable(done) else done
    return current.finish(redirect(f"/review/packs/{pack_id}?done={code}#message"))


@router.post("/packs/{pack_id}/submit")
async def submit(request: Request, pack_id: str, current: VisitDep) -> Response:
    async def action(principal: keys.Principal, fields: dict[str, str]) -> None:
        await run_in_threadpool(
            lifecycle.submit,
            sessions=current.services.sessions,
            principal=principal,
            pack_id=pack_id,
        )

    return await _act(request, current, pack_id, action, "submitted")


@router.post("/packs/{pack_id}/request-changes")
async def request_changes(request: Request, pack_id: str, current: VisitDep) -> Response:
    async def action(principal: keys.Principal, fields: dict[str, str]) -> None:
        await run_in_threadpool(
            lifecycle.request_changes,
            sessions=current.services.sessions,
            principal=principal,
            pack_id=pack_id,
            reason=fields.get("reason", "")[:2000],
        )

    return await _act(request, current, pack_id, action, "changes_requested")


@router.post("/packs/{pack_id}/waive")
async def waive(request: Request, pack_id: str, current: VisitDep) -> Response:
    confirmed: list[bool] = []

    async def action(principal: keys.Principal, fields: dict[str, str]) -> None:
        check, _, chart = fields.get("item", "").partition("/")
        if not check or not chart:
            raise InvalidRequest("choose the check to waive from the list")
        services = current.services
        await run_in_threadpool(
            lifecycle.waive,
            sessions=services.sessions,
            store=services.store,
            principal=principal,
            pack_id=pack_id,
            check=check,
            chart=chart,
            reason=fields.get("reason", ""),
        )
        row = await run_in_threadpool(drafts.get, sessions=services.sessions, pack_id=pack_id)
        confirmed.extend(
            r["status"] == "waived"
            for r in row.results
            if (r["check"], r["chart"]) == (check, chart)
        )

    return await _act(
        request, current, pack_id, action, lambda _: "confirmed" if any(confirmed) else "waived"
    )


@router.post("/packs/{pack_id}/sign-off")
async def sign_off(request: Request, pack_id: str, current: VisitDep) -> Response:
    async def action(principal: keys.Principal, fields: dict[str, str]) -> None:
        digest = fields.get("content_sha256", "").strip().lower()
        if not re.fullmatch(r"[0-9a-f]{64}", digest):
            raise InvalidRequest(
                "the form must name the SHA-256 of the draft PDF you reviewed (64 hex digits); "
                "reload the page and sign off from there"
            )
        await current.services.sign_off_and_seal(principal, pack_id, digest)

    return await _act(request, current, pack_id, action, "signed_off")


# --- files ---------------------------------------------------------------------------------------


def _pdf(data: bytes, digest: str, filename: str, *, attachment: bool) -> Response:
    disposition = "attachment" if attachment else "inline"
    return Response(
        data,
        media_type="application/pdf",
        headers={
            "Content-Disposition": f'{disposition}; filename="{filename}"',
            "ETag": f'"{digest}"',
            "Cache-Control": "private, no-store",
            "X-Content-Type-Options": "nosniff",
            "Content-Security-Policy": "frame-ancestors 'self'",
        },
    )


async def _visible(request: Request, current: Visit, pack_id: str) -> Any:
    principal = signed_in(request, current)
    pack_id = _pack_id(current, pack_id)
    try:
        return await run_in_threadpool(
            drafts.visible,
            sessions=current.services.sessions,
            principal=principal,
            pack_id=pack_id,
        )
    except NotFound:
        raise _not_found(current, pack_id) from None


@router.get("/packs/{pack_id}/draft.pdf")
async def draft_pdf(
    request: Request, pack_id: str, current: VisitDep, download: int = 0
) -> Response:
    row = await _visible(request, current, pack_id)
    data = await run_in_threadpool(current.services.store.get, row.pdf_sha256)
    name = f"{row.report_id}-{row.id}-draft.pdf"
    return _pdf(data, row.pdf_sha256, name, attachment=bool(download))


@router.get("/packs/{pack_id}/sealed.pdf")
async def sealed_pdf(request: Request, pack_id: str, current: VisitDep) -> Response:
    row = await _visible(request, current, pack_id)
    sealed = await run_in_threadpool(
        drafts.seal_of, sessions=current.services.sessions, pack_id=row.id
    )
    if sealed is None:
        raise refuse(
            current,
            404,
            "No sealed file",
            f"The pack '{row.id}' has no sealed file: it is {review.STATUS_NAMES[row.status]}. "
            "A pack is sealed when an approver signs it off.",
        )
    data = await run_in_threadpool(current.services.store.get, sealed.sha256)
    return _pdf(data, sealed.sha256, f"{row.report_id}-{row.id}-sealed.pdf", attachment=True)


# --- month over month ----------------------------------------------------------------------------


@router.get("/packs/{pack_id}/compare/{other_id}")
async def month_over_month(
    request: Request, pack_id: str, other_id: str, current: VisitDep
) -> Response:
    principal = signed_in(request, current)
    pack_id, other_id = _pack_id(current, pack_id), _pack_id(current, other_id)
    services = current.services
    try:
        # compare re-runs the checks without drawing (matplotlib stays unloaded)
        result = await run_in_threadpool(
            compare,
            sessions=services.sessions,
            store=services.store,
            principal=principal,
            pack_id=pack_id,
            other_id=other_id,
            limits=services.settings.limits,
        )
    except NotFound:
        raise refuse(
            current,
            404,
            "Pack not found",
            "One of the two packs does not exist or your key may not see it.",
        ) from None
    except PlumblineError as exc:
        raise refuse(current, exc.status, "Packs not compared", _reason(exc)) from None
    return current.finish(html("compare.html", current.context(result=result, back=pack_id)))
