"""Intents: what a chart must show, and the encoder that picks an honest form for it.

``ENCODERS`` (in ``registry``) is the one table of intents; each intent module registers its
encoder when imported here.
"""

from __future__ import annotations

from service.intents import (  # noqa: F401  (each registers its encoder)
    compare,
    distribution,
    movement,
    relationship,
    relative_change,
    share,
    target,
    trend,
)
from service.intents.registry import ENCODERS, Encoder, Env

__all__ = ["ENCODERS", "Encoder", "Env"]
