"""Refuse request bodies past the configured size with 413, before they are read whole.

Starlette enforces no body limit of its own. A declared ``Content-Length`` over the limit is refused
at once; a streamed body is counted chunk by chunk and refused as soon as it passes the limit.
"""

from __future__ import annotations

import json
from typing import Any

from starlette.types import ASGIApp, Message, Receive, Scope, Send

from service.errors import PayloadTooLarge

SETTING = "PLUMBLINE_LIMITS__MAX_PAYLOAD_BYTES"
"""The setting that raises the limit (``Limits.max_payload_bytes``), named in the answer."""


class BodyLimit:
    def __init__(self, app: ASGIApp, *, limit: int) -> None:
        self.app, self.limit = app, limit

    async def __call__(self, scope: Scope, receive: Receive, send: Send) -> None:
        if scope["type"] != "http":
            await self.app(scope, receive, send)
            return
        declared = dict(scope.get("headers") or []).get(b"content-length")
        if declared is not None and declared.isdigit() and int(declared) > self.limit:
            await _refuse(send, int(declared), self.limit)
            return
        seen = 0
        started = False

        async def counted() -> Message:
            nonlocal seen
            message = await receive()
            if message["type"] == "http.request":
                seen += len(message.get("body", b""))
                if seen > self.limit:
                    raise _TooLarge(seen)
            return message

        async def tracked(message: Message) -> None:
            nonlocal started
            if message["type"] == "http.response.start":
                started = True
            await send(message)

        try:
            await self.app(scope, counted, tracked)
        except _TooLarge as exc:
            if not started:
                await _refuse(send, exc.seen, self.limit)


class _TooLarge(Exception):
    def __init__(self, seen: int) -> None:
        super().__init__(seen)
        self.seen = seen


async def _refuse(send: Send, size: int, limit: int) -> None:
    error = PayloadTooLarge(size=size, limit=limit)
    problem = _problem(error.status, error.code, error.message, limit=limit, setting=SETTING)
    body = json.dumps(problem).encode()
    await send(
        {
            "type": "http.response.start",
            "status": 413,
            "headers": [
                (b"content-type", b"application/problem+json"),
                (b"content-length", str(len(body)).encode()),
                (b"connection", b"close"),
            ],
        }
    )
    await send({"type": "http.response.body", "body": body})


def _problem(status: int, code: str, detail: str, **extra: Any) -> dict[str, Any]:
    return {
        "type": f"urn:plumbline:error:{code}",
        "title": code.replace("_", " "),
        "status": status,
        "code": code,
        "detail": detail,
        **extra,
    }
