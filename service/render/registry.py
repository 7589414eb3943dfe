"""One drawing function per plan form. Each form module registers its drawers on import."""

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
