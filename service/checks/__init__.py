"""Integrity checks: measured on chart plans, each a small registered unit (see ``registry``).

Importing this package registers every check, in the order the engine runs them: a correction made by
an earlier check (e.g. the zero baseline) is seen by the later ones (the lie factor).
"""

from service.checks import (  # noqa: F401  (each registers its checks, in this order)
    baseline,
    lie_factor,
    missing,
    partial,
    scale_note,
    text,
)
from service.checks.registry import CHECKS

__all__ = ["CHECKS"]
