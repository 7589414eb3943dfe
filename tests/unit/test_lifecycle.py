"""The review lifecycle against a real SQLite file: every rule passes when kept and refuses with the
right error when broken; illegal transitions are 409s; two concurrent sign-offs, exactly one wins."""

from __future__ import annotations

import hashlib
import json
import threading
import uuid
from collections.abc import Callable, Iterable
from datetime import timedelta
from pathlib import Path
from typing import Any

import pytest
from sqlalchemy import update
from sqlalchemy.orm import sessionmaker

from service.archive import audit
from service.archive.db import PackRow, ReviewRow, WaiverRow, connect, now
from service.archive.files import Store
from service.errors import NotFound
from service.workflow import lifecycle
from service.workflow.keys import Forbidden, InvalidRequest, Principal, Role, authenticate, create
from service.workflow.lifecycle import Conflict

REPORT = "hollin-vale-ops-monthly"
REASON = "The board asked for this scale; noted in the narrative."
CHARTS = [("riders", "trend"), ("shares", "share"), ("costs", "compare")]


class World:
    """A real SQLite file, a file store, and one key per person."""

    def __init__(self, tmp_path: Path) -> None:
        self.sessions: sessionmaker[Any] = connect(f"sqlite:///{tmp_path / 'a.db'}")
        self.store = Store(tmp_path / "files")
        self.ann = self.key("Ann Author", Role.author)
        self.rui = self.key("Rui Reviewer", Role.reviewer)
        self.pat = self.key("Pat Approver", Role.approver)
        self.quinn = self.key("Quinn Approver", Role.approver)
        self.ada = self.key("Ada Auditor", Role.auditor)
        self.all_rounder = self.key("Sam Both", Role.author, Role.reviewer, Role.approver)
        self.stranger = self.key(
            "Mo Elsewhere", Role.author, Role.reviewer, Role.approver, family="marsh-end"
        )

    def key(
        self, name: str, *roles: Role, family: str = "hollin-vale", person: str | None = None
    ) -> Principal:
        """A principal as ``keys.authenticate`` returns it (scrypt per key would slow every test;
        ``test_keys_made_and_authenticated_drive_the_lifecycle`` goes through the real keys)."""
        key_id = f"key_{uuid.uuid4().hex[:16]}"
        person = person or f"person_{uuid.uuid4().hex[:16]}"
        return Principal(key_id, name, frozenset(roles), frozenset({family}), person)

    def pack(
        self,
        *,
        failed: Iterable[tuple[str, str]] = (),
        period: str = "Twelve months to November 2026",
        created_at_offset: timedelta = timedelta(0),
    ) -> PackRow:
        definition = {
            "version": 1,
            "report": {"id": REPORT},
            "sections": [{"heading": "All", "charts": [{"id": c, "intent": i} for c, i in CHARTS]}],
        }
        pdf = f"%PDF-1.7 draft {uuid.uuid4()}".encode()
        results = [{"check": "source-line", "chart": "riders", "status": "passed"}]
        results += [{"check": check, "chart": chart, "status": "failed"} for check, chart in failed]
        row = PackRow(
            id=f"pk_{uuid.uuid4().hex}",
            report_id=REPORT,
            title="Monthly operations pack",
            period=period,
            as_of="2026-11-09T07:30:00+00:00",
            status="draft",
            blocked=bool(results[1:]),
            summary={},
            results=results,
            unused_waivers=[],
            definition_sha256=self.store.put(json.dumps(definition).encode()),
            pdf_sha256=self.store.put(pdf),
            pdf_bytes=len(pdf),
            created_at=now() + created_at_offset,
        )
        with self.sessions.begin() as session:
            session.add(row)
        return row

    def status(self, pack_id: str) -> str:
        with self.sessions() as session:
            row = session.get(PackRow, pack_id)
            assert isinstance(row, PackRow)
            return row.status

    def set_status(self, pack_id: str, status: str) -> None:
        with self.sessions.begin() as session:
            session.execute(update(PackRow).where(PackRow.id == pack_id).values(status=status))

    def replace_pdf(self, pack_id: str) -> str:
        """The draft's PDF is rebuilt under the same pack id (a changed draft)."""
        digest = self.store.put(f"%PDF-1.7 rebuilt {uuid.uuid4()}".encode())
        with self.sessions.begin() as session:
            session.execute(update(PackRow).where(PackRow.id == pack_id).values(pdf_sha256=digest))
        return digest

    def submit(self, pack: PackRow, who: Principal | None = None) -> None:
        lifecycle.submit(sessions=self.sessions, principal=who or self.ann, pack_id=pack.id)

    def waive(self, pack: PackRow, check: str, chart: str, **kw: Any) -> None:
        args: dict[str, Any] = {"principal": self.rui, "reason": REASON}
        lifecycle.waive(
            sessions=self.sessions,
            store=self.store,
            pack_id=pack.id,
            check=check,
            chart=chart,
            **(args | kw),
        )

    def sign(self, pack: PackRow, who: Principal | None = None, digest: str | None = None) -> None:
        lifecycle.sign_off(
            sessions=self.sessions,
            principal=who or self.pat,
            pack_id=pack.id,
            content_sha256=digest or pack.pdf_sha256,
        )

    def send_back(self, pack: PackRow, who: Principal | None = None) -> None:
        lifecycle.request_changes(
            sessions=self.sessions,
            principal=who or self.rui,
            pack_id=pack.id,
            reason="Label the axis.",
        )

    def actions(self, pack_id: str) -> list[str]:
        return [e.action for e in audit.trail(self.sessions, pack_id)]


