"""Load each dataset into a typed pandas frame, reporting every value that does not parse.

Missing and zero stay distinct: an empty cell or ``null`` becomes a missing value (NaN/NaT/None), never
0. Values are converted column-wise (no Python loop over rows), and a user string is never handed to
pandas as a path or URL: CSV text is wrapped in a ``StringIO``.
"""

from __future__ import annotations

import io
import math
from collections.abc import Iterable
from dataclasses import dataclass, field
from datetime import UTC, datetime, tzinfo
from typing import Any

import numpy as np
import pandas as pd

from service import formatting
from service.data import periods
from service.definition.model import (
    Column,
    ColumnType,
    Dataset,
    Frequency,
    ReportDefinition,
    display_name,
    local_wall_time,
)
from service.errors import Problem

#: Numbers at or beyond this size are refused: no report quantity is that large, and the number
#: formats (CLDR decimals, 28 significant digits) cannot print them.
MAX_MAGNITUDE = 1e18

#: At most this many value problems are listed per column; the last one says how many more there are.
MAX_PROBLEMS_PER_COLUMN = 5


@dataclass(frozen=True)
class Table:
    """A dataset as typed columns, with units and (for time series) the period of each row."""

    name: str
    frame: pd.DataFrame
    units: dict[str, str]
    time_column: str | None = None
    frequency: Frequency | None = None
    periods: pd.PeriodIndex | None = None
    types: dict[str, ColumnType] = field(default_factory=dict)
    source: str | None = None
    estimates: frozenset[str] = frozenset()
    """Columns declared as estimates or forecasts rather than actuals."""
    same_as: dict[str, str] = field(default_factory=dict)
    """Columns declared the same measure as another dataset's column (``dataset.column``)."""
    columns: dict[str, Column] = field(default_factory=dict)
    """The declared columns by name (labels and number formats)."""

    def label(self, name: str) -> str:
        """What readers see for column ``name`` (its label, else the name in words)."""
        column = self.columns.get(name)
        return column.display_name if column is not None else display_name(name)

    def style(self, name: str) -> formatting.Style:
        """How the values of column ``name`` are written."""
        column = self.columns.get(name)
        if column is not None:
            return column.style
        return formatting.style_for(
            self.units.get(name), integer=self.types.get(name) is ColumnType.integer
        )


def load_all(
    definition: ReportDefinition,
    *,
    skip: frozenset[int] = frozenset(),
    max_periods: int | None = None,
) -> tuple[dict[str, Table], list[Problem]]:
    """The datasets that loaded cleanly, and every value problem of those that did not.

    Datasets listed in ``skip`` (by index) already have problems with their declaration and are not
    read at all. A time series spanning more than ``max_periods`` periods is refused here, before
    anything is done period by period.
    """
    tables: dict[str, Table] = {}
    problems: list[Problem] = []
    as_of = local_wall_time(definition.report.as_of)
    for d, dataset in enumerate(definition.datasets):
        if d in skip:
            continue
        table, found = load(
            dataset, path=f"datasets[{d}]", as_of=as_of, zone=definition.report.as_of.tzinfo
        )
        if table is not None and not found and max_periods is not None:
            found = _span_problems(table, f"datasets[{d}]", max_periods)
        problems.extend(found)
        if table is not None and not found:
            tables[dataset.name] = table
    return tables, problems


def _span_problems(table: Table, path: str, max_periods: int) -> list[Problem]:
    """A time series whose first and last rows lie more than ``max_periods`` periods apart:
    two rows can span ten thousand years of days, and every check and chart works per period."""
    if table.periods is None or table.frequency is None:
        return []
    count = periods.span(table.periods)
    if count <= max_periods:
        return []
    what = (
        f"the dataset '{table.name}' spans {table.periods.min()} to {table.periods.max()}, "
        f"{count} periods of a {table.frequency.value}"
    )
    return [
        Problem.over_limit(
            path,
            what,
            count,
            setting="max_periods",
            limit=max_periods,
            advice="give a shorter span or a coarser frequency",
        )
    ]


