"""Every route of the app × every kind of caller: only the allowed cells succeed.

``ROUTES`` classifies each route of ``create_app().routes``; ``test_the_table_covers_every_route``
fails when a route is added and not classified. Callers: no key, author, reviewer, approver,
auditor, admin, another family's key (every pack role, family ``marsh-end``), an expired key and a
revoked key (every role, every family). The designed answers (docs/http-api.md; OWASP API
Security Top 10 2023, API1 object level and API5 function level):

- public routes (health, schema, the check catalogue, the API's own description) answer everyone;
- every other API route answers 401 without a valid key (none, expired, revoked);
- reading a pack needs only a key of its family (any role); another family's pack is 404 exactly
  like a missing one; each action needs its role (403 otherwise), checked before the pack is
  looked up; a job is seen only by the key that posted it (404 for every other);
- the review pages send a visitor without a session to sign in (303), refuse a role the action
  needs with the page and 403, and answer another family's pack 404.

A succeeding action changes a pack, so every allowed cell acts on a pack of its own made for it;
refused cells act on shared packs and show that the pack did not change.
"""

from __future__ import annotations

import ipaddress
import json
import re
import ssl
from collections.abc import Callable, Iterator
from contextlib import closing
from dataclasses import dataclass
from datetime import UTC, datetime, timedelta
from typing import Any

import httpx
import pytest
from factories import make_compare_definition, make_report, make_waiver
from fastapi.routing import APIRoute
from harness import serving_app
from starlette.routing import Mount, Route

from service.app import create_app
from service.config import Settings
from service.workflow import keys
from service.workflow.keys import Role

FAMILY = "hollin-vale"
REPORT = "hollin-vale-matrix"
REASON = "The board asked to see the spread above the 45 % floor this month."
ALL_PACK_ROLES = {Role.author, Role.reviewer, Role.approver, Role.auditor}
PEOPLE: dict[str, tuple[str, set[Role], set[str]]] = {
    "author": ("Ada Author", {Role.author}, {FAMILY}),
    "reviewer": ("Rui Reviewer", {Role.reviewer}, {FAMILY}),
    "approver": ("Ana Approver", {Role.approver}, {FAMILY}),
    "auditor": ("Aud Auditor", {Role.auditor}, {"*"}),
    "admin": ("Adm Admin", {Role.admin}, {"*"}),
    "stranger": ("Mo Elsewhere", {Role.author, Role.reviewer, Role.approver}, {"marsh-end"}),
    "expired": ("Ex Pired", ALL_PACK_ROLES, {"*"}),
    "revoked": ("Re Voked", ALL_PACK_ROLES, {"*"}),
}
CALLERS = ["none", *PEOPLE]
NO_KEY = {"none", "expired", "revoked"}


# --- the server and its packs -------------------------------------------------------------------


def definition(period: str) -> dict[str, Any]:
    """Bars from 45 % with a standing waiver of the zero baseline: the lie factor fails (Tufte's
    50/55-from-45 case), so a reviewer has something to waive before sign-off."""
    made = make_compare_definition(
        {"Route 7": 50, "Route 12": 55},
        baseline=45,
        waivers=[make_waiver("bar-zero-baseline", "on-time")],
    )
    made["report"] = make_report(
        id=REPORT,
        title="Matrix",
        period={"start": "2026-06-01", "end": "2026-11-30", "label": period},
    )
    return made


@dataclass
class Site:
    base: str
    secrets: dict[str, str]
    app: Any
    counter: int = 0

    def api(self, who: str) -> httpx.Client:
        headers = {} if who == "none" else {"Authorization": f"Bearer {self.secrets[who]}"}
        return httpx.Client(base_url=self.base, headers=headers, timeout=180)

    def pack(self, state: str) -> dict[str, Any]:
        """A new pack of the matrix report in ``state``: draft, in_review, ready (in review with
        every failed check waived and the standing waiver confirmed) or signed_off."""
        self.counter += 1
        with self.api("author") as author:
            made = author.post("/v1/reports", json=definition(f"Matrix {self.counter}"))
            assert made.status_code == 201, made.text
            pack = dict(made.json())
            if state == "draft":
                return pack
            assert author.post(f"/v1/reports/{pack['id']}/submit").status_code == 200
        if state == "in_review":
            return pack
        with self.api("reviewer") as reviewer:
            for check in ("lie-factor", "bar-zero-baseline"):
                body = {"check": check, "chart": "on-time", "reason": REASON}
                r = reviewer.post(f"/v1/reports/{pack['id']}/waivers", json=body)
                assert r.status_code == 200, r.text
        if state == "ready":
            return pack
        with self.api("approver") as approver:
            body = {"content_sha256": pack["pdf"]["sha256"]}
            signed = approver.post(f"/v1/reports/{pack['id']}/sign-off", json=body)
            assert signed.status_code == 200, signed.text
            return dict(signed.json())

    def status(self, pack_id: str) -> str:
        with self.api("auditor") as auditor:
            return str(auditor.get(f"/v1/reports/{pack_id}").json()["status"])