@pytest.fixture
def w(tmp_path: Path) -> World:
    return World(tmp_path)


# --- submit and request changes ------------------------------------------------------------------


def test_an_author_submits_and_a_reviewer_sends_back(w: World) -> None:
    pack = w.pack()
    w.submit(pack)
    assert w.status(pack.id) == "in_review"
    w.send_back(pack)
    assert w.status(pack.id) == "draft"
    w.submit(pack)
    assert w.actions(pack.id) == ["pack.submitted", "pack.changes_requested", "pack.submitted"]


def test_only_an_author_submits(w: World) -> None:
    pack = w.pack()
    for who in (w.rui, w.pat, w.ada):
        with pytest.raises(Forbidden, match="author role"):
            w.submit(pack, who)
    assert w.status(pack.id) == "draft"


def test_request_changes_needs_a_reviewer_or_approver_and_a_reason(w: World) -> None:
    pack = w.pack()
    w.submit(pack)
    with pytest.raises(Forbidden):
        w.send_back(pack, w.ann)
    with pytest.raises(InvalidRequest, match="changes"):
        lifecycle.request_changes(sessions=w.sessions, principal=w.rui, pack_id=pack.id, reason=" ")
    w.send_back(pack, w.pat)
    assert w.status(pack.id) == "draft"


def test_another_familys_pack_is_not_found(w: World) -> None:
    pack = w.pack()
    with pytest.raises(NotFound):
        w.submit(pack, w.stranger)
    w.submit(pack)
    with pytest.raises(NotFound):
        w.waive(pack, "precision", "riders", principal=w.stranger)
    with pytest.raises(NotFound):
        w.sign(pack, w.stranger)
    with pytest.raises(NotFound):
        lifecycle.history(sessions=w.sessions, principal=w.stranger, pack_id=pack.id)
    with pytest.raises(NotFound):
        lifecycle.sign_off(
            sessions=w.sessions, principal=w.pat, pack_id="pk_missing", content_sha256="0" * 64
        )
    assert w.status(pack.id) == "in_review"


# --- the transition table -------------------------------------------------------------------------

ACTIONS: dict[str, Callable[[World, PackRow], None]] = {
    "submit": lambda w, p: w.submit(p, w.all_rounder),
    "request_changes": lambda w, p: w.send_back(p),
    "waive": lambda w, p: w.waive(p, "precision", "riders"),
    "sign_off": lambda w, p: w.sign(p),
}


@pytest.mark.parametrize("state", ["draft", "in_review", "signed_off", "superseded"])
@pytest.mark.parametrize("action", list(ACTIONS))
def test_every_move_outside_the_table_is_a_conflict(w: World, state: str, action: str) -> None:
    pack = w.pack(failed=[("precision", "riders")] if action == "waive" else [])
    w.set_status(pack.id, state)
    with w.sessions.begin() as session:  # an authored pack, so only the state can refuse
        session.add(ReviewRow(pack_id=pack.id, authors=[], submitted_sha256=pack.pdf_sha256))
    allowed = lifecycle.TRANSITIONS[action][0] == state
    if allowed:
        ACTIONS[action](w, pack)
        assert w.status(pack.id) == lifecycle.TRANSITIONS[action][1]
        return
    with pytest.raises(Conflict) as caught:
        ACTIONS[action](w, pack)
    assert caught.value.status == 409
    assert caught.value.message == lifecycle.refusal(state, action)
    assert w.status(pack.id) == state
    assert w.actions(pack.id) == []


