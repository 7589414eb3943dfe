"""Background builds over HTTP: 202 at once, progress, done with the draft or failed with the
problem; only the key that posted a job sees it; an Idempotency-Key retry gets the same job."""

from __future__ import annotations

import json
import time
import uuid
from pathlib import Path
from typing import Any

import httpx
from factories import Clients

DEMO = Path(__file__).parents[2] / "sample_requests" / "bus-cooperative-monthly.json"


def wait_for(http: httpx.Client, location: str, timeout: float = 120) -> dict[str, Any]:
    deadline = time.monotonic() + timeout
    seen = []
    while time.monotonic() < deadline:
        job = http.get(location).json()
        seen.append(job["status"])
        if job["status"] in ("done", "failed"):
            job["seen"] = seen
            return dict(job)
        time.sleep(0.2)
    raise AssertionError(f"the job did not end in {timeout} s: {seen}")


def test_a_background_build_answers_202_then_ends_with_the_draft(people: Clients) -> None:
    author = people("author")
    started = author.post(
        "/v1/reports",
        params={"wait": "false"},
        content=DEMO.read_bytes(),
        headers={"content-type": "application/json"},
    )
    assert started.status_code == 202, started.text
    job = started.json()
    assert job["status"] == "queued"
    assert started.headers["Location"] == f"/v1/jobs/{job['id']}"
    done = wait_for(author, started.headers["Location"])
    assert done["status"] == "done", done
    assert done["progress"]["stage"] == "done"
    pack = author.get(done["links"]["pack"]).json()
    assert pack["id"] == done["pack"]
    assert pack["status"] == "draft"
    assert pack["review"]["authors"] == ["Ann Author"]
    # another key does not see the job at all
    assert people("auditor").get(started.headers["Location"]).status_code == 404


def test_a_background_build_of_a_bad_definition_fails_with_every_problem(people: Clients) -> None:
    definition = json.loads(DEMO.read_text())
    definition["sections"][0]["charts"][0]["dataset"] = "no-such-dataset"
    author = people("author")
    started = author.post("/v1/reports", params={"wait": "false"}, json=definition)
    assert started.status_code == 202
    failed = wait_for(author, started.headers["Location"])
    assert failed["status"] == "failed"
    assert failed["error"]["status"] == 422
    assert "sections[0].charts[0].dataset" in {e["path"] for e in failed["error"]["errors"]}


def test_a_retried_background_post_gets_the_same_job(people: Clients) -> None:
    author = people("author")
    headers = {"content-type": "application/json", "Idempotency-Key": uuid.uuid4().hex}
    first = author.post(
        "/v1/reports", params={"wait": "false"}, content=DEMO.read_bytes(), headers=headers
    )
    again = author.post(
        "/v1/reports", params={"wait": "false"}, content=DEMO.read_bytes(), headers=headers
    )
    assert first.status_code == again.status_code == 202
    assert again.json()["id"] == first.json()["id"]
    assert wait_for(author, first.headers["Location"])["status"] == "done"


def test_the_same_key_with_another_query_is_a_different_request(people: Clients) -> None:
    """The fingerprint covers method, path and query: ``?wait=true`` after ``?wait=false`` with the
    same key is refused like a different body, not answered with the stored 202."""
    author = people("author")
    headers = {"content-type": "application/json", "Idempotency-Key": uuid.uuid4().hex}
    first = author.post(
        "/v1/reports", params={"wait": "false"}, content=DEMO.read_bytes(), headers=headers
    )
    assert first.status_code == 202, first.text
    other = author.post(
        "/v1/reports", params={"wait": "true"}, content=DEMO.read_bytes(), headers=headers
    )
    assert other.status_code == 422, other.text
    assert "different request" in other.json()["detail"]
    assert "Idempotent-Replayed" not in other.headers
    assert wait_for(author, first.headers["Location"])["status"] == "done"


def test_only_authors_start_jobs_and_job_ids_are_checked(people: Clients) -> None:
    refused = people("reviewer").post(
        "/v1/reports", params={"wait": "false"}, content=DEMO.read_bytes()
    )
    assert refused.status_code == 403
    assert people("author").get("/v1/jobs/not-a-job").status_code == 422
    assert people("author").get("/v1/jobs/jb_" + "0" * 32).status_code == 404