@pytest.fixture(scope="module")
def site(tmp_path_factory: pytest.TempPathFactory) -> Iterator[Site]:
    settings = Settings(data_dir=tmp_path_factory.mktemp("matrix-data"), workers=2)
    with serving_app(create_app(settings)) as (app, base):
        sessions = app.state.services.sessions
        secrets: dict[str, str] = {}
        for who, (name, roles, families) in PEOPLE.items():
            expires = datetime.now(UTC) - timedelta(hours=1) if who == "expired" else None
            key_id, secrets[who] = keys.create(
                sessions,
                name=name,
                roles=roles,
                families=families,
                expires=expires,
                allow_expired=True,
            )
            if who == "revoked":
                keys.revoke(sessions, key_id=key_id)
        yield Site(base=base, secrets=secrets, app=app)


@pytest.fixture(scope="module")
def shared(site: Site) -> dict[str, Any]:
    """Packs the refused cells act on (they must not change), and a job and a sealed file."""
    out: dict[str, Any] = {
        "draft": site.pack("draft"),
        "in_review": site.pack("in_review"),
        "ready": site.pack("ready"),
        "earlier": site.pack("signed_off"),
        "signed": site.pack("signed_off"),
    }
    with site.api("author") as author:
        body = json.dumps(definition("Matrix job")).encode()
        job = author.post("/v1/reports?wait=false", content=body)
        assert job.status_code == 202, job.text
        out["job"] = job.json()["id"]
        out["sealed_pdf"] = author.get(f"/v1/reports/{out['signed']['id']}/sealed").content
    return out


# --- the routes ---------------------------------------------------------------------------------


@dataclass(frozen=True)
class Call:
    """How to call one route, and who succeeds."""

    allowed: frozenset[str]
    """Callers whose call succeeds (``ok``)."""
    ok: int = 200
    state: str = ""
    """The state of the pack an allowed caller acts on (one of its own); refused callers act on
    the shared pack in this state and it must keep it."""
    body: Callable[[dict[str, Any]], Any] | None = None
    family_bound: bool = True
    """Another family's key gets 404 (the route is about one pack)."""
    web: bool = False


EVERYONE = frozenset(CALLERS)
ANY_KEY = frozenset(PEOPLE) - NO_KEY
IN_FAMILY = ANY_KEY - {"stranger"}


def _waiver(_: dict[str, Any]) -> dict[str, str]:
    return {"check": "lie-factor", "chart": "on-time", "reason": REASON}


def _sign_off(pack: dict[str, Any]) -> dict[str, str]:
    return {"content_sha256": pack["pdf"]["sha256"]}