def test_a_signed_off_pack_cannot_be_sent_back(w: World) -> None:
    pack = w.pack()
    w.submit(pack)
    w.sign(pack)
    with pytest.raises(Conflict, match="a signed-off pack cannot be sent back to draft"):
        w.send_back(pack)


# --- waivers -------------------------------------------------------------------------------------


def test_a_reviewer_waives_a_failed_waivable_check(w: World) -> None:
    pack = w.pack(failed=[("precision", "riders")])
    w.submit(pack)
    before = now()
    w.waive(pack, "precision", "riders", reason=f"  {REASON}  ")
    with w.sessions() as session:
        (waiver,) = session.query(WaiverRow).all()
    assert (waiver.check, waiver.chart, waiver.reason) == ("precision", "riders", REASON)
    assert (waiver.by_key_id, waiver.by_name) == (w.rui.key_id, "Rui Reviewer")
    assert waiver.pdf_sha256 == pack.pdf_sha256
    assert before - timedelta(seconds=1) <= waiver.at.replace(tzinfo=before.tzinfo) <= now()
    assert w.status(pack.id) == "in_review"


@pytest.mark.parametrize("reason", ["", "too short", "x" * 19, " " * 30, "x" * 2001])
def test_a_waiver_needs_a_reason_of_at_least_20_characters(w: World, reason: str) -> None:
    pack = w.pack(failed=[("precision", "riders")])
    w.submit(pack)
    with pytest.raises(InvalidRequest, match="20") as caught:
        w.waive(pack, "precision", "riders", reason=reason)
    assert caught.value.status == 422
    w.waive(pack, "precision", "riders", reason="x" * 20)  # exactly 20 is enough


def test_only_a_reviewer_waives(w: World) -> None:
    pack = w.pack(failed=[("precision", "riders")])
    w.submit(pack)
    for who in (w.ann, w.pat, w.ada):
        with pytest.raises(Forbidden, match="reviewer"):
            w.waive(pack, "precision", "riders", principal=who)


def test_nobody_waives_checks_on_a_pack_they_authored(w: World, tmp_path: Path) -> None:
    pack = w.pack(failed=[("precision", "riders")])
    w.submit(pack, w.all_rounder)
    with pytest.raises(Forbidden, match="authored"):
        w.waive(pack, "precision", "riders", principal=w.all_rounder)
    twin = w.key("Sam's reviewer key", Role.reviewer, person=w.all_rounder.person)
    with pytest.raises(Forbidden, match="authored"):
        w.waive(pack, "precision", "riders", principal=twin)
    w.waive(pack, "precision", "riders")


def test_the_recorded_author_of_a_draft_cannot_waive_either(w: World) -> None:
    pack = w.pack(failed=[("precision", "riders")])
    lifecycle.record_author(sessions=w.sessions, principal=w.all_rounder, pack_id=pack.id)
    w.submit(pack)  # submitted by someone else
    with pytest.raises(Forbidden, match="authored"):
        w.waive(pack, "precision", "riders", principal=w.all_rounder)
    with w.sessions() as session:
        review = session.get(ReviewRow, pack.id)
    assert review is not None
    assert [a["key_id"] for a in review.authors] == [w.all_rounder.key_id, w.ann.key_id]


@pytest.mark.parametrize(
    ("check", "chart"),
    [
        ("missing-periods", "riders"),  # a data-integrity rule: never waivable
        ("bar-zero-baseline", "shares"),  # waivable, but never for a share (parts of a whole)
    ],
)
def test_a_data_integrity_failure_cannot_be_waived(w: World, check: str, chart: str) -> None:
    pack = w.pack(failed=[(check, chart)])
    w.submit(pack)
    with pytest.raises(Conflict, match="integrity of the data"):
        w.waive(pack, check, chart)
    with pytest.raises(Conflict, match=f"not waived: {check} on {chart}"):
        w.sign(pack)


def test_the_same_check_is_waivable_on_a_compare_chart(w: World) -> None:
    pack = w.pack(failed=[("bar-zero-baseline", "costs")])
    w.submit(pack)
    w.waive(pack, "bar-zero-baseline", "costs")
    w.sign(pack)
    assert w.status(pack.id) == "signed_off"


