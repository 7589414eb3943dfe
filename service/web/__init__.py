"""The reviewer web pages: server-rendered HTML (Jinja2) over the review workflow, under ``/review``.

Reviewers and approvers sign in with an API key, see the packs awaiting them, read every check and
waive, request changes, submit or sign off with plain HTML forms (no script is needed for any
action). Sessions are signed cookies; every form carries a CSRF token (``session``, ``visit``).

This package sits beside ``service.api`` at the edge of the service: it calls the workflow library
and the runner's services (``service.runner.services``), never the API, and nothing imports it but
the composition root (``service.app``).
"""

from __future__ import annotations

from pathlib import Path
from typing import TYPE_CHECKING

if TYPE_CHECKING:
    from fastapi import FastAPI, Request
    from starlette.responses import Response

STATIC = Path(__file__).resolve().parent / "static"


async def _stop(request: Request, exc: Exception) -> Response:
    from service.web.pages import Stop

    assert isinstance(exc, Stop)
    return exc.response


def install(app: FastAPI) -> None:
    """Add the review pages (``/review``) and their style sheet (``/review/static``) to ``app``.

    Installing twice is a no-op, so a caller need not know whether the factory did it already."""
    if getattr(app.state, "web_installed", False):
        return
    # imported here so that ``service.web.session`` loads without the workflow and the pipeline
    from starlette.staticfiles import StaticFiles

    from service.web.pages import Stop
    from service.web.routes import router

    app.include_router(router)
    app.mount("/review/static", StaticFiles(directory=STATIC), name="review-static")
    app.add_exception_handler(Stop, _stop)
    app.state.web_installed = True


__all__ = ["install"]
