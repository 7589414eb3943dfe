"""The service process killed (SIGKILL) while it archives a background build's draft: after a
restart the interrupted job is failed with its reason, the archive is consistent (the files
written before the kill are claimed by no row), the killed service's render workers did not
outlive it, and posting the definition again works.

To stop the service at a known moment of ``drafts.create`` without touching its code, the test
holds the SQLite database's write lock (``BEGIN IMMEDIATE`` on its own connection) once the job is
running: the service writes the definition and the PDF to the store, then waits for the lock in
the transaction that would add the pack's row, and is killed there."""

from __future__ import annotations

import hashlib
import json
import sqlite3
from pathlib import Path
from typing import Any

import consistency
import httpx
import pytest
import serving

DEMO = serving.ROOT / "sample_requests" / "bus-cooperative-monthly.json"


def _job(http: httpx.Client, job_id: str) -> dict[str, Any]:
    response = http.get(f"/v1/jobs/{job_id}")
    assert response.status_code == 200, response.text
    found: dict[str, Any] = response.json()
    return found


def _stored(files: Path) -> set[str]:
    return {p.parent.name + p.name for p in files.glob("*/*") if not p.name.startswith(".")}


@pytest.fixture
def server(tmp_path: Path) -> Any:
    secrets = serving.keys(f"sqlite:///{tmp_path / 'plumbline.db'}")
    running = serving.Server(tmp_path, {"PLUMBLINE_WORKERS": "1", "PLUMBLINE_CHART_CACHE": "false"})
    yield running.start(), secrets
    running.stop()


def _check(running: serving.Server) -> consistency.Found:
    return consistency.check(
        f"sqlite:///{running.data_dir / 'plumbline.db'}", running.data_dir / "files"
    )


def test_the_service_killed_while_archiving_a_draft_recovers_on_restart(server: Any) -> None:
    running, secrets = server
    raw = DEMO.read_bytes()
    files = running.data_dir / "files"
    workers = serving.render_workers(running.pid)
    assert workers
    with running.client(secrets["author"]) as http:
        accepted = http.post("/v1/reports", params={"wait": "false"}, content=raw)
        assert accepted.status_code == 202, accepted.text
        job_id = accepted.json()["id"]
        serving.wait_for(lambda: _job(http, job_id)["status"] == "running", 60, "the job to run")

    lock = sqlite3.connect(running.data_dir / "plumbline.db", timeout=30, isolation_level=None)
    try:
        lock.execute("BEGIN IMMEDIATE")  # the write lock: drafts.create's transaction waits
        serving.wait_for(lambda: len(_stored(files)) >= 2, 120, "the draft's files in the store")
        assert running.kill() == -9
    finally:
        lock.execute("ROLLBACK")
        lock.close()
    written = _stored(files)
    assert hashlib.sha256(raw).hexdigest() in written  # the definition was stored before the row
    # the render workers notice their service is gone and leave
    serving.wait_for(lambda: not any(serving.alive(w) for w in workers), 20, "orphaned workers")

    found = _check(running)
    assert found.packs == {}  # no row for the interrupted draft...
    assert found.unclaimed == written  # ...and no row claims the files it wrote
    assert found.jobs[job_id].status == "running"  # what the killed process left

    running.start()
    recovered = _check(running).jobs[job_id]
    assert recovered.status == "failed"
    assert recovered.error is not None
    assert recovered.error["code"] == "interrupted"
    assert "post the definition again" in recovered.error["detail"]
    with running.client(secrets["author"]) as http:
        assert _job(http, job_id)["error"]["code"] == "interrupted"
        retried = http.post("/v1/reports", content=raw)
        assert retried.status_code == 201, retried.text
        pack = retried.json()

    found = _check(running)
    assert set(found.packs) == {pack["id"]}
    assert found.unclaimed == set()  # the retry wrote the same bytes and now claims both files
    assert found.claimed == written


def _variant(n: int) -> bytes:
    """The demo with another title: new definition and PDF bytes, so new files in the store."""
    definition = json.loads(DEMO.read_bytes())
    definition["report"]["title"] = f"{definition['report']['title']} (run {n})"
    return json.dumps(definition).encode()


def _kill_at(running: serving.Server, secret: str, raw: bytes, moment: str) -> str:
    """Post a build and kill the service at ``moment``; returns the job's id."""
    files = running.data_dir / "files"
    before = len(_stored(files))
    with running.client(secret) as http:
        accepted = http.post("/v1/reports", params={"wait": "false"}, content=raw)
        assert accepted.status_code == 202, accepted.text
        job_id = str(accepted.json()["id"])
        if moment == "running":
            serving.wait_for(lambda: _job(http, job_id)["status"] != "queued", 60, "running")
        else:
            wanted = before + (1 if moment == "first file" else 2)
            serving.wait_for(lambda: len(_stored(files)) >= wanted, 120, moment)
    running.kill()
    return job_id


def test_the_service_killed_at_spread_out_moments_of_a_build_leaves_a_consistent_archive(
    server: Any,
) -> None:
    """No lock held: each kill lands wherever it lands (drawing, the store writes, the commit)."""
    running, secrets = server
    outcomes = []
    for n, moment in enumerate(("running", "first file", "two files")):
        job_id = _kill_at(running, secrets["author"], _variant(n), moment)
        _check(running)
        running.start()
        found = _check(running)
        job = found.jobs[job_id]
        outcomes.append(job.status)
        if job.status == "failed":
            assert job.error is not None
            assert job.error["code"] == "interrupted"
        else:  # the kill came after the commit: the job ended done, with its pack
            assert job.status == "done"
            assert job.pack_id in found.packs
    assert "failed" in outcomes, f"no kill interrupted a job: {outcomes}"
    with running.client(secrets["author"]) as http:
        assert http.post("/v1/reports", content=_variant(0)).status_code == 201
    _check(running)
