"""Shared test setup.

This file's directory is put on ``sys.path`` by pytest (rootdir-relative conftest, no package), so
test modules import the builders with ``from factories import ...`` and the harness (free ports,
servers started and waited for, require-or-skip) with ``import harness``.

The ``slow`` marker is given here, by folder or file, not test by test: ``make quick`` (``pytest -m
"not slow"``) runs everything else.
"""

from __future__ import annotations

from pathlib import Path

import pytest

from service.config import Limits

TESTS = Path(__file__).parent

SLOW = (
    "api/",  # a `plumbline serve` of its own; whole reviews, sealed and verified
    "bench/",  # the benchmark and the load test, each a real run
    "browser/",  # Chromium and a server of its own
    "distributed/",  # redis-server, moto, PostgreSQL and Celery worker processes
    "e2e/test_demo_pack.py",  # the CLI renders the demo again and again, in fresh processes
    "e2e/test_render_progress.py",
    "e2e/test_verify_cli.py",  # walkthrough, seal and verify, in fresh processes
    "faults/",  # servers killed and started again
    "fuzz/",  # hundreds of generated requests and definitions
    "hostile/test_attacks.py",  # the outside attacker's round, re-run against a real service
    "hostile/test_injection.py",  # every payload in every field, rendered, sealed and read back
    "ops/",  # a `plumbline serve` of its own per test
    "quality/test_pack_quality.py::test_the_demo",  # the demo drafted and read back as pictures
    "archive/test_migrations.py::test_processes_starting_at_once_migrate_once",  # processes racing
    "unit/test_chart_cache.py",  # packs drawn twice, cold and from the cache
    "unit/test_large_series.py",  # packs of a million rows
    "unit/test_render_parallel.py",  # pools of spawned drawing processes
    "quality/test_marks.py",  # every chart of the generated gallery drawn and measured
)
"""Where the ``slow`` tests are: folders, files or tests under ``tests/`` (the archive's PostgreSQL
cases are marked where their parameter is made, in ``tests/archive/conftest.py``)."""


def pytest_collection_modifyitems(items: list[pytest.Item]) -> None:
    for item in items:
        where = f"{item.path.relative_to(TESTS).as_posix()}::{item.name}"
        if where.startswith(SLOW):
            item.add_marker(pytest.mark.slow)


@pytest.fixture
def limits() -> Limits:
    """The default limits, as a service started without PLUMBLINE_LIMITS__* settings uses."""
    return Limits()
