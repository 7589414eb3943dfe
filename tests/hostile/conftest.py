"""Fixtures of the hostile-input tests (the helpers are in ``hostile_kit``)."""

from __future__ import annotations

from collections.abc import Iterator

import pytest
from hostile_kit import Listener, listening


@pytest.fixture(scope="session")
def listener() -> Iterator[Listener]:
    """A loopback HTTP server that records every request: a test shows nothing was fetched."""
    with listening() as found:
        yield found