ROUTES: dict[tuple[str, str], Call] = {
    ("GET", "/openapi.json"): Call(EVERYONE, family_bound=False),
    ("GET", "/docs"): Call(EVERYONE, family_bound=False),
    ("GET", "/docs/oauth2-redirect"): Call(EVERYONE, family_bound=False),
    ("GET", "/redoc"): Call(EVERYONE, family_bound=False),
    ("GET", "/v1/health"): Call(EVERYONE, family_bound=False),
    ("GET", "/v1/ready"): Call(EVERYONE, family_bound=False),
    ("GET", "/v1/schema"): Call(EVERYONE, family_bound=False),
    ("GET", "/v1/checks"): Call(EVERYONE, family_bound=False),
    ("POST", "/v1/check"): Call(ANY_KEY, family_bound=False),
    ("POST", "/v1/verify"): Call(ANY_KEY, family_bound=False),
    ("POST", "/v1/reports"): Call(frozenset({"author"}), ok=201, family_bound=False),
    ("GET", "/v1/reports"): Call(ANY_KEY, family_bound=False),
    ("GET", "/v1/reports/{pack_id}"): Call(IN_FAMILY, state="draft"),
    ("GET", "/v1/reports/{pack_id}/checks"): Call(IN_FAMILY, state="draft"),
    ("GET", "/v1/reports/{pack_id}/audit"): Call(IN_FAMILY, state="draft"),
    ("GET", "/v1/reports/{pack_id}/pdf"): Call(IN_FAMILY, state="draft"),
    ("GET", "/v1/reports/{pack_id}/sealed"): Call(IN_FAMILY, state="signed"),
    ("GET", "/v1/reports/{pack_id}/compare/{other_id}"): Call(IN_FAMILY, state="signed"),
    ("POST", "/v1/reports/{pack_id}/submit"): Call(frozenset({"author"}), state="draft"),
    ("POST", "/v1/reports/{pack_id}/request-changes"): Call(
        frozenset({"reviewer", "approver"}), state="in_review", body=lambda _: {"reason": REASON}
    ),
    ("POST", "/v1/reports/{pack_id}/waivers"): Call(
        frozenset({"reviewer"}), state="in_review", body=_waiver
    ),
    ("POST", "/v1/reports/{pack_id}/sign-off"): Call(
        frozenset({"approver"}), state="ready", body=_sign_off
    ),
    ("GET", "/v1/jobs/{job_id}"): Call(frozenset({"author"})),
    ("GET", "/review/sign-in"): Call(EVERYONE, family_bound=False, web=True),
    ("POST", "/review/sign-in"): Call(ANY_KEY, ok=303, family_bound=False, web=True),
    ("POST", "/review/sign-out"): Call(EVERYONE, ok=303, family_bound=False, web=True),
    ("GET", "/review"): Call(ANY_KEY, family_bound=False, web=True),
    ("GET", "/review/packs/{pack_id}"): Call(IN_FAMILY, state="draft", web=True),
    ("GET", "/review/packs/{pack_id}/draft.pdf"): Call(IN_FAMILY, state="draft", web=True),
    ("GET", "/review/packs/{pack_id}/sealed.pdf"): Call(IN_FAMILY, state="signed", web=True),
    ("GET", "/review/packs/{pack_id}/compare/{other_id}"): Call(
        IN_FAMILY, state="signed", web=True
    ),
    ("POST", "/review/packs/{pack_id}/submit"): Call(
        frozenset({"author"}), ok=303, state="draft", web=True
    ),
    ("POST", "/review/packs/{pack_id}/request-changes"): Call(
        frozenset({"reviewer", "approver"}),
        ok=303,
        state="in_review",
        body=lambda _: {"reason": REASON},
        web=True,
    ),
    ("POST", "/review/packs/{pack_id}/waive"): Call(
        frozenset({"reviewer"}),
        ok=303,
        state="in_review",
        body=lambda _: {"item": "lie-factor/on-time", "reason": REASON},
        web=True,
    ),
    ("POST", "/review/packs/{pack_id}/sign-off"): Call(
        frozenset({"approver"}), ok=303, state="ready", body=_sign_off, web=True
    ),
    ("GET", "/review/static/{path}"): Call(EVERYONE, family_bound=False, web=True),
}


def _walk(routes: list[Any], prefix: str = "") -> Iterator[Any]:
    """Every route, with included routers opened (FastAPI 0.165 keeps them as included routers,
    each with its include prefix); yields (prefix + path, route)."""
    for route in routes:
        router = getattr(route, "original_router", None)
        if router is not None:
            yield from _walk(router.routes, prefix + route.include_context.prefix)
        else:
            yield prefix, route


def app_routes() -> set[tuple[str, str]]:
    """Every (method, path) the application answers, read from the app itself."""
    found: set[tuple[str, str]] = set()
    for prefix, route in _walk(create_app(Settings()).routes):
        if isinstance(route, Mount):
            found.add(("GET", f"{prefix}{route.path}/{{path}}"))
        elif isinstance(route, APIRoute | Route):
            found |= {(m, prefix + route.path) for m in (route.methods or set()) if m != "HEAD"}
        else:
            raise AssertionError(f"a route of an unknown kind: {route!r}")
    return found


