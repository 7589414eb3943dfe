"""The request-id and access-log middleware: every request gets an id, answered in a header and
in every problem body, and one access line when its answer is sent."""

from __future__ import annotations

import json
import logging
import time
from collections.abc import Callable, Mapping
from typing import Any

from fastapi import Request
from starlette.datastructures import MutableHeaders
from starlette.types import ASGIApp, Message, Receive, Scope, Send

from service import logs

access_log = logging.getLogger(logs.ACCESS)


class RequestIds:
    """Give every request an id (the client's ``X-Request-ID`` if sane, else a new one), answer
    it in the ``X-Request-ID`` header and as ``request_id`` in every problem body, and write one
    access line when the answer is sent.

    An exception no handler took is answered here with the app's last-resort handler (so that
    answer carries the id too) instead of by Starlette's outermost error middleware.
    """

    def __init__(self, app: ASGIApp, *, handlers: Mapping[Any, Callable[..., Any]]) -> None:
        self.app, self.handlers = app, handlers

    async def __call__(self, scope: Scope, receive: Receive, send: Send) -> None:
        if scope["type"] != "http":
            await self.app(scope, receive, send)
            return
        rid = logs.accept_request_id(dict(scope.get("headers") or []).get(b"x-request-id"))
        logs.request_id.set(rid)  # the request's own task: it ends with the request
        scope.setdefault("state", {})["request_id"] = rid
        began = time.perf_counter()
        status = 0
        held: Message | None = None
        body = b""

        async def answer(message: Message) -> None:
            nonlocal status, held, body
            if message["type"] == "http.response.start":
                status = int(message["status"])
                headers = MutableHeaders(scope=message)
                headers["X-Request-ID"] = rid
                if headers.get("content-type", "").startswith("application/problem+json"):
                    held = message  # sent with the body, once the id is in it
                    return
                await send(message)
            elif message["type"] == "http.response.body" and held is not None:
                body += message.get("body", b"")
                if message.get("more_body", False):
                    return
                body = _with_request_id(body, rid)
                MutableHeaders(scope=held)["content-length"] = str(len(body))
                start, held = held, None
                await send(start)
                await send({"type": "http.response.body", "body": body})
            else:
                await send(message)

        try:
            await self.app(scope, receive, answer)
        except Exception as exc:
            handler = self.handlers.get(Exception)
            if status or handler is None:
                raise
            response = await handler(Request(scope, receive), exc)
            await response(scope, receive, answer)
        finally:
            access_log.info(
                "%s %s %s",
                scope.get("method", ""),
                scope.get("path", ""),
                status,
                extra={
                    "method": scope.get("method", ""),
                    "path": scope.get("path", ""),
                    "status": status,
                    "duration_ms": round((time.perf_counter() - began) * 1000, 1),
                },
            )


def _with_request_id(body: bytes, rid: str) -> bytes:
    try:
        problem = json.loads(body)
    except ValueError:
        return body
    if not isinstance(problem, dict):
        return body
    problem.setdefault("request_id", rid)
    return json.dumps(problem, ensure_ascii=False, separators=(",", ":")).encode()