def load(
    dataset: Dataset, *, path: str, as_of: datetime, zone: tzinfo | None = None
) -> tuple[Table | None, list[Problem]]:
    """One dataset as typed columns; ``zone`` is the clock of ``as_of`` (timestamps go onto it)."""
    raw, problems, locate = _raw_frame(dataset, path)
    if raw is None:
        return None, problems
    frame = pd.DataFrame(index=raw.index)
    for column in dataset.columns:
        values = (
            raw[column.name] if column.name in raw else pd.Series([None] * len(raw), dtype=object)
        )
        converted, bad = _convert(values, column.type, zone)
        frame[column.name] = converted
        problems.extend(_value_problems(bad, values, column.name, column.type, locate))
    table = Table(
        name=dataset.name,
        frame=frame,
        units={c.name: c.unit for c in dataset.columns if c.unit},
        types={c.name: c.type for c in dataset.columns},
        source=dataset.source,
        estimates=frozenset(c.name for c in dataset.columns if c.estimate),
        same_as={c.name: c.same_as for c in dataset.columns if c.same_as},
        columns={c.name: c for c in dataset.columns},
    )
    if dataset.time_column and dataset.frequency and not problems:
        table, found = _with_periods(table, dataset, as_of, locate)
        problems.extend(found)
    return table, problems


Locator = Any  # (row position, column name) -> (path, context)


def _raw_frame(dataset: Dataset, path: str) -> tuple[pd.DataFrame | None, list[Problem], Locator]:
    declared = [c.name for c in dataset.columns]
    problems: list[Problem] = []
    if dataset.rows is not None:

        def locate_row(row: int, column: str) -> tuple[str, dict[str, Any]]:
            return f"{path}.rows[{row}].{column}", {}

        unknown: dict[str, int] = {}
        for r, record in enumerate(dataset.rows):
            for key in record:
                if key not in declared and key not in unknown:
                    unknown[key] = r
        for key, r in unknown.items():
            problems.append(
                Problem(
                    "unknown_column",
                    f"{path}.rows[{r}].{key}",
                    f"row {r} has a value for '{key}', which is not a declared column",
                    f"declare '{key}' in {path}.columns, or remove it from the rows",
                    key,
                )
            )
        frame = (
            pd.DataFrame.from_records(dataset.rows, columns=declared)
            if dataset.rows
            else pd.DataFrame(columns=declared)
        )
        return frame.astype(object), problems, locate_row

    def locate_line(row: int, column: str) -> tuple[str, dict[str, Any]]:
        return f"{path}.csv", {"line": row + 2, "column": column}

    assert dataset.csv is not None
    try:
        frame = pd.read_csv(
            _csv_source(dataset.csv),
            dtype=str,
            keep_default_na=False,
            na_values=[""],
            on_bad_lines="error",
            skipinitialspace=True,
        )
    except (pd.errors.ParserError, pd.errors.EmptyDataError, ValueError) as exc:
        problems.append(
            Problem(
                "bad_csv",
                f"{path}.csv",
                f"the CSV text cannot be read: {exc}".strip(),
                "give a header line naming the columns, then one line per row with the same number "
                "of fields; quote fields that contain commas",
            )
        )
        return None, problems, locate_line
    header = [str(c).strip() for c in frame.columns]
    frame.columns = pd.Index(header)
    for name in header:
        if name not in declared:
            problems.append(
                Problem(
                    "unknown_column",
                    f"{path}.csv",
                    f"the CSV header names '{name}', which is not a declared column",
                    f"declare '{name}' in {path}.columns, or drop it from the CSV",
                    name,
                    {"line": 1},
                )
            )
    for c, name in enumerate(declared):
        if name not in header:
            problems.append(
                Problem(
                    "column_missing",
                    f"{path}.columns[{c}]",
                    f"the column '{name}' is declared but the CSV header does not name it",
                    "add it to the CSV header, or remove the declaration",
                    name,
                )
            )
    if problems:
        return None, problems, locate_line
    return frame, problems, locate_line  # string columns: converted without a copy as objects


