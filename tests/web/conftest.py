"""Fixtures of the review-page tests (the helpers are in ``review_site``)."""

from __future__ import annotations

from collections.abc import Iterator
from pathlib import Path

import httpx
import pytest
from review_site import PEOPLE, Site, serving

from service.config import Settings
from service.workflow import keys


@pytest.fixture(scope="session")
def site(tmp_path_factory: pytest.TempPathFactory) -> Iterator[Site]:
    settings = Settings(data_dir=Path(tmp_path_factory.mktemp("web-data")), workers=1)
    with serving(settings) as (app, base):
        sessions = app.state.services.sessions
        made = {
            who: keys.create(sessions, name=name, roles=roles, families=families, expires=None)
            for who, (name, roles, families) in PEOPLE.items()
        }
        with httpx.Client(base_url=base, follow_redirects=False, timeout=180) as client:
            yield Site(
                app=app,
                base=base,
                client=client,
                settings=settings,
                secrets={who: secret for who, (_, secret) in made.items()},
                key_ids={who: key_id for who, (key_id, _) in made.items()},
                opened=[],
            )


@pytest.fixture(autouse=True)
def _close_people(request: pytest.FixtureRequest) -> Iterator[None]:
    yield
    if "site" in request.fixturenames:
        request.getfixturevalue("site").close_people()
