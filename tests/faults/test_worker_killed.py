"""A render worker killed (SIGKILL) in the middle of a background build: the job fails saying why,
the worker is replaced, the service keeps serving (the next job is built), and the archive is
consistent. A real ``plumbline serve`` with one worker; the worker is found as its child process."""

from __future__ import annotations

import json
import os
import signal
from pathlib import Path
from typing import Any

import consistency
import httpx
import pytest
import serving

from bench import generate

DEMO = serving.ROOT / "sample_requests" / "bus-cooperative-monthly.json"


def _job(http: httpx.Client, job_id: str) -> dict[str, Any]:
    response = http.get(f"/v1/jobs/{job_id}")
    assert response.status_code == 200, response.text
    found: dict[str, Any] = response.json()
    return found


def _finished(http: httpx.Client, job_id: str, timeout: float = 180) -> dict[str, Any]:
    serving.wait_for(
        lambda: _job(http, job_id)["status"] in ("done", "failed"), timeout, f"job {job_id}"
    )
    return _job(http, job_id)


@pytest.fixture
def server(tmp_path: Path) -> Any:
    secrets = serving.keys(f"sqlite:///{tmp_path / 'plumbline.db'}")
    # the chart cache off: every build draws, so the worker is busy long enough to be killed
    env = {"PLUMBLINE_WORKERS": "1", "PLUMBLINE_CHART_CACHE": "false"}
    running = serving.Server(tmp_path, env).start()
    yield running, secrets
    running.stop()


def test_a_render_worker_killed_mid_build_fails_its_job_and_nothing_else(server: Any) -> None:
    running, secrets = server
    before = serving.render_workers(running.pid)
    assert len(before) == 1, f"expected one render worker, found {before}"
    slow = generate.encoded(generate.sixty(charts=12))  # several seconds of drawing
    with running.client(secrets["author"]) as http:
        accepted = http.post("/v1/reports", params={"wait": "false"}, content=slow)
        assert accepted.status_code == 202, accepted.text
        job_id = accepted.json()["id"]
        serving.wait_for(
            lambda: _job(http, job_id)["progress"]["stage"] == "drawing", 60, "the drawing stage"
        )
        os.kill(before[0], signal.SIGKILL)

        failed = _finished(http, job_id)
        assert failed["status"] == "failed", failed
        assert failed["error"]["code"] == "render_failed"
        assert "render worker stopped unexpectedly" in failed["error"]["detail"]
        assert "pack" not in failed

        serving.wait_for(lambda: not serving.alive(before[0]), 10, "the killed worker to go")
        after = serving.render_workers(running.pid)
        assert len(after) == 1
        assert after != before, "the killed worker was not replaced"

        # the service keeps serving: a next job is built by the new worker
        assert http.get("/v1/health").status_code == 200
        again = http.post("/v1/reports", params={"wait": "false"}, content=DEMO.read_bytes())
        assert again.status_code == 202, again.text
        done = _finished(http, again.json()["id"])
        assert done["status"] == "done", done
        pdf = http.get(f"/v1/reports/{done['pack']}/pdf")
        assert pdf.status_code == 200
        assert pdf.content.startswith(b"%PDF-")

    found = consistency.check(
        f"sqlite:///{running.data_dir / 'plumbline.db'}", running.data_dir / "files"
    )
    assert set(found.packs) == {done["pack"]}  # the killed build left no pack behind
    assert found.jobs[job_id].status == "failed"
    assert found.temporary == []
    assert json.loads(DEMO.read_bytes())["report"]["id"] == found.packs[done["pack"]].report_id
