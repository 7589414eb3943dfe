"""A pack's review lifecycle: submit, request changes, waive failed checks, sign off, supersede.

    draft ──submit──► in_review ──sign_off──► signed_off ──(a later pack of the same report
      ▲                  │                                  and period is signed off)──► superseded
      └─request_changes──┘        (waive: in_review → in_review)

The state lives in ``packs.status``. Every change is one transaction that starts with a
conditional ``UPDATE packs SET status=<to> WHERE id=? AND status=<from> [AND …]``: the row count
says whether the move was legal, the statement takes the database's write lock before anything is
read (so two concurrent sign-offs of one draft cannot both succeed), and every later rule that
refuses raises, which rolls the move back. Each change writes its audit record in that transaction.

Rules: only an author submits; a reviewer who did not author the pack waives a failed, waivable
check with a reason of at least 20 characters, or confirms a standing waiver that came with the
definition; an approver who did not author the pack (separation of duties, NIST SP 800-53 AC-5)
signs off the exact PDF hash that was submitted, and only when every failed check is waived and
every standing waiver confirmed for that hash. A pack outside the key's families is "not found".

Sign-off is two steps so that the slow part (rendering and signing the sealed pack) runs outside
any transaction: :func:`sign_off_preflight` applies every rule read-only and returns the sign-off
record; the caller seals the pack and stores its bytes; :func:`sign_off` applies the rules again in
the transaction that moves the state and records the seal, so a row never claims a file that was
not written, and a lost race (another sign-off won) leaves at most an unclaimed file.
"""

from __future__ import annotations

import json
from dataclasses import dataclass
from datetime import datetime
from typing import Any, cast

from sqlalchemy import ColumnElement, CursorResult, select, update
from sqlalchemy.orm import Session, sessionmaker

from service.archive import audit
from service.archive.db import (
    PackRow,
    ReviewRow,
    SealRow,
    WaiverRow,
    failed_checks,
    now,
    review_of,
    standing_waived_checks,
    utc,
    waived_checks,
)
from service.archive.files import BlobStore
from service.checks.registry import CHECKS
from service.errors import Conflict, Forbidden, InvalidRequest, NotFound
from service.workflow.keys import Principal, Role, can_see

DRAFT, IN_REVIEW, SIGNED_OFF, SUPERSEDED = "draft", "in_review", "signed_off", "superseded"
MIN_REASON = 20

TRANSITIONS: dict[str, tuple[str, str]] = {
    "submit": (DRAFT, IN_REVIEW),
    "request_changes": (IN_REVIEW, DRAFT),
    "waive": (IN_REVIEW, IN_REVIEW),
    "sign_off": (IN_REVIEW, SIGNED_OFF),
    "supersede": (SIGNED_OFF, SUPERSEDED),
}
"""action → (the state it must start from, the state it leaves the pack in)."""

REFUSALS: dict[tuple[str, str], str] = {
    (SIGNED_OFF, "request_changes"): "a signed-off pack cannot be sent back to draft",
    (SIGNED_OFF, "submit"): "a signed-off pack cannot be submitted again; build a new draft",
    (SIGNED_OFF, "sign_off"): "the pack is signed off already",
    (SIGNED_OFF, "waive"): "the checks of a signed-off pack can no longer be waived",
    (IN_REVIEW, "submit"): "the pack is in review already",
    (DRAFT, "request_changes"): "changes can be requested only while the pack is in review",
    (DRAFT, "waive"): "checks are waived during review: submit the draft first",
    (DRAFT, "sign_off"): "a draft must be submitted for review before it is signed off",
}


def refusal(state: str, action: str) -> str:
    if state == SUPERSEDED:
        return "a superseded pack is final: a later pack of its report and period was signed off"
    return REFUSALS.get((state, action), f"cannot {action.replace('_', ' ')} a pack in {state}")


