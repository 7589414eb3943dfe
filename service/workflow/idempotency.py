"""The stored answers behind ``Idempotency-Key`` (the HTTP side is ``service.api.idempotency``):
a claim per (API key, idempotency key) taken before a request runs, the answer stored after it,
and the claim released when the request fails, all in the archive's ``idempotency`` table.
"""

from __future__ import annotations

from datetime import timedelta
from typing import Any

from sqlalchemy import delete
from sqlalchemy.exc import IntegrityError
from sqlalchemy.orm import sessionmaker

from service.archive.db import IdempotencyRow, now, utc
from service.errors import Conflict, InvalidRequest

HEADER = "Idempotency-Key"
STALE = timedelta(minutes=15)
IN_PROGRESS = 0

Answer = tuple[int, dict[str, Any], str | None]
"""status code, JSON body, Location (or None)."""


def claim(
    sessions: sessionmaker[Any], *, key_id: str, key: str, method: str, path: str, fingerprint: str
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
                        method=method,
                        path=path,
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


def store(sessions: sessionmaker[Any], key_id: str, key: str, answer: Answer) -> None:
    status, body, location = answer
    with sessions.begin() as session:
        row = session.get(IdempotencyRow, (key_id, key))
        assert row is not None
        row.status_code, row.body, row.location = status, body, location


def release(sessions: sessionmaker[Any], key_id: str, key: str) -> None:
    with sessions.begin() as session:
        session.execute(
            delete(IdempotencyRow).where(
                IdempotencyRow.key_id == key_id,
                IdempotencyRow.idempotency_key == key,
                IdempotencyRow.status_code == IN_PROGRESS,
            )
        )


__all__ = ["HEADER", "IN_PROGRESS", "STALE", "Answer", "claim", "release", "store"]
