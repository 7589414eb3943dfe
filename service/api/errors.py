"""Error responses: RFC 9457 problem details, one shape for every error the API returns.

``PlumblineError`` subclasses map to their own status and code; request-shape errors from FastAPI
(e.g. a bad path parameter) use the same shape; anything else is logged with an opaque id and
answered 500 without internals.
"""

from __future__ import annotations

import logging
import uuid
from typing import Any

from fastapi import FastAPI, Request
from fastapi.exceptions import RequestValidationError
from fastapi.responses import JSONResponse

from service.definition import paths
from service.errors import InvalidDefinition, PlumblineError, Problem, TooBusy

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


def install(app: FastAPI) -> None:
    @app.exception_handler(InvalidDefinition)
    async def _invalid(request: Request, exc: InvalidDefinition) -> JSONResponse:
        return problem(
            exc.status, exc.code, exc.message, errors=[p.as_dict() for p in exc.problems]
        )

    @app.exception_handler(PlumblineError)
    async def _known(request: Request, exc: PlumblineError) -> JSONResponse:
        if exc.status >= 500:
            incident = uuid.uuid4().hex[:12]
            log.error("request failed [%s]: %s", incident, exc.message)
            return problem(
                exc.status, exc.code, f"{exc.message} (incident {incident})", incident=incident
            )
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

    @app.exception_handler(Exception)
    async def _last_resort(request: Request, exc: Exception) -> JSONResponse:
        incident = uuid.uuid4().hex[:12]
        log.exception("unhandled error [%s]", incident)
        return problem(
            500,
            "internal_error",
            f"something went wrong on our side (incident {incident})",
            incident=incident,
        )
