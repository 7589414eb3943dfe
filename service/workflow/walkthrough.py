"""A whole review on the command line: a definition becomes a draft, is reviewed, signed off and
sealed in the local archive by three demonstration keys (an author, a reviewer, an approver).

It drives the same library the HTTP API and the review pages use — the same rules, audit records
and sealed file — with the sealing done in this process. Every failed check that may be waived is
waived, and every standing waiver confirmed, with a reason that says it was done by the
walkthrough, so the sealed appendix never passes one off as a person's judgement.
"""

from __future__ import annotations

import functools
from collections.abc import Callable
from dataclasses import dataclass
from pathlib import Path

from service import pipeline
from service.archive import db
from service.archive.db import PackRow, SealRow, failed_checks, standing_waived_checks
from service.archive.files import Store
from service.config import Settings
from service.render.options import from_settings
from service.workflow import drafts, keys, lifecycle, sealing
from service.workflow.keys import Principal, Role

PEOPLE = {
    Role.author: "Demo Author",
    Role.reviewer: "Demo Reviewer",
    Role.approver: "Demo Approver",
}
"""Invented people for the walkthrough's keys."""
REASON = (
    "Accepted by the demonstration walkthrough, not by a person: review this exception yourself."
)


@dataclass(frozen=True)
class Walked:
    pack: PackRow
    seal: SealRow
    draft_pdf: bytes
    sealed_pdf: bytes
    waived: list[str]


def review_and_seal(
    definition: bytes, settings: Settings, say: Callable[[str], None] = lambda _: None
) -> Walked:
    """Draft, submit, waive, sign off and seal one pack in the configured archive."""
    settings.data_dir.mkdir(parents=True, exist_ok=True)
    sessions = db.connect(settings.database_url)
    store = Store(settings.store_dir)
    report_id = str(pipeline.intake(definition, settings.limits).definition.report.id)
    people = {role: _key(sessions, name, role, report_id) for role, name in PEOPLE.items()}
    options = from_settings(settings)
    built = pipeline.build(definition, settings.limits, options=options)
    row = drafts.create(
        sessions=sessions,
        store=store,
        built=built,
        definition=definition,
        author=people[Role.author],
    )
    say(f"draft {row.id} by {PEOPLE[Role.author]}: {built.summary}")
    lifecycle.submit(sessions=sessions, principal=people[Role.author], pack_id=row.id)
    say(f"submitted for review (draft PDF SHA-256 {row.pdf_sha256})")
    waived = []
    for check, chart in sorted(failed_checks(row) | standing_waived_checks(row)):
        lifecycle.waive(
            sessions=sessions,
            store=store,
            principal=people[Role.reviewer],
            pack_id=row.id,
            check=check,
            chart=chart,
            reason=REASON,
        )
        waived.append(f"{check} on {chart}")
        say(f"{PEOPLE[Role.reviewer]} waived {check} on {chart}")
    sealer = functools.partial(
        sealing.seal_pack,
        key_path=settings.seal_key,
        cert_path=settings.seal_cert,
        development_dir=settings.data_dir / "keys",
        limits=settings.limits,
        options=options,
    )
    sealed = sealing.sign_off_and_seal(
        sessions=sessions,
        store=store,
        principal=people[Role.approver],
        pack_id=row.id,
        content_sha256=row.pdf_sha256,
        sealer=sealer,
    )
    say(f"signed off by {PEOPLE[Role.approver]}; sealed pack SHA-256 {sealed.sha256}")
    final = drafts.get(sessions=sessions, pack_id=row.id)
    walked = Walked(final, sealed, built.pdf, store.get(sealed.sha256), waived)
    db.engine_of(sessions).dispose()
    return walked


def _key(sessions: object, name: str, role: Role, report_id: str) -> Principal:
    """A new key of the invented person ``name`` (the same person on every walkthrough in one
    archive: a second person of that name would be refused)."""
    assert callable(sessions)
    key_id, secret = keys.create(
        sessions,  # type: ignore[arg-type]
        name=name,
        roles={role},
        families={report_id},
        expires=None,
        person=keys.person_named(sessions, name),  # type: ignore[arg-type]
    )
    del key_id
    return keys.authenticate(sessions, secret)  # type: ignore[arg-type]


def write(path: Path, data: bytes) -> None:
    from service.archive import files

    files.write_atomic(path, data)
