"""The ``@drawer(form)`` decorator and the table it fills; read the table through ``registry``.

A drawer module imports this (never ``registry``), so that ``registry`` can load every drawer
module without an import cycle.
"""

from __future__ import annotations

from collections.abc import Callable

from matplotlib.figure import Figure

from service.intents.plan import ChartPlan

Drawer = Callable[[Figure, ChartPlan], None]
"""Draws ``plan`` into an empty figure (it adds its own axes)."""

DRAWERS: dict[str, Drawer] = {}


def drawer(form: str) -> Callable[[Drawer], Drawer]:
    def register(function: Drawer) -> Drawer:
        if form in DRAWERS:
            raise ValueError(f"form {form!r} has two drawers")
        DRAWERS[form] = function
        return function

    return register
