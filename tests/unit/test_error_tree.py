"""Every exception the product raises to a caller is in the error tree of ``service/errors.py``:
it derives from ``PlumblineError``, the module's docstring draws it with its status and code, the
API's handlers answer it with that status and code, and it survives pickling (worker processes
and Celery hand errors across process boundaries).

A 5xx never carries a foreign exception's text: a job that fails with one stores an incident id,
and the log line with the detail has the same id.
"""

from __future__ import annotations

import asyncio
import importlib
import inspect
import json
import logging
import pickle
import re
from pathlib import Path
from typing import Any

import pytest
from starlette.requests import Request

from service import errors
from service.config import Settings
from service.errors import InvalidDefinition, PayloadTooLarge, PlumblineError, Problem, TooBusy

SERVICE = Path(errors.__file__).resolve().parent

NOT_IMPORTED = {"service.distributed.app", "service.cli"}
"""Modules with effects on import (a Celery app from the settings, a command run); they define no
exception."""

INTERNAL = {
    "service.web.pages.Stop": "ends a request with a ready page; caught by the web package's handler",
}
"""Exception classes that never reach a caller (besides private ``_Names``), and why."""


def _modules() -> list[str]:
    names = []
    for path in sorted(SERVICE.rglob("*.py")):
        parts = list(path.relative_to(SERVICE.parent).with_suffix("").parts)
        if parts[-1] == "__init__":
            parts.pop()
        if "migrations" in parts:
            continue
        name = ".".join(parts)
        if name not in NOT_IMPORTED and "class " in path.read_text(encoding="utf-8"):
            names.append(name)
    return names


def _exceptions() -> list[type[BaseException]]:
    found: list[type[BaseException]] = []
    for name in _modules():
        module = importlib.import_module(name)
        for value in vars(module).values():
            if (
                inspect.isclass(value)
                and issubclass(value, BaseException)
                and value.__module__ == name
                and not value.__name__.startswith("_")
                and f"{name}.{value.__qualname__}" not in INTERNAL
            ):
                found.append(value)
    return sorted(found, key=lambda c: f"{c.__module__}.{c.__qualname__}")


EXCEPTIONS = _exceptions()


def _id(cls: type[BaseException]) -> str:
    return f"{cls.__module__}.{cls.__qualname__}"


def instance(cls: type[PlumblineError]) -> PlumblineError:
    """One of ``cls``, made as its raisers make it."""
    if issubclass(cls, InvalidDefinition):
        return cls([Problem("unknown_column", "datasets[0].columns[1]", "no such column", "hint")])
    if issubclass(cls, PayloadTooLarge):
        return cls(size=2_000, limit=1_000)
    if issubclass(cls, TooBusy):
        return cls("busy now", retry_after=7)
    return cls("what went wrong, and how to put it right")


def test_the_search_finds_the_product_exceptions() -> None:
    names = {c.__name__ for c in EXCEPTIONS}
    assert {"PlumblineError", "InvalidDefinition", "RenderMemory", "DatabaseUnavailable"} <= names


@pytest.mark.parametrize("cls", EXCEPTIONS, ids=_id)
def test_each_exception_is_in_the_tree(cls: type[BaseException]) -> None:
    assert issubclass(cls, PlumblineError), f"{_id(cls)} is not a PlumblineError"
    assert isinstance(cls.status, int)
    assert 400 <= cls.status <= 599
    assert re.fullmatch(r"[a-z][a-z_]*", cls.code), cls.code
    drawn = rf"\b{cls.__name__} \({cls.status}, {cls.code}\)"
    assert re.search(drawn, errors.__doc__ or ""), (
        f"draw {cls.__name__} ({cls.status}, {cls.code}) in the tree of service/errors.py"
    )


@pytest.fixture(scope="module")
def handlers(tmp_path_factory: pytest.TempPathFactory) -> dict[Any, Any]:
    from service.app import create_app

    app = create_app(Settings(data_dir=tmp_path_factory.mktemp("data")))
    return dict(app.exception_handlers)


