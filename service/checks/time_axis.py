"""Time axes place periods in proportion to time; logarithmic value axes are disclosed.

``time-proportional``: every period the declared frequency expects between the first and last row
has its place on the x axis, at its index, so a gap keeps its width; every line's points are in
time order within that axis. Calendar periods are spaced equally: months of 28–31 days take the same
width (common practice, no source).

``log-scale-noted``: a logarithmic value axis is said on the chart (``trend.LOG_NOTE``), and is never
used for marks that encode value by length (bars, deviation, histogram, pie): on a log axis a bar's
length does not encode its value.
"""

from __future__ import annotations

import itertools

from service.checks.registry import CheckSpec, Context, Finding, register
from service.data import periods
from service.definition.model import INTENTS, OVER_TIME
from service.intents.forms import LENGTH_FORMS, POSITION_FORMS
from service.intents.plan import ChartPlan, Scale, all_series
from service.intents.trend import LOG_NOTE

_TIME_FORMS = frozenset({"lines", "panels", "control"})


def expected_labels(ctx: Context) -> list[str]:
    """Every period label from the first to the last row, at the declared frequency."""
    table = ctx.table
    assert table.periods is not None and table.frequency is not None
    full = periods.expected(table.periods.min(), table.periods.max())
    return periods.labels(full, table.frequency, ctx.locale)


def _disorder(plan: ChartPlan) -> list[str]:
    """Series whose points are not in strictly increasing period order within the axis."""
    n = len(plan.periods)
    found = []
    for series in all_series(plan):
        if series.xs is None:  # value i is at period i: in order, and inside when the axis is
            if len(series.values) > n:
                found.append(series.name)
            continue
        xs = series.xs
        ordered = all(a < b for a, b in itertools.pairwise(xs))
        if len(xs) != len(series.values) or not ordered or (xs and (xs[0] < 0 or xs[-1] >= n)):
            found.append(series.name)
    return found


def _proportional(plan: ChartPlan, ctx: Context) -> Finding:
    labels = expected_labels(ctx)
    shown = f"{len(plan.periods)} of {len(labels)} periods"
    problems = []
    if plan.periods != labels:
        drawn = set(plan.periods)
        dropped = [p for p in labels if p not in drawn]
        listed = f" (missing: {', '.join(dropped[:6])})" if dropped else ""
        problems.append(
            f"the time axis does not place every expected period at its own index{listed}"
        )
    disordered = _disorder(plan)
    if disordered:
        problems.append(f"points of {', '.join(disordered)} are out of time order")
    if problems:
        text = "; ".join(problems)
        return Finding(False, len(plan.periods), text[0].upper() + text[1:] + ".", shown)
    return Finding(
        True,
        len(labels),
        f"Each of the {len(labels)} periods from {labels[0]} to {labels[-1]} has its own place on "
        "the time axis, so a gap keeps its width. Calendar periods are spaced equally (a month "
        "of 28 days takes the width of one of 31)."
        if ctx.table.frequency is not None and ctx.table.frequency.value == "month"
        else "the time axis, so a gap keeps its width.",
        shown,
    )


SPEC_PROPORTIONAL = register(
    CheckSpec(
        id="time-proportional",
        title="The time axis is proportional to time",
        intents=OVER_TIME,
        forms=_TIME_FORMS,
        measures="whether the x axis holds every period the declared frequency expects, each at its "
        "index, and every line's points in time order",
        threshold="every expected period placed; no point out of order",
        source="common practice (no source)",
        waivable=False,
        correction=None,
        measure=_proportional,
    )
)


def _log_axes(plan: ChartPlan) -> list[tuple[str, Scale, list[str]]]:
    """Each logarithmic axis: its name, the scale, and the notes that may disclose it."""
    axes: list[tuple[str, Scale, list[str]]] = []
    if plan.panels:
        axes += [(p.title, p.value_axis, [*p.notes, *plan.notes]) for p in plan.panels]
    else:
        axes.append(("value axis", plan.value_axis, plan.notes))
    if plan.x_axis is not None:
        axes.append(("x axis", plan.x_axis, plan.notes))
    return [axis for axis in axes if axis[1].log]


def _length_on_log(plan: ChartPlan) -> bool:
    return plan.form in LENGTH_FORMS and plan.value_axis.log


def _log_noted(plan: ChartPlan, ctx: Context) -> Finding:
    logs = _log_axes(plan)
    if not logs:
        return Finding(True, "linear", "The value axis is linear.", "linear", applicable=False)
    if _length_on_log(plan):
        return Finding(
            False,
            "log",
            f"A {plan.form} chart uses a logarithmic value axis: the length of a bar on a log axis "
            "does not encode its value. Use a linear axis from zero, or dots or lines.",
            f"log ({plan.form})",
        )
    unnoted = [name for name, _, notes in logs if LOG_NOTE not in notes]
    if unnoted:
        return Finding(
            False,
            "log",
            f"The {', '.join(unnoted)} is logarithmic, but the chart does not say so.",
            "log, not noted",
        )
    return Finding(
        True, "log", f"The scale is logarithmic, and the chart says so: {LOG_NOTE}", "log"
    )


def _add_note(plan: ChartPlan, ctx: Context) -> ChartPlan:
    if LOG_NOTE in plan.notes:
        return plan
    return plan.model_copy(update={"notes": [*plan.notes, LOG_NOTE]})


SPEC_LOG = register(
    CheckSpec(
        id="log-scale-noted",
        title="A logarithmic scale is marked, and never used for lengths",
        intents=frozenset(INTENTS),
        forms=LENGTH_FORMS | POSITION_FORMS,
        measures="whether an axis is logarithmic, whether the chart says so, and whether its marks "
        "encode value by length",
        threshold="linear; or log with a note on the chart, and never for bars, deviation, "
        "histogram or pie",
        source="common practice (no source)",
        waivable=False,
        correction="A note saying the scale is logarithmic was added to the chart.",
        measure=_log_noted,
        correct=_add_note,
    )
)
