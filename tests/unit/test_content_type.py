"""JSON routes read JSON only: a body sent as another media type is refused with 415 and a problem
document, not read as JSON anyway (or refused with a confusing shape error)."""

from __future__ import annotations

import asyncio
from collections.abc import Callable

import httpx
import pytest
from fastapi import FastAPI
from fastapi.routing import APIRoute

from service.api import deps, errors, reports, routes

JSON_ROUTES = {
    "/v1/check",
    "/v1/reports",
    "/v1/reports/{pack_id}/request-changes",
    "/v1/reports/{pack_id}/waivers",
    "/v1/reports/{pack_id}/sign-off",
}


Post = Callable[..., httpx.Response]


@pytest.fixture(scope="module")
def post() -> Post:
    """POST ``{}`` to a route that takes JSON, with the headers given."""
    app = FastAPI()
    errors.install(app)

    @app.post("/echo", dependencies=[deps.JsonBody])
    async def echo() -> dict[str, bool]:
        return {"ok": True}

    async def send(headers: dict[str, str]) -> httpx.Response:
        transport = httpx.ASGITransport(app=app)
        async with httpx.AsyncClient(transport=transport, base_url="http://t") as client:
            return await client.post("/echo", content=b"{}", headers=headers)

    return lambda headers=None: asyncio.run(send(headers or {}))


@pytest.mark.parametrize(
    "given",
    [
        "text/plain",
        "application/x-www-form-urlencoded",
        "multipart/form-data; boundary=x",
        "application/json; charset=utf-16",
        "application/xml",
        "",
    ],
)
def test_other_media_types_are_refused_with_415(post: Post, given: str) -> None:
    response = post({"Content-Type": given})
    assert response.status_code == 415
    assert response.headers["content-type"].startswith("application/problem+json")
    body = response.json()
    assert body["code"] == "unsupported_media_type"
    assert "application/json" in body["detail"]


@pytest.mark.parametrize(
    "given",
    [
        "application/json",
        "application/json; charset=utf-8",
        'Application/JSON; charset="UTF-8"',
        "application/problem+json",
    ],
)
def test_json_is_read(post: Post, given: str) -> None:
    response = post({"Content-Type": given})
    assert response.status_code == 200


def test_a_request_that_names_no_type_is_read_as_json(post: Post) -> None:
    assert post().status_code == 200


def test_every_json_route_requires_json() -> None:
    found = {
        route.path
        for router in (routes.router, reports.router)
        for route in router.routes
        if isinstance(route, APIRoute)
        and any(d.dependency is deps.json_body for d in route.dependencies)
    }
    assert found == JSON_ROUTES
    documented = {
        route.path
        for router in (routes.router, reports.router)
        for route in router.routes
        if isinstance(route, APIRoute) and 415 in route.responses
    }
    assert documented == JSON_ROUTES
