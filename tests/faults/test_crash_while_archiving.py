"""Crash safety of sign-off: a process killed (SIGKILL) at any moment while it seals and archives a
pack leaves the archive consistent — no row claims a file that is missing or different, a pack is
signed off exactly when its seal and its audit record exist, and a retry afterwards succeeds.

The sign-offs run in a real child process on a real SQLite file and file store; the parent kills
it at spread-out moments of the slow part (rendering, sealing, signing, writing)."""

from __future__ import annotations

import hashlib
import os
import signal
import subprocess
import sys
import textwrap
import time
from pathlib import Path
from typing import Any

import pytest
from sqlalchemy import select

from service import pipeline
from service.archive import audit
from service.archive.db import AuditRow, PackRow, ReviewRow, SealRow, connect
from service.archive.files import Store
from service.config import Limits
from service.workflow import drafts, lifecycle
from service.workflow.keys import Principal, Role

ROOT = Path(__file__).parents[2]
DEMO = ROOT / "sample_requests" / "bus-cooperative-monthly.json"
AUTHOR = Principal("key_author0000001", "Ann Author", frozenset({Role.author}), frozenset({"*"}))

CHILD = textwrap.dedent(
    """
    import functools, sys
    from pathlib import Path
    from service.archive.db import connect
    from service.archive.files import Store
    from service.config import Limits
    from service.workflow import sealing
    from service.workflow.keys import Principal, Role

    folder, pack_id, digest = Path(sys.argv[1]), sys.argv[2], sys.argv[3]
    approver = Principal("key_approver00001", "Pat Approver", frozenset({Role.approver}),
                         frozenset({"*"}))
    sealer = functools.partial(sealing.seal_pack, key_path=None, cert_path=None,
                               development_dir=folder / "keys", limits=Limits())
    sealing.sign_off_and_seal(sessions=connect(f"sqlite:///{folder / 'a.db'}"),
                              store=Store(folder / "files"), principal=approver,
                              pack_id=pack_id, content_sha256=digest, sealer=sealer)
    print("signed off")
    """
)


def _sign_off_in_child(folder: Path, pack: PackRow, kill_after: float | None) -> int:
    process = subprocess.Popen(
        [sys.executable, "-c", CHILD, str(folder), pack.id, pack.pdf_sha256],
        cwd=ROOT,
        stdout=subprocess.PIPE,
        stderr=subprocess.PIPE,
        env={**os.environ, "MPLBACKEND": "Agg"},
    )
    if kill_after is not None:
        time.sleep(kill_after)
        if process.poll() is None:
            process.send_signal(signal.SIGKILL)
    process.communicate(timeout=300)
    return process.returncode


def _consistent(folder: Path) -> dict[str, Any]:
    """Check every invariant of the archive; returns what it found."""
    sessions = connect(f"sqlite:///{folder / 'a.db'}")
    store = Store(folder / "files")
    with sessions() as session:
        packs = {p.id: p for p in session.scalars(select(PackRow))}
        seals = {s.pack_id: s for s in session.scalars(select(SealRow))}
        reviews = {r.pack_id: r for r in session.scalars(select(ReviewRow))}
        signed_records = {
            a.pack_id for a in session.scalars(select(AuditRow)) if a.action == "pack.signed_off"
        }
    for sealed in seals.values():
        data = store.get(sealed.sha256)  # the file the row claims is there...
        assert hashlib.sha256(data).hexdigest() == sealed.sha256  # ...and is the same file
        assert len(data) == sealed.bytes
    signed = {p for p, row in packs.items() if row.status in ("signed_off", "superseded")}
    assert signed == set(seals) == signed_records
    for pack_id in signed:
        assert reviews[pack_id].signed_off_name == "Pat Approver"
    assert audit.gaps(sessions) == []
    return {"signed": signed, "packs": packs}


@pytest.fixture
def archive(tmp_path: Path) -> Path:
    sessions = connect(f"sqlite:///{tmp_path / 'a.db'}")
    store = Store(tmp_path / "files")
    built = pipeline.build(DEMO.read_bytes(), Limits())
    for _ in range(5):
        row = drafts.create(
            sessions=sessions, store=store, built=built, definition=DEMO.read_bytes(), author=AUTHOR
        )
        lifecycle.submit(sessions=sessions, principal=AUTHOR, pack_id=row.id)
    return tmp_path


def test_a_sign_off_killed_at_any_moment_leaves_a_consistent_archive(archive: Path) -> None:
    packs = sorted(_consistent(archive)["packs"].values(), key=lambda p: p.created_at)
    outcomes = []
    for pack, moment in zip(packs, (0.5, 1.5, 2.5, 3.5), strict=False):
        code = _sign_off_in_child(archive, pack, kill_after=moment)
        outcomes.append(code)
        _consistent(archive)  # after every kill, whatever it interrupted
    assert -signal.SIGKILL in outcomes, f"no child was killed mid-way: {outcomes}"
    # a pack whose sign-off was killed can be signed off afterwards
    interrupted = [p for p, code in zip(packs, outcomes, strict=False) if code != 0]
    assert _sign_off_in_child(archive, interrupted[0], kill_after=None) == 0
    found = _consistent(archive)
    assert interrupted[0].id in found["signed"]
