"""The HTTP API, exercised over a real socket against a running server."""

from __future__ import annotations

import hashlib
import json
import sqlite3
from pathlib import Path
from typing import Any

import httpx
import pytest

DEMO = Path(__file__).parents[2] / "sample_requests" / "bus-cooperative-monthly.json"


def demo() -> dict[str, Any]:
    return json.loads(DEMO.read_text())


def test_health(client: httpx.Client) -> None:
    response = client.get("/v1/health")
    assert response.status_code == 200
    assert response.json()["status"] == "ok"


def test_post_demo_stores_a_draft_that_can_be_fetched(
    client: httpx.Client, server: dict[str, object]
) -> None:
    response = client.post(
        "/v1/reports", content=DEMO.read_bytes(), headers={"content-type": "application/json"}
    )
    assert response.status_code == 201, response.text
    body = response.json()
    assert body["status"] == "draft"
    assert body["blocked"] is False
    assert body["summary"]["failed"] == 0
    assert body["summary"]["corrected"] == 4  # the drawing adds label-layout: a label into the key
    assert response.headers["location"] == f"/v1/reports/{body['id']}"
    corrected = [c for c in body["checks"] if c["status"] == "corrected"]
    assert ("bar-zero-baseline", "on-time-by-route") in [
        (c["check"], c["chart"]) for c in corrected
    ]

    fetched = client.get(f"/v1/reports/{body['id']}").json()
    assert fetched["pdf"]["sha256"] == body["pdf"]["sha256"]
    assert "checks" not in fetched

    checks = client.get(f"/v1/reports/{body['id']}/checks").json()
    assert checks["checks"] == body["checks"]

    pdf = client.get(f"/v1/reports/{body['id']}/pdf")
    assert pdf.status_code == 200
    assert pdf.headers["content-type"] == "application/pdf"
    assert pdf.content.startswith(b"%PDF-")
    assert hashlib.sha256(pdf.content).hexdigest() == body["pdf"]["sha256"]
    assert pdf.headers["etag"] == f'"{body["pdf"]["sha256"]}"'

    # The record lives in a real SQLite file, the bytes in the content-addressed store.
    data_dir = Path(str(server["data_dir"]))
    with sqlite3.connect(data_dir / "plumbline.db") as db:
        row = db.execute(
            "SELECT status, pdf_sha256 FROM packs WHERE id = ?", (body["id"],)
        ).fetchone()
    assert row == ("draft", body["pdf"]["sha256"])
    digest = body["pdf"]["sha256"]
    assert (data_dir / "files" / digest[:2] / digest[2:]).read_bytes() == pdf.content


def test_invalid_definition_answers_422_with_every_problem(client: httpx.Client) -> None:
    definition = demo()
    definition["sections"][1]["charts"][0]["measure"] = "on_tme"
    definition["sections"][0]["charts"][0]["dataset"] = "riders"
    definition["report"]["colour"] = "teal"
    response = client.post("/v1/reports", json=definition)
    assert response.status_code == 422
    assert response.headers["content-type"].startswith("application/problem+json")
    body = response.json()
    assert body["code"] == "invalid_definition"
    by_path = {e["path"]: e for e in body["errors"]}
    assert by_path["report.colour"]["code"] == "unknown_field"
    # The shape pass stops before references; fix it and the reference problems appear together.
    del definition["report"]["colour"]
    body = client.post("/v1/reports", json=definition).json()
    by_path = {e["path"]: e for e in body["errors"]}
    assert by_path["sections[1].charts[0].measure"]["code"] == "unknown_column"
    assert by_path["sections[1].charts[0].measure"]["hint"] == "did you mean 'on_time'?"
    assert by_path["sections[0].charts[0].dataset"]["code"] == "unknown_dataset"
    assert by_path["sections[0].charts[0].dataset"]["value"] == "riders"


