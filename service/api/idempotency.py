"""``Idempotency-Key`` for POSTs (IETF httpapi draft "The Idempotency-Key HTTP Header Field").

A client that may retry sends a unique key with the request. The first request with a key is
carried out and its answer stored; a retry with the same key and the same request (method, path,
body) gets the stored answer again, with ``Idempotent-Replayed: true``; the same key with a
different request is refused with 422; a retry while the first is still running gets 409.

Keys are scoped to the API key that sent them, so two clients cannot collide or read each other's
answers. Only successful answers are stored: a refused request (a 4xx) changed nothing, so a retry
runs again and gets its own answer. A claim left by a process that died mid-request is taken over
after ``STALE``.
"""

from __future__ import annotations

import hashlib
from collections.abc import Awaitable, Callable
from datetime import timedelta
from typing import Any

from fastapi import Request
from fastapi.responses import JSONResponse
from sqlalchemy import delete
from sqlalchemy.exc import IntegrityError
from sqlalchemy.orm import sessionmaker
from starlette.concurrency import run_in_threadpool

from service.archive.db import IdempotencyRow, now, utc
from service.errors import Conflict, InvalidRequest
from service.workflow.keys import Principal

HEADER = "Idempotency-Key"
MAX_KEY = 255
STALE = timedelta(minutes=15)
IN_PROGRESS = 0

Answer = tuple[int, dict[str, Any], str | None]
"""status code, JSON body, Location (or None)."""


async def once(
    request: Request,
    sessions: sessionmaker[Any],
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
    fingerprint = hashlib.sha256(
        request.method.encode() + b" " + request.url.path.encode() + b"\n" + body
    ).hexdigest()
    stored = await run_in_threadpool(_claim, sessions, principal.key_id, key, request, fingerprint)
    if stored is not None:
        return _respond(stored, replayed=True)
    try:
        answer = await run()
    except BaseException:
        await run_in_threadpool(_release, sessions, principal.key_id, key)
        raise
    await run_in_threadpool(_store, sessions, principal.key_id, key, answer)
    return _respond(answer, replayed=False)


def _respond(answer: Answer, *, replayed: bool) -> JSONResponse:
    status, body, location = answer
    response = JSONResponse(body, status_code=status)
    if location is not None:
        response.headers["Location"] = location
    if replayed:
        response.headers["Idempotent-Replayed"] = "true"
    return response


def _claim(
    sessions: sessionmaker[Any], key_id: str, key: str, request: Request, fingerprint: str
) -> Answer | None:
    """Claim the key for this request, or return the stored answer of the first one."""
    for _ in range(2):
        with sessions.begin() as session:
            row = session.get(IdempotencyRow, (key_id, key))
            if row is None:
                session.add(
                    IdempotencyRow(
                        key_id=key_id,
                        idempotency_key=key,
                        method=request.method,
                        path=request.url.path,
                        request_sha256=fingerprint,
                        status_code=IN_PROGRESS,
                        body={},
                        location=None,
                        created_at=now(),
                    )
                )
                try:
                    session.flush()
                except IntegrityError:
                    session.rollback()
                    continue  # claimed a moment ago by a concurrent request: read theirs
                return None
            if row.request_sha256 != fingerprint:
                raise InvalidRequest(
                    f"this {HEADER} was used for a different request "
                    f"({row.method} {row.path}); use a new key for a new request"
                )
            if row.status_code != IN_PROGRESS:
                return row.status_code, row.body, row.location
            if now() - utc(row.created_at) < STALE:
                raise Conflict(
                    f"a request with this {HEADER} is still being processed; retry later"
                )
            row.created_at = now()  # its first run died: take the claim over
            return None
    raise Conflict(f"a request with this {HEADER} is still being processed; retry later")


def _store(sessions: sessionmaker[Any], key_id: str, key: str, answer: Answer) -> None:
    status, body, location = answer
    with sessions.begin() as session:
        row = session.get(IdempotencyRow, (key_id, key))
        assert row is not None
        row.status_code, row.body, row.location = status, body, location


def _release(sessions: sessionmaker[Any], key_id: str, key: str) -> None:
    with sessions.begin() as session:
        session.execute(
            delete(IdempotencyRow).where(
                IdempotencyRow.key_id == key_id,
                IdempotencyRow.idempotency_key == key,
                IdempotencyRow.status_code == IN_PROGRESS,
            )
        )
