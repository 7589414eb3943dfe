"""The review workflow on the archive, on a real SQLite file and a real PostgreSQL server: keys
made and authenticated, a draft submitted, a check waived and the pack signed off; two concurrent
sign-offs of one draft, exactly one wins; concurrent audit records of different packs, no clash and
no gap."""

from __future__ import annotations

import json
import threading
import uuid
from collections.abc import Callable, Iterator
from concurrent.futures import ThreadPoolExecutor
from pathlib import Path
from typing import Any

import pytest
from sqlalchemy.orm import sessionmaker

from service.archive import audit
from service.archive.db import PackRow, ReviewRow, connect, engine_of, now
from service.archive.files import Store
from service.workflow import keys, lifecycle
from service.workflow.keys import Principal, Role
from service.workflow.lifecycle import Conflict

REPORT = "hollin-vale-ops-monthly"
REASON = "The board asked for this scale; noted in the narrative."


class Archive:
    """An archive database (its URL given) with a file store beside it."""

    def __init__(self, url: str, files: Path) -> None:
        self.sessions: sessionmaker[Any] = connect(url)
        self.store = Store(files)

    def draft(self, *, failed: tuple[str, str] | None = None) -> PackRow:
        """A draft row whose definition and PDF are in the store, as ``workflow.drafts`` leaves it."""
        definition = {
            "version": 1,
            "report": {"id": REPORT},
            "sections": [{"heading": "All", "charts": [{"id": "riders", "intent": "trend"}]}],
        }
        pdf = f"%PDF-1.7 draft {uuid.uuid4()}".encode()
        results = [{"check": "source-line", "chart": "riders", "status": "passed"}]
        if failed is not None:
            results.append({"check": failed[0], "chart": failed[1], "status": "failed"})
        row = PackRow(
            id=f"pk_{uuid.uuid4().hex}",
            report_id=REPORT,
            title="Monthly operations pack",
            period=f"Period {uuid.uuid4().hex[:8]}",  # each draft its own period: none supersedes
            as_of="2026-11-09T07:30:00+00:00",
            status="draft",
            blocked=failed is not None,
            summary={},
            results=results,
            unused_waivers=[],
            definition_sha256=self.store.put(json.dumps(definition).encode()),
            pdf_sha256=self.store.put(pdf),
            pdf_bytes=len(pdf),
            created_at=now(),
        )
        with self.sessions.begin() as session:
            session.add(row)
        return row

    def status(self, pack_id: str) -> str:
        with self.sessions() as session:
            row = session.get(PackRow, pack_id)
            assert row is not None
            return row.status


@pytest.fixture
def archive(database_url: str, tmp_path: Path) -> Iterator[Archive]:
    made = Archive(database_url, tmp_path / "files")
    yield made
    engine_of(made.sessions).dispose()


def principal(name: str, *roles: Role) -> Principal:
    """A principal as ``keys.authenticate`` returns it, without the scrypt work of a real key."""
    return Principal(
        f"key_{uuid.uuid4().hex[:16]}", name, frozenset(roles), frozenset({"hollin-vale"})
    )


def run_together(jobs: list[Callable[[], None]]) -> list[BaseException]:
    """Run the jobs on threads released at the same moment; returns what they raised."""
    start = threading.Barrier(len(jobs))

    def released(job: Callable[[], None]) -> None:
        start.wait()
        job()

    with ThreadPoolExecutor(max_workers=len(jobs)) as pool:
        futures = [pool.submit(released, job) for job in jobs]
        outcomes = [future.exception(timeout=60) for future in futures]
    return [raised for raised in outcomes if raised is not None]


def test_keys_drive_a_draft_through_review_to_sign_off(archive: Archive) -> None:
    people = {}
    for name, role in [("Ann Author", Role.author), ("Rui Reviewer", Role.reviewer)]:
        _, secret = keys.create(
            archive.sessions, name=name, roles={role}, families={"hollin-vale"}, expires=None
        )
        people[name] = keys.authenticate(archive.sessions, secret)
    _, secret = keys.create(
        archive.sessions,
        name="Pat Approver",
        roles={Role.approver},
        families={"hollin-vale"},
        expires=None,
    )
    people["Pat Approver"] = keys.authenticate(archive.sessions, secret)
    pack = archive.draft(failed=("precision", "riders"))
    sessions = archive.sessions

    lifecycle.submit(sessions=sessions, principal=people["Ann Author"], pack_id=pack.id)
    assert archive.status(pack.id) == "in_review"
    with pytest.raises(Conflict, match="not waived: precision on riders"):
        lifecycle.sign_off(
            sessions=sessions,
            principal=people["Pat Approver"],
            pack_id=pack.id,
            content_sha256=pack.pdf_sha256,
        )
    lifecycle.waive(
        sessions=sessions,
        store=archive.store,
        principal=people["Rui Reviewer"],
        pack_id=pack.id,
        check="precision",
        chart="riders",
        reason=REASON,
    )
    lifecycle.sign_off(
        sessions=sessions,
        principal=people["Pat Approver"],
        pack_id=pack.id,
        content_sha256=pack.pdf_sha256,
    )

    assert archive.status(pack.id) == "signed_off"
    with sessions() as session:
        review = session.get(ReviewRow, pack.id)
    assert review is not None
    assert review.signed_off_name == "Pat Approver"
    assert review.signed_off_sha256 == pack.pdf_sha256
    assert review.signed_off_at is not None
    assert [(e.action, e.name) for e in audit.trail(sessions, pack.id)] == [
        ("pack.submitted", "Ann Author"),
        ("check.waived", "Rui Reviewer"),
        ("pack.signed_off", "Pat Approver"),
    ]
    everything = audit.everything(sessions)
    assert [e.action for e in everything[:3]] == ["key.created"] * 3
    assert [e.seq for e in everything] == list(range(1, 7))
    assert audit.gaps(sessions) == []


