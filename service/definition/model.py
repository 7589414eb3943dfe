"""The report definition, version 1: what a scheduler or portal sends.

This module owns the *shape* of a definition. Cross-references (does the chart's dataset exist, is the
column numeric, …) are checked in :mod:`service.definition.validate`, which reports every problem at
once with a path into the definition.
"""

from __future__ import annotations

from datetime import datetime
from enum import StrEnum
from typing import Annotated, Any, ClassVar, Literal, get_args

from pydantic import Field, StringConstraints, model_validator

from service import formatting
from service.definition.base import (
    Day,
    Flag,
    Id,
    Input,
    Label,
    Moment,
    Name,
    Number,
    Text,
    Version,
    Whole,
)

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


SameAs = Annotated[str, StringConstraints(pattern=r"^[a-z0-9][a-z0-9_-]{0,63}\.\S", max_length=265)]
"""A column of another dataset, ``dataset.column`` (a dataset name holds no dot)."""


def same_as_parts(link: str) -> tuple[str, str]:
    """The dataset and the column a ``same_as`` link names."""
    dataset, _, column = link.partition(".")
    return dataset, column


class Format(Input):
    """How a numeric column's values are written; what is left out follows its type and unit."""

    decimals: Annotated[Whole, Field(ge=0, le=6)] | None = Field(
        None,
        description="Decimals always shown (default: as many as a value needs, up to two; "
        "none for an integer column).",
    )
    style: Literal["plain", "percent", "currency"] | None = Field(
        None,
        description="'percent' (values already in percent, e.g. 94.6), 'currency' (the unit is "
        "an ISO 4217 code or a symbol such as '£'), or 'plain' (the number, then the unit). "
        "Default: percent for the unit '%', currency for a currency unit, else plain.",
    )
    thousands: Flag = Field(
        True, description="Group thousands the way the report's locale does (1,234 or 1.234)."
    )


class Column(Input):
    name: Name
    type: ColumnType
    label: Label | None = Field(
        None,
        description="What readers see for this column on the pack (chart axes, keys, sentences, "
        "table headers), e.g. 'On-time journeys'; default: the name in words.",
    )
    unit: Label | None = Field(
        None, description="Unit of a numeric column, e.g. 'GBP', '%', 'journeys'."
    )
    format: Format | None = Field(
        None, description="How the values are written; defaults follow the type and unit."
    )
    description: Text | None = None
    estimate: Flag = Field(
        False, description="The values are estimates or forecasts, not actuals (drawn dashed)."
    )
    projectable: Flag = Field(
        False, description="A partial last period of this column may be projected (e.g. run rate)."
    )
    additive: Flag | None = Field(
        None,
        description="Whether the values add up to a meaningful total (counts, money). Default: "
        "yes for numbers, except percentages and rates ('%', 'pp', a unit with '/' or 'per'); "
        "say false for means, ratings and other values that do not add up.",
    )
    same_as: SameAs | None = Field(
        None,
        description="The same measure as a column of another dataset, written 'dataset.column': "
        "the check 'one-measure-one-truth' holds the two to one value in every period. Columns of "
        "one name in two time-indexed datasets of one frequency are compared without a link.",
    )

    def adds_up(self) -> bool:
        """Whether a total of this column means something (see ``additive``)."""
        if self.type not in (ColumnType.number, ColumnType.integer):
            return False
        if self.additive is not None:
            return self.additive
        return not _rate(self.unit or "")

    @property
    def display_name(self) -> str:
        """What readers see for the column: its ``label``, else its name in words."""
        return display_name(self.name, self.label)

    @property
    def style(self) -> formatting.Style:
        """How the column's values are written (``format``, else defaults from type and unit)."""
        chosen = self.format or Format()
        return formatting.style_for(
            self.unit,
            integer=self.type is ColumnType.integer,
            decimals=chosen.decimals,
            kind=chosen.style,
            grouping=chosen.thousands,
        )

    def shown(self, value: float | None, locale: str) -> str:
        """One of the column's values as the pack writes it, in the report's locale."""
        return formatting.show(value, self.style, locale)


