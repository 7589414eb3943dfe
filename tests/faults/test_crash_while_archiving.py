"""Crash safety of sign-off: a process killed (SIGKILL) at any moment while it seals and archives a
pack leaves the archive consistent — no row claims a file that is missing or different, a pack is
signed off exactly when its seal and its audit record exist, and a retry afterwards succeeds.

The sign-offs run in a real child process on a real SQLite file and file store; the parent kills
it at spread-out moments of the slow part (rendering, sealing, signing, writing)."""

from __future__ import annotations

import os
import signal
import subprocess
import sys
import textwrap
import time
from pathlib import Path

import consistency
import pytest

from service import pipeline
from service.archive.db import PackRow, connect
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


def _consistent(folder: Path) -> consistency.Found:
    return consistency.check(
        f"sqlite:///{folder / 'a.db'}", folder / "files", approver="Pat Approver"
    )


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
    packs = sorted(_consistent(archive).packs.values(), key=lambda p: p.created_at)
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
    assert interrupted[0].id in found.signed
