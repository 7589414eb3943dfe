"""The product's exception hierarchy.

Every error Plumbline raises on purpose derives from :class:`PlumblineError` and carries a stable
``code`` and the HTTP status the API answers with::

    PlumblineError (500, internal_error)
    ├── InvalidDefinition (422, invalid_definition)   every problem found, each with a path
    ├── PayloadTooLarge (413, payload_too_large)       before the body is parsed
    │   └── HeadersTooLarge (431, headers_too_large)   the request's header block, before routing
    ├── Unreadable (400, unreadable_input)            a file the CLI was given cannot be read
    ├── Unauthorized (401, unauthorized)               no key, or an unknown, revoked or expired one
    ├── Forbidden (403, forbidden)                     the key's roles do not allow the action
    ├── NotFound (404, not_found)
    ├── Conflict (409, conflict)                       an illegal transition, a changed draft, a race
    ├── InvalidRequest (422, invalid_request)          a request that is not a definition is wrong
    ├── UnsupportedMediaType (415, unsupported_media_type)   a JSON route sent another type
    ├── TooBusy (429, too_busy)                        the background queue is full (Retry-After)
    ├── RenderTimeout (422, render_timeout)            a render past its time budget, stopped
    ├── RenderFailed (500, render_failed)              a foreign exception during drawing or assembly
    │
    │   defined beside what raises them:
    ├── runner.pool.RenderMemory (422, render_memory)                past PLUMBLINE_WORKER_MEMORY_MB
    ├── archive.db.DatabaseUnavailable (503, database_unavailable)   connection lost, or busy
    ├── archive.files.StorageFull (507, insufficient_storage)        the store's disk is full
    ├── archive.objects.StoreUnavailable (503, store_unavailable)    the object store cannot be reached
    ├── archive.migrate.SchemaMismatch (500, schema_mismatch)        the database is of another version
    ├── seal.keys.KeyProblem (500, seal_key)                         the signing key cannot be used
    ├── seal.sign.NotSealed (422, not_sealed)                        the bytes are not a sealed pack
    ├── runner.services.NotReady (503, not_ready)                    a part the service needs is down
    ├── web.session.SessionSecretProblem (500, session_secret)       the pages' session secret is unusable
    ├── distributed.options.QueueMisconfigured (500, queue_misconfigured)   PLUMBLINE_QUEUE_* is wrong
    └── distributed.jobs.QueueUnavailable (503, queue_unavailable)   the broker did not take a job

Every class has a stable ``code`` (the API answers it as ``code`` and as the problem's ``type``,
``urn:plumbline:error:<code>``) and the ``status`` the API answers with; ``tests/unit/
test_error_tree.py`` holds every exception class under ``service/`` to this tree. Errors cross
process boundaries (worker processes, Celery) by pickling, which keeps every attribute.

A 5xx answer never carries a foreign exception's text: the failure is logged under an opaque
incident id (``service.logs.incident``) and the answer names the id (``incident``).

Foreign exceptions are translated at the stage boundary (``raise RenderFailed(...) from exc``).
"""

from __future__ import annotations

import json
import logging
from dataclasses import dataclass, field
from typing import Any


@dataclass(frozen=True)
class Problem:
    """One thing wrong with a definition: what, where, the offending value, and how to fix it."""

    code: str
    path: str
    message: str
    hint: str = ""
    value: Any = None
    context: dict[str, Any] = field(default_factory=dict)

    @classmethod
    def over_limit(
        cls, path: str, what: str, size: int, *, setting: str, limit: int, advice: str
    ) -> Problem:
        """A size past a configured limit: names the limit and the setting that raises it."""
        return cls(
            "limit_exceeded",
            path,
            f"{what}: {size} is more than the limit of {limit}",
            f"{advice}, or raise PLUMBLINE_LIMITS__{setting.upper()}",
            size,
            {"limit": limit, "setting": setting},
        )

    def as_dict(self) -> dict[str, Any]:
        out: dict[str, Any] = {
            "code": self.code,
            "path": self.path,
            "message": self.message,
            "hint": self.hint,
            "value": self.value,
        }
        if self.context:
            out["context"] = self.context
        return out

    def line(self) -> str:
        shown = "" if self.value is None else f" (got {_short(self.value)})"
        hint = f" — {self.hint}" if self.hint else ""
        return f"{self.path or '<root>'}: [{self.code}] {self.message}{shown}{hint}"


MAX_LISTED_PROBLEMS = 100
"""An answer lists at most this many of a definition's problems, and says how many there are."""

MAX_ECHO_CHARS = 200
"""An offending value longer than this (as JSON) is echoed as its start, cut with "…"."""