def test_the_table_covers_every_route() -> None:
    routes = app_routes()
    assert routes - set(ROUTES) == set(), "classify the new routes in ROUTES"
    assert set(ROUTES) - routes == set(), "ROUTES names routes the app no longer has"


def test_no_route_serves_csv() -> None:
    """No route exports CSV meant for a spreadsheet (see test_injection's docstring): one that
    does must neutralise formula prefixes, and then this test is changed with that decision."""
    for _, route in _walk(create_app(Settings()).routes):
        if isinstance(route, APIRoute):
            kinds = json.dumps(route.responses) + str(route.response_class)
            assert "csv" not in kinds.lower(), route.path
            assert "csv" not in route.path.lower(), route.path


# --- one cell -----------------------------------------------------------------------------------


def _web_client(site: Site, who: str) -> tuple[httpx.Client, str]:
    """A browser for ``who``: signed in when the key is valid; else an anonymous session (the
    expired and revoked keys are refused at sign-in). Returns it and a CSRF token of its session."""
    http = httpx.Client(base_url=site.base, follow_redirects=False, timeout=180)
    token = _csrf(http.get("/review/sign-in").text)
    if who not in NO_KEY:
        signed = http.post("/review/sign-in", data={"csrf": token, "key": site.secrets[who]})
        assert signed.status_code == 303, signed.text
        token = _csrf(http.get("/review").text)
    elif who != "none":
        refused = http.post("/review/sign-in", data={"csrf": token, "key": site.secrets[who]})
        assert refused.status_code == 401
    return http, token


def _csrf(page: str) -> str:
    found = re.search(r'name="csrf" value="([^"]+)"', page)
    assert found is not None, page[:300]
    return found.group(1)


def _expected(call: Call, who: str) -> int:  # noqa: PLR0911 (one return per rule)
    if who in call.allowed:
        return call.ok
    if call.web:
        if who in NO_KEY and call.state:
            return 303  # to the sign-in page
        if who in NO_KEY:
            return 401 if call.ok == 303 else 303
        return 404 if who == "stranger" and call.family_bound else 403
    if who in NO_KEY:
        return 401
    if who == "stranger" and call.family_bound:
        return 404
    if call == ROUTES[("GET", "/v1/jobs/{job_id}")]:
        return 404  # another key's job is not found
    return 403


CELLS = [(method, path, who) for (method, path) in ROUTES for who in CALLERS]


@pytest.mark.parametrize(
    ("method", "path", "who"), CELLS, ids=[f"{m} {p} {w}" for m, p, w in CELLS]
)
def test_cell(  # noqa: PLR0912 (one branch per kind of route)
    site: Site, shared: dict[str, Any], method: str, path: str, who: str
) -> None:
    call = ROUTES[(method, path)]
    allowed = who in call.allowed
    pack: dict[str, Any] = {}
    if call.state:
        fresh = allowed and method == "POST"
        pack = (
            site.pack(call.state if call.state != "signed" else "signed_off")
            if fresh
            else shared[call.state]
        )
    url = path.replace("{pack_id}", pack.get("id", "")).replace(
        "{other_id}", shared["earlier"]["id"]
    )
    url = url.replace("{job_id}", shared["job"]).replace("{path}", "review.css")
    body = call.body(pack) if call.body else None
    if path == "/v1/reports":
        content: bytes | None = (
            json.dumps(definition(f"Cell {who}")).encode() if method == "POST" else None
        )
    elif path == "/v1/check":
        content = json.dumps(definition("Checked")).encode()
    elif path == "/v1/verify":
        content = shared["sealed_pdf"]
    else:
        content = json.dumps(body).encode() if body is not None and not call.web else None

    if call.web:
        http, token = _web_client(site, who)
        with closing(http):
            if method == "GET":
                answer = http.get(url)
            else:
                form = {"csrf": token, **(body or {})}
                if path == "/review/sign-in":
                    form["key"] = site.secrets.get(who, "")
                answer = http.post(url, data=form)
    else:
        with site.api(who) as http:
            kind = "application/pdf" if path == "/v1/verify" else "application/json"
            headers = {"content-type": kind} if content is not None else {}
            answer = http.request(method, url, content=content, headers=headers)

    expected = _expected(call, who)
    assert answer.status_code == expected, (answer.status_code, answer.text[:400])
    if not call.web and answer.status_code >= 400:
        assert answer.headers["content-type"].startswith("application/problem+json")
        assert answer.json()["detail"]  # says why
    if call.state and not allowed and method == "POST":
        wanted = {"signed": "signed_off"}.get(call.state, call.state)
        assert site.status(pack["id"]) == ("in_review" if call.state == "ready" else wanted)
    if call.web and answer.status_code == 303 and who in NO_KEY and call.state:
        assert answer.headers["location"].startswith("/review/sign-in")
    if path == "/v1/reports" and method == "GET" and allowed:
        seen = {p["id"] for p in answer.json()["packs"]}
        assert (shared["draft"]["id"] in seen) == (who != "stranger")