@dataclass(frozen=True)
class Allowed:
    """What a key may do to a pack now: the forms a page offers (each action applies every rule
    again, so a forged form is still refused)."""

    is_author: bool
    submit: bool
    waive: bool
    request_changes: bool
    sign_off: bool


def allowed(
    principal: Principal,
    row: PackRow,
    review: ReviewRow | None,
    *,
    waivable: bool,
    blocked: bool,
) -> Allowed:
    """``waivable``: the pack has a failed check or standing waiver a reviewer may waive or
    confirm; ``blocked``: one is still open."""
    is_author = review is not None and review.is_author(principal.key_id, principal.person)
    in_review = row.status == IN_REVIEW
    roles = principal.roles
    return Allowed(
        is_author=is_author,
        submit=Role.author in roles and row.status == DRAFT,
        waive=Role.reviewer in roles and in_review and not is_author and waivable,
        request_changes=bool(roles & {Role.reviewer, Role.approver}) and in_review,
        sign_off=Role.approver in roles and in_review and not is_author and not blocked,
    )


def record_author(*, sessions: sessionmaker[Any], principal: Principal, pack_id: str) -> None:
    """Name the key that built a draft as its author (call when the draft is created)."""
    principal.require(Role.author)
    with sessions.begin() as session:
        row = _visible(session, principal, pack_id)
        if row.status != DRAFT:
            raise Conflict(f"authors are recorded on drafts; this pack is {row.status}")
        review_of(session, pack_id).add_author(principal.key_id, principal.name, principal.person)
        _record(session, principal, "pack.author_recorded", row, {})


def submit(*, sessions: sessionmaker[Any], principal: Principal, pack_id: str) -> None:
    """An author sends a draft for review; the submitter is recorded as an author."""
    principal.require(Role.author)
    with sessions.begin() as session:
        row = _move(session, principal=principal, pack_id=pack_id, action="submit")
        review = review_of(session, pack_id)
        review.add_author(principal.key_id, principal.name, principal.person)
        review.submitted_sha256, review.submitted_at = row.pdf_sha256, now()
        _record(session, principal, "pack.submitted", row, _moved("submit"))


def request_changes(
    *, sessions: sessionmaker[Any], principal: Principal, pack_id: str, reason: str
) -> None:
    """A reviewer or approver sends a pack in review back to draft, saying why."""
    principal.require(Role.reviewer, Role.approver)
    if not reason.strip():
        raise InvalidRequest("say which changes are needed")
    with sessions.begin() as session:
        row = _move(session, principal=principal, pack_id=pack_id, action="request_changes")
        detail = _moved("request_changes") | {"reason": reason.strip()}
        _record(session, principal, "pack.changes_requested", row, detail)


def waive(
    *,
    sessions: sessionmaker[Any],
    store: BlobStore,
    principal: Principal,
    pack_id: str,
    check: str,
    chart: str,
    reason: str,
) -> None:
    """A reviewer accepts one failed, waivable check on one chart of this exact draft, or confirms
    a standing waiver (one that came with the definition) of a check on it."""
    principal.require(Role.reviewer)
    reason = reason.strip()
    if not MIN_REASON <= len(reason) <= 2000:
        raise InvalidRequest(f"a waiver needs a reason of {MIN_REASON} to 2000 characters")
    with sessions.begin() as session:
        row = _move(session, principal=principal, pack_id=pack_id, action="waive")
        if review_of(session, pack_id).is_author(principal.key_id, principal.person):
            raise Forbidden("nobody waives checks on a pack they authored")
        if (check, chart) not in failed_checks(row) | standing_waived_checks(row):
            raise Conflict(
                f"the check '{check}' did not fail on chart '{chart}' of this pack and has no "
                "standing waiver to confirm"
            )
        intent = _intent(store, row, chart)
        spec = CHECKS.get(check)
        if spec is None or intent is None or not spec.waivable_for(intent):
            raise Conflict(
                f"the check '{check}' protects the integrity of the data and cannot be waived; "
                "fix the data or the chart instead"
            )
        if waived_checks(session, row) & {(check, chart)}:
            raise Conflict(f"'{check}' on '{chart}' is waived already for this draft")
        session.add(
            WaiverRow(
                pack_id=pack_id,
                check=check,
                chart=chart,
                pdf_sha256=row.pdf_sha256,
                reason=reason,
                by_key_id=principal.key_id,
                by_name=principal.name,
                at=now(),
            )
        )
        detail = {"check": check, "chart": chart, "reason": reason}
        _record(session, principal, "check.waived", row, detail)


