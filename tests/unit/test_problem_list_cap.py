"""An answer listing a definition's problems is never much larger than the request: the first
``MAX_LISTED_PROBLEMS`` problems and their total, each echoed value cut to ``MAX_ECHO_CHARS``.

Once, 0.89 MB of CSV header gave a 23.7 MB answer listing 100,002 problems.
"""

from __future__ import annotations

import asyncio
import json
from pathlib import Path
from typing import Any

import pytest
from factories import encode, make_category_dataset, make_compare_definition
from starlette.requests import Request

from service import cli, pipeline
from service.config import Limits, Settings
from service.errors import (
    MAX_ECHO_CHARS,
    MAX_LISTED_PROBLEMS,
    InvalidDefinition,
    Problem,
    listing,
)
from service.runner import jobs

HEADER_NAMES = 100_002


def header_flood(names: int = HEADER_NAMES) -> bytes:
    """A definition whose CSV header names ``names`` undeclared columns (100,002: about 0.9 MB)."""
    definition = make_compare_definition({"North": 1.0})
    dataset = make_category_dataset({"North": 1.0})
    del dataset["rows"]
    dataset["csv"] = ",".join(f"x{n}" for n in range(names)) + "\n"
    definition["datasets"] = [dataset]
    return encode(definition)


@pytest.fixture(scope="module")
def flood() -> InvalidDefinition:
    with pytest.raises(InvalidDefinition) as caught:
        pipeline.intake(header_flood(), Limits())
    assert len(caught.value.problems) > HEADER_NAMES
    return caught.value


def test_the_api_lists_the_first_problems_and_the_total(
    flood: InvalidDefinition, tmp_path: Path
) -> None:
    from service.app import create_app

    app = create_app(Settings(data_dir=tmp_path))
    handler = app.exception_handlers[InvalidDefinition]
    request = Request({"type": "http", "method": "POST", "path": "/", "headers": []})
    response = asyncio.run(handler(request, flood))
    assert response.status_code == 422
    assert len(response.body) < 100_000
    body = json.loads(response.body)
    assert len(body["errors"]) == MAX_LISTED_PROBLEMS
    assert body["problems_total"] == len(flood.problems)
    assert body["problems_truncated"] is True
    assert str(len(flood.problems)) in body["detail"]


def test_echoed_values_are_cut_to_a_bounded_length() -> None:
    listed = listing([Problem("bad", "a.b", "message", "hint", "w" * 100_000)])
    value = listed["errors"][0]["value"]
    assert len(value) <= MAX_ECHO_CHARS
    assert value.startswith("www")
    assert value.endswith("…")
    assert listed == {**listed, "problems_total": 1, "problems_truncated": False}
    nested = listing([Problem("bad", "a", "m", "", {"k": ["v" * 1000] * 100})])
    assert len(nested["errors"][0]["value"]) <= MAX_ECHO_CHARS
    short = listing([Problem("bad", "a", "m", "", {"k": [1, 2]})])
    assert short["errors"][0]["value"] == {"k": [1, 2]}


def test_a_failed_job_stores_the_same_capped_list(flood: InvalidDefinition) -> None:
    error: dict[str, Any] = jobs.failure(flood)
    assert len(error["errors"]) == MAX_LISTED_PROBLEMS
    assert error["problems_total"] == len(flood.problems)
    assert error["problems_truncated"] is True


def test_the_command_line_prints_the_first_problems_and_the_total(
    tmp_path: Path, capsys: pytest.CaptureFixture[str], monkeypatch: pytest.MonkeyPatch
) -> None:
    path = tmp_path / "flood.json"
    path.write_bytes(header_flood(300))  # cut like the flood, read quicker
    monkeypatch.setattr(cli, "_within_budget", lambda args, settings, job, *a, **kw: job(*a, **kw))
    assert cli.main(["check", str(path)]) == cli.EXIT_INVALID
    err = capsys.readouterr().err
    assert len(err.splitlines()) <= MAX_LISTED_PROBLEMS + 2
    assert f"and {300 + 2 - MAX_LISTED_PROBLEMS} more" in err  # and the two declared columns
    assert cli.main(["check", str(path), "--json"]) == cli.EXIT_INVALID
    out = json.loads(capsys.readouterr().out)
    assert len(out["errors"]) == MAX_LISTED_PROBLEMS
    assert out["problems_truncated"] is True
