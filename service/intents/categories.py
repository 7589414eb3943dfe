"""Validation every category-based intent shares: one labelled row per category, within limits."""

from __future__ import annotations

from collections.abc import Iterable

from service.config import Limits
from service.data.frames import Table
from service.errors import Problem


def problems(
    table: Table,
    column: str,
    path: str,
    limits: Limits,
    *,
    count: int | None = None,
    noun: str = "categories",
    advice: str = "show the largest categories and group the rest as 'Other' in the data",
) -> Iterable[Problem]:
    """Too many categories, rows without a label, categories given twice.

    ``count`` overrides the number compared with the limit (e.g. parts expected but absent)."""
    labels = table.frame[column]
    shown = len(labels) if count is None else count
    if shown > limits.max_categories:
        yield Problem.over_limit(
            f"{path}.category",
            noun,
            shown,
            setting="max_categories",
            limit=limits.max_categories,
            advice=advice,
        )
    if labels.isna().any():
        yield Problem(
            "category_missing",
            f"{path}.category",
            f"{int(labels.isna().sum())} rows of dataset '{table.name}' have no '{column}'",
            "give every row a label",
            None,
        )
    repeated = labels[labels.duplicated() & labels.notna()]
    if not repeated.empty:
        yield Problem(
            "duplicate_category",
            f"{path}.category",
            f"{noun} appear more than once: {', '.join(map(str, repeated.unique()[:5]))}",
            "give one row each (add the rows up in the data first)",
            str(repeated.iloc[0]),
        )
