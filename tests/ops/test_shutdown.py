"""Graceful shutdown of a real ``plumbline serve``: on SIGTERM a running background build is let
finish within ``PLUMBLINE_SHUTDOWN_GRACE_S`` (or, past it, failed saying to post again) and the
process exits 0 within the grace."""

from __future__ import annotations

import time

import httpx
from ops_server import DEMO, Server, Start
from sqlalchemy import create_engine, text


def _start_job(server: Server) -> str:
    with server.client() as http:
        started = http.post(
            "/v1/reports",
            params={"wait": "false"},
            content=DEMO.read_bytes(),
            headers={"content-type": "application/json"},
        )
        assert started.status_code == 202, started.text
        job_id = str(started.json()["id"])
        deadline = time.monotonic() + 60
        while http.get(f"/v1/jobs/{job_id}").json()["status"] != "running":
            assert time.monotonic() < deadline, "the job never started"
            time.sleep(0.05)
    return job_id


def _job(server: Server, job_id: str) -> dict[str, object]:
    engine = create_engine(f"sqlite:///{server.data_dir / 'plumbline.db'}")
    try:
        with engine.connect() as connection:
            row = connection.execute(
                text("SELECT status, pack_id, error FROM jobs WHERE id = :id"), {"id": job_id}
            ).one()
    finally:
        engine.dispose()
    return {"status": row.status, "pack": row.pack_id, "error": row.error}


def test_sigterm_lets_a_running_build_finish_and_exits_0(start_server: Start) -> None:
    server = start_server(PLUMBLINE_SHUTDOWN_GRACE_S="60")
    job_id = _start_job(server)
    stopped = time.monotonic()
    assert server.stop(timeout=60) == 0
    assert time.monotonic() - stopped < 60
    job = _job(server, job_id)
    assert job["status"] == "done", job
    assert job["pack"]
    try:
        httpx.get(f"{server.base}/v1/health", timeout=2)
        raise AssertionError("the server still answers")
    except httpx.TransportError:
        pass


def test_a_build_still_running_past_the_grace_fails_saying_to_post_again(
    start_server: Start,
) -> None:
    server = start_server(PLUMBLINE_SHUTDOWN_GRACE_S="0")
    job_id = _start_job(server)
    stopped = time.monotonic()
    assert server.stop(timeout=30) == 0
    assert time.monotonic() - stopped < 15  # the grace, plus stopping the workers
    job = _job(server, job_id)
    assert job["status"] == "failed", job
    error = job["error"]
    assert isinstance(error, str)  # JSON text in SQLite
    assert '"shutdown"' in error
    assert "post the definition again" in error
