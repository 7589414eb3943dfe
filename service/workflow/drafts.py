"""Drafts: a built pack stored as a draft — bytes first, then the row that points at them."""

from __future__ import annotations

import uuid
from typing import Any

from sqlalchemy.orm import sessionmaker

from service.archive.db import PackRow, now
from service.archive.files import Store
from service.errors import NotFound
from service.pipeline import Built

DRAFT = "draft"


def create(
    *, sessions: sessionmaker[Any], store: Store, built: Built, definition: bytes
) -> PackRow:
    definition_digest = store.put(definition)
    pdf_digest = store.put(built.pdf)
    row = PackRow(
        id=f"pk_{uuid.uuid4().hex}",
        report_id=built.report["id"],
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
    return row


def get(*, sessions: sessionmaker[Any], pack_id: str) -> PackRow:
    with sessions() as session:
        row = session.get(PackRow, pack_id)
    if not isinstance(row, PackRow):
        raise NotFound(f"there is no pack '{pack_id}'")
    return row
