"""What a table of a dataset shows, decided once before it is checked and written.

A table of a time-indexed dataset lists every period the declared frequency expects between its
first and last row: a period without a row is a row of its own, marked as having no data; the
period ``as_of`` falls in is marked partial with its completeness; columns declared as estimates
are marked. Then the definition's options apply: ``columns`` (which, in what order), ``sort``,
``limit`` (how many rows were left out is kept) and ``totals`` (of measures that add up).

The plan holds values, not text: :mod:`service.assemble.tables` writes it in the report's locale,
and :mod:`service.checks.tables` measures it against the data.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace
from datetime import datetime
from typing import Literal

import pandas as pd

from service import wording
from service.data import periods
from service.data.frames import Table
from service.definition.model import Column, ColumnType, Dataset
from service.definition.model import Table as TableSpec

Value = float | str | None
State = Literal["actual", "partial", "missing"]


def label_of(column: Column) -> str:
    """What readers see for a column: its ``label``, else its name made readable."""
    return column.display_name


@dataclass(frozen=True)
class TableColumn:
    name: str
    label: str
    unit: str | None
    kind: ColumnType
    estimate: bool = False
    """Declared an estimate or forecast: marked in the header and listed under the table."""
    time: bool = False

    @property
    def numeric(self) -> bool:
        return self.kind in (ColumnType.number, ColumnType.integer)


@dataclass(frozen=True)
class TableRow:
    values: tuple[Value, ...]
    """One value per column of the plan; a period's label in the time column."""
    state: State = "actual"
    completeness: periods.Completeness | None = None
    """How much of a partial period had elapsed at ``as_of``."""


@dataclass(frozen=True)
class TablePlan:
    table_id: str
    title: str
    columns: tuple[TableColumn, ...]
    rows: tuple[TableRow, ...]
    left_out: int = 0
    """Rows the ``limit`` left out."""
    totals: tuple[tuple[str, float], ...] = ()
    """(column name, total of the rows shown) for each totalled column."""
    unshown_missing: tuple[str, ...] = ()
    """Periods without data that are not among the rows shown (a ``limit`` left them out): the
    table names them in a note."""

    @property
    def time_indexed(self) -> bool:
        return any(c.time for c in self.columns)


def plan(
    spec: TableSpec, dataset: Dataset, table: Table, as_of: datetime, locale: str
) -> TablePlan:
    """The plan of one table (``as_of`` on the sender's wall clock)."""
    declared = {c.name: c for c in dataset.columns}
    names = spec.columns or [c.name for c in dataset.columns]
    columns = tuple(
        TableColumn(
            name=n,
            label=label_of(declared[n]),
            unit=declared[n].unit,
            kind=declared[n].type,
            estimate=declared[n].estimate,
            time=n == table.time_column,
        )
        for n in names
    )
    frame, states = _rows(table, names, as_of, locale)
    if spec.sort is not None:
        order = _sort_order(frame, spec.sort.column, spec.sort.order, table)
        frame, states = frame.iloc[order].reset_index(drop=True), [states[i] for i in order]
    shown = len(frame) if spec.limit is None else min(spec.limit, len(frame))
    rows = tuple(
        TableRow(tuple(_value(frame[n].iloc[r]) for n in names), *states[r]) for r in range(shown)
    )
    plan_ = TablePlan(
        table_id=spec.id,
        title=spec.title,
        columns=columns,
        rows=rows,
        left_out=len(frame) - shown,
    )
    return with_totals(plan_, spec.totals or [])


def with_totals(plan_: TablePlan, names: list[str]) -> TablePlan:
    """The plan with each named column totalled over the rows shown."""
    index = {c.name: i for i, c in enumerate(plan_.columns)}
    totals = tuple((n, total_of(plan_, index[n])) for n in names if n in index)
    return replace(plan_, totals=totals)


def total_of(plan_: TablePlan, column: int) -> float:
    """The sum of a column's values over the rows shown (rows without a value add nothing)."""
    return math.fsum(v for row in plan_.rows if isinstance(v := row.values[column], float))


def completeness_text(done: periods.Completeness, locale: str) -> str:
    """How much of a partial period had elapsed, in words ("8 of 30 days")."""
    key = "table.day" if done.total_days == 1 else "table.days"
    return wording.say(key, locale, elapsed=done.elapsed_days, total=done.total_days)


def expected_periods(table: Table) -> pd.PeriodIndex:
    """Every period from the dataset's first row to its last."""
    assert table.periods is not None
    if len(table.periods) == 0:
        return table.periods
    return periods.expected(table.periods.min(), table.periods.max())


_RowState = tuple[State, periods.Completeness | None]


def _rows(
    table: Table, names: list[str], as_of: datetime, locale: str
) -> tuple[pd.DataFrame, list[_RowState]]:
    """The dataset's rows, one per expected period for a time series (periods as labels)."""
    frame = table.frame[names]
    if table.periods is None or table.frequency is None:
        return frame.reset_index(drop=True), [("actual", None)] * len(frame)
    full = expected_periods(table)
    present = set(table.periods)
    frame = frame.set_index(table.periods).reindex(full)
    if table.time_column in names:
        frame[table.time_column] = periods.labels(full, table.frequency, locale)
    states: list[_RowState] = []
    for period in full:
        done = periods.completeness(period, as_of)
        if period not in present:
            states.append(("missing", done))
        else:
            states.append(("actual" if done is None else "partial", done))
    return frame.reset_index(drop=True), states


def _sort_order(frame: pd.DataFrame, column: str, order: str, table: Table) -> list[int]:
    """Row positions in the asked order; rows without a value last, ties in the given order."""
    descending = order == "descending"
    if column == table.time_column:  # the rows are in time order already
        positions = list(range(len(frame)))
        return positions[::-1] if descending else positions
    values = frame[column].reset_index(drop=True)
    present = [int(i) for i in values.index[values.notna()]]
    absent = [int(i) for i in values.index[values.isna()]]
    # Python's sort is stable going backwards too: ties keep their given order
    return sorted(present, key=lambda i: values.iloc[i], reverse=descending) + absent


def _value(value: object) -> Value:
    if hasattr(value, "item") and not isinstance(value, pd.Timestamp):  # a numpy scalar
        value = value.item()
    if value is None or value is pd.NaT or (isinstance(value, float) and math.isnan(value)):
        return None
    if isinstance(value, pd.Timestamp):
        midnight = value == value.normalize()
        return value.date().isoformat() if midnight else value.isoformat(timespec="minutes")
    if isinstance(value, int | float):
        return float(value)
    return str(value)
