"""What a consistent archive is, checked after every injected fault.

- every pack is whole or absent: a pack row with an author has its review row and its
  ``pack.created`` audit record, and a job that says *done* names a pack that exists;
- no row claims a file it does not have: every PDF and definition hash a pack row names, and every
  sealed file a seal row names, is in the store and hashes to that name (with the recorded size);
- a pack is signed off (or superseded) exactly when it has a seal row and a ``pack.signed_off``
  audit record, and its review names the approver;
- the audit trail has no gap in its sequence numbers.

Files no row names (a write interrupted between the store and the database) are allowed: they are
counted, not claimed.
"""

from __future__ import annotations

import hashlib
from dataclasses import dataclass, field
from pathlib import Path

from sqlalchemy import select

from service.archive import audit
from service.archive.db import (
    AuditRow,
    JobRow,
    PackRow,
    ReviewRow,
    SealRow,
    connect,
    engine_of,
)
from service.archive.files import Store


@dataclass
class Found:
    packs: dict[str, PackRow]
    jobs: dict[str, JobRow]
    signed: set[str]
    claimed: set[str]
    """Every file hash some row names."""
    unclaimed: set[str] = field(default_factory=set)
    """Stored files no row names (left by an interrupted write: allowed)."""
    temporary: list[Path] = field(default_factory=list)
    """Temporary files of writes killed mid-way (allowed after a SIGKILL, never claimed)."""


def check(url: str, files: Path, *, approver: str | None = None) -> Found:
    """Assert every invariant of the archive at ``url`` with its file store under ``files``."""
    sessions = connect(url)
    store = Store(files)
    try:
        with sessions() as session:
            packs = {p.id: p for p in session.scalars(select(PackRow))}
            seals = {s.pack_id: s for s in session.scalars(select(SealRow))}
            reviews = {r.pack_id: r for r in session.scalars(select(ReviewRow))}
            jobs = {j.id: j for j in session.scalars(select(JobRow))}
            records = list(session.scalars(select(AuditRow)))
        gaps = audit.gaps(sessions)
    finally:
        engine_of(sessions).dispose()

    claimed: set[str] = set()
    for pack in packs.values():
        pdf = _stored(store, pack.pdf_sha256, f"the draft PDF of {pack.id}")
        assert len(pdf) == pack.pdf_bytes, f"{pack.id}: the stored PDF is not the recorded size"
        _stored(store, pack.definition_sha256, f"the definition of {pack.id}")
        claimed |= {pack.pdf_sha256, pack.definition_sha256}
    for sealed in seals.values():
        data = _stored(store, sealed.sha256, f"the sealed file of {sealed.pack_id}")
        assert len(data) == sealed.bytes, f"{sealed.pack_id}: the sealed file is not its size"
        claimed.add(sealed.sha256)

    created = {a.pack_id for a in records if a.action == "pack.created"}
    for pack_id, review in reviews.items():
        assert pack_id in packs, f"a review row of a pack that is not there: {pack_id}"
        if review.authors:
            assert pack_id in created, f"{pack_id} has an author but no pack.created record"
    for pack_id in created:
        assert pack_id in packs, f"a pack.created record of a pack that is not there: {pack_id}"
    for job in jobs.values():
        if job.status == "done":
            assert job.pack_id in packs, f"job {job.id} is done but its pack is not there"
        if job.pack_id is not None:
            assert job.status == "done", f"job {job.id} names a pack but is {job.status}"

    signed = {p for p, row in packs.items() if row.status in ("signed_off", "superseded")}
    signed_records = {a.pack_id for a in records if a.action == "pack.signed_off"}
    assert signed == set(seals) == signed_records, (signed, set(seals), signed_records)
    for pack_id in signed:
        assert reviews[pack_id].signed_off_sha256 == packs[pack_id].pdf_sha256
        if approver is not None:
            assert reviews[pack_id].signed_off_name == approver
    assert gaps == [], f"the audit trail has gaps: {gaps}"

    everything = {
        p.parent.name + p.name
        for p in files.glob("*/*")
        if p.is_file() and not p.name.startswith(".")
    }
    return Found(
        packs=packs,
        jobs=jobs,
        signed=signed,
        claimed=claimed,
        unclaimed=everything - claimed,
        temporary=store.temporary(),
    )


def _stored(store: Store, digest: str, what: str) -> bytes:
    path = store.path(digest)
    assert path.is_file(), f"{what} is claimed but missing from the store ({digest})"
    data = path.read_bytes()
    assert hashlib.sha256(data).hexdigest() == digest, f"{what} does not hash to its name"
    return data