def test_only_a_failed_check_is_waived_and_only_once(w: World) -> None:
    pack = w.pack(failed=[("precision", "riders")])
    w.submit(pack)
    with pytest.raises(Conflict, match="did not fail"):
        w.waive(pack, "source-line", "riders")  # it passed
    with pytest.raises(Conflict, match="did not fail"):
        w.waive(pack, "precision", "costs")  # failed on another chart
    w.waive(pack, "precision", "riders")
    with pytest.raises(Conflict, match="waived already"):
        w.waive(pack, "precision", "riders")


# --- sign-off ------------------------------------------------------------------------------------


def test_an_approver_signs_off_the_hash_that_was_reviewed(w: World) -> None:
    pack = w.pack(failed=[("precision", "riders")])
    w.submit(pack)
    w.waive(pack, "precision", "riders")
    w.sign(pack)
    assert w.status(pack.id) == "signed_off"
    with w.sessions() as session:
        review = session.get(ReviewRow, pack.id)
    assert review is not None
    assert (review.signed_off_by, review.signed_off_name) == (w.pat.key_id, "Pat Approver")
    assert review.signed_off_sha256 == pack.pdf_sha256
    assert review.signed_off_at is not None
    digest = hashlib.sha256(w.store.get(pack.pdf_sha256)).hexdigest()
    assert review.signed_off_sha256 == digest  # the name is the PDF's own SHA-256


def test_only_an_approver_signs_off(w: World) -> None:
    pack = w.pack()
    w.submit(pack)
    for who in (w.ann, w.rui, w.ada):
        with pytest.raises(Forbidden, match="approver"):
            w.sign(pack, who)


def test_an_author_cannot_sign_off_their_own_pack(w: World) -> None:
    """Separation of duties (NIST SP 800-53 Rev. 5, control AC-5)."""
    pack = w.pack()
    w.submit(pack, w.all_rounder)
    with pytest.raises(Forbidden, match="separation of duties"):
        w.sign(pack, w.all_rounder)
    assert w.status(pack.id) == "in_review"  # the refused move was rolled back
    assert w.actions(pack.id) == ["pack.submitted"]
    w.sign(pack)


def test_sign_off_is_refused_while_a_failed_check_is_unwaived(w: World) -> None:
    pack = w.pack(failed=[("precision", "riders"), ("series-count", "riders")])
    w.submit(pack)
    w.waive(pack, "precision", "riders")
    with pytest.raises(Conflict, match="not waived: series-count on riders"):
        w.sign(pack)
    assert w.status(pack.id) == "in_review"
    w.waive(pack, "series-count", "riders")
    w.sign(pack)


def test_sign_off_names_the_exact_content_hash(w: World) -> None:
    pack = w.pack()
    w.submit(pack)
    with pytest.raises(Conflict, match="changed since it was reviewed"):
        w.sign(pack, digest=hashlib.sha256(b"another file").hexdigest())
    assert w.status(pack.id) == "in_review"


def test_sign_off_is_refused_if_the_draft_changed_since(w: World) -> None:
    pack = w.pack()
    w.submit(pack)
    rebuilt = w.replace_pdf(pack.id)
    with pytest.raises(Conflict, match="changed since it was reviewed"):
        w.sign(pack)  # the hash the approver reviewed
    with pytest.raises(Conflict, match="changed since it was reviewed"):
        w.sign(pack, digest=rebuilt)  # the new PDF was never submitted for review
    assert w.status(pack.id) == "in_review"


def test_a_waiver_does_not_carry_over_to_a_changed_draft(w: World) -> None:
    pack = w.pack(failed=[("precision", "riders")])
    w.submit(pack)
    w.waive(pack, "precision", "riders")
    w.send_back(pack)
    rebuilt = w.replace_pdf(pack.id)
    w.submit(pack)
    with pytest.raises(Conflict, match="not waived: precision on riders"):
        w.sign(pack, digest=rebuilt)
    w.waive(pack, "precision", "riders")
    w.sign(pack, digest=rebuilt)
    assert w.status(pack.id) == "signed_off"


# --- superseded ----------------------------------------------------------------------------------


def test_signing_off_a_later_pack_supersedes_the_earlier_one(w: World) -> None:
    first = w.pack(created_at_offset=timedelta(minutes=-5))
    other_period = w.pack(
        period="Twelve months to October 2026", created_at_offset=timedelta(minutes=-9)
    )
    second = w.pack()
    for pack in (first, other_period, second):
        w.submit(pack)
    w.sign(first)
    w.sign(other_period)
    w.sign(second, w.quinn)
    assert w.status(first.id) == "superseded"
    assert w.status(other_period.id) == "signed_off"  # a different period
    assert w.status(second.id) == "signed_off"
    assert w.actions(first.id)[-1] == "pack.superseded"
    last = audit.trail(w.sessions, first.id)[-1]
    assert (last.key_id, last.detail) == (
        w.quinn.key_id,
        {"from": "signed_off", "to": "superseded", "by_pack": second.id},
    )
    with pytest.raises(Conflict, match="superseded pack is final"):
        w.send_back(first)


