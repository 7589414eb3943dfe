"""The service's log: one JSON object a line on standard error (or plain text), each line carrying
the id of the request it belongs to.

What is logged is the service's own wording: access lines (method, path without its query, status,
duration), and errors with their type and stack. Never a request's headers, body, query string or
a definition's contents; an exception's message is left out too (a foreign library's message can
quote the data it choked on), and anything shaped like an API key secret or a ``Bearer`` credential
that still reaches a line is masked before it is written.

``setup`` configures the root logger once, from ``PLUMBLINE_LOG_FORMAT`` and
``PLUMBLINE_LOG_LEVEL``, and routes the server's (uvicorn's) loggers through it; the HTTP side sets
``request_id`` for the duration of a request.
"""

from __future__ import annotations

import json
import logging
import re
import sys
import traceback
import uuid
import warnings
from contextvars import ContextVar
from datetime import UTC, datetime
from types import TracebackType
from typing import Any, TextIO

request_id: ContextVar[str | None] = ContextVar("plumbline_request_id", default=None)
"""The id of the request being answered, in the task (and threads) answering it."""

_SANE_ID = re.compile(r"[A-Za-z0-9._-]{1,64}")

ACCESS = "plumbline.access"
"""The logger of access lines: one per request, with method, path, status and duration_ms."""

FIELDS = ("method", "path", "status", "duration_ms", "incident")
"""Extra fields of a record (``log.info(..., extra={...})``) that are written out."""

_SECRETS = (
    # an API key's secret: "<key id>.<43 URL-safe characters>" (service.workflow.keys)
    (re.compile(r"\b(key_[0-9a-f]{16})\.[A-Za-z0-9_-]{16,}"), r"\1.[redacted]"),
    (re.compile(r"(?i)\b(bearer|basic)\s+[A-Za-z0-9._~+/=-]{8,}"), r"\1 [redacted]"),
    (
        re.compile(r"(?i)\b(authorization|cookie|set-cookie)(['\"]?\s*[:=]\s*)[^\s,;]+"),
        r"\1\2[redacted]",
    ),
)


def accept_request_id(sent: bytes | str | None) -> str:
    """The client's ``X-Request-ID`` if it is sane (1–64 of ``A-Z a-z 0-9 . _ -``), else a new one."""
    if isinstance(sent, bytes):
        sent = sent.decode("latin-1")
    if sent is not None and _SANE_ID.fullmatch(sent):
        return sent
    return uuid.uuid4().hex


def redact(text: str) -> str:
    for pattern, replacement in _SECRETS:
        text = pattern.sub(replacement, text)
    return text


def _stack(
    info: tuple[type[BaseException], BaseException, TracebackType | None] | tuple[None, None, None],
) -> dict[str, Any] | None:
    kind, _, tb = info
    if kind is None:
        return None
    frames = [f"{f.filename}:{f.lineno} in {f.name}" for f in traceback.extract_tb(tb)]
    return {"type": f"{kind.__module__}.{kind.__qualname__}", "stack": frames}


class JsonFormatter(logging.Formatter):
    def format(self, record: logging.LogRecord) -> str:
        line: dict[str, Any] = {
            "time": datetime.fromtimestamp(record.created, UTC).isoformat(timespec="milliseconds"),
            "level": record.levelname.lower(),
            "logger": record.name,
            "message": redact(record.getMessage()),
            "request_id": getattr(record, "request_id", None) or request_id.get(),
        }
        for name in FIELDS:
            if hasattr(record, name):
                line[name] = getattr(record, name)
        if record.exc_info:
            line["error"] = _stack(record.exc_info)
        return json.dumps(line, ensure_ascii=False, default=str)


class TextFormatter(logging.Formatter):
    def format(self, record: logging.LogRecord) -> str:
        moment = datetime.fromtimestamp(record.created, UTC).isoformat(timespec="milliseconds")
        rid = getattr(record, "request_id", None) or request_id.get()
        text = f"{moment} {record.levelname:<7} {record.name}"
        if rid:
            text += f" [{rid}]"
        text += f" {redact(record.getMessage())}"
        error = _stack(record.exc_info) if record.exc_info else None
        if error is not None:
            text += f"\n  {error['type']}\n    " + "\n    ".join(error["stack"])
        return text


def incident(
    log: logging.Logger,
    what: str,
    *,
    detail: str = "",
    exc: BaseException | None = None,
    found: str | None = None,
) -> str:
    """Log a server-side failure under an opaque id (``found``, or a new one) and return the id:
    the answer names the id, the log holds the detail (a foreign exception's text and stack
    never reach a client)."""
    found = found or uuid.uuid4().hex[:12]
    extra = {"incident": found}
    if exc is not None:
        text = f"{type(exc).__name__}: {exc}"
        log.error("%s [%s]: %s", what, found, text, exc_info=exc, extra=extra)
    else:
        log.error("%s [%s]%s", what, found, f": {detail}" if detail else "", extra=extra)
    return found


WARNINGS = logging.getLogger("plumbline.warnings")
"""Python warnings (matplotlib's, pandas'), as their category and message only."""
_PATH = re.compile(r"(?:[A-Za-z]:)?[\\/](?:[^\s'\":\\/]+[\\/])+([^\s'\":\\/]+)")


def route_warnings() -> None:
    """Show every Python warning through the log, as its category and message with any file path
    cut to the file's name. Python's own display starts with the source file and line of the
    library that warned: the installation's paths, on a user's terminal or in a log line."""
    warnings.showwarning = _show_warning


def _show_warning(  # noqa: PLR0917 (the signature of warnings.showwarning)
    message: Warning | str,
    category: type[Warning],
    filename: str,
    lineno: int,
    file: TextIO | None = None,
    line: str | None = None,
) -> None:
    WARNINGS.warning("%s: %s", category.__name__, _PATH.sub(r"\1", redact(str(message))))


class _Ours(logging.StreamHandler[TextIO]):
    """The handler ``setup`` installs (found again and replaced on a second call)."""


def setup(format: str = "json", level: str = "info", stream: TextIO | None = None) -> None:
    """Send every log record through one handler on standard error, in ``format`` (json|text),
    at ``level`` and above; the server's own loggers too (its access log is replaced by ours)."""
    root = logging.getLogger()
    for handler in list(root.handlers):
        if isinstance(handler, _Ours):
            root.removeHandler(handler)
    handler = _Ours(stream or sys.stderr)
    handler.setFormatter(JsonFormatter() if format == "json" else TextFormatter())
    root.addHandler(handler)
    root.setLevel(level.upper())
    route_warnings()
    for name in ("uvicorn", "uvicorn.error", "uvicorn.asgi"):
        server = logging.getLogger(name)
        server.handlers.clear()
        server.propagate = True
        server.setLevel(logging.NOTSET)
    access = logging.getLogger("uvicorn.access")
    access.handlers.clear()
    access.disabled = True  # it logs the query string; ours is written by the service


__all__ = [
    "ACCESS",
    "JsonFormatter",
    "TextFormatter",
    "accept_request_id",
    "incident",
    "redact",
    "request_id",
    "route_warnings",
    "setup",
]
