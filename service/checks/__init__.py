"""Integrity checks: measured on chart plans, each a small registered unit (see ``registry``).

Importing this package registers every check. ``ORDER`` is the order the engine runs them in: a
correction made by an earlier check (e.g. the zero baseline) is seen by the later ones (the lie
factor). It is a list of names rather than an import list so that no import sorter can change it.
"""

from importlib import import_module

from service.checks import registry

ORDER = (
    "share",  # parts of a whole: data integrity first, and expected parts put back
    "same_measure",  # one measure, one value per period across the pack's datasets
    "series",  # form changes (too many series, the form relative_change chose) before measuring
    "baseline",
    "lie_factor",
    "missing",
    "partial",
    "estimates",
    "movement",
    "cycle",
    "uncertainty",
    "distribution",
    "time_axis",
    "points",  # reduces long series, so it runs after every check that reads all the points
    "scale_note",
    "precision",
    "colour",
    "banking",
    "text",
    "layout",  # measured on the drawn chart
)

registry.set_order([f"service.checks.{name}" for name in ORDER])
for _name in ORDER:
    import_module(f"service.checks.{_name}")

CHECKS = registry.CHECKS

__all__ = ["CHECKS", "ORDER"]