_PERCENT_UNITS = frozenset({"percent", "per cent", "pp", "percentage points", "percentage point"})


def _rate(unit: str) -> bool:
    """A unit of a percentage or a rate, whose values do not add up."""
    text = unit.strip().lower()
    return text in _PERCENT_UNITS or "%" in text or "/" in text or " per " in f" {text} "


def display_name(name: str, label: str | None = None) -> str:
    """A column's name as readers see it: the ``label`` given, else the name in words."""
    return label or formatting.humanise(name)


class Dataset(Input):
    name: Id
    description: Text | None = None
    source: Text | None = Field(None, description="Where the data comes from (the source line).")
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
    start: Day
    end: Day
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
    as_of: Moment = Field(
        description="When the data was extracted, with a time zone; judges partial periods."
    )
    owner: Label
    audience: Label | None = None
    locale: Annotated[str, Field(pattern=r"^[a-z]{2,3}(-[A-Z]{2})?$")] = "en-GB"
    palette: list[Annotated[str, Field(pattern=r"^#[0-9a-fA-F]{6}$")]] | None = Field(
        None,
        min_length=1,
        max_length=12,
        description="A custom categorical palette (e.g. brand colours); checked like the default.",
    )


class Role(StrEnum):
    """What a chart uses a column for; validation checks each role's type and unit."""

    measure = "measure"  # numeric, with a unit
    number = "number"  # numeric, unit optional (sample sizes, spreads)
    category = "category"  # text


class Precision(Input):
    """The precision readers need from the chart: a share of the value, or an amount."""

    relative: Annotated[Number, Field(gt=0, lt=1)] | None = Field(
        None, description="e.g. 0.01: readers must tell values apart to within 1 % of the value"
    )
    absolute: Annotated[Number, Field(gt=0)] | None = Field(
        None, description="e.g. 0.5: readers must tell values apart to within 0.5 units"
    )

    @model_validator(mode="after")
    def _one(self) -> Precision:
        if (self.relative is None) == (self.absolute is None):
            raise ValueError("give the precision as 'relative' or 'absolute', not both")
        return self


class ChartBase(Input):
    over_time: ClassVar[bool] = False
    """The intent draws values over time: its dataset needs a time column, and the checks of
    periods (missing, partial, estimates, cycles, banking, points) apply to it."""

    id: Id
    intent: str
    title: Label
    subtitle: Text | None = None
    dataset: Id
    note: Text | None = Field(None, description="A sentence printed under the chart.")
    source: Text | None = Field(
        None, description="The source line under the chart; defaults to the dataset's source."
    )
    description: Text | None = Field(
        None,
        description="A text alternative written by the author; otherwise one is generated.",
    )
    precision: Precision | None = None
    key_figure: Label | None = Field(
        None,
        description=(
            "The one figure of this chart the cover lists among the headline figures: a measure "
            "or series as the chart names it (its latest value and change), a category's label, "
            "or a summary such as 'median' or 'n'."
        ),
    )

    def columns(self) -> list[tuple[str, str, Role]]:
        """Every column this chart reads: (field path, column name, role)."""
        return []


class Interval(Input):
    """Uncertainty of each category's value: interval bounds, or a spread with a sample size."""

    lower: Name | None = None
    upper: Name | None = None
    sd: Name | None = Field(None, description="Standard deviation of each category's sample")
    n: Name | None = Field(None, description="Sample size of each category")
    level: Annotated[Number, Field(gt=0.5, lt=1)] = Field(
        0.95, description="Confidence level of the intervals"
    )

    @model_validator(mode="after")
    def _pairs(self) -> Interval:
        bounds = (self.lower is None, self.upper is None)
        spread = (self.sd is None, self.n is None)
        if bounds == (False, False) and spread == (True, True):
            return self
        if spread == (False, False) and bounds == (True, True):
            return self
        raise ValueError("give either 'lower' and 'upper', or 'sd' and 'n'")

    def columns(self, base: str) -> list[tuple[str, str, Role]]:
        names = {"lower": self.lower, "upper": self.upper, "sd": self.sd, "n": self.n}
        return [(f"{base}.{k}", v, Role.number) for k, v in names.items() if v is not None]


