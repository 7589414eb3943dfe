"""Missing periods are drawn as gaps marked "no data": never joined across, never filled with zero.

The check recomputes, from the data alone, every period the declared frequency expects between the
first and last row, and which measures lack a value there; then it verifies that the plan has a place
for each such period, no line segment spanning it, and a "no data" mark on it.
"""

from __future__ import annotations

import pandas as pd

from service.checks.registry import CheckSpec, Context, Finding, register
from service.data import periods
from service.definition.model import TrendChart
from service.intents import trend
from service.intents.plan import ChartPlan, Gap

#: Period labels listed in an explanation before it says "and N more".
_LISTED = 6


def expected_gaps(ctx: Context) -> tuple[list[str], dict[int, list[str]]]:
    """The full period labels and, per period index, the measures with no value there."""
    chart, table = ctx.chart, ctx.table
    assert isinstance(chart, TrendChart)
    assert table.periods is not None and table.frequency is not None
    full = periods.expected(table.periods.min(), table.periods.max())
    frame = table.frame.set_index(table.periods).reindex(full)
    gaps: dict[int, list[str]] = {}
    for measure in chart.measures:
        for i in map(int, frame.index.get_indexer(frame.index[frame[measure].isna()])):
            gaps.setdefault(i, []).append(measure)
    labels = [periods.label(p, table.frequency, ctx.locale) for p in full]
    return labels, dict(sorted(gaps.items()))


def _violations(plan: ChartPlan, labels: list[str], gaps: dict[int, list[str]]) -> list[str]:
    if plan.periods != labels:
        return ["the time axis does not hold every expected period"]
    found: list[str] = []
    marked = {g.index: set(g.series) for g in plan.gaps}
    for series in plan.series:
        for i, names in gaps.items():
            if series.name not in names:
                continue
            if series.values[i] is not None:
                found.append(f"{series.name} has a value drawn at {labels[i]}")
            if any(a <= i <= b for a, b in series.segments):
                found.append(f"{series.name} is joined across {labels[i]}")
            if series.name not in marked.get(i, set()):
                found.append(f"{labels[i]} is not marked 'no data' for {series.name}")
    return found


def _measure(plan: ChartPlan, ctx: Context) -> Finding:
    labels, gaps = expected_gaps(ctx)
    listed = ", ".join(labels[i] for i in list(gaps)[:_LISTED])
    more = f" and {len(gaps) - _LISTED} more" if len(gaps) > _LISTED else ""
    noun = "period" if len(gaps) == 1 else "periods"
    problems = _violations(plan, labels, gaps)
    shown = f"{len(gaps)} {noun}"
    if problems:
        return Finding(
            False,
            len(gaps),
            f"{len(gaps)} {noun} without data, but " + "; ".join(problems[:3]) + ".",
            shown,
        )
    if not gaps:
        return Finding(
            True, 0, f"Every expected period from {labels[0]} to {labels[-1]} has data.", shown
        )
    return Finding(
        True,
        len(gaps),
        f"{len(gaps)} {noun} without data ({listed}{more}): the line "
        "is broken there and marked 'no data'; nothing is filled in.",
        shown,
    )


def _correct(plan: ChartPlan, ctx: Context) -> ChartPlan:
    labels, gaps = expected_gaps(ctx)
    chart, table = ctx.chart, ctx.table
    assert isinstance(chart, TrendChart) and table.periods is not None
    full = periods.expected(table.periods.min(), table.periods.max())
    frame = table.frame.set_index(table.periods).reindex(full)
    series = []
    for old, measure in zip(plan.series, chart.measures, strict=True):
        values = [None if pd.isna(v) else float(v) for v in frame[measure]]
        series.append(old.model_copy(update={"values": values, "segments": trend.runs(values)}))
    return plan.model_copy(
        update={
            "periods": labels,
            "series": series,
            "gaps": [Gap(index=i, series=names) for i, names in gaps.items()],
        }
    )


SPEC = register(
    CheckSpec(
        id="missing-periods",
        title="Missing periods are shown as gaps",
        intents=frozenset({"trend"}),
        forms=frozenset({"lines"}),
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
