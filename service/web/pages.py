"""Rendering the review pages: one Jinja2 environment (autoescape on for every template), the
security headers every page carries, and :class:`Stop`, which ends a request with a ready answer.

Templates live in the repository's top-level ``templates/`` folder. User text reaches a template
only as values, which Jinja2 escapes; no template marks user text safe.
"""

from __future__ import annotations

from pathlib import Path
from typing import Any

from jinja2 import Environment, FileSystemLoader, StrictUndefined
from starlette.responses import HTMLResponse, Response

from service.workflow import lifecycle

TEMPLATES = Path(__file__).resolve().parents[2] / "templates"
CAUTION = (
    "These checks support, but do not replace, the report owner's judgement, the reporting "
    "standards that apply, and professional review."
)
PAGE_HEADERS = {
    "Content-Security-Policy": (
        "default-src 'none'; style-src 'self'; img-src 'self'; object-src 'self'; "
        "frame-src 'self'; form-action 'self'; frame-ancestors 'none'; base-uri 'none'"
    ),
    "Cache-Control": "no-store",
    "X-Content-Type-Options": "nosniff",
    "Referrer-Policy": "same-origin",
    "X-Frame-Options": "DENY",
}
FLASH = {
    "signed_in": "You are signed in.",
    "signed_out": "You are signed out.",
    "submitted": "The draft was submitted for review.",
    "changes_requested": "Changes were requested: the pack is a draft again.",
    "waived": "The check was waived for this draft.",
    "confirmed": "The standing waiver was confirmed for this draft.",
    "signed_off": "The pack was signed off and sealed. The sealed PDF is ready to download.",
}
"""Messages shown after a redirect, chosen by a code in the query string (never user text)."""

_env = Environment(
    loader=FileSystemLoader(TEMPLATES),
    autoescape=True,
    undefined=StrictUndefined,
    trim_blocks=True,
    lstrip_blocks=True,
)
_env.globals.update(caution=CAUTION, min_reason=lifecycle.MIN_REASON)


def number(value: object) -> str:
    """A figure as the comparison tables show it: up to 6 significant digits, thousands grouped."""
    if isinstance(value, bool) or not isinstance(value, int | float):
        return "" if value is None else str(value)
    return f"{value:,.6g}" if isinstance(value, float) else f"{value:,}"


_env.filters["number"] = number


class Stop(Exception):
    """End the request with this answer (a redirect, a refusal page)."""

    def __init__(self, response: Response) -> None:
        super().__init__(response.status_code)
        self.response = response


def html(template: str, context: dict[str, Any], *, status: int = 200) -> HTMLResponse:
    body = _env.get_template(template).render(**context)
    return HTMLResponse(body, status_code=status, headers=PAGE_HEADERS)


def redirect(location: str) -> Response:
    """303 See Other: after a POST the browser fetches the page with GET."""
    return Response(status_code=303, headers={"Location": location, "Cache-Control": "no-store"})
