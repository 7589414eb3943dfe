"""Drafts and the archive's packs: a built pack stored as a draft — bytes first, then the row that
points at them — and the read side: one visible pack, a search, a pack's sealed file."""

from __future__ import annotations

import uuid
from dataclasses import dataclass
from typing import Any

from sqlalchemy import ColumnElement, false, func, or_, select
from sqlalchemy.orm import sessionmaker

from service.archive import audit
from service.archive.db import PackRow, ReviewRow, SealRow, WaiverRow, now
from service.archive.files import BlobStore
from service.errors import Forbidden, InvalidRequest, NotFound
from service.pipeline import Built
from service.workflow.keys import Principal, Role, can_see

Pack = PackRow
"""A stored pack, as the edges name it (they do not import the archive's tables)."""

DRAFT = "draft"
STATUSES = ("draft", "in_review", "signed_off", "superseded")
MAX_PAGE = 200


def create(
    *,
    sessions: sessionmaker[Any],
    store: BlobStore,
    built: Built,
    definition: bytes,
    author: Principal | None = None,
) -> PackRow:
    """Store a built draft; with ``author``, the key is checked (author role, the report's family)
    and recorded as the draft's author in the same transaction as the row."""
    report_id = str(built.report["id"])
    if author is not None:
        author.require(Role.author)
        if not can_see(author, report_id):
            raise Forbidden(
                f"the key '{author.key_id}' is not granted the report family of '{report_id}'"
            )
    definition_digest = store.put(definition)
    pdf_digest = store.put(built.pdf)
    row = PackRow(
        id=f"pk_{uuid.uuid4().hex}",
        report_id=report_id,
        title=built.report["title"],
        period=built.report["period"],
        as_of=built.report["as_of"],
        status=DRAFT,
        blocked=built.blocked,
        summary=built.counts,
        results=built.results,
        unused_waivers=built.unused_waivers,
        definition_sha256=definition_digest,
        pdf_sha256=pdf_digest,
        pdf_bytes=len(built.pdf),
        created_at=now(),
    )
    with sessions.begin() as session:
        session.add(row)
        if author is not None:
            session.flush()
            review = ReviewRow(pack_id=row.id, authors=[])
            review.add_author(author.key_id, author.name, author.person)
            session.add(review)
            audit.append(
                session,
                key_id=author.key_id,
                name=author.name,
                action="pack.created",
                pack_id=row.id,
                content_hash=pdf_digest,
                detail={"report": report_id, "definition_sha256": definition_digest},
            )
    return row


def get(*, sessions: sessionmaker[Any], pack_id: str) -> PackRow:
    with sessions() as session:
        row = session.get(PackRow, pack_id)
    if not isinstance(row, PackRow):
        raise NotFound(f"there is no pack '{pack_id}'")
    return row


def visible(*, sessions: sessionmaker[Any], principal: Principal, pack_id: str) -> PackRow:
    """The pack, if the key may see it; another family's pack is "not found", like a missing one."""
    row = get(sessions=sessions, pack_id=pack_id)
    if not can_see(principal, row.report_id):
        raise NotFound(f"there is no pack '{pack_id}'")
    return row


def seal_of(*, sessions: sessionmaker[Any], pack_id: str) -> SealRow | None:
    with sessions() as session:
        found: SealRow | None = session.get(SealRow, pack_id)
    return found


def review(*, sessions: sessionmaker[Any], pack_id: str) -> ReviewRow | None:
    with sessions() as session:
        found: ReviewRow | None = session.get(ReviewRow, pack_id)
    return found


def waivers_of(*, sessions: sessionmaker[Any], pack_id: str) -> list[WaiverRow]:
    """The waivers given in review of a pack, in the order they were given."""
    with sessions() as session:
        return list(
            session.scalars(
                select(WaiverRow).where(WaiverRow.pack_id == pack_id).order_by(WaiverRow.id)
            ).all()
        )


@dataclass(frozen=True)
class Query:
    """A search of the archive; every field narrows it, ``None`` leaves it open."""

    report: str | None = None
    period: str | None = None
    """Part of the period's label, case-insensitive."""
    status: str | None = None
    signer: str | None = None
    """Part of the approver's name, case-insensitive."""
    limit: int = 50
    offset: int = 0

    def checked(self) -> Query:
        if self.status is not None and self.status not in STATUSES:
            raise InvalidRequest(f"status '{self.status}' is not one of: {', '.join(STATUSES)}")
        if not 1 <= self.limit <= MAX_PAGE:
            raise InvalidRequest(f"limit must be 1 to {MAX_PAGE}")
        if self.offset < 0:
            raise InvalidRequest("offset must be 0 or more")
        return self


def search(
    *, sessions: sessionmaker[Any], principal: Principal, query: Query
) -> tuple[list[PackRow], int]:
    """Packs the key may see that match, newest first, and how many match in all."""
    query = query.checked()
    where: list[ColumnElement[bool]] = [_families(principal)]
    if query.report is not None:
        where.append(PackRow.report_id == query.report)
    if query.period is not None:
        where.append(func.lower(PackRow.period).contains(query.period.lower(), autoescape=True))
    if query.status is not None:
        where.append(PackRow.status == query.status)
    statement = select(PackRow).outerjoin(ReviewRow, ReviewRow.pack_id == PackRow.id)
    if query.signer is not None:
        where.append(
            func.lower(ReviewRow.signed_off_name).contains(query.signer.lower(), autoescape=True)
        )
    with sessions() as session:
        total = session.scalar(statement.with_only_columns(func.count()).where(*where)) or 0
        rows = session.scalars(
            statement.where(*where)
            .order_by(PackRow.created_at.desc(), PackRow.id)
            .limit(query.limit)
            .offset(query.offset)
        ).all()
    return list(rows), int(total)


def _families(principal: Principal) -> ColumnElement[bool]:
    """The SQL form of :func:`service.workflow.keys.can_see`."""
    if "*" in principal.families:
        return PackRow.id.is_not(None)
    granted: list[ColumnElement[bool]] = []
    for family in sorted(principal.families):
        granted.append(PackRow.report_id == family)
        for boundary in "-_":
            granted.append(PackRow.report_id.startswith(family + boundary, autoescape=True))
    return or_(*granted) if granted else false()
