"""Helpers of the review-page tests: the real app served by uvicorn on a loopback port (in a thread
of the test process, so tests can reach its database), a real SQLite file and file store in a
temporary folder, one real worker process for rendering and sealing, and an httpx client per person
(each with its own cookies). Named apart from ``conftest`` so that test modules can import it."""

from __future__ import annotations

import json
import re
from collections.abc import Iterator
from contextlib import contextmanager
from dataclasses import dataclass
from html.parser import HTMLParser
from typing import Any

import harness
import httpx
from factories import make_compare_definition, make_report, make_waiver
from fastapi import FastAPI

from service import web
from service.app import create_app
from service.config import Settings
from service.runner.services import Services
from service.workflow.keys import Role

FAMILY = "hollin-vale"
REPORT = "hollin-vale-punctuality"
_CSRF = re.compile(r'name="csrf" value="([^"]+)"')


def failing_definition(
    values: dict[str, float | None] | None = None, **report: Any
) -> dict[str, Any]:
    """A bar chart that asks for bars from 45 % with a standing waiver of the zero baseline, so the
    lie factor (Tufte's 50/55-from-45 case, 10.0) fails and blocks sign-off until it is waived."""
    definition = make_compare_definition(
        values or {"Route 7": 50, "Route 12": 55},
        baseline=45,
        waivers=[make_waiver("bar-zero-baseline", "on-time")],
    )
    definition["report"] = make_report(
        **({"id": REPORT, "title": "Hollin Vale punctuality"} | report)
    )
    return definition


def csrf_of(page: str) -> str:
    found = _CSRF.search(page)
    assert found is not None, "the page has no form with a CSRF token"
    return found.group(1)


class Person:
    """One browser: its own cookies, signed in with its own key."""

    def __init__(self, base: str, secret: str, name: str) -> None:
        self.http = httpx.Client(base_url=base, follow_redirects=False, timeout=120)
        self.secret, self.name = secret, name

    def sign_in(self) -> httpx.Response:
        form = self.http.get("/review/sign-in")
        return self.http.post(
            "/review/sign-in", data={"csrf": csrf_of(form.text), "key": self.secret}
        )

    def post(self, path: str, page: str, **fields: str) -> httpx.Response:
        """Send a form as the page would, with the page's CSRF token."""
        return self.http.post(path, data={"csrf": csrf_of(page), **fields})


@dataclass
class Site:
    app: FastAPI
    base: str
    client: httpx.Client
    settings: Settings
    secrets: dict[str, str]
    key_ids: dict[str, str]
    opened: list[Person]

    @property
    def services(self) -> Services:
        services = self.app.state.services
        assert isinstance(services, Services)
        return services

    def person(self, who: str) -> Person:
        person = Person(self.base, self.secrets[who], who)
        self.opened.append(person)
        return person

    def close_people(self) -> None:
        while self.opened:
            self.opened.pop().http.close()

    def draft(
        self,
        *,
        submit: bool = True,
        values: dict[str, float | None] | None = None,
        **report: Any,
    ) -> dict[str, Any]:
        """A draft built by the JSON API (as the author), optionally submitted for review."""
        bearer = {"Authorization": f"Bearer {self.secrets['author']}"}
        body = json.dumps(failing_definition(values, **report))
        made = self.client.post(
            "/v1/reports", content=body, headers={**bearer, "content-type": "application/json"}
        )
        assert made.status_code == 201, made.text
        pack = made.json()
        if submit:
            sent = self.client.post(f"/v1/reports/{pack['id']}/submit", headers=bearer)
            assert sent.status_code == 200, sent.text
        return dict(pack)


PEOPLE: dict[str, tuple[str, set[Role], set[str]]] = {
    "author": ("Ada Author", {Role.author}, {FAMILY}),
    "reviewer": ("Rui Reviewer", {Role.reviewer}, {FAMILY}),
    "approver": ("Ana Approver", {Role.approver}, {FAMILY}),
    "outsider": ("Oli Outsider", {Role.reviewer, Role.approver}, {"brackmoor"}),
    "auditor": ("Aud Auditor", {Role.auditor}, {"*"}),
}


@contextmanager
def serving(settings: Settings) -> Iterator[tuple[FastAPI, str]]:
    """The app with the review pages, served by uvicorn in a thread; yields it and its base URL."""
    app = create_app(settings)
    web.install(app)  # a no-op once the application factory installs the pages itself
    with harness.serving_app(app) as served:
        yield served


class _Fields(HTMLParser):
    """Every form control of a page, and the ids that a <label for> names."""

    def __init__(self) -> None:
        super().__init__()
        self.controls: list[dict[str, str | None]] = []
        self.labelled: set[str] = set()
        self._in_label = 0

    def handle_starttag(self, tag: str, attrs: list[tuple[str, str | None]]) -> None:
        found = dict(attrs)
        if tag == "label":
            self._in_label += 1
            if found.get("for"):
                self.labelled.add(str(found["for"]))
        elif tag in ("input", "select", "textarea"):
            self.controls.append(found | {"tag": tag, "wrapped": "1" if self._in_label else None})

    def handle_endtag(self, tag: str) -> None:
        if tag == "label":
            self._in_label -= 1


def unlabelled(page: str) -> list[dict[str, str | None]]:
    """Form controls a person can use (not hidden inputs) that have no label of any kind."""
    parser = _Fields()
    parser.feed(page)
    return [
        c
        for c in parser.controls
        if c.get("type") != "hidden"
        and not c.get("wrapped")
        and not c.get("aria-label")
        and not c.get("aria-labelledby")
        and c.get("id") not in parser.labelled
    ]


def controls(page: str) -> list[dict[str, str | None]]:
    parser = _Fields()
    parser.feed(page)
    return parser.controls
