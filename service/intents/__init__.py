"""Intents: what a chart must show, and the encoder that picks an honest form for it.

``ENCODERS`` (in ``registry``) is the one table of intents; the module of each intent named in
``definition.model.INTENTS`` registers its encoder when it is loaded here.
"""

from __future__ import annotations

from importlib import import_module

from service.definition.model import INTENTS
from service.intents.registry import ENCODERS, Encoder, Env

for _intent in INTENTS:
    import_module(f"service.intents.{_intent}")

__all__ = ["ENCODERS", "Encoder", "Env"]
