"""Missing periods are drawn as gaps marked "no data": never joined across, never filled with zero.

The check recomputes, from the data alone, every period the declared frequency expects between the
first and last row, and which measures lack a value there; then it verifies that the plan has a place
for each such period, no line segment spanning it, and a "no data" mark on it.
"""

from __future__ import annotations

from service import wording
from service.checks.registry import CheckSpec, Context, Finding, register
from service.data import periods
from service.definition.model import (
    OVER_TIME,
    AnyChart,
    MovementChart,
    RelativeChangeChart,
    TrendChart,
)
from service.intents import trend
from service.intents.plan import ChartPlan, Gap, Series, all_series

#: Period labels listed in an explanation before it says "and N more".
_LISTED = 6


def measures_of(chart: AnyChart) -> list[str]:
    """The measures a time chart draws, one series each."""
    if isinstance(chart, MovementChart):
        return [chart.measure]
    assert isinstance(chart, TrendChart | RelativeChangeChart)
    return list(chart.measures)


def expected_gaps(ctx: Context) -> tuple[list[str], dict[int, list[str]]]:
    """The full period labels and, per period index, the measures with no value there."""
    table = ctx.table
    assert table.periods is not None and table.frequency is not None
    full = periods.expected(table.periods.min(), table.periods.max())
    frame = table.frame.set_index(table.periods).reindex(full)
    gaps: dict[int, list[str]] = {}
    for measure in measures_of(ctx.chart):
        for i in map(int, frame.index.get_indexer(frame.index[frame[measure].isna()])):
            gaps.setdefault(i, []).append(measure)
    labels = periods.labels(full, table.frequency, ctx.locale)
    return labels, dict(sorted(gaps.items()))


def _violations(plan: ChartPlan, labels: list[str], gaps: dict[int, list[str]]) -> list[str]:
    locale = plan.locale
    if plan.periods != labels:
        return [wording.say("finding.axis_lacks_periods", locale)]
    found: list[str] = []
    marked = {g.index: set(g.series) for g in plan.gaps}
    for series in all_series(plan):
        missing = [i for i, names in gaps.items() if series.name in names]
        drawn, joined = series.drawn_at(missing), series.spanned(missing)
        for i, value, across in zip(missing, drawn, joined, strict=True):
            where = {"name": series.title, "period": labels[i]}
            if value:
                found.append(wording.say("finding.value_drawn_at", locale, **where))
            if across:
                found.append(wording.say("finding.joined_across", locale, **where))
            if series.name not in marked.get(i, set()):
                found.append(wording.say("finding.gap_unmarked", locale, **where))
    return found


def _measure(plan: ChartPlan, ctx: Context) -> Finding:
    labels, gaps = expected_gaps(ctx)
    locale = plan.locale
    listed = ", ".join(labels[i] for i in list(gaps)[:_LISTED])
    if len(gaps) > _LISTED:
        listed = wording.say("finding.and_more", locale, listed=listed, more=len(gaps) - _LISTED)
    count = len(gaps)
    shown = wording.say("finding.period" if count == 1 else "finding.periods", locale, count=count)
    problems = _violations(plan, labels, gaps)
    if problems:
        detail = wording.say(
            "finding.gaps_but", locale, shown=shown, problems="; ".join(problems[:3])
        )
        return Finding(False, count, wording.sentence(detail), shown)
    if not gaps:
        detail = wording.say("finding.no_gaps", locale, first=labels[0], last=labels[-1])
        return Finding(True, 0, detail, shown)
    return Finding(
        True, count, wording.say("finding.gaps_ok", locale, shown=shown, listed=listed), shown
    )


def _correct(plan: ChartPlan, ctx: Context) -> ChartPlan:
    """Remove whatever is drawn at a missing period and break the lines there."""
    labels, gaps = expected_gaps(ctx)

    def mended(series: Series) -> Series:
        missing = {i for i, names in gaps.items() if series.name in names}
        xs = series.positions()
        values = [None if x in missing else v for x, v in zip(xs, series.values, strict=True)]
        return series.model_copy(update={"values": values, "segments": trend.runs(values)})

    panels = [p.model_copy(update={"series": [mended(s) for s in p.series]}) for p in plan.panels]
    return plan.model_copy(
        update={
            "periods": labels,
            "series": [mended(s) for s in plan.series],
            "panels": panels,
            "gaps": [Gap(index=i, series=names) for i, names in gaps.items()],
        }
    )


SPEC = register(
    CheckSpec(
        id="missing-periods",
        title="Missing periods are shown as gaps",
        intents=OVER_TIME,
        forms=frozenset({"lines", "panels", "control"}),
        measures="periods the declared frequency expects between the first and last row that have no "
        "value, and whether each is drawn as a marked gap",
        threshold="every missing period drawn as a gap; none joined or filled",
        source="common practice (no source)",
        waivable=False,
        correction="The line was broken at each missing period and marked 'no data'.",
        measure=_measure,
        correct=_correct,
    )
)