def listing(problems: list[Problem]) -> dict[str, Any]:
    """What an answer says of a definition's problems: the first :data:`MAX_LISTED_PROBLEMS`
    (``errors``, each echoed value cut to :data:`MAX_ECHO_CHARS`), how many there are in all
    (``problems_total``) and whether some were left out (``problems_truncated``) — so that an
    answer is never much larger than the request that caused it."""
    shown = problems[:MAX_LISTED_PROBLEMS]
    return {
        "errors": [_echoed(p.as_dict()) for p in shown],
        "problems_total": len(problems),
        "problems_truncated": len(shown) < len(problems),
    }


def _echoed(listed: dict[str, Any]) -> dict[str, Any]:
    return {**listed, "value": _echo(listed["value"])}


def _echo(value: Any) -> Any:
    """``value`` as given when it is short; else the start of its text, cut with "…"."""
    if value is None or isinstance(value, bool | int | float):
        return value
    text = value if isinstance(value, str) else json.dumps(value, default=str)
    if len(text) <= MAX_ECHO_CHARS:
        return value
    return text[: MAX_ECHO_CHARS - 1] + "…"


def _short(value: Any, limit: int = 60) -> str:
    text = repr(value)
    return text if len(text) <= limit else text[: limit - 1] + "…"


class PlumblineError(Exception):
    code = "internal_error"
    status = 500
    incident: str | None = None
    """The id a server-side failure was logged under, when it was logged where it happened."""

    def __init__(self, message: str, *, incident: str | None = None) -> None:
        super().__init__(message)
        self.message = message
        if incident is not None:
            self.incident = incident

    def __reduce__(self) -> tuple[Any, ...]:
        # every attribute crosses a process boundary, whatever the subclass's __init__ takes
        return (_rebuild, (type(self), self.args, self.__dict__))


def _rebuild(
    cls: type[PlumblineError], args: tuple[Any, ...], state: dict[str, Any]
) -> PlumblineError:
    error = cls.__new__(cls, *args)
    error.args = args
    error.__dict__.update(state)
    return error


class InvalidDefinition(PlumblineError):
    code = "invalid_definition"
    status = 422

    def __init__(self, problems: list[Problem]) -> None:
        noun = "problem" if len(problems) == 1 else "problems"
        super().__init__(f"the report definition has {len(problems)} {noun}")
        self.problems = problems


class PayloadTooLarge(PlumblineError):
    code = "payload_too_large"
    status = 413

    def __init__(self, *, size: int, limit: int) -> None:
        super().__init__(
            f"the request body is larger than the limit of {limit} bytes "
            f"(read {size} bytes before stopping); send less data, or raise "
            "PLUMBLINE_LIMITS__MAX_PAYLOAD_BYTES"
        )
        self.size = size
        self.limit = limit


class HeadersTooLarge(PayloadTooLarge):
    code = "headers_too_large"
    status = 431

    def __init__(self, *, size: int, limit: int) -> None:
        PlumblineError.__init__(
            self,
            f"the request's header block is larger than the limit of {limit} bytes (read {size} "
            "bytes before stopping); send shorter headers (an API key is 61 characters), or "
            "raise PLUMBLINE_MAX_HEADER_BYTES",
        )
        self.size = size
        self.limit = limit


class Unreadable(PlumblineError):
    code = "unreadable_input"
    status = 400


class Unauthorized(PlumblineError):
    code = "unauthorized"
    status = 401


class Forbidden(PlumblineError):
    code = "forbidden"
    status = 403


class Conflict(PlumblineError):
    code = "conflict"
    status = 409


class InvalidRequest(PlumblineError):
    code = "invalid_request"
    status = 422


class UnsupportedMediaType(PlumblineError):
    """A JSON route was sent a body of another media type (or a charset other than UTF-8)."""

    code = "unsupported_media_type"
    status = 415


class NotFound(PlumblineError):
    code = "not_found"
    status = 404


class RenderFailed(PlumblineError):
    code = "render_failed"
    status = 500

    @classmethod
    def logged(cls, sentence: str, exc: BaseException) -> RenderFailed:
        """``sentence`` and an incident id; the foreign exception's text (its class, message,
        memory addresses) goes to the log under that id, never into the answer."""
        from service import logs  # here: the log module is not needed to define the tree

        incident = logs.incident(logging.getLogger("plumbline.render"), sentence, exc=exc)
        return cls(f"{sentence} (incident {incident})", incident=incident)


class RenderTimeout(PlumblineError):
    """A render that ran past its time budget and was stopped (its worker process killed)."""

    code = "render_timeout"
    status = 422


class TooBusy(PlumblineError):
    """More background builds are waiting than the service accepts: try again later."""

    code = "too_busy"
    status = 429

    def __init__(self, message: str, *, retry_after: int) -> None:
        super().__init__(message)
        self.retry_after = retry_after
