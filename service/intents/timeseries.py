"""What every intent over time shares: a limit on series, rows to draw, and values on the axis.

A time axis can hold a million periods, so the values, their runs and the gaps are found with numpy
column by column, never with a Python loop over the periods.
"""

from __future__ import annotations

from collections.abc import Iterable, Sequence

import numpy as np
import numpy.typing as npt
import pandas as pd

from service.config import Limits
from service.data.frames import Table
from service.errors import Problem
from service.intents.plan import Gap

Mask = npt.NDArray[np.bool_]


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


def on_axis(column: pd.Series) -> tuple[list[float | None], Mask]:
    """A measure's values on the full period axis (``None``: no data), and where they are present."""
    numbers = column.to_numpy(dtype=float, na_value=np.nan)
    present = ~np.isnan(numbers)
    values: list[float | None] = numbers.tolist()
    for i in np.flatnonzero(~present).tolist():
        values[i] = None
    return values, present


def runs_of(present: Mask) -> list[tuple[int, int]]:
    """Maximal runs of consecutive present values, as (first, last) indexes."""
    edges = np.diff(np.concatenate(([False], present, [False])).astype(np.int8))
    starts = np.flatnonzero(edges == 1)
    ends = np.flatnonzero(edges == -1) - 1
    return list(zip(starts.tolist(), ends.tolist(), strict=True))


def gaps_of(names: Sequence[str], present: Sequence[Mask]) -> list[Gap]:
    """A gap at every period where a series has no value, naming the series that lack it."""
    if not present:
        return []
    absent = ~np.vstack(present)
    return [
        Gap(
            index=i,
            series=[name for name, missing in zip(names, absent[:, i], strict=True) if missing],
        )
        for i in np.flatnonzero(absent.any(axis=0)).tolist()
    ]


def extremes(values: npt.NDArray[np.float64], *, positive: bool = False) -> list[float]:
    """The least and greatest of the present (optionally positive) values: all an axis range
    reads (``scales.fit`` and ``scales.fit_log`` look at nothing else)."""
    kept = values[np.isfinite(values)]
    if positive:
        kept = kept[kept > 0]
    return [float(kept.min()), float(kept.max())] if len(kept) else []