# --- API3: clients cannot set server-owned fields -------------------------------------------------

OWNED = {
    "status": "signed_off",
    "author": "Mallory",
    "signed_off_by": "Mallory",
    "sha256": "0" * 64,
}


@pytest.mark.parametrize(
    ("action", "body"),
    [
        ("request-changes", {"reason": REASON}),
        ("waivers", {"check": "lie-factor", "chart": "on-time", "reason": REASON}),
        ("sign-off", {"content_sha256": "0" * 64}),
    ],
)
@pytest.mark.parametrize("field", sorted(OWNED))
def test_action_bodies_refuse_server_owned_fields(
    site: Site, shared: dict[str, Any], action: str, body: dict[str, str], field: str
) -> None:
    pack = shared["in_review"]
    who = {"request-changes": "reviewer", "waivers": "reviewer", "sign-off": "approver"}[action]
    with site.api(who) as http:
        answer = http.post(f"/v1/reports/{pack['id']}/{action}", json={**body, field: OWNED[field]})
    assert answer.status_code == 422, answer.text
    paths = {e["path"] for e in answer.json()["errors"]}
    assert any(p.endswith(field) for p in paths), paths
    assert site.status(pack["id"]) == "in_review"


@pytest.mark.parametrize("field", ["status", "author", "pdf_sha256", "created_at", "id"])
def test_a_definition_cannot_carry_server_owned_fields(site: Site, field: str) -> None:
    body = definition("Owned fields") | {field: "signed_off"}
    with site.api("author") as http:
        answer = http.post("/v1/reports", json=body)
    assert answer.status_code == 422, answer.text
    assert field in {e["path"] for e in answer.json()["errors"]}


def test_a_body_sent_to_submit_is_ignored(site: Site) -> None:
    """Submit takes no body; whatever is sent is ignored (the server records who and what)."""
    pack = site.pack("draft")
    with site.api("author") as http:
        sent = {"status": "signed_off", "authors": ["Mallory"], "submitted_sha256": "0" * 64}
        answer = http.post(f"/v1/reports/{pack['id']}/submit", json=sent)
    assert answer.status_code == 200, answer.text
    view = answer.json()
    assert view["status"] == "in_review"
    assert view["review"]["authors"] == ["Ada Author"]
    assert view["review"]["submitted_sha256"] == pack["pdf"]["sha256"]


def test_extra_form_fields_are_ignored_by_the_review_pages(site: Site) -> None:
    pack = site.pack("in_review")
    http, token = _web_client(site, "reviewer")
    with closing(http):
        form = {"csrf": token, "item": "lie-factor/on-time", "reason": REASON}
        form |= {"by": "Mallory", "status": "signed_off", "pdf_sha256": "0" * 64}
        answer = http.post(f"/review/packs/{pack['id']}/waive", data=form)
    assert answer.status_code == 303, answer.text
    with site.api("auditor") as auditor:
        waivers = auditor.get(f"/v1/reports/{pack['id']}/checks").json()["waivers"]
    assert [(w["by"], w["pdf_sha256"]) for w in waivers] == [
        ("Rui Reviewer", pack["pdf"]["sha256"])
    ]
    assert site.status(pack["id"]) == "in_review"


# --- review pages: CSRF on every form, cookie attributes ------------------------------------------

_FORM = re.compile(r"<form\b[^>]*>.*?</form>", re.S | re.I)


