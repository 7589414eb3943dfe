"""The report definition, version 1: what a scheduler or portal sends.

This module owns the *shape* of a definition. Cross-references (does the chart's dataset exist, is the
column numeric, …) are checked in :mod:`service.definition.validate`, which reports every problem at
once with a path into the definition.
"""

from __future__ import annotations

from datetime import date, datetime
from enum import StrEnum
from typing import Annotated, Any, Literal

from pydantic import AwareDatetime, Field, model_validator

from service.definition.base import Id, Input, Label, Name, Text

VERSION = 1


class ColumnType(StrEnum):
    text = "text"
    number = "number"
    integer = "integer"
    date = "date"
    timestamp = "timestamp"


class Frequency(StrEnum):
    day = "day"
    week = "week"  # ISO 8601 weeks, Monday to Sunday
    month = "month"
    quarter = "quarter"
    year = "year"


class Column(Input):
    name: Name
    type: ColumnType
    unit: Label | None = Field(
        None, description="Unit of a numeric column, e.g. 'GBP', '%', 'journeys'."
    )
    description: Text | None = None


class Dataset(Input):
    name: Id
    description: Text | None = None
    columns: list[Column] = Field(min_length=1)
    time_column: Name | None = Field(
        None, description="The column that places each row in time (type date or timestamp)."
    )
    frequency: Frequency | None = Field(
        None, description="Declared frequency of the time column; required with time_column."
    )
    rows: list[dict[str, Any]] | None = Field(
        None, description="Rows inline as records: one object per row, keyed by column name."
    )
    csv: str | None = Field(
        None, description="Rows as CSV text with a header line naming the columns."
    )

    @model_validator(mode="after")
    def _one_source(self) -> Dataset:
        if (self.rows is None) == (self.csv is None):
            raise ValueError("give the rows either as 'rows' (records) or as 'csv' text, not both")
        if (self.time_column is None) != (self.frequency is None):
            raise ValueError("'time_column' and 'frequency' go together: give both or neither")
        return self


class Period(Input):
    start: date
    end: date
    label: Label | None = Field(None, description="How the period is named, e.g. 'October 2026'.")

    @model_validator(mode="after")
    def _ordered(self) -> Period:
        if self.end < self.start:
            raise ValueError("the period ends before it starts")
        return self


class Report(Input):
    id: Id
    title: Label
    period: Period
    as_of: AwareDatetime = Field(
        description="When the data was extracted, with a time zone; judges partial periods."
    )
    owner: Label
    audience: Label | None = None
    locale: Annotated[str, Field(pattern=r"^[a-z]{2,3}(-[A-Z]{2})?$")] = "en-GB"


class ChartBase(Input):
    id: Id
    intent: str
    title: Label
    subtitle: Text | None = None
    dataset: Id
    note: Text | None = Field(None, description="A sentence printed under the chart.")


class CompareChart(ChartBase):
    """One measure across categories."""

    intent: Literal["compare"]
    category: Name
    measure: Name
    baseline: float | None = Field(
        None,
        description="Requested start of the value axis. Bars always start at zero: a non-zero "
        "request is corrected unless the check 'bar-zero-baseline' is waived.",
    )
    focus: Literal["totals", "differences"] = Field(
        "totals",
        description="'differences' draws dots on a non-zero scale (position, not length), "
        "with a note on the chart, instead of truncated bars.",
    )
    sort: Literal["descending", "ascending", "as_given"] = "descending"


class TrendChart(ChartBase):
    """One or more measures over time (sharing one unit)."""

    intent: Literal["trend"]
    measures: list[Name] = Field(min_length=1)
    from_zero: bool = Field(
        False, description="Start the value axis at zero (otherwise it fits the data, with a note)."
    )


Chart = Annotated[CompareChart | TrendChart, Field(discriminator="intent")]


class Table(Input):
    id: Id
    title: Label
    dataset: Id
    columns: list[Name] | None = Field(None, description="Columns to show; all when omitted.")


class Section(Input):
    heading: Label
    narrative: Text | None = None
    charts: list[Chart] = Field(default_factory=list)
    tables: list[Table] = Field(default_factory=list)


class Waiver(Input):
    check: Id
    chart: Id
    reason: Annotated[str, Field(min_length=20)] = Field(
        description="Why the exception is acceptable, in a full sentence (at least 20 characters)."
    )
    by: Label
    expires: date | None = None


class ReportDefinition(Input):
    """A report pack: metadata, datasets, sections of charts and tables, and accepted waivers."""

    version: Literal[1]
    report: Report
    datasets: list[Dataset] = Field(min_length=1)
    sections: list[Section] = Field(min_length=1)
    waivers: list[Waiver] = Field(default_factory=list)

    def charts(self) -> list[tuple[str, CompareChart | TrendChart]]:
        """Every chart with its path in the definition, in reading order."""
        return [
            (f"sections[{s}].charts[{c}]", chart)
            for s, section in enumerate(self.sections)
            for c, chart in enumerate(section.charts)
        ]

    def period_text(self) -> str:
        period = self.report.period
        if period.label:
            return period.label
        return f"{period.start.isoformat()} to {period.end.isoformat()}"

    def dataset(self, name: str) -> Dataset | None:
        return next((d for d in self.datasets if d.name == name), None)


def local_wall_time(value: datetime) -> datetime:
    """``as_of`` on the sender's own clock (its zone dropped, not converted).

    Periods are calendar periods of the reporting organisation, so "is November over?" is judged on the
    clock the definition was written in: 2026-11-09T08:00+01:00 is 8 o'clock on 9 November.
    """
    return value.replace(tzinfo=None)