@dataclass(frozen=True)
class SignOff:
    """What the approver signs off, decided before the sealed pack is rendered."""

    pack_id: str
    report_id: str
    content_sha256: str
    definition_sha256: str
    approver_key_id: str
    approver: str
    at: datetime
    waivers: list[dict[str, str]]
    """Every review waiver and confirmation of the draft: check, chart, reason, by, at, kind."""

    def record(self) -> dict[str, Any]:
        """The sign-off record attached to the sealed pack (``review.json``)."""
        return {
            "pack": self.pack_id,
            "report": self.report_id,
            "reviewed_sha256": self.content_sha256,
            "definition_sha256": self.definition_sha256,
            "signed_off_by": self.approver,
            "signed_off_at": self.at.isoformat(),
            "waivers": self.waivers,
        }


def sign_off_preflight(
    *, sessions: sessionmaker[Any], principal: Principal, pack_id: str, content_sha256: str
) -> SignOff:
    """Every sign-off rule, read-only: raises what :func:`sign_off` would, else the record."""
    principal.require(Role.approver)
    with sessions() as session:
        row = _visible(session, principal, pack_id)
        if row.status != IN_REVIEW:
            raise Conflict(refusal(row.status, "sign_off"))
        if row.pdf_sha256 != content_sha256:
            raise Conflict(_CHANGED)
        review = review_of(session, pack_id)
        _sign_off_rules(session, principal, row, review, content_sha256)
        waivers = session.scalars(
            select(WaiverRow)
            .where(WaiverRow.pack_id == pack_id, WaiverRow.pdf_sha256 == content_sha256)
            .order_by(WaiverRow.chart, WaiverRow.check)
        ).all()
        standing = standing_waived_checks(row)
        return SignOff(
            pack_id=row.id,
            report_id=row.report_id,
            content_sha256=content_sha256,
            definition_sha256=row.definition_sha256,
            approver_key_id=principal.key_id,
            approver=principal.name,
            at=now().replace(microsecond=0),
            waivers=[
                {
                    "check": w.check,
                    "chart": w.chart,
                    "reason": w.reason,
                    "by": w.by_name,
                    "at": utc(w.at).replace(microsecond=0).isoformat(),
                    "kind": "confirmed" if (w.check, w.chart) in standing else "review",
                }
                for w in waivers
            ],
        )


_CHANGED = "the draft changed since it was reviewed: its PDF is no longer the one named"


def sign_off(
    *,
    sessions: sessionmaker[Any],
    principal: Principal,
    pack_id: str,
    content_sha256: str,
    seal: SealRow | None = None,
    at: datetime | None = None,
) -> None:
    """An approver who is not an author signs off the PDF whose SHA-256 they reviewed; with
    ``seal``, the sealed pack (already in the store) is recorded in the same transaction."""
    principal.require(Role.approver)
    with sessions.begin() as session:
        row = _move(
            session,
            principal=principal,
            pack_id=pack_id,
            action="sign_off",
            where=(PackRow.pdf_sha256 == content_sha256,),
            mismatch=_CHANGED,
        )
        review = review_of(session, pack_id)
        _sign_off_rules(session, principal, row, review, content_sha256)
        review.signed_off_by, review.signed_off_name = principal.key_id, principal.name
        review.signed_off_at, review.signed_off_sha256 = at or now(), content_sha256
        detail = _moved("sign_off")
        if seal is not None:
            session.add(seal)
            detail |= {"sealed_sha256": seal.sha256, "development_key": seal.development_key}
        _record(session, principal, "pack.signed_off", row, detail)
        _supersede(session, principal, row)