def _csv_source(text: str) -> io.BytesIO | io.StringIO:
    """The CSV text as a buffer pandas reads (never a path or URL).

    UTF-8 bytes: pandas' reader tokenises UTF-8 anyway, and a ``StringIO`` would first copy the
    text into four bytes per character (80 MB for a 20 MB CSV). Text that cannot be encoded (a lone
    surrogate from JSON) is read as text, as before, so its cell is reported where it is.
    """
    try:
        return io.BytesIO(text.encode())
    except UnicodeEncodeError:
        return io.StringIO(text)


def _convert(
    values: pd.Series, kind: ColumnType, zone: tzinfo | None = None
) -> tuple[pd.Series, pd.Series]:
    """Typed values, and a mask of the cells that were given but did not parse."""
    given = values.notna()
    read = isinstance(values.dtype, pd.StringDtype)  # from CSV text: every cell is a str or missing
    if kind is ColumnType.text:
        if read:
            return values.astype(object), pd.Series(False, index=values.index)
        nested = given & values.map(lambda v: isinstance(v, list | dict))  # no text to print
        converted = values.where(given & ~nested, None).map(lambda v: v if v is None else str(v))
        return converted.astype(object), nested
    if kind in (ColumnType.number, ColumnType.integer):
        if read:
            wrong = pd.Series(False, index=values.index)
            numbers = pd.to_numeric(values, errors="coerce").astype(float)
        else:  # a JSON number, strictly: not true/false, and not "93.4" (text is CSV's business)
            wrong = values.map(_not_a_json_number)
            numbers = pd.to_numeric(values.where(~wrong, None), errors="coerce").astype(float)
        huge = numbers.abs() >= MAX_MAGNITUDE
        bad = given & (numbers.isna() | ~np.isfinite(numbers.fillna(0.0)) | wrong | huge)
        if kind is ColumnType.integer:
            bad |= given & numbers.notna() & (numbers != np.floor(numbers.fillna(0.0)))
        return numbers.where(~bad), bad
    # dates and times are ISO 8601 text: a JSON number (seconds? a year?) is refused
    text = values if read else values.where(values.map(lambda v: isinstance(v, str)), None)
    if kind is ColumnType.date:
        parsed = pd.to_datetime(text, format="%Y-%m-%d", errors="coerce")
    else:
        parsed = _on_senders_clock(text, zone)
    bad = given & parsed.isna()
    return parsed, bad


def _not_a_json_number(value: object) -> bool:
    """Not a number, or (true, false) not meant as one, or an integer past ``MAX_MAGNITUDE``
    (10^309 and above cannot even be made a float)."""
    if isinstance(value, bool) or not isinstance(value, int | float):
        return True
    return isinstance(value, int) and abs(value) >= MAX_MAGNITUDE


_OFFSET = r"(?:Z|[+-]\d{2}:?\d{2})$"


def _on_senders_clock(text: pd.Series, zone: tzinfo | None) -> pd.Series:
    """Timestamps as wall time on the clock ``as_of`` was written in (its offset).

    A timestamp with an offset is converted to that clock; one without is taken as already on it.
    """
    aware = text.str.contains(_OFFSET, regex=True, na=False)
    out = pd.Series(pd.NaT, index=text.index, dtype="datetime64[ns]")
    if aware.any():
        stamped = pd.to_datetime(text[aware], format="ISO8601", errors="coerce", utc=True)
        out[aware] = _on_ns_clock(stamped.dt.tz_convert(zone or UTC).dt.tz_localize(None))
    plain = ~aware & text.notna()
    if plain.any():
        out[plain] = _on_ns_clock(pd.to_datetime(text[plain], format="ISO8601", errors="coerce"))
    return out


def _on_ns_clock(parsed: pd.Series) -> pd.Series:
    """Times that fit pandas' nanosecond clock (1677-09-21 to 2262-04-11); others do not parse.

    ISO 8601 also reads a bare number such as ``12`` as a year, which that clock cannot hold."""
    return parsed.where(parsed.between(pd.Timestamp.min, pd.Timestamp.max))


