"""Problems in the loaded values that the later stages could not show honestly or at all.

Run once every dataset is loaded (they read the typed frames): a measure with no value at all, user
text the page cannot draw (a glyph the house fonts lack, right-to-left script), and a table too long
to print. Each is reported with its path, beside the problems of :mod:`service.data.frames`.
"""

from __future__ import annotations

from service import glyphs
from service.config import Limits
from service.data import periods
from service.data.frames import Table
from service.definition import validate
from service.definition.model import ColumnType, ReportDefinition, Role
from service.errors import Problem


def problems(
    definition: ReportDefinition, tables: dict[str, Table], found: list[Problem], limits: Limits
) -> list[Problem]:
    """Every such problem, in a fixed order; ``found`` (the problems so far) keeps a measure
    already reported as empty from being reported twice."""
    return [
        *empty_measures(definition, tables, found),
        *long_cells(definition, tables, limits),
        *undrawable_text(definition, tables),
        *table_limits(definition, tables, limits),
    ]


def texts(definition: ReportDefinition, tables: dict[str, Table]) -> list[tuple[str, str]]:
    """Every piece of user text that reaches the page, with its path: one list, so one rule holds
    for every drawn field."""
    out = [(path, text) for path, text, _ in validate.texts(definition) if text]
    for d, dataset in enumerate(definition.datasets):
        out += [
            (f"datasets[{d}].columns[{c}].name", c_.name) for c, c_ in enumerate(dataset.columns)
        ]
        loaded = tables.get(dataset.name)
        if loaded is None:
            continue
        for column in dataset.columns:
            if column.type is ColumnType.text:
                values = loaded.frame[column.name].dropna().unique()
                out += [(f"datasets[{d}].rows[*].{column.name}", str(v)) for v in values]
    return [(p, t) for p, t in out if t]


def long_cells(
    definition: ReportDefinition, tables: dict[str, Table], limits: Limits
) -> list[Problem]:
    """Text cells (categories, labels) are labels: no longer than ``max_label_chars``."""
    found = []
    for path, text in texts(definition, tables):
        if ".rows[*]." in path and len(text) > limits.max_label_chars:
            found.append(
                Problem.over_limit(
                    path,
                    "characters of text in a cell",
                    len(text),
                    setting="max_label_chars",
                    limit=limits.max_label_chars,
                    advice="shorten it",
                )
            )
    return found[:MAX_LONG_CELLS]


MAX_LONG_CELLS = 5
"""At most this many over-long cells are listed."""


def undrawable_text(definition: ReportDefinition, tables: dict[str, Table]) -> list[Problem]:
    hint = {
        "glyph_missing": "use characters of Latin, Greek or Cyrillic scripts, or describe the "
        "symbol in words",
        "right_to_left_text": "give the text in a left-to-right script for now",
    }
    return [
        Problem(code, path, message, hint[code], text)
        for path, code, message, text in glyphs.problems_in(texts(definition, tables))
    ]


def empty_measures(
    definition: ReportDefinition, tables: dict[str, Table], found: list[Problem]
) -> list[Problem]:
    """A measure with no value at all has nothing to show (zero would be a lie, gaps say nothing)."""
    reported = {p.path for p in found if p.code == "no_values"}
    out = []
    for path, chart in definition.charts():
        table = tables.get(chart.dataset)
        if table is None:
            continue
        for field, name, role in chart.columns():
            where = f"{path}.{field}"
            if role is not Role.measure or where in reported or name not in table.frame:
                continue
            if table.frame[name].isna().all():
                out.append(
                    Problem(
                        "no_values",
                        where,
                        f"'{name}' has no values at all in dataset '{table.name}'",
                        "give it values, or drop the chart",
                        name,
                    )
                )
    return out


def table_limits(
    definition: ReportDefinition, tables: dict[str, Table], limits: Limits
) -> list[Problem]:
    found = []
    for s, section in enumerate(definition.sections):
        for t, spec in enumerate(section.tables):
            table = tables.get(spec.dataset)
            if table is None:
                continue
            rows = len(table.frame)  # a time series prints a row for every expected period
            if table.periods is not None:
                rows = periods.span(table.periods)
            rows = min(rows, spec.limit or rows)
            if rows > limits.max_table_rows:
                found.append(
                    Problem.over_limit(
                        f"sections[{s}].tables[{t}]",
                        "table rows",
                        rows,
                        setting="max_table_rows",
                        limit=limits.max_table_rows,
                        advice="show a chart instead, a shorter dataset, or set the table's limit",
                    )
                )
    return found


__all__ = [
    "empty_measures",
    "long_cells",
    "problems",
    "table_limits",
    "texts",
    "undrawable_text",
]