def test_an_earlier_pack_cannot_be_signed_off_after_a_later_one(w: World) -> None:
    earlier = w.pack(created_at_offset=timedelta(minutes=-5))
    later = w.pack()
    w.submit(earlier)
    w.submit(later)
    w.sign(later)
    with pytest.raises(Conflict, match=f"later pack '{later.id}'"):
        w.sign(earlier)
    assert (w.status(earlier.id), w.status(later.id)) == ("in_review", "signed_off")


# --- concurrency ---------------------------------------------------------------------------------


@pytest.mark.parametrize("attempt", range(5))
def test_two_concurrent_sign_offs_exactly_one_succeeds(w: World, attempt: int) -> None:
    pack = w.pack()
    w.submit(pack)
    start = threading.Barrier(2)
    outcomes: list[str] = []

    def sign(who: Principal) -> None:
        start.wait()
        try:
            w.sign(pack, who)
            outcomes.append("signed")
        except Conflict as exc:
            outcomes.append(f"conflict: {exc.message}")

    threads = [threading.Thread(target=sign, args=(who,)) for who in (w.pat, w.quinn)]
    for thread in threads:
        thread.start()
    for thread in threads:
        thread.join(timeout=30)
    assert sorted(outcomes) == ["conflict: the pack is signed off already", "signed"]
    assert w.status(pack.id) == "signed_off"
    assert w.actions(pack.id).count("pack.signed_off") == 1
    assert audit.gaps(w.sessions) == []


def test_history_is_readable_by_an_auditor(w: World) -> None:
    pack = w.pack()
    w.submit(pack)
    entries = lifecycle.history(sessions=w.sessions, principal=w.ada, pack_id=pack.id)
    assert [e.action for e in entries] == ["pack.submitted"]


def test_keys_made_and_authenticated_drive_the_lifecycle(w: World) -> None:
    made = {}
    for name, role in [("Ann", Role.author), ("Rui", Role.reviewer), ("Pat", Role.approver)]:
        _, secret = create(
            w.sessions, name=name, roles={role}, families={"hollin-vale"}, expires=None
        )
        made[name] = authenticate(w.sessions, secret)
    pack = w.pack(failed=[("precision", "riders")])
    w.submit(pack, made["Ann"])
    w.waive(pack, "precision", "riders", principal=made["Rui"])
    w.sign(pack, made["Pat"])
    assert w.status(pack.id) == "signed_off"


def test_two_keys_of_one_person_cannot_author_and_approve_or_review(w: World) -> None:
    """Separation of duties compares persons: a second key of the author, whatever its name, is
    still the author; another person is not, whatever their key is called."""
    _, author_secret = create(
        w.sessions, name="Alice Author", roles={Role.author}, families={"hollin-vale"}, expires=None
    )
    author = authenticate(w.sessions, author_secret)
    made: dict[str, Principal] = {}
    for role in (Role.approver, Role.reviewer):
        _, secret = create(
            w.sessions,
            name=f"A. A. {role.value} key",
            roles={role},
            families={"hollin-vale"},
            expires=None,
            person=author.person,
        )
        made[role] = authenticate(w.sessions, secret)
    pack = w.pack(failed=[("precision", "riders")])
    w.submit(pack, author)
    with pytest.raises(Forbidden, match="authored"):
        w.waive(pack, "precision", "riders", principal=made[Role.reviewer])
    w.waive(pack, "precision", "riders")
    with pytest.raises(Forbidden, match="separation of duties"):
        w.sign(pack, made[Role.approver])
    with w.sessions() as session:
        row = session.get(PackRow, pack.id)
        review = session.get(ReviewRow, pack.id)
    assert row is not None
    assert review is not None
    may = lifecycle.allowed(made[Role.approver], row, review, waivable=False, blocked=False)
    assert may.is_author
    assert not may.sign_off
    namesake = Principal(
        "key_namesake00001",
        "Alice Author",
        frozenset({Role.approver}),
        frozenset({"hollin-vale"}),
        person_id="person_someone_else",
    )
    w.sign(pack, namesake)  # a name is not a person: one who only shares it may sign off
    assert w.status(pack.id) == "signed_off"