def test_every_form_carries_a_csrf_token(site: Site, shared: dict[str, Any]) -> None:
    pages = 0
    for who in ("author", "reviewer", "approver", "auditor"):
        http, _ = _web_client(site, who)
        with closing(http):
            urls = ["/review/sign-in", "/review"] + [
                f"/review/packs/{shared[s]['id']}"
                for s in ("draft", "in_review", "ready", "signed")
            ]
            urls.append(f"/review/packs/{shared['signed']['id']}/compare/{shared['earlier']['id']}")
            for url in urls:
                page = http.get(url)
                assert page.status_code == 200, (who, url)
                forms = _FORM.findall(page.text)
                pages += 1
                for form in forms:
                    if re.search(r'method="post"', form, re.I):
                        assert re.search(r'type="hidden" name="csrf" value="[^"]+"', form), form
    assert pages == 28


@pytest.mark.parametrize(
    "path", [p for (m, p) in ROUTES if m == "POST" and p.startswith("/review")]
)
def test_a_review_post_without_the_token_is_403(
    site: Site, shared: dict[str, Any], path: str
) -> None:
    pack = shared["ready"]
    url = path.replace("{pack_id}", pack["id"])
    who = "approver"
    http, _ = _web_client(site, who)
    with closing(http):
        form = {"reason": REASON, "item": "lie-factor/on-time", "key": site.secrets[who]}
        form["content_sha256"] = pack["pdf"]["sha256"]
        answer = http.post(url, data=form)
    assert answer.status_code == 403, (answer.status_code, answer.text[:300])
    assert "security token" in answer.text
    assert site.status(pack["id"]) == "in_review"


def _cookie(answer: httpx.Response) -> str:
    found = [v for k, v in answer.headers.multi_items() if k.lower() == "set-cookie"]
    assert found, answer.headers
    return found[0]


def test_the_session_cookie_is_http_only_and_same_site_lax(site: Site) -> None:
    with httpx.Client(base_url=site.base) as http:
        cookie = _cookie(http.get("/review/sign-in")).lower()
    assert "httponly" in cookie
    assert "samesite=lax" in cookie
    assert "secure" not in cookie.split(";")[1:].__str__()  # plain HTTP, not configured


def test_the_session_cookie_is_secure_over_tls(tmp_path: Any) -> None:
    from cryptography import x509
    from cryptography.hazmat.primitives import hashes, serialization
    from cryptography.hazmat.primitives.asymmetric import rsa
    from cryptography.x509.oid import NameOID

    key = rsa.generate_private_key(public_exponent=65537, key_size=2048)
    name = x509.Name([x509.NameAttribute(NameOID.COMMON_NAME, "127.0.0.1")])
    now = datetime.now(UTC)
    cert = (
        x509.CertificateBuilder()
        .subject_name(name)
        .issuer_name(name)
        .public_key(key.public_key())
        .serial_number(x509.random_serial_number())
        .not_valid_before(now - timedelta(minutes=5))
        .not_valid_after(now + timedelta(hours=1))
        .add_extension(
            x509.SubjectAlternativeName([x509.IPAddress(ipaddress.ip_address("127.0.0.1"))]),
            critical=False,
        )
        .sign(key, hashes.SHA256())
    )
    (tmp_path / "key.pem").write_bytes(
        key.private_bytes(
            serialization.Encoding.PEM,
            serialization.PrivateFormat.PKCS8,
            serialization.NoEncryption(),
        )
    )
    (tmp_path / "cert.pem").write_bytes(cert.public_bytes(serialization.Encoding.PEM))
    settings = Settings(data_dir=tmp_path / "data", workers=1)
    tls = {"ssl_keyfile": str(tmp_path / "key.pem"), "ssl_certfile": str(tmp_path / "cert.pem")}
    with serving_app(create_app(settings), **tls) as (_, base):
        assert base.startswith("https://")
        trusted = ssl.create_default_context(cafile=str(tmp_path / "cert.pem"))
        with httpx.Client(base_url=base, verify=trusted) as http:
            cookie = _cookie(http.get("/review/sign-in")).lower()
    attributes = [part.strip() for part in cookie.split(";")]
    assert "secure" in attributes
    assert "httponly" in attributes
    assert "samesite=lax" in attributes
