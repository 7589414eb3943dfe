"""Report definitions drawn by Hypothesis, sent to the real app in-process.

Valid definitions must pass ``/v1/check`` (and a few must render); mutated ones must be refused
with a 4xx problem that says where (422 with ``errors[].path``), or else be accepted. Never a
5xx, never a request past ``REQUEST_TIMEOUT_S``. With ``wait=false`` the background job must reach
the same verdict as the check.
"""

from __future__ import annotations

import hashlib
import json
import time
from collections import Counter
from collections.abc import Iterator
from typing import Any

import httpx
import pytest
from fuzz_kit import REQUEST_TIMEOUT_S, Api, fuzz_settings, report
from hypothesis import given
from strategies import Json, Mutated, definitions, mutations

PROBLEM = "application/problem+json"

COUNTS: Counter[str] = Counter()
"""Cases sent per test and outcome, shown at the end of the module."""


@pytest.fixture(scope="module", autouse=True)
def _show_counts(request: pytest.FixtureRequest) -> Iterator[None]:
    yield
    total = sum(COUNTS.values())
    report(request.config, f"definition fuzz: {total} cases {dict(sorted(COUNTS.items()))}")


SCOPED = frozenset(
    {"huge_number", "non_finite_token", "non_finite_string", "outside_font", "right_to_left"}
)
"""Mutations whose refusal must name a place inside the part they struck."""


def _encode(definition: Json) -> bytes:
    return json.dumps(definition, ensure_ascii=False).encode()


def _chart_ids(definition: Json) -> set[str]:
    return {c["id"] for s in definition["sections"] for c in s.get("charts", [])}


def _table_ids(definition: Json) -> set[str]:
    return {t["id"] for s in definition["sections"] for t in s.get("tables", [])}


def assert_refusal_says_where(response: httpx.Response, mutated: Mutated | None = None) -> None:
    """A 4xx answer is a problem document; a 422 lists its problems, each with a path."""
    assert 400 <= response.status_code < 500, response.text
    assert response.headers["content-type"].startswith(PROBLEM), response.headers
    body = response.json()
    assert body["status"] == response.status_code
    assert body["code"]
    assert body["detail"]
    if response.status_code != 422:
        return
    errors = body.get("errors")
    assert errors, body
    for error in errors:
        assert isinstance(error["path"], str), error
        assert error["code"], error
        assert error["message"], error
    if mutated is not None and mutated.kind in SCOPED:
        scope = mutated.scope()
        assert any(e["path"].startswith(scope) for e in errors), (
            f"{mutated.kind} at {mutated.where}: no problem within {scope}: {errors}"
        )


@given(definition=definitions())
@fuzz_settings(40)
def test_valid_definitions_pass_the_check(api: Api, definition: Json) -> None:
    response = api.post_json("/v1/check", _encode(definition))
    COUNTS["valid /v1/check"] += 1
    assert response.status_code == 200, response.text
    body = response.json()
    assert body["report"] == definition["report"]["id"]
    # every chart is checked; a table is checked where a table check can fail for it
    checked = {r["chart"] for r in body["checks"]}
    assert _chart_ids(definition) <= checked <= _chart_ids(definition) | _table_ids(definition)


@given(definition=definitions(max_charts=2))
@fuzz_settings(4)
def test_valid_definitions_render(api: Api, definition: Json) -> None:
    response = api.post_json("/v1/reports", _encode(definition))
    COUNTS["valid /v1/reports"] += 1
    assert response.status_code == 201, response.text
    pack = response.json()
    pdf = api.send("GET", f"/v1/reports/{pack['id']}/pdf")
    assert pdf.content.startswith(b"%PDF-")
    assert hashlib.sha256(pdf.content).hexdigest() == pack["pdf"]["sha256"]


@given(mutated=mutations())
@fuzz_settings(150)
def test_mutated_definitions_are_refused_with_paths_or_checked(api: Api, mutated: Mutated) -> None:
    response = api.post_json("/v1/check", mutated.body)
    COUNTS[f"mutated /v1/check {response.status_code}"] += 1
    if response.status_code == 200:
        assert response.json()["checks"], "an accepted definition is checked"
        return
    assert_refusal_says_where(response, mutated)


@given(mutated=mutations(definitions(max_charts=1)))
@fuzz_settings(6)
def test_mutated_definitions_are_refused_with_paths_or_rendered(api: Api, mutated: Mutated) -> None:
    response = api.post_json("/v1/reports", mutated.body)
    COUNTS[f"mutated /v1/reports {response.status_code}"] += 1
    if response.status_code == 201:
        assert response.json()["pdf"]["bytes"] > 0
        return
    assert_refusal_says_where(response, mutated)


def _finished(api: Api, location: str) -> dict[str, Any]:
    deadline = time.monotonic() + REQUEST_TIMEOUT_S
    while time.monotonic() < deadline:
        job: dict[str, Any] = api.send("GET", location).json()
        if job["status"] in ("done", "failed"):
            return job
        time.sleep(0.1)
    pytest.fail(f"the job {location} did not finish within {REQUEST_TIMEOUT_S:g} s")


@given(mutated=mutations(definitions(max_charts=1)))
@fuzz_settings(6)
def test_background_builds_reach_the_checks_verdict(api: Api, mutated: Mutated) -> None:
    checked = api.post_json("/v1/check", mutated.body)
    started = api.post_json("/v1/reports", mutated.body, params={"wait": "false"})
    COUNTS[f"mutated wait=false {checked.status_code}"] += 1
    assert started.status_code == 202, started.text
    job = _finished(api, started.headers["location"])
    if checked.status_code == 200:
        assert job["status"] == "done", job
        return
    assert job["status"] == "failed", job
    assert job["error"]["status"] == checked.status_code
    if checked.status_code == 422:
        paths = {e["path"] for e in job["error"]["errors"]}
        assert paths == {e["path"] for e in checked.json()["errors"]}
