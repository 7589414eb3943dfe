"""Validation every intent over time shares: a limit on series, and rows to draw."""

from __future__ import annotations

from collections.abc import Iterable

from service.config import Limits
from service.data.frames import Table
from service.errors import Problem


def problems(
    measures: list[str], table: Table, path: str, limits: Limits, *, noun: str = "series"
) -> list[Problem]:
    """Too many series, or a dataset with no rows. An empty list means the series can be drawn."""
    found: list[Problem] = []
    if len(measures) > limits.max_series:
        found.append(
            Problem.over_limit(
                f"{path}.measures",
                noun,
                len(measures),
                setting="max_series",
                limit=limits.max_series,
                advice="split the chart",
            )
        )
    if table.periods is None or len(table.periods) == 0:
        found.append(
            Problem(
                "empty_dataset",
                f"{path}.dataset",
                f"dataset '{table.name}' has no rows to draw",
                "add rows",
                table.name,
            )
        )
    return found


def drawable(found: Iterable[Problem]) -> bool:
    return not any(p.code == "empty_dataset" for p in found)
