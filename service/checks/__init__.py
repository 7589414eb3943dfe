"""Integrity checks: measured on chart plans, each a small registered unit (see ``registry``).

Importing this package registers every check, in the order the engine runs them: a correction made by
an earlier check (e.g. the zero baseline) is seen by the later ones (the lie factor).
"""

from service.checks import (  # noqa: F401  (each registers its checks, in this order)
    banking,
    baseline,
    colour,
    cycle,
    distribution,
    estimates,
    lie_factor,
    missing,
    movement,
    partial,
    points,  # reduces long series, so it runs after every check that reads all the points
    precision,
    scale_note,
    series,  # form changes (too many series, the form relative_change chose) before measuring
    share,  # parts of a whole: data integrity first, and expected parts put back
    text,
    time_axis,
    uncertainty,
)
from service.checks.registry import CHECKS

__all__ = ["CHECKS"]
