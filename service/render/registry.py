"""The drawer column of the form table (``intents.forms.FORMS``): one drawing function per form.

Each module of ``MODULES`` registers its drawers with ``@drawer(form)`` (``render.drawer``) when it
is loaded, and this module loads them all, so whoever imports the registry finds every drawer. A
test holds ``MODULES`` to the modules on disk that register drawers, and ``DRAWERS`` to the forms
of the table.
"""

from __future__ import annotations

from importlib import import_module

from service.render.drawer import DRAWERS, Drawer

#: The modules that register drawers, loaded by name so that no import sorter can drop one.
MODULES = ("basic", "pie", "control", "panels", "deviation", "distribution", "scatter")
for _name in MODULES:
    import_module(f"service.render.{_name}")

__all__ = ["DRAWERS", "MODULES", "Drawer"]