def test_not_json_answers_422(client: httpx.Client) -> None:
    response = client.post(
        "/v1/reports", content=b"{not json", headers={"content-type": "application/json"}
    )
    assert response.status_code == 422
    assert response.json()["errors"][0]["code"] == "invalid_json"


def test_body_over_the_limit_answers_413(client: httpx.Client) -> None:
    response = client.post(
        "/v1/reports", content=b" " * 2_000_001, headers={"content-type": "application/json"}
    )
    assert response.status_code == 413
    assert response.json()["code"] == "payload_too_large"


def test_streamed_body_over_the_limit_answers_413(client: httpx.Client) -> None:
    def chunks() -> Any:
        for _ in range(40):
            yield b" " * 100_000

    response = client.post(
        "/v1/reports", content=chunks(), headers={"content-type": "application/json"}
    )
    assert response.status_code == 413


def test_unknown_pack_is_404_and_bad_id_is_422(client: httpx.Client) -> None:
    missing = client.get("/v1/reports/pk_" + "0" * 32)
    assert missing.status_code == 404
    assert missing.json()["code"] == "not_found"
    assert client.get("/v1/reports/../../etc/passwd").status_code == 404
    assert client.get("/v1/reports/not-an-id").status_code == 422


def test_failed_check_is_stored_as_a_blocked_draft(client: httpx.Client) -> None:
    definition = demo()
    definition["waivers"] = [
        {
            "check": "bar-zero-baseline",
            "chart": "on-time-by-route",
            "by": "A. Reviewer",
            "reason": "The board asked to see the spread above the 85 % floor this month.",
        }
    ]
    response = client.post("/v1/reports", json=definition)
    assert response.status_code == 201
    body = response.json()
    assert body["blocked"] is True
    assert body["failed"] == ["lie-factor on on-time-by-route"]
    waived = next(c for c in body["checks"] if c["status"] == "waived")
    assert waived["waiver"]["by"] == "A. Reviewer"


def test_check_endpoint_runs_checks_without_storing(client: httpx.Client) -> None:
    response = client.post(
        "/v1/check", content=DEMO.read_bytes(), headers={"content-type": "application/json"}
    )
    assert response.status_code == 200
    body = response.json()
    assert body["summary"]["corrected"] == 3
    assert "id" not in body


def test_schema_and_catalogue(client: httpx.Client) -> None:
    schema = client.get("/v1/schema").json()
    assert schema["title"].startswith("Plumbline report definition")
    assert "sections" in schema["required"]
    catalogue = {c["id"]: c for c in client.get("/v1/checks").json()}
    assert catalogue["lie-factor"]["threshold"] == "0.95 to 1.05"
    assert catalogue["missing-periods"]["waivable"] is False
    openapi = client.get("/openapi.json").json()
    assert "ReportDefinition" in openapi["components"]["schemas"]


@pytest.mark.parametrize("count", [8])
def test_concurrent_posts_all_succeed(
    client: httpx.Client, server: dict[str, object], count: int
) -> None:
    """Rendering runs in worker processes: the service keeps answering while packs render."""
    import concurrent.futures

    payload = DEMO.read_bytes()
    base = str(server["base"])
    keys = server["keys"]
    assert isinstance(keys, dict)
    auth = {"Authorization": f"Bearer {keys['author']}"}

    def post(_: int) -> tuple[int, str]:
        with httpx.Client(base_url=base, timeout=120, headers=auth) as http:
            r = http.post(
                "/v1/reports", content=payload, headers={"content-type": "application/json"}
            )
            return r.status_code, r.json()["pdf"]["sha256"]

    with concurrent.futures.ThreadPoolExecutor(count) as pool:
        futures = [pool.submit(post, i) for i in range(count)]
        health = client.get("/v1/health", timeout=5)  # answered while renders are in flight
        results = [f.result() for f in futures]
    assert health.status_code == 200
    assert {status for status, _ in results} == {201}
    assert len({digest for _, digest in results}) == 1  # same definition, same bytes
