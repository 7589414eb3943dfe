"""Defects the fuzz tests found, each pinned by the smallest request that showed it."""

from __future__ import annotations

import json
import warnings
from typing import Any

from factories import make_compare_definition, make_definition
from fastapi import FastAPI
from fuzz_kit import Api

from service.checks.lie_factor import worst

PROBLEM = "application/problem+json"


def test_an_offset_past_64_bit_integers_is_refused_not_a_server_error(api: Api) -> None:
    # Found by schemathesis: GET /v1/reports?offset=345284530309763546148318422669197312 was a
    # 500 (OverflowError: Python int too large to convert to SQLite INTEGER).
    response = api.send("GET", "/v1/reports", params={"offset": str(10**35)})
    assert response.status_code == 422
    assert response.headers["content-type"].startswith(PROBLEM)
    assert any("offset" in e["path"] for e in response.json()["errors"])
    assert api.send("GET", "/v1/reports", params={"offset": "1000000000"}).status_code == 200


def test_a_body_that_is_not_utf8_is_a_problem_document(api: Api) -> None:
    # Found by schemathesis: a body of bytes that are not UTF-8 on a route with a JSON body was
    # answered 400 {"detail": "There was an error parsing the body"}: not a problem document, and
    # a status the route did not document.
    response = api.send(
        "POST",
        "/v1/reports/pk_00000000000000000000000000000000/request-changes",
        content=b"\xa3L4A\xff\x1f",
        headers={"Content-Type": "application/json"},
    )
    assert response.status_code == 400
    assert response.headers["content-type"].startswith(PROBLEM)
    body = response.json()
    assert body["code"] == "unreadable_body"
    assert "UTF-8" in body["detail"]


def test_an_unknown_route_is_a_problem_document(api: Api) -> None:
    response = api.send("GET", "/v1/no-such-route")
    assert response.status_code == 404
    assert response.headers["content-type"].startswith(PROBLEM)
    assert response.json()["code"] == "not_found"


def test_a_status_filter_is_described_as_the_values_it_takes(api: Api, fuzz_app: FastAPI) -> None:
    # Found by schemathesis: 'status' was documented as any text, yet 'closed' was refused (a
    # schema-valid request rejected). The document now gives the pattern the service enforces.
    parameters = fuzz_app.openapi()["paths"]["/v1/reports"]["get"]["parameters"]
    status = next(p for p in parameters if p["name"] == "status")
    assert "signed_off" in str(status["schema"])
    assert api.send("GET", "/v1/reports", params={"status": "closed"}).status_code == 422
    assert api.send("GET", "/v1/reports", params={"status": "draft"}).status_code == 200


def _responses(app: FastAPI, path: str, method: str) -> dict[str, Any]:
    responses: dict[str, Any] = app.openapi()["paths"][path][method]["responses"]
    return responses


def test_every_refusal_a_route_gives_is_documented_as_a_problem(fuzz_app: FastAPI) -> None:
    # Found by schemathesis: 401 from /v1/check and /v1/verify, 202 from POST /v1/reports and
    # 400 from the review actions were answered but not documented.
    assert {"401", "413", "422"} <= set(_responses(fuzz_app, "/v1/check", "post"))
    assert "401" in _responses(fuzz_app, "/v1/verify", "post")
    assert {"201", "202", "429"} <= set(_responses(fuzz_app, "/v1/reports", "post"))
    waivers = _responses(fuzz_app, "/v1/reports/{pack_id}/waivers", "post")
    assert "400" in waivers
    for status, entry in waivers.items():
        if status.startswith("4"):
            schema = entry["content"][PROBLEM]["schema"]
            assert {"type", "title", "status", "code", "detail"} <= set(schema["required"])


def test_a_value_near_the_smallest_float_does_not_overflow_the_lie_factor() -> None:
    # Found by the definition fuzz: a compare chart with 5e-324 beside ordinary values made
    # numpy warn "overflow encountered in divide" in the lie factor (an error where warnings are
    # errors, as in this suite). Pairs whose effect overflows define no factor.
    values = [5e-324, 100.0, 200.0]
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        factor = worst(values, values)
    assert factor is not None
    assert abs(factor - 1.0) < 1e-9


def test_a_compare_chart_with_a_subnormal_value_is_checked(api: Api) -> None:
    definition = make_compare_definition({"North": 5e-324, "South": 40.0, "East": 55.5})
    response = api.post_json("/v1/check", _json(definition))
    assert response.status_code == 200, response.text
    lie = [c for c in response.json()["checks"] if c["check"] == "lie-factor"]
    assert lie, "the lie factor ran"


def test_a_plain_definition_still_passes(api: Api) -> None:
    assert api.post_json("/v1/check", _json(make_definition())).status_code == 200


def _json(definition: dict[str, Any]) -> bytes:
    return json.dumps(definition).encode()


def test_a_query_parameter_given_twice_is_refused(api: Api) -> None:
    """Found by schemathesis: ``?period=a&period=b`` was read as its last value, and answered."""
    answer = api.send("GET", "/v1/reports?period=2026&period=2025&status=draft")
    assert answer.status_code == 422, answer.text
    assert "period" in answer.json()["detail"]
    assert "more than once" in answer.json()["detail"]


def test_an_unknown_query_parameter_is_refused_naming_the_ones_the_route_takes(api: Api) -> None:
    """Found by schemathesis: ``?limit=1&!3;PhSW[=null`` was answered as if the stranger were not
    there; a typo such as ``stauts`` would have listed every pack instead of the wanted ones."""
    answer = api.send("GET", "/v1/reports?stauts=draft")
    assert answer.status_code == 422, answer.text
    assert "stauts" in answer.json()["detail"]
    assert "status" in answer.json()["detail"]  # among the ones it takes
    assert api.send("GET", "/v1/reports?status=draft").status_code == 200
