"""The worker's Celery application, for ``celery -A service.distributed.app worker --pool=solo``:
configured from the ``PLUMBLINE_*`` environment when imported."""

from __future__ import annotations

from typing import Any

from service.config import get_settings
from service.distributed.queue import make_app

app: Any = make_app(get_settings())

__all__ = ["app"]