def _sign_off_rules(
    session: Session, principal: Principal, row: PackRow, review: ReviewRow, content_sha256: str
) -> None:
    if review.is_author(principal.key_id, principal.person):
        raise Forbidden("an author cannot sign off their own pack (separation of duties)")
    if review.submitted_sha256 != content_sha256:
        raise Conflict(_CHANGED)
    waived = waived_checks(session, row)
    open_ = sorted(failed_checks(row) - waived)
    if open_:
        listed = ", ".join(f"{c} on {ch}" for c, ch in open_)
        raise Conflict(f"failed checks are not waived: {listed}")
    unconfirmed = sorted(standing_waived_checks(row) - waived)
    if unconfirmed:
        listed = ", ".join(f"{c} on {ch}" for c, ch in unconfirmed)
        raise Conflict(f"standing waivers need a reviewer's confirmation first: {listed}")


def history(
    *, sessions: sessionmaker[Any], principal: Principal, pack_id: str
) -> list[audit.Entry]:
    """The pack's audit trail, for any key that can see the pack (auditors included)."""
    with sessions() as session:
        _visible(session, principal, pack_id)
    return audit.trail(sessions, pack_id)


def _supersede(session: Session, principal: Principal, row: PackRow) -> None:
    others = session.scalars(
        select(PackRow).where(
            PackRow.report_id == row.report_id,
            PackRow.period == row.period,
            PackRow.id != row.id,
            PackRow.status == SIGNED_OFF,
        )
    ).all()
    for other in others:
        if (utc(other.created_at), other.id) > (utc(row.created_at), row.id):
            raise Conflict(f"a later pack '{other.id}' of this report and period is signed off")
        _move(session, principal=principal, pack_id=other.id, action="supersede", visible=False)
        review_of(session, other.id).superseded_by = row.id
        detail = _moved("supersede") | {"by_pack": row.id}
        _record(session, principal, "pack.superseded", other, detail)


def _move(
    session: Session,
    *,
    principal: Principal,
    pack_id: str,
    action: str,
    where: tuple[ColumnElement[bool], ...] = (),
    mismatch: str = "",
    visible: bool = True,
) -> PackRow:
    """The conditional UPDATE of one transition; raises (rolling back) if it is not legal."""
    source, target = TRANSITIONS[action]
    statement = (
        update(PackRow)
        .where(PackRow.id == pack_id, PackRow.status == source, *where)
        .values(status=target)
        .execution_options(synchronize_session=False)
    )
    moved = cast(CursorResult[Any], session.execute(statement)).rowcount
    row = _visible(session, principal, pack_id) if visible else session.get(PackRow, pack_id)
    assert row is not None
    session.refresh(row)
    if moved != 1:
        raise Conflict(refusal(row.status, action) if row.status != source else mismatch)
    return row


def _visible(session: Session, principal: Principal, pack_id: str) -> PackRow:
    row = session.get(PackRow, pack_id)
    if row is None or not can_see(principal, row.report_id):
        raise NotFound(f"there is no pack '{pack_id}'")
    return row


def _intent(store: BlobStore, row: PackRow, chart: str) -> str | None:
    definition = json.loads(store.get(row.definition_sha256))
    for section in definition.get("sections", []):
        for item in section.get("charts", []):
            if item.get("id") == chart:
                return str(item.get("intent"))
    return None


def _moved(action: str) -> dict[str, Any]:
    source, target = TRANSITIONS[action]
    return {"from": source, "to": target}


def _record(
    session: Session, principal: Principal, action: str, row: PackRow, detail: dict[str, Any]
) -> None:
    audit.append(
        session,
        key_id=principal.key_id,
        name=principal.name,
        action=action,
        pack_id=row.id,
        content_hash=row.pdf_sha256,
        detail=detail,
    )