@pytest.mark.parametrize("attempt", range(5))
def test_two_concurrent_sign_offs_exactly_one_succeeds(archive: Archive, attempt: int) -> None:
    pack = archive.draft()
    lifecycle.submit(
        sessions=archive.sessions, principal=principal("Ann Author", Role.author), pack_id=pack.id
    )
    approvers = [
        principal("Pat Approver", Role.approver),
        principal("Quinn Approver", Role.approver),
    ]

    def sign(who: Principal) -> Callable[[], None]:
        return lambda: lifecycle.sign_off(
            sessions=archive.sessions,
            principal=who,
            pack_id=pack.id,
            content_sha256=pack.pdf_sha256,
        )

    raised = run_together([sign(who) for who in approvers])
    assert [(type(e), getattr(e, "message", str(e))) for e in raised] == [
        (Conflict, "the pack is signed off already")
    ]
    assert archive.status(pack.id) == "signed_off"
    actions = [e.action for e in audit.trail(archive.sessions, pack.id)]
    assert actions == ["pack.submitted", "pack.signed_off"]
    with archive.sessions() as session:
        review = session.get(ReviewRow, pack.id)
    assert review is not None
    assert review.signed_off_name in {"Pat Approver", "Quinn Approver"}
    assert audit.gaps(archive.sessions) == []


def test_concurrent_audit_records_of_different_packs_do_not_clash(archive: Archive) -> None:
    """Eight writers at once, each submitting and sending back its own packs: every action is
    recorded once, the sequence has no gap and no number twice."""
    writers, rounds = 8, 6
    author = principal("Ann Author", Role.author)
    reviewer = principal("Rui Reviewer", Role.reviewer)
    packs = [[archive.draft() for _ in range(rounds)] for _ in range(writers)]

    def work(mine: list[PackRow]) -> Callable[[], None]:
        def run() -> None:
            for pack in mine:
                lifecycle.submit(sessions=archive.sessions, principal=author, pack_id=pack.id)
                lifecycle.request_changes(
                    sessions=archive.sessions,
                    principal=reviewer,
                    pack_id=pack.id,
                    reason="Label it.",
                )

        return run

    assert run_together([work(mine) for mine in packs]) == []
    everything = audit.everything(archive.sessions)
    assert [e.seq for e in everything] == list(range(1, writers * rounds * 2 + 1))
    assert audit.gaps(archive.sessions) == []
    for pack in (p for mine in packs for p in mine):
        assert [e.action for e in audit.trail(archive.sessions, pack.id)] == [
            "pack.submitted",
            "pack.changes_requested",
        ]
        assert archive.status(pack.id) == "draft"


def test_concurrent_sealed_sign_offs_leave_one_sealed_file(archive: Archive) -> None:
    """Six approvers seal and sign off one draft at once: the store keeps exactly one sealed file,
    and it names the signer the archive records (a loser's signed file is removed)."""
    from service.archive.db import SealRow
    from service.workflow import sealing

    pack = archive.draft()
    lifecycle.submit(
        sessions=archive.sessions, principal=principal("Ann Author", Role.author), pack_id=pack.id
    )
    before = set(archive.store.root.glob("*/*"))
    approvers = [principal(f"Approver {n}", Role.approver) for n in range(6)]

    def fake_sealer(definition: bytes, record: dict[str, Any]) -> sealing.SealedPack:
        import time

        time.sleep(0.3)  # every approver passes the checks before any one records a sign-off
        signed = f"%PDF sealed, signed off by {record['signed_off_by']}".encode()
        return sealing.SealedPack(signed, record, "test signer", True, {})

    def sign(who: Principal) -> Callable[[], None]:
        def job() -> None:
            sealing.sign_off_and_seal(
                sessions=archive.sessions,
                store=archive.store,
                principal=who,
                pack_id=pack.id,
                content_sha256=pack.pdf_sha256,
                sealer=fake_sealer,
            )

        return job

    raised = run_together([sign(who) for who in approvers])
    assert len(raised) == 5
    assert all(isinstance(e, Conflict) for e in raised)
    sealed = sorted(set(archive.store.root.glob("*/*")) - before)
    with archive.sessions() as session:
        review = session.get(ReviewRow, pack.id)
        seal = session.get(SealRow, pack.id)
    assert review is not None
    assert seal is not None
    assert [p.name for p in sealed] == [seal.sha256[2:]]
    assert sealed[0].read_bytes().decode().endswith(f"by {review.signed_off_name}")
    assert archive.store.temporary() == []
