"""Time axes place periods in proportion to time; logarithmic value axes are disclosed.

``time-proportional``: every period the declared frequency expects between the first and last row
has its place on the x axis, at its index, so a gap keeps its width; every line's points are in
time order within that axis. Calendar periods are spaced equally: months of 28–31 days take the same
width (common practice, no source).

``log-scale-noted``: a logarithmic value axis is said on the chart (``trend.log_note``), and is never
used for marks that encode value by length (bars, deviation, histogram, pie): on a log axis a bar's
length does not encode its value.
"""

from __future__ import annotations

import itertools

from service import wording
from service.checks.registry import CheckSpec, Context, Finding, register
from service.data import periods
from service.definition.model import INTENTS, OVER_TIME
from service.intents.forms import LENGTH_FORMS, POSITION_FORMS
from service.intents.plan import ChartPlan, Scale, all_series
from service.intents.trend import log_note

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
    locale = ctx.locale
    counts = {"drawn": len(plan.periods), "count": len(labels)}
    shown = wording.say("finding.periods_of", locale, **counts)
    problems = []
    if plan.periods != labels:
        drawn = set(plan.periods)
        dropped = [p for p in labels if p not in drawn]
        if dropped:
            problem = wording.say("finding.axis_missing", locale, names=", ".join(dropped[:6]))
        else:
            problem = wording.say("finding.axis_misplaced", locale)
        problems.append(problem)
    disordered = [s.title for s in all_series(plan) if s.name in set(_disorder(plan))]
    if disordered:
        problems.append(wording.say("finding.out_of_order", locale, names=", ".join(disordered)))
    if problems:
        text = "; ".join(problems)
        return Finding(
            False, len(plan.periods), wording.sentence(text[0].upper() + text[1:]), shown
        )
    detail = wording.say("finding.own_place", locale, first=labels[0], last=labels[-1], **counts)
    if ctx.table.frequency is not None and ctx.table.frequency.value == "month":
        detail = wording.sentence(detail, wording.say("finding.months_equal", locale))
    return Finding(True, len(labels), detail, shown)


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
    locale = plan.locale
    if not logs:
        return Finding(
            True, "linear", wording.say("finding.linear", locale), "linear", applicable=False
        )
    if _length_on_log(plan):
        form = wording.say(f"text.form_{plan.form}", locale)
        detail = wording.say("finding.log_lengths", locale, form=form)
        return Finding(False, "log", detail, f"log ({plan.form})")
    note = log_note(locale)
    unnoted = [name for name, _, notes in logs if note not in notes]
    if unnoted:
        names = ", ".join(
            wording.say(f"finding.{n.replace(' ', '_')}", locale)
            if n in ("value axis", "x axis")
            else n
            for n in unnoted
        )
        detail = wording.say("finding.log_not_noted", locale, names=names)
        return Finding(False, "log", detail, "log, not noted")
    return Finding(True, "log", wording.say("finding.log_noted", locale, note=note), "log")


def _add_note(plan: ChartPlan, ctx: Context) -> ChartPlan:
    note = log_note(plan.locale)
    if note in plan.notes:
        return plan
    return plan.model_copy(update={"notes": [*plan.notes, note]})


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