def _answer(handlers: dict[Any, Any], exc: Exception) -> tuple[int, dict[str, Any]]:
    handler = next(handlers[k] for k in type(exc).__mro__ if k in handlers)
    request = Request({"type": "http", "method": "GET", "path": "/", "headers": []})
    response = asyncio.run(handler(request, exc))
    return response.status_code, json.loads(response.body)


@pytest.mark.parametrize("cls", EXCEPTIONS, ids=_id)
def test_the_api_answers_each_with_its_status_and_code(
    cls: type[PlumblineError], handlers: dict[Any, Any]
) -> None:
    status, body = _answer(handlers, instance(cls))
    assert (status, body["code"], body["status"]) == (cls.status, cls.code, cls.status)
    assert body["type"] == f"urn:plumbline:error:{cls.code}"
    if cls.status >= 500:
        assert re.fullmatch(r"[0-9a-f]{12}", body["incident"])


@pytest.mark.parametrize("cls", EXCEPTIONS, ids=_id)
def test_each_survives_pickling(cls: type[PlumblineError]) -> None:
    sent = instance(cls)
    sent.incident = "0123456789ab"
    got = pickle.loads(pickle.dumps(sent))  # noqa: S301 - our own bytes, as between workers
    assert type(got) is cls
    assert got.message == sent.message
    assert str(got) == str(sent)
    assert got.incident == sent.incident
    assert vars(got) == vars(sent)  # problems, retry_after, size and limit among them
    if isinstance(sent, InvalidDefinition):
        assert got.problems == sent.problems


def test_a_foreign_exception_is_answered_with_an_incident_not_its_text(
    handlers: dict[Any, Any], caplog: pytest.LogCaptureFixture
) -> None:
    status, body = _answer(handlers, ZeroDivisionError("secret internals"))
    assert status == 500
    assert "secret internals" not in json.dumps(body)
    assert "ZeroDivision" not in json.dumps(body)
    logged = [r for r in caplog.records if getattr(r, "incident", None) == body["incident"]]
    assert logged
    assert "secret internals" in logged[0].getMessage()


def test_a_job_failing_with_a_foreign_exception_stores_an_incident_id_only(
    tmp_path: Path, caplog: pytest.LogCaptureFixture
) -> None:
    from service.archive import db
    from service.archive.db import JobRow
    from service.archive.files import Store
    from service.runner.jobs import JobState, LocalJobs
    from service.runner.views import view
    from service.workflow.keys import Principal, Role

    class Breaking:
        size = 1

        async def build(self, *_: Any, **__: Any) -> Any:
            raise ZeroDivisionError("division by zero in the secret part")

    settings = Settings(data_dir=tmp_path)
    sessions = db.connect(settings.database_url)
    jobs = LocalJobs(
        sessions=sessions,
        store=Store(tmp_path / "files"),
        workers=Breaking(),  # type: ignore[arg-type]
        settings=settings,
    )
    author = Principal("ky_test", "Ann Author", frozenset({Role.author}), frozenset({"*"}))

    async def run() -> JobRow:
        row = await jobs.start(author, b"{}")
        for _ in range(500):
            row = jobs.get(author, row.id)
            if row.status != JobState.QUEUED:
                break
            await asyncio.sleep(0.01)
        await jobs.close()
        return row

    with caplog.at_level(logging.ERROR):
        row = asyncio.run(run())
    answer = json.dumps(view(row).json_body())
    assert row.status == JobState.FAILED
    assert row.error is not None
    assert row.error["code"] == "internal_error"
    incident = row.error["incident"]
    assert re.fullmatch(r"[0-9a-f]{12}", incident)
    assert incident in row.error["detail"]
    assert "ZeroDivision" not in answer
    assert "secret part" not in answer
    logged = [r for r in caplog.records if getattr(r, "incident", None) == incident]
    assert logged, "no log line carries the job's incident id"
    assert "ZeroDivisionError: division by zero in the secret part" in logged[0].getMessage()
    db.engine_of(sessions).dispose()
