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


def intents_drawing(forms: frozenset[str]) -> frozenset[str]:
    """The intents whose encoder can produce one of ``forms`` (e.g. every intent that draws bars)."""
    return frozenset(intent for intent, encoder in ENCODERS.items() if encoder.forms & forms)


__all__ = ["ENCODERS", "Encoder", "Env", "intents_drawing"]