class CompareChart(ChartBase):
    """One measure across categories."""

    intent: Literal["compare"]
    category: Name
    measure: Name
    baseline: Number | None = Field(
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
    interval: Interval | None = Field(
        None, description="Draw each value's uncertainty and judge whether differences are real."
    )

    def columns(self) -> list[tuple[str, str, Role]]:
        found = [
            ("category", self.category, Role.category),
            ("measure", self.measure, Role.measure),
        ]
        return found + (self.interval.columns("interval") if self.interval else [])


class Projection(Input):
    method: Literal["run_rate"] = Field(
        description="'run_rate': the partial period's value divided by the share of it elapsed"
    )


class TrendChart(ChartBase):
    """One or more measures over time (sharing one unit)."""

    over_time = True
    intent: Literal["trend"]
    measures: list[Name] = Field(min_length=1)
    from_zero: Flag = Field(
        False, description="Start the value axis at zero (otherwise it fits the data, with a note)."
    )
    scale: Literal["linear", "log"] = "linear"
    focus: Name | None = Field(
        None, description="With many series, the one to highlight (the rest are drawn in grey)."
    )
    projection: Projection | None = Field(
        None,
        description="Estimate the partial last period (only for columns declared projectable).",
    )

    def columns(self) -> list[tuple[str, str, Role]]:
        return [(f"measures[{i}]", m, Role.measure) for i, m in enumerate(self.measures)]


class ShareChart(ChartBase):
    """Parts of a whole."""

    intent: Literal["share"]
    category: Name
    measure: Name
    whole: Number | None = Field(
        None, description="The stated whole the parts must add up to (else their sum)."
    )
    tolerance: Annotated[Number, Field(ge=0)] | None = Field(
        None,
        description="How far the parts may miss the whole (default: half a unit of the last "
        "decimal shown in the data, per part).",
    )
    expected_categories: list[Label] | None = Field(
        None, description="Parts the whole is made of; any the data lacks is shown as missing."
    )
    allow_pie: Flag = Field(
        False, description="Allow a pie when it can be read: at most 5 parts, each pair distinct."
    )

    def columns(self) -> list[tuple[str, str, Role]]:
        return [("category", self.category, Role.category), ("measure", self.measure, Role.measure)]


class RelativeChangeChart(ChartBase):
    """Two or more measures over time, usually in different units: indexed, or aligned panels."""

    over_time = True
    intent: Literal["relative_change"]
    measures: list[Name] = Field(min_length=2)
    form: Literal["index", "panels"] = "index"
    base_period: Day | None = Field(
        None, description="The period indexed to 100 (default: the first with every measure)."
    )
    index_as: Literal["base_100", "percent_change"] = "base_100"

    def columns(self) -> list[tuple[str, str, Role]]:
        return [(f"measures[{i}]", m, Role.measure) for i, m in enumerate(self.measures)]


class MovementChart(ChartBase):
    """A KPI's latest change judged against its own history (individuals and moving-range chart)."""

    over_time = True
    intent: Literal["movement"]
    measure: Name
    run_length: Annotated[Whole, Field(ge=6, le=12)] = Field(
        8, description="Points in a row on one side of the centre line that count as a signal"
    )
    min_history: Annotated[Whole, Field(ge=6)] = Field(
        10, description="Fewer points than this: no verdict is given"
    )

    def columns(self) -> list[tuple[str, str, Role]]:
        return [("measure", self.measure, Role.measure)]


class TargetChart(ChartBase):
    """Actual against plan or target, per category."""

    intent: Literal["target"]
    category: Name
    actual: Name
    target: Name | None = Field(None, description="A column holding each category's target")
    target_value: Number | None = Field(None, description="One target for every category")
    form: Literal["bars", "deviation"] = "bars"

    @model_validator(mode="after")
    def _one_target(self) -> TargetChart:
        if (self.target is None) == (self.target_value is None):
            raise ValueError("give the target as a column ('target') or a value ('target_value')")
        return self

    def columns(self) -> list[tuple[str, str, Role]]:
        found = [("category", self.category, Role.category), ("actual", self.actual, Role.measure)]
        return found + ([("target", self.target, Role.measure)] if self.target else [])


class DistributionChart(ChartBase):
    """How the values of one measure are spread."""

    intent: Literal["distribution"]
    measure: Name
    form: Literal["histogram", "box"] = "histogram"
    group: Name | None = Field(None, description="A text column: one box per group")
    bins: Annotated[Whole, Field(ge=2, le=200)] | None = None

    def columns(self) -> list[tuple[str, str, Role]]:
        found = [("measure", self.measure, Role.measure)]
        return found + ([("group", self.group, Role.category)] if self.group else [])


class RelationshipChart(ChartBase):
    """Two measures against each other."""

    intent: Literal["relationship"]
    x: Name
    y: Name
    label: Name | None = Field(None, description="A text column naming each point")
    fit: Flag = Field(False, description="Draw a least-squares line, with its r²")

    def columns(self) -> list[tuple[str, str, Role]]:
        found = [("x", self.x, Role.measure), ("y", self.y, Role.measure)]
        return found + ([("label", self.label, Role.category)] if self.label else [])


AnyChart = (
    CompareChart
    | TrendChart
    | ShareChart
    | RelativeChangeChart
    | MovementChart
    | TargetChart
    | DistributionChart
    | RelationshipChart
)
Chart = Annotated[AnyChart, Field(discriminator="intent")]

CHART_MODELS: tuple[type[ChartBase], ...] = get_args(AnyChart)
"""One model per intent: the one list of intents (an intent is added here and in ``AnyChart``)."""


def intent_of(model: type[ChartBase]) -> str:
    """The intent a chart model stands for (its ``intent`` literal)."""
    (intent,) = get_args(model.model_fields["intent"].annotation)
    return str(intent)


INTENTS = tuple(intent_of(model) for model in CHART_MODELS)
#: Intents that draw values over time (``ChartBase.over_time``).
OVER_TIME = frozenset(intent_of(model) for model in CHART_MODELS if model.over_time)


class TableSort(Input):
    column: Name
    order: Literal["ascending", "descending"] = "ascending"


class Table(Input):
    id: Id
    title: Label
    dataset: Id
    columns: list[Name] | None = Field(
        None, description="Columns to show, in this order; all when omitted."
    )
    sort: TableSort | None = Field(
        None,
        description="Order of the rows; periods in time order (or rows as given) when omitted. "
        "Rows without a value sort last.",
    )
    totals: list[Name] | None = Field(
        None,
        description="Columns to total in a last row: only measures that add up (not "
        "percentages, rates or means; see the column's 'additive').",
    )
    limit: Annotated[Whole, Field(ge=1)] | None = Field(
        None,
        description="Show at most this many rows (the first in the table's order); the table "
        "says how many were left out.",
    )


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
    expires: Day | None = None


class ReportDefinition(Input):
    """A report pack: metadata, datasets, sections of charts and tables, and accepted waivers."""

    version: Version
    report: Report
    datasets: list[Dataset] = Field(min_length=1)
    sections: list[Section] = Field(min_length=1)
    waivers: list[Waiver] = Field(default_factory=list)

    def charts(self) -> list[tuple[str, AnyChart]]:
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
