"""One measure, one truth: two datasets of a pack never give one measure two values for one period.

A pack that says a month has no count on one page and draws a value for it on the next tells two
stories. For each measure a chart over time draws, this check finds every other time-indexed dataset
of the pack, of the same frequency, that carries the same measure: a column of the same name and
unit (both actuals, or both estimates), or a column linked to it by ``same_as`` in either direction.
Over the periods both datasets cover (from each one's first period to its last), it compares them:
two values that differ by more than half a unit of the last decimal the coarser of them shows, or a
value in one where the other has none (a row without it, or no row), are a contradiction.

Periods outside one dataset's span are not compared: a dataset that ends in October says nothing
about November. This is a data-integrity rule: it can be neither waived nor corrected; the data must
be put right (or a different measure given a name of its own).
"""

from __future__ import annotations

from collections.abc import Iterator, Mapping
from dataclasses import dataclass

import numpy as np
import pandas as pd

from service import formatting, wording
from service.checks.missing import measures_of
from service.checks.registry import CheckSpec, Context, Finding, register
from service.data import periods
from service.data.frames import Table
from service.definition.model import OVER_TIME, ColumnType
from service.intents.plan import ChartPlan

#: Contradictions quoted in a finding before it says "and N more".
_LISTED = 3
_NUMERIC = frozenset({ColumnType.number, ColumnType.integer})


@dataclass(frozen=True)
class Contradiction:
    measure: str
    period: pd.Period
    value: float | None
    """The value in the chart's dataset; ``None``: it has no data for the period."""
    other: str
    other_value: float | None


def _linked(table: Table, column: str, other: Table, other_column: str) -> bool:
    """``same_as`` links the two columns, in either direction."""
    there = table.same_as.get(column)
    back = other.same_as.get(other_column)
    return there == f"{other.name}.{other_column}" or back == f"{table.name}.{column}"


def counterparts(
    table: Table, column: str, tables: Mapping[str, Table]
) -> Iterator[tuple[Table, str]]:
    """Every other dataset's column that carries the same measure, period by period."""
    for other in tables.values():
        if other.name == table.name or other.periods is None or other.frequency != table.frequency:
            continue
        for name, kind in other.types.items():
            if kind not in _NUMERIC:
                continue
            same_name = (
                name == column
                and other.units.get(name) == table.units.get(column)
                and (name in other.estimates) == (column in table.estimates)
            )
            if same_name or _linked(table, column, other, name):
                yield other, name


def _over_span(table: Table, column: str) -> pd.Series:
    """The column's values on every period from the dataset's first to its last (NaN: no data)."""
    assert table.periods is not None
    values = pd.Series(table.frame[column].to_numpy(dtype=float, na_value=np.nan), table.periods)
    return values.reindex(periods.expected(table.periods.min(), table.periods.max()))


def _decimals(value: float) -> int:
    text = np.format_float_positional(value, trim="-")
    return len(text.partition(".")[2])


def _agree(a: float, b: float) -> bool:
    """Equal to the precision of the coarser of the two values (half a unit of its last decimal)."""
    return abs(a - b) <= 0.5 * 10.0 ** -min(_decimals(a), _decimals(b)) + 1e-12 * max(
        abs(a), abs(b)
    )


def compare(
    table: Table, column: str, other: Table, other_column: str
) -> tuple[int, list[Contradiction]]:
    """The number of periods both datasets cover, and where they contradict each other."""
    mine, theirs = _over_span(table, column), _over_span(other, other_column)
    shared = mine.index.intersection(theirs.index)
    a = mine.reindex(shared).to_numpy()
    b = theirs.reindex(shared).to_numpy()
    absent_a, absent_b = np.isnan(a), np.isnan(b)
    suspect = (absent_a != absent_b) | (~absent_a & ~absent_b & (a != b))
    found = []
    for i in np.flatnonzero(suspect).tolist():
        mine_i = None if absent_a[i] else float(a[i])
        theirs_i = None if absent_b[i] else float(b[i])
        if mine_i is not None and theirs_i is not None and _agree(mine_i, theirs_i):
            continue
        found.append(Contradiction(column, shared[i], mine_i, other.name, theirs_i))
    return len(shared), found


def _case(found: Contradiction, table: Table, locale: str) -> str:
    assert table.frequency is not None
    unit = table.units.get(found.measure, "")
    words = {
        "measure": shown_name(table, found.measure),
        "period": periods.label(found.period, table.frequency, locale),
    }
    if found.value is None or found.other_value is None:
        has, lacks = (found.other, table.name) if found.value is None else (table.name, found.other)
        value = found.other_value if found.value is None else found.value
        return wording.say(
            "finding.same_measure.missing",
            locale,
            **words,
            dataset=lacks,
            other=has,
            other_value=formatting.with_unit(value, unit, locale),
        )
    return wording.say(
        "finding.same_measure.differs",
        locale,
        **words,
        dataset=table.name,
        value=formatting.with_unit(found.value, unit, locale),
        other=found.other,
        other_value=formatting.with_unit(found.other_value, unit, locale),
    )


def shown_name(table: Table, column: str) -> str:
    """The name a reader sees for a column (its label, once columns carry one)."""
    labels: Mapping[str, str] = getattr(table, "labels", {})
    return labels.get(column, column)


def _measure(plan: ChartPlan, ctx: Context) -> Finding:
    table, locale = ctx.table, ctx.locale
    found: list[Contradiction] = []
    compared = 0
    agreeing: list[str] = []
    for measure in measures_of(ctx.chart):
        pairs = list(counterparts(table, measure, ctx.tables))
        for other, column in pairs:
            shared, contradictions = compare(table, measure, other, column)
            compared += shared
            found += contradictions
        if pairs:
            agreeing.append(shown_name(table, measure))
    if found:
        cases = [_case(c, table, locale) for c in found[:_LISTED]]
        if len(found) > _LISTED:
            cases.append(
                wording.say("finding.same_measure.more", locale, count=len(found) - _LISTED)
            )
        return Finding(
            False,
            len(found),
            wording.sentence(
                wording.say("finding.same_measure.failed", locale, cases="; ".join(cases))
            ),
            wording.say("finding.same_measure.shown_contradictions", locale, count=len(found)),
        )
    if not agreeing:
        return Finding(
            True,
            0,
            wording.say("finding.same_measure.alone", locale),
            wording.say("finding.same_measure.shown_alone", locale),
        )
    agrees = wording.say(
        "finding.same_measure.agrees", locale, measures=", ".join(agreeing), periods=compared
    )
    return Finding(
        True,
        0,
        agrees[:1].upper() + agrees[1:],
        wording.say("finding.same_measure.shown_agree", locale, periods=compared),
    )


SPEC = register(
    CheckSpec(
        id="one-measure-one-truth",
        title="One measure has one value per period across the pack",
        intents=OVER_TIME,
        forms=frozenset({"lines", "panels", "control"}),
        measures="for each measure the chart draws, every other time-indexed dataset of the pack "
        "(same frequency) carrying it (same column name and unit, or a 'same_as' link): values "
        "that differ, and values where the other dataset has none, in the periods both cover",
        threshold="0 contradictions (values agree to the precision of the coarser one)",
        source="common practice (no source)",
        waivable=False,
        correction=None,
        measure=_measure,
    )
)


__all__ = ["SPEC", "Contradiction", "compare", "counterparts", "shown_name"]
