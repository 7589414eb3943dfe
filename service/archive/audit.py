"""The audit trail: append-only records of who did what to which pack, and with which content.

Every change to a pack's review or to a key writes one record with :func:`append` *in the same
transaction as the change*, so a change without its record (or a record without its change) cannot
be committed. Sequence numbers are assigned as ``max + 1`` inside the writer's transaction (not by
a database sequence, which may skip numbers on a rollback), so :func:`gaps` can prove that no
record was removed. The database refuses to rewrite a record: the first migration
(``service/archive/migrations``) gives the table triggers that abort any UPDATE or DELETE on SQLite,
and UPDATE, DELETE or TRUNCATE on PostgreSQL; on other databases grant the service INSERT and
SELECT only.

Two writers must not read the same ``max``. On SQLite the caller's transaction holds the database's
write lock by the time it appends (its first change took it). On PostgreSQL, under READ COMMITTED,
two transactions could both read ``max`` and clash on ``seq``, so :func:`append` first takes a
transaction-level advisory lock: writers queue for it until the holder commits or rolls back, and
the next one reads a ``max`` that includes the committed record. An advisory lock needs no
privilege beyond connecting, unlike ``LOCK TABLE``, which the INSERT-and-SELECT grant would refuse.
"""

from __future__ import annotations

from dataclasses import dataclass
from datetime import datetime
from typing import Any

from sqlalchemy import func, select, text
from sqlalchemy.orm import Session, sessionmaker

from service.archive.db import AuditRow, now, utc

LOCK_KEY = 0x504C_4155_4454  # any constant bigint; ASCII "PLAUDT": Plumbline's audit writer lock
"""The PostgreSQL advisory lock held by the transaction that appends an audit record."""


@dataclass(frozen=True)
class Entry:
    seq: int
    at: datetime
    key_id: str | None
    name: str
    action: str
    pack_id: str | None
    content_hash: str | None
    detail: dict[str, Any]


def append(
    session: Session,
    *,
    key_id: str | None,
    name: str,
    action: str,
    pack_id: str | None = None,
    content_hash: str | None = None,
    detail: dict[str, Any] | None = None,
) -> int:
    """Add one record to the caller's open transaction; returns its sequence number."""
    if session.get_bind().dialect.name == "postgresql":
        session.execute(text("SELECT pg_advisory_xact_lock(:key)"), {"key": LOCK_KEY})
    last = session.scalar(select(func.coalesce(func.max(AuditRow.seq), 0)))
    seq = int(last or 0) + 1
    session.add(
        AuditRow(
            seq=seq,
            at=now(),
            key_id=key_id,
            name=name,
            action=action,
            pack_id=pack_id,
            content_hash=content_hash,
            detail=dict(detail or {}),
        )
    )
    session.flush()  # a clash on ``seq`` (a concurrent writer) fails here, inside the transaction
    return seq


def trail(sessions: sessionmaker[Any], pack_id: str) -> list[Entry]:
    """Every record about one pack, oldest first."""
    with sessions() as session:
        rows = session.scalars(
            select(AuditRow).where(AuditRow.pack_id == pack_id).order_by(AuditRow.seq)
        ).all()
        return [_entry(row) for row in rows]


def everything(sessions: sessionmaker[Any]) -> list[Entry]:
    """The whole trail, oldest first (for an auditor's export)."""
    with sessions() as session:
        return [_entry(r) for r in session.scalars(select(AuditRow).order_by(AuditRow.seq))]


def gaps(sessions: sessionmaker[Any]) -> list[int]:
    """The sequence numbers missing from 1 to the last record: empty when the trail is whole."""
    with sessions() as session:
        present = set(session.scalars(select(AuditRow.seq)))
    if not present:
        return []
    return [n for n in range(1, max(present) + 1) if n not in present]


def _entry(row: AuditRow) -> Entry:
    return Entry(
        seq=row.seq,
        at=utc(row.at),
        key_id=row.key_id,
        name=row.name,
        action=row.action,
        pack_id=row.pack_id,
        content_hash=row.content_hash,
        detail=dict(row.detail),
    )
