"""One visit to the review pages: its session, the signed-in key's principal, and the guard every
POST passes (same origin, a CSRF token bound to the session, a small url-encoded form)."""

from __future__ import annotations

import re
import time
from dataclasses import dataclass
from datetime import UTC, datetime
from typing import Any
from urllib.parse import parse_qs, quote, urlsplit

from fastapi import Request
from starlette.concurrency import run_in_threadpool
from starlette.responses import Response

from service.errors import Unauthorized
from service.runner.services import Services
from service.web import session as cookies
from service.web.pages import Stop, html, redirect
from service.workflow import keys
from service.workflow.keys import Principal

MAX_FORM_BYTES = 64 * 1024
_NEXT = re.compile(r"^/review(/[A-Za-z0-9_./-]*)?$")


@dataclass
class Visit:
    services: Services
    secret: bytes
    session: cookies.Session
    principal: Principal | None
    fresh: bool
    """The cookie must be (re)set on the answer."""
    ended: str = ""
    """Why the session this visitor came with ended (key revoked or expired)."""
    https: bool = False
    """The request came over TLS: the cookie is then Secure even when not configured so."""

    @property
    def secure(self) -> bool:
        return self.https or self.services.settings.secure_cookies

    @property
    def csrf(self) -> str:
        return cookies.csrf_token(self.session, self.secret)

    def context(self, **extra: Any) -> dict[str, Any]:
        """What every template is given."""
        base = {"principal": self.principal, "csrf": self.csrf, "ended": self.ended, "flash": ""}
        return base | extra

    def finish(self, response: Response) -> Response:
        if self.fresh:
            response.set_cookie(
                cookies.COOKIE,
                cookies.encode(self.session, self.secret),
                max_age=max(0, self.session.expires - _now()),
                path=cookies.PATH,
                httponly=True,
                samesite="lax",
                secure=self.secure,
            )
        return response

    async def start(self, key_id: str) -> None:
        """Sign in: a new session id, recorded in the archive for the key."""
        self.session = cookies.Session.signed_in()
        expires = datetime.fromtimestamp(self.session.expires, UTC)
        await run_in_threadpool(
            keys.start_session,
            self.services.sessions,
            digest=self.session.digest,
            key_id=key_id,
            expires=expires,
        )
        self.fresh = True

    async def end(self, response: Response) -> Response:
        """Sign out: the session ends in the archive (a copy of the cookie is worth nothing
        afterwards) and the cookie is removed."""
        await run_in_threadpool(keys.end_session, self.services.sessions, self.session.digest)
        response.delete_cookie(
            cookies.COOKIE,
            path=cookies.PATH,
            httponly=True,
            samesite="lax",
            secure=self.secure,
        )
        return response


def _now() -> int:
    return int(time.time())


def _secret(request: Request, services: Services) -> bytes:
    cached = getattr(request.app.state, "web_session_secret", None)
    if isinstance(cached, bytes):
        return cached
    secret = cookies.secret_of(services.settings)
    request.app.state.web_session_secret = secret
    return secret


async def visit(request: Request) -> Visit:
    """The visit's session (a new anonymous one if the cookie is missing, altered or expired) and
    the principal of its key, looked up again now."""
    services = request.app.state.services
    assert isinstance(services, Services)
    secret = await run_in_threadpool(_secret, request, services)
    https = request.url.scheme == "https"
    found = cookies.decode(request.cookies.get(cookies.COOKIE), secret)
    if found is None:
        return Visit(services, secret, cookies.Session.anonymous(), None, fresh=True, https=https)
    try:
        principal = await run_in_threadpool(keys.session_principal, services.sessions, found.digest)
    except Unauthorized:
        return Visit(
            services,
            secret,
            cookies.Session.anonymous(),
            None,
            fresh=True,
            ended="Your session ended: it was signed out or expired, or its key was revoked.",
            https=https,
        )
    return Visit(services, secret, found, principal, fresh=False, https=https)  # None: anonymous


def signed_in(request: Request, current: Visit) -> Principal:
    """The principal, or a redirect to the sign-in page that comes back here afterwards."""
    if current.principal is None:
        target = f"/review/sign-in?next={quote(request.url.path, safe='/')}"
        if current.ended:
            target += "&ended=1"
        raise Stop(current.finish(redirect(target)))
    return current.principal


def safe_next(value: str | None) -> str:
    """Where to go after signing in: a path of the review pages only (no open redirect)."""
    if value and _NEXT.match(value) and "//" not in value and ".." not in value:
        return value
    return "/review"


def refuse(current: Visit, status: int, title: str, message: str) -> Stop:
    page = html("refused.html", current.context(title=title, message=message), status=status)
    return Stop(current.finish(page))


def _same_origin(request: Request) -> bool:
    """An Origin (or else Referer) header, when the browser sends one, must name this host."""
    host = request.headers.get("host", "")
    for header in ("origin", "referer"):
        value = request.headers.get(header)
        if value is not None:
            return bool(host) and urlsplit(value).netloc == host
    return True


async def form(request: Request, current: Visit) -> dict[str, str]:
    """The posted form, after the same-origin and CSRF checks (each refusal is a 403 page)."""
    if not _same_origin(request):
        raise refuse(
            current,
            403,
            "Form refused",
            "This form was sent from another site, so it was not accepted. Open the page on "
            "this site and send the form from there.",
        )
    kind = request.headers.get("content-type", "").split(";")[0].strip().lower()
    if kind != "application/x-www-form-urlencoded":
        raise refuse(
            current,
            415,
            "Form not readable",
            "Send the form from the page itself (as application/x-www-form-urlencoded).",
        )
    body = await request.body()
    if len(body) > MAX_FORM_BYTES:
        raise refuse(
            current, 413, "Form too large", f"A form may hold at most {MAX_FORM_BYTES} bytes."
        )
    try:
        parsed = parse_qs(
            body.decode("utf-8"), keep_blank_values=True, strict_parsing=False, max_num_fields=20
        )
    except (UnicodeDecodeError, ValueError):
        raise refuse(
            current, 400, "Form not readable", "The form could not be read as UTF-8 text."
        ) from None
    fields = {name: values[0] for name, values in parsed.items()}
    if not cookies.csrf_ok(current.session, current.secret, fields.get("csrf")):
        raise refuse(
            current,
            403,
            "Form expired",
            "This form's security token is missing or does not belong to your session (it may "
            "have been open from before you signed in or out). Reload the page and send the "
            "form again.",
        )
    return fields
