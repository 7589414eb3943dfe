"""Refuse request bodies past the configured size with 413, before they are read whole, and header
blocks past theirs with 431.

Starlette enforces no body limit of its own. A declared ``Content-Length`` over the limit is refused
at once; a streamed body is counted chunk by chunk and refused as soon as it passes the limit.

Headers are limited twice, so the answer does not depend on how the bytes arrived: the HTTP parser
(h11) stops a header block it is still waiting for once its buffer passes the limit, and
:class:`HeaderLimitH11` answers that 431 with a problem document (uvicorn answers a plain-text 400
and closes at once, which a client still sending its 200 kB header sees as a connection reset);
a header block that arrived whole is measured here before any route sees it.
"""

from __future__ import annotations

import json
from typing import Any

import h11
from starlette.types import ASGIApp, Message, Receive, Scope, Send
from uvicorn.protocols.http.h11_impl import H11Protocol

from service.errors import HeadersTooLarge, PayloadTooLarge

SETTING = "PLUMBLINE_LIMITS__MAX_PAYLOAD_BYTES"
"""The setting that raises the limit (``Limits.max_payload_bytes``), named in the answer."""
HEADER_SETTING = "PLUMBLINE_MAX_HEADER_BYTES"


class BodyLimit:
    def __init__(self, app: ASGIApp, *, limit: int, header_limit: int | None = None) -> None:
        self.app, self.limit, self.header_limit = app, limit, header_limit

    async def __call__(self, scope: Scope, receive: Receive, send: Send) -> None:
        if scope["type"] != "http":
            await self.app(scope, receive, send)
            return
        headers = scope.get("headers") or []
        if self.header_limit is not None:
            query = scope.get("query_string") or b""
            target = (scope.get("raw_path") or b"") + (b"?" + query if query else b"")
            size = header_bytes(scope.get("method", ""), target, headers)
            if size > self.header_limit:
                await _answer(send, HeadersTooLarge(size=size, limit=self.header_limit))
                return
        declared = dict(headers).get(b"content-length")
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
    await _answer(send, PayloadTooLarge(size=size, limit=limit))


async def _answer(send: Send, error: PayloadTooLarge) -> None:
    headers, body = refusal(error)
    await send({"type": "http.response.start", "status": error.status, "headers": headers})
    await send({"type": "http.response.body", "body": body})


def refusal(error: PayloadTooLarge) -> tuple[list[tuple[bytes, bytes]], bytes]:
    """The headers and body of the problem document that refuses a request past a size limit."""
    setting = HEADER_SETTING if isinstance(error, HeadersTooLarge) else SETTING
    problem = _problem(error.status, error.code, error.message, limit=error.limit, setting=setting)
    body = json.dumps(problem).encode()
    headers = [
        (b"content-type", b"application/problem+json"),
        (b"content-length", str(len(body)).encode()),
        (b"connection", b"close"),
    ]
    return headers, body


def header_bytes(method: str, target: bytes, headers: list[tuple[bytes, bytes]]) -> int:
    """The size of a request's line and header block as it was sent (``name: value\\r\\n`` each)."""
    line = len(method) + len(target) + len(" HTTP/1.1\r\n")
    return line + sum(len(name) + len(value) + 4 for name, value in headers) + 2


class HeaderLimitH11(H11Protocol):
    """uvicorn's h11 protocol, answering a header block past the limit with 431 and a problem
    document, then reading and discarding what the client still sends until it closes, stops
    sending for ``LINGER_IDLE_S`` or has sent ``LINGER_MAX_BYTES`` (a lingering close, as web
    servers do): closing with unread bytes would reset the connection before the client reads
    the answer. Any other malformed request keeps uvicorn's 400."""

    LINGER_IDLE_S = 1.0
    LINGER_MAX_S = 10.0
    LINGER_MAX_BYTES = 64 * 1024 * 1024

    _lingering: tuple[float, int] | None = None
    """While lingering: when it started and the bytes discarded since."""
    _linger_timer: Any = None

    def send_400_response(self, msg: str) -> None:
        buffered = len(self.conn.trailing_data[0])
        limit = self.config.h11_max_incomplete_event_size
        if limit is None or buffered <= limit:  # not h11's "receive buffer too long"
            super().send_400_response(msg)
            return
        headers, body = refusal(HeadersTooLarge(size=buffered, limit=limit))
        reason = b"Request Header Fields Too Large"
        for event in (
            h11.Response(status_code=431, headers=headers, reason=reason),
            h11.Data(data=body),
            h11.EndOfMessage(),
        ):
            self.transport.write(self.conn.send(event))
        self._lingering = (self.loop.time(), 0)
        self.flow.resume_reading()
        self._linger_timer = self.loop.call_later(self.LINGER_IDLE_S, self._linger_end, 0)

    def data_received(self, data: bytes) -> None:
        if self._lingering is None:
            super().data_received(data)
            return
        started, seen = self._lingering
        self._lingering = (started, seen + len(data))
        if (
            seen + len(data) > self.LINGER_MAX_BYTES
            or self.loop.time() > started + self.LINGER_MAX_S
        ):
            self._linger_end(None)

    def _linger_end(self, seen_then: int | None) -> None:
        """Close once the client sent nothing since the last look (or at once with ``None``)."""
        if self._lingering is None or self.transport.is_closing():
            return
        seen = self._lingering[1]
        if seen_then is not None and seen != seen_then:
            self._linger_timer = self.loop.call_later(self.LINGER_IDLE_S, self._linger_end, seen)
            return
        self.transport.close()

    def connection_lost(self, exc: Exception | None) -> None:
        if self._linger_timer is not None:
            self._linger_timer.cancel()
        super().connection_lost(exc)


def _problem(status: int, code: str, detail: str, **extra: Any) -> dict[str, Any]:
    return {
        "type": f"urn:plumbline:error:{code}",
        "title": code.replace("_", " "),
        "status": status,
        "code": code,
        "detail": detail,
        **extra,
    }
