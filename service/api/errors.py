"""Error responses: RFC 9457 problem details, one shape for every error the API returns.

``PlumblineError`` subclasses map to their own status and code; request-shape errors from FastAPI
(e.g. a bad path parameter) use the same shape; anything else is logged with an opaque id and
answered 500 without internals.
"""

from __future__ import annotations

import logging
from typing import Any

from fastapi import FastAPI, Request
from fastapi.exceptions import RequestValidationError
from fastapi.responses import JSONResponse
from starlette.exceptions import HTTPException

from service import logs
from service.definition import paths
from service.errors import InvalidDefinition, PlumblineError, Problem, TooBusy, listing

log = logging.getLogger("plumbline.api")

PROBLEM = "application/problem+json"


def problem(status: int, code: str, detail: str, **extra: Any) -> JSONResponse:
    body = {
        "type": f"urn:plumbline:error:{code}",
        "title": code.replace("_", " "),
        "status": status,
        "code": code,
        "detail": detail,
        **extra,
    }
    return JSONResponse(body, status_code=status, media_type=PROBLEM)


_HTTP: dict[int, tuple[str, str]] = {
    400: (
        "unreadable_body",
        "the request body cannot be read: send a UTF-8 encoded JSON object "
        "(Content-Type: application/json)",
    ),
    404: ("not_found", "there is nothing at this address; see /docs for the API's routes"),
    405: ("method_not_allowed", "this address does not take that method; see the Allow header"),
}
"""Statuses FastAPI and Starlette answer themselves (an unreadable body, an unknown route), given
the same problem shape as every other error instead of their bare ``{"detail": ...}``."""


def install(app: FastAPI) -> None:
    @app.exception_handler(InvalidDefinition)
    async def _invalid(request: Request, exc: InvalidDefinition) -> JSONResponse:
        return problem(exc.status, exc.code, exc.message, **listing(exc.problems))

    @app.exception_handler(PlumblineError)
    async def _known(request: Request, exc: PlumblineError) -> JSONResponse:
        if exc.status >= 500:
            incident = logs.incident(log, "request failed", detail=exc.message, found=exc.incident)
            detail = exc.message if exc.incident else f"{exc.message} (incident {incident})"
            return problem(exc.status, exc.code, detail, incident=incident)
        response = problem(exc.status, exc.code, exc.message)
        if exc.status == 401:
            response.headers["WWW-Authenticate"] = 'Bearer realm="plumbline"'
        if isinstance(exc, TooBusy):
            response.headers["Retry-After"] = str(exc.retry_after)
        return response

    @app.exception_handler(RequestValidationError)
    async def _shape(request: Request, exc: RequestValidationError) -> JSONResponse:
        problems = [
            Problem("invalid_request", paths.join(e["loc"]), str(e["msg"])).as_dict()
            for e in exc.errors()
        ]
        return problem(422, "invalid_request", "the request is not valid", errors=problems)

    @app.exception_handler(HTTPException)
    async def _http(request: Request, exc: HTTPException) -> JSONResponse:
        code, detail = _HTTP.get(exc.status_code, ("http_error", str(exc.detail)))
        response = problem(exc.status_code, code, detail)
        for name, value in (exc.headers or {}).items():
            response.headers[name] = value
        return response

    @app.exception_handler(Exception)
    async def _last_resort(request: Request, exc: Exception) -> JSONResponse:
        incident = logs.incident(log, "unhandled error", exc=exc)
        return problem(
            500,
            "internal_error",
            f"something went wrong on our side (incident {incident})",
            incident=incident,
        )
