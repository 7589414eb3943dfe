"""``Idempotency-Key`` for POSTs (IETF httpapi draft "The Idempotency-Key HTTP Header Field").

A client that may retry sends a unique key with the request. The first request with a key is
carried out and its answer stored; a retry with the same key and the same request (method, path,
query string, body) gets the stored answer again, with ``Idempotent-Replayed: true``; the same key with a
different request is refused with 422; a retry while the first is still running gets 409.

Keys are scoped to the API key that sent them, so two clients cannot collide or read each other's
answers. Only successful answers are stored: a refused request (a 4xx) changed nothing, so a retry
runs again and gets its own answer. A claim left by a process that died mid-request is taken over
after ``STALE``.
"""

from __future__ import annotations

import hashlib
from collections.abc import Awaitable, Callable

from fastapi import Request
from fastapi.responses import JSONResponse
from starlette.concurrency import run_in_threadpool

from service.errors import InvalidRequest
from service.runner.services import Services
from service.workflow import idempotency as answers
from service.workflow.idempotency import HEADER, Answer
from service.workflow.keys import Principal

MAX_KEY = 255


async def once(
    request: Request,
    services: Services,
    principal: Principal,
    body: bytes,
    run: Callable[[], Awaitable[Answer]],
) -> JSONResponse:
    """Carry out ``run`` at most once per ``Idempotency-Key`` (or every time without one)."""
    key = request.headers.get(HEADER)
    if key is None:
        return _respond(await run(), replayed=False)
    key = key.strip().strip('"')
    if not 1 <= len(key) <= MAX_KEY or not key.isprintable():
        raise InvalidRequest(f"an {HEADER} is 1 to {MAX_KEY} printable characters")
    target = request.url.path + ("?" + request.url.query if request.url.query else "")
    fingerprint = hashlib.sha256(
        request.method.encode() + b" " + target.encode() + b"\n" + body
    ).hexdigest()
    sessions = services.sessions
    stored = await run_in_threadpool(
        answers.claim,
        sessions,
        key_id=principal.key_id,
        key=key,
        method=request.method,
        path=request.url.path,
        fingerprint=fingerprint,
    )
    if stored is not None:
        return _respond(stored, replayed=True)
    try:
        answer = await run()
    except BaseException:
        await run_in_threadpool(answers.release, sessions, principal.key_id, key)
        raise
    await run_in_threadpool(answers.store, sessions, principal.key_id, key, answer)
    return _respond(answer, replayed=False)


def _respond(answer: Answer, *, replayed: bool) -> JSONResponse:
    status, body, location = answer
    response = JSONResponse(body, status_code=status)
    if location is not None:
        response.headers["Location"] = location
    if replayed:
        response.headers["Idempotent-Replayed"] = "true"
    return response


__all__ = ["HEADER", "MAX_KEY", "Answer", "once"]
