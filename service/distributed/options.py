"""The queue's settings, read from the typed settings where they are declared, else from the
``PLUMBLINE_*`` environment (the same names), so the worker and the service read the same values."""

from __future__ import annotations

import os
from dataclasses import dataclass
from typing import Any
from urllib.parse import urlsplit

from service.config import Settings
from service.errors import PlumblineError

VISIBILITY_MARGIN_S = 120.0
"""How much longer than the render budget a delivered build may stay unacknowledged before the
broker gives it to another worker: the draft is stored after the render, and that takes time."""


class QueueMisconfigured(PlumblineError):
    code = "queue_misconfigured"
    status = 500


def setting(settings: Settings, name: str, default: Any = None) -> Any:
    """``settings.<name>``, else the environment variable ``PLUMBLINE_<NAME>``, else ``default``."""
    value = getattr(settings, name, None)
    if value is None or value == "":
        value = os.environ.get(f"PLUMBLINE_{name.upper()}", "")
    return default if value is None or value == "" else value


@dataclass(frozen=True)
class QueueOptions:
    url: str
    visibility_timeout_s: float
    restore_interval_s: float
    render_timeout_s: float

    @classmethod
    def of(cls, settings: Settings) -> QueueOptions:
        url = str(setting(settings, "queue_url", ""))
        if not url:
            raise QueueMisconfigured(
                "PLUMBLINE_QUEUE_URL is not set; give the Redis broker's URL, e.g. "
                "redis://127.0.0.1:6379/0, or leave it unset and use the service's own workers"
            )
        if urlsplit(url).scheme not in ("redis", "rediss"):
            raise QueueMisconfigured(
                f"PLUMBLINE_QUEUE_URL {url!r} is not a Redis URL; use redis://host:port/db "
                "(or rediss:// for TLS)"
            )
        budget = float(settings.render_timeout_s)
        visibility = _number(
            setting(settings, "queue_visibility_timeout_s", budget + VISIBILITY_MARGIN_S),
            "PLUMBLINE_QUEUE_VISIBILITY_TIMEOUT_S",
        )
        if visibility <= budget:
            raise QueueMisconfigured(
                f"PLUMBLINE_QUEUE_VISIBILITY_TIMEOUT_S ({visibility:g} s) must be longer than "
                f"the render budget PLUMBLINE_RENDER_TIMEOUT_S ({budget:g} s), or a build still "
                "running would be given to a second worker; raise it, or leave it unset for "
                f"the budget plus {VISIBILITY_MARGIN_S:g} s"
            )
        restore = _number(
            setting(settings, "queue_restore_interval_s", 10.0),
            "PLUMBLINE_QUEUE_RESTORE_INTERVAL_S",
        )
        return cls(
            url=url,
            visibility_timeout_s=visibility,
            restore_interval_s=restore,
            render_timeout_s=budget,
        )


def _number(value: Any, name: str) -> float:
    try:
        number = float(value)
    except (TypeError, ValueError):
        raise QueueMisconfigured(f"{name} must be a number of seconds; got {value!r}") from None
    if number <= 0:
        raise QueueMisconfigured(f"{name} must be more than 0 seconds; got {value!r}")
    return number


__all__ = ["QueueMisconfigured", "QueueOptions", "setting"]
