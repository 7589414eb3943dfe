"""What the OpenAPI document says about answers: the problem-details body every error shares, and
which error statuses each route can give.

A route lists exactly the refusals it can answer (``refusals(401, 404, 422)``), so a client (or a
conformance test) reading the document is not surprised by a status nor told of one that never
comes. Every error body is ``application/problem+json`` in the shape ``errors.problem`` writes.
"""

from __future__ import annotations

from typing import Any

from pydantic import BaseModel, Field

PROBLEM_MEDIA_TYPE = "application/problem+json"

_TEXT: dict[str, Any] = {"type": "string"}


class ProblemItem(BaseModel):
    """One problem found, where it is."""

    code: str
    path: str = Field(description="e.g. sections[0].charts[1].measure")
    message: str
    hint: str = ""
    value: Any = Field(None, description="The offending value, when it helps.")
    context: dict[str, Any] = Field(default_factory=dict)


class Problem(BaseModel):
    """RFC 9457 problem details, with Plumbline's stable code; a definition's problems are listed
    in `errors`, each with the path into the definition."""

    type: str = Field(description="urn:plumbline:error:<code>")
    title: str
    status: int = Field(ge=400, le=599)
    code: str = Field(description="A stable code, e.g. invalid_definition, not_found.")
    detail: str = Field(description="What is wrong, and how to put it right.")
    errors: list[ProblemItem] = Field(
        default_factory=list, description="Every problem found, each where it is."
    )
    incident: str = Field("", description="The id under which a server error was logged.")
    request_id: str = Field("", description="The request's id, as in X-Request-ID.")


def _inline(model: type[BaseModel]) -> dict[str, Any]:
    """``model``'s JSON Schema with its nested models written in place (no references)."""
    schema = model.model_json_schema()
    defs = schema.pop("$defs", {})

    def resolve(node: Any) -> Any:
        if isinstance(node, dict):
            ref = node.get("$ref", "")
            if ref.startswith("#/$defs/"):
                return resolve(defs[ref.removeprefix("#/$defs/")])
            return {k: resolve(v) for k, v in node.items()}
        if isinstance(node, list):
            return [resolve(v) for v in node]
        return node

    resolved: dict[str, Any] = resolve(schema)
    return resolved


PROBLEM_SCHEMA: dict[str, Any] = _inline(Problem)
"""The body of every error answer (``errors.problem`` writes it)."""

_MEANING = {
    400: "The request body cannot be read (e.g. it is not UTF-8).",
    401: "No API key, or an unknown, revoked or expired one.",
    403: "The key's roles do not allow this action, or the key is the pack's author.",
    404: "No such pack or job, or one of a report family the key is not granted.",
    409: "An illegal transition, a changed draft, an open failed check, or a request with the "
    "same Idempotency-Key still running.",
    413: "The request body is larger than the configured limit.",
    415: "The body was sent as another media type than application/json (UTF-8).",
    422: "The request is not valid; each problem is listed with its path.",
    429: (
        "Too busy (the queue is full, too many requests wait, or this address sent too many "
        "wrong keys); retry after the time given in Retry-After."
    ),
    500: "Something failed on the service's side; the detail names an incident id.",
    503: "The archive's database could not be reached or was busy; nothing was saved, send the "
    "request again.",
    507: "The disk of the file store is full; nothing was saved.",
}

_HEADERS: dict[int, dict[str, Any]] = {
    401: {"WWW-Authenticate": {"schema": _TEXT, "description": 'Bearer realm="plumbline"'}},
    429: {"Retry-After": {"schema": _TEXT, "description": "Seconds to wait before retrying."}},
}


def refusals(*statuses: int) -> dict[int | str, dict[str, Any]]:
    """The OpenAPI ``responses`` entries of these error statuses, each a problem-details body.

    A route that takes a key reads the archive's database, so it can also answer 503 when that
    is unreachable (``archive.db.DatabaseUnavailable``), and 429 to an address that sent too
    many wrong keys; one that can write files (413 listed: it takes a body) can answer 507 when
    the store's disk is full."""
    wanted = set(statuses)
    if 401 in wanted:
        wanted |= {429, 503}
    if 413 in wanted or 409 in wanted:
        wanted.add(507)
    out: dict[int | str, dict[str, Any]] = {}
    for status in sorted(wanted):
        entry: dict[str, Any] = {
            "description": _MEANING[status],
            "content": {PROBLEM_MEDIA_TYPE: {"schema": PROBLEM_SCHEMA}},
        }
        if status in _HEADERS:
            entry["headers"] = _HEADERS[status]
        out[status] = entry
    return out


DEFINITION_BODY: dict[str, Any] = {
    "requestBody": {
        "required": True,
        "content": {
            "application/json": {"schema": {"$ref": "#/components/schemas/ReportDefinition"}}
        },
    }
}
"""A route that reads a report definition as its raw body (validated by ``definition.validate``)."""

PDF_BODY: dict[str, Any] = {
    "requestBody": {
        "required": True,
        "content": {"application/pdf": {"schema": {"type": "string", "format": "binary"}}},
    }
}

PDF_ANSWER: dict[int | str, dict[str, Any]] = {
    200: {
        "description": "The PDF file; its SHA-256 is the ETag.",
        "content": {"application/pdf": {"schema": {"type": "string", "format": "binary"}}},
        "headers": {
            "ETag": {"schema": _TEXT, "description": "The file's SHA-256, quoted."},
            "Content-Disposition": {"schema": _TEXT},
        },
    }
}

IDEMPOTENCY_KEY: dict[str, Any] = {
    "parameters": [
        {
            "name": "Idempotency-Key",
            "in": "header",
            "required": False,
            "description": "A unique key per request, so a retry is carried out once: 1 to 255 "
            "printable ASCII characters, without spaces or double quotes. The same key with a "
            "different request is refused with 422; with one still running, 409.",
            "schema": {"type": "string", "pattern": "^[!#-~]{1,255}$"},
        }
    ]
}
"""The ``Idempotency-Key`` header every POST that changes something takes (``idempotency``)."""


def merged(*parts: dict[str, Any]) -> dict[str, Any]:
    """Several ``openapi_extra`` fragments as one (their top-level keys do not overlap)."""
    out: dict[str, Any] = {}
    for part in parts:
        out.update(part)
    return out
