"""Shared test setup.

This file's directory is put on ``sys.path`` by pytest (rootdir-relative conftest, no package), so
test modules import the builders with ``from factories import ...``.
"""

from __future__ import annotations

import pytest

from service.config import Limits


@pytest.fixture
def limits() -> Limits:
    """The default limits, as a service started without PLUMBLINE_LIMITS__* settings uses."""
    return Limits()
