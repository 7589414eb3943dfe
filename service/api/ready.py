"""``GET /v1/ready``: whether the service can do its work (database, store, and build queue)."""

from __future__ import annotations

import asyncio
import logging
from collections.abc import Callable

from fastapi import APIRouter
from fastapi.responses import JSONResponse
from starlette.concurrency import run_in_threadpool

from service import logs
from service.api import errors
from service.api.deps import ServicesDep
from service.errors import PlumblineError

log = logging.getLogger("plumbline.api")

PROBE_TIMEOUT_S = 5.0

router = APIRouter(prefix="/v1", tags=["service"])


@router.get(
    "/ready",
    responses={
        503: {
            "description": "A part the service needs cannot be reached; `checks` says which.",
            "content": {"application/problem+json": {}},
        }
    },
)
async def ready(services: ServicesDep) -> JSONResponse:
    """Whether the service can do its work: the database answers ``SELECT 1``, the store takes a
    write and gives it back, every render worker is alive, and the build queue (if
    ``PLUMBLINE_QUEUE_URL`` is set) answers.
    ``/v1/health`` only says the process is alive."""
    probes: dict[str, Callable[[], None]] = {
        "database": services.probe_database,
        "store": services.probe_store,
        "workers": services.probe_workers,
    }
    if services.settings.queue_url:
        probes["queue"] = lambda: services.jobs.ping(PROBE_TIMEOUT_S)
    checks: dict[str, str] = {}
    for name, probe in probes.items():
        try:
            await asyncio.wait_for(run_in_threadpool(probe), timeout=PROBE_TIMEOUT_S)
            checks[name] = "ok"
        except TimeoutError:
            checks[name] = f"no answer within {PROBE_TIMEOUT_S:g} s"
        except Exception as exc:  # noqa: BLE001 - a probe's every failure is the answer
            checks[name] = _reason(exc)
    failed = {name: why for name, why in checks.items() if why != "ok"}
    if not failed:
        return JSONResponse({"status": "ready", "checks": checks})
    detail = "; ".join(f"{name}: {why}" for name, why in failed.items())
    return errors.problem(
        503,
        "not_ready",
        f"the service cannot do its work now ({detail}); it answers 200 here again once "
        "that is back",
        checks=checks,
    )


def _reason(exc: BaseException) -> str:
    if isinstance(exc, PlumblineError):
        return exc.message
    incident = logs.incident(log, "a readiness probe failed", exc=exc)
    return f"failed (incident {incident})"