_EXPECTED = {
    ColumnType.text: ("text, not a list or an object", "give one piece of text per cell"),
    ColumnType.number: (
        "a number below 10^18 in size",
        "write numbers without units or thousands separators, e.g. 1234.5",
    ),
    ColumnType.integer: ("a whole number below 10^18", "write whole numbers, e.g. 1234"),
    ColumnType.date: ("a date", "write dates as YYYY-MM-DD, e.g. 2026-10-01"),
    ColumnType.timestamp: ("a timestamp", "write ISO 8601, e.g. 2026-10-01T08:00:00+00:00"),
}


def _value_problems(
    bad: pd.Series, values: pd.Series, column: str, kind: ColumnType, locate: Locator
) -> Iterable[Problem]:
    rows = np.flatnonzero(bad.to_numpy())
    what, hint = _EXPECTED.get(kind, ("text", ""))
    for n, row in enumerate(rows[:MAX_PROBLEMS_PER_COLUMN]):
        path, context = locate(int(row), column)
        value = values.iloc[row]
        if isinstance(value, float) and not math.isfinite(value):
            value = str(value)
        elif isinstance(value, list | dict):
            value = None  # the path says where
        more = len(rows) - MAX_PROBLEMS_PER_COLUMN
        tail = (
            f"; {more} more values in this column have the same problem"
            if n == MAX_PROBLEMS_PER_COLUMN - 1 and more > 0
            else ""
        )
        yield Problem(
            "unparseable_value", path, f"'{column}' should be {what}{tail}", hint, value, context
        )


def _with_periods(
    table: Table, dataset: Dataset, as_of: datetime, locate: Locator
) -> tuple[Table, list[Problem]]:
    assert dataset.time_column is not None and dataset.frequency is not None
    times = table.frame[dataset.time_column]
    problems: list[Problem] = []
    for row in np.flatnonzero(times.isna().to_numpy())[:MAX_PROBLEMS_PER_COLUMN]:
        path, context = locate(int(row), dataset.time_column)
        problems.append(
            Problem(
                "time_missing",
                path,
                "a row has no time, so it cannot be placed in a period",
                "give every row a time, or remove the row",
                None,
                context,
            )
        )
    if problems:
        return table, problems
    found = periods.to_periods(times, dataset.frequency)
    duplicated = np.flatnonzero(found.duplicated())
    for row in duplicated[:MAX_PROBLEMS_PER_COLUMN]:
        path, context = locate(int(row), dataset.time_column)
        problems.append(
            Problem(
                "duplicate_period",
                path,
                f"two rows fall in the same {dataset.frequency.value} ({found[row]})",
                f"give one row per {dataset.frequency.value}: add the rows up first, or declare a "
                "finer frequency",
                str(times.iloc[row]),
                context,
            )
        )
    as_of_period = pd.Period(as_of, freq=periods.pandas_freq(dataset.frequency))
    for row in np.flatnonzero(found > as_of_period)[:MAX_PROBLEMS_PER_COLUMN]:
        path, context = locate(int(row), dataset.time_column)
        problems.append(
            Problem(
                "period_after_as_of",
                path,
                f"the row is for {found[row]}, which had not begun at as_of ({as_of:%Y-%m-%d %H:%M})",
                "check the dates, or the report's as_of",
                str(times.iloc[row]),
                context,
            )
        )
    order = np.argsort(found.asi8, kind="stable")
    in_order = bool((order == np.arange(len(order))).all())  # the usual case: no copy to make
    frame = table.frame if in_order else table.frame.iloc[order].reset_index(drop=True)
    return Table(
        name=table.name,
        frame=frame,
        units=table.units,
        time_column=dataset.time_column,
        frequency=dataset.frequency,
        periods=pd.PeriodIndex(found if in_order else found[order]),
        types=table.types,
        source=table.source,
        estimates=table.estimates,
        same_as=table.same_as,
        columns=table.columns,
    ), problems
